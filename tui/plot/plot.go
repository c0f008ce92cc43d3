package plot

import (
	"math"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// Mark is how a series is drawn.
type Mark int

// The marks. Solid and Dotted draw on the braille grid (two dots across,
// four down per cell), Marker puts one glyph in each column.
const (
	// Solid joins the points with a continuous braille line.
	Solid Mark = iota
	// Dotted joins them with every third dot of the line: a sparse trace.
	Dotted
	// Marker puts Series.Glyph in the cell nearest the series' value at
	// each column's centre.
	Marker
)

// Series is one trace: points (X[i], Y[i]); a NaN in either breaks the
// line. X need not be sorted, but a line joins points in slice order.
type Series struct {
	Name string
	X, Y []float64
	Mark Mark
	// Glyph is the Marker glyph; zero means '·'.
	Glyph rune
	// Style, when set, wraps every run of cells this series owns (and its
	// legend sample), e.g. with a lipgloss colour. It must not change the
	// printed width.
	Style func(string) string
}

// Options set the axes. The zero value labels both axes as plain numbers
// and fits the y range to the data.
type Options struct {
	// XDim and YDim format the axis labels (catalog.Format): Second and
	// Volt for a waveform.
	XDim, YDim catalog.Dim
	// XMin and XMax fix the x range when XMax > XMin (a waveform window
	// starting at 0 s); otherwise it is the data's range.
	XMin, XMax float64
	// YMin and YMax fix the y range when YMax > YMin; otherwise it is the
	// data's range, widened when the data are flat.
	YMin, YMax float64
	// NoLegend leaves the legend line out.
	NoLegend bool
}

// Render draws series in a block of width columns by height lines (axes,
// labels and legend included) and returns it with lines joined by "\n"
// and no trailing newline. A block too small for a plot area, or no finite
// point at all, gives a short message that fits the width instead; it
// never panics.
func Render(width, height int, series []Series, opts Options) string {
	if width <= 0 || height <= 0 {
		return ""
	}
	xlo, xhi, ylo, yhi, ok := bounds(series)
	if !ok {
		return fit("no data to plot", width)
	}
	if fixed(opts.XMin, opts.XMax) {
		xlo, xhi = opts.XMin, opts.XMax
	}
	if fixed(opts.YMin, opts.YMax) {
		ylo, yhi = opts.YMin, opts.YMax
	} else if yhi == ylo {
		pad := math.Max(math.Abs(yhi)*0.1, 1e-12)
		if yhi == 0 {
			pad = 1
		}
		ylo, yhi = ylo-pad, yhi+pad
	}
	if xhi == xlo {
		xhi = xlo + 1
	}
	legend := !opts.NoLegend && height >= 5
	rows := height - 2
	if legend {
		rows--
	}
	top, mid, bot := catalog.Format(yhi, opts.YDim), catalog.Format((ylo+yhi)/2, opts.YDim), catalog.Format(ylo, opts.YDim)
	lw := max(runeLen(top), runeLen(bot))
	if rows >= 5 {
		lw = max(lw, runeLen(mid))
	}
	cols := width - lw - 2 // label, space, axis
	if rows < 1 || cols < 2 {
		return fit("plot area too small", width)
	}
	g := newGrid(cols, rows)
	sc := scale{xlo: xlo, xhi: xhi, ylo: ylo, yhi: yhi, w: cols * 2, h: rows * 4}
	for i := range series {
		g.draw(i, &series[i], &sc)
	}

	var b strings.Builder
	for r := 0; r < rows; r++ {
		label, tick := "", '│'
		switch {
		case r == 0:
			label, tick = top, '┤'
		case r == rows-1:
			label, tick = bot, '┤'
		case rows >= 5 && r == (rows-1)/2 && (rows-1)%2 == 0:
			label, tick = mid, '┤'
		}
		b.WriteString(strings.Repeat(" ", lw-runeLen(label)))
		b.WriteString(label)
		b.WriteByte(' ')
		b.WriteRune(tick)
		g.writeRow(&b, r, series)
		b.WriteByte('\n')
	}
	b.WriteString(strings.Repeat(" ", lw+1))
	b.WriteRune('└')
	b.WriteString(strings.Repeat("─", cols))
	b.WriteByte('\n')
	b.WriteString(strings.Repeat(" ", lw+2))
	b.WriteString(xLabels(cols, xlo, xhi, opts.XDim))
	if legend {
		b.WriteByte('\n')
		b.WriteString(strings.Repeat(" ", lw+2))
		b.WriteString(legendLine(series, cols))
	}
	return b.String()
}

// bounds is the range of the finite points of all series.
func bounds(series []Series) (xlo, xhi, ylo, yhi float64, ok bool) {
	xlo, ylo = math.Inf(1), math.Inf(1)
	xhi, yhi = math.Inf(-1), math.Inf(-1)
	for _, s := range series {
		n := min(len(s.X), len(s.Y))
		for i := 0; i < n; i++ {
			x, y := s.X[i], s.Y[i]
			if !finite(x) || !finite(y) {
				continue
			}
			xlo, xhi = math.Min(xlo, x), math.Max(xhi, x)
			ylo, yhi = math.Min(ylo, y), math.Max(yhi, y)
			ok = true
		}
	}
	return xlo, xhi, ylo, yhi, ok
}

// xLabels puts the low end at the left, the high end at the right and the
// middle in between when they fit in cols columns.
func xLabels(cols int, xlo, xhi float64, d catalog.Dim) string {
	lo, hi := catalog.Format(xlo, d), catalog.Format(xhi, d)
	line := []rune(strings.Repeat(" ", cols))
	put := func(at int, s string) bool {
		r := []rune(s)
		if at < 0 || at+len(r) > len(line) {
			return false
		}
		for i := at - 1; i <= at+len(r); i++ { // keep a space between labels
			if i >= 0 && i < len(line) && line[i] != ' ' {
				return false
			}
		}
		copy(line[at:], r)
		return true
	}
	if !put(0, lo) {
		return fit(lo, cols)
	}
	put(cols-runeLen(hi), hi)
	mid := catalog.Format((xlo+xhi)/2, d)
	put(cols/2-runeLen(mid)/2, mid)
	return strings.TrimRight(string(line), " ")
}

// legendLine names each series after a sample of its mark, as far as the
// width allows.
func legendLine(series []Series, width int) string {
	var b strings.Builder
	used := 0
	for i := range series {
		s := &series[i]
		if s.Name == "" {
			continue
		}
		sample := sampleOf(s)
		item := sample + " " + s.Name
		n := runeLen(item)
		if used > 0 {
			n += 2
		}
		if used+n > width {
			break
		}
		if used > 0 {
			b.WriteString("  ")
		}
		if s.Style != nil {
			sample = s.Style(sample)
		}
		b.WriteString(sample + " " + s.Name)
		used += n
	}
	return b.String()
}

// sampleOf draws the series' mark on a flat line four cells wide.
func sampleOf(s *Series) string {
	switch s.Mark {
	case Marker:
		g := glyph(s)
		return string([]rune{g, ' ', g, ' '})
	case Dotted:
		return dotted(4)
	}
	return strings.Repeat(string(rune(brailleBase)|rune(dotBit[0][1]|dotBit[1][1])), 4)
}

// dotted is a flat Dotted line of n cells on the second dot row.
func dotted(n int) string {
	cells := make([]rune, n)
	for i := range cells {
		cells[i] = brailleBase
	}
	for x := 0; x < 2*n; x += dottedEvery {
		cells[x/2] |= rune(dotBit[x%2][1])
	}
	return string(cells)
}

func glyph(s *Series) rune {
	if s.Glyph == 0 {
		return '·'
	}
	return s.Glyph
}

// fixed reports whether lo … hi is a usable fixed range.
func fixed(lo, hi float64) bool { return finite(lo) && finite(hi) && hi > lo && finite(hi-lo) }

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

func runeLen(s string) int { return len([]rune(s)) }

// fit cuts s to width runes.
func fit(s string, width int) string {
	r := []rune(s)
	if len(r) > width {
		r = r[:width]
	}
	return string(r)
}
