package plot

import (
	"math"
	"strings"
)

// brailleBase is the empty braille cell; a cell's dots are bits on it.
const brailleBase = 0x2800

// dotBit[col][row] is the bit of the dot at column col (0, 1) and row
// row (0 top … 3 bottom) of a braille cell (Unicode braille patterns:
// dots 1–3 and 7 on the left, 4–6 and 8 on the right).
var dotBit = [2][4]uint8{{0x01, 0x02, 0x04, 0x40}, {0x08, 0x10, 0x20, 0x80}}

// dottedEvery keeps one dot in this many along a Dotted line.
const dottedEvery = 3

// scale maps data to dot coordinates: x to 0 … w−1 left to right, y to
// 0 … h−1 top to bottom.
type scale struct {
	xlo, xhi, ylo, yhi float64
	w, h               int
}

func (s *scale) dot(x, y float64) (int, int) {
	px := int(math.Round((x - s.xlo) / (s.xhi - s.xlo) * float64(s.w-1)))
	py := int(math.Round((s.yhi - y) / (s.yhi - s.ylo) * float64(s.h-1)))
	return px, py
}

// cell is one character of the plot area: the braille dots every series
// set in it, the series that owns it (the first in slice order with a dot
// or marker there) and a marker.
type cell struct {
	bits   uint8
	owner  int // series index owning the braille dots, −1 none
	marker rune
	mowner int // series index of the marker, −1 none
}

type grid struct {
	cols, rows int
	cells      []cell
}

func newGrid(cols, rows int) *grid {
	g := &grid{cols: cols, rows: rows, cells: make([]cell, cols*rows)}
	for i := range g.cells {
		g.cells[i].owner, g.cells[i].mowner = -1, -1
	}
	return g
}

// set turns on the dot (px, py) for series i; dots outside are clipped.
func (g *grid) set(i, px, py int) {
	if px < 0 || py < 0 || px >= 2*g.cols || py >= 4*g.rows {
		return
	}
	c := &g.cells[(py/4)*g.cols+px/2]
	c.bits |= dotBit[px%2][py%4]
	if c.owner < 0 || i < c.owner {
		c.owner = i
	}
}

func (g *grid) draw(i int, s *Series, sc *scale) {
	n := min(len(s.X), len(s.Y))
	if s.Mark == Marker {
		g.markers(i, s, sc, n)
		return
	}
	step := 0 // dots drawn along a Dotted path
	havePrev := false
	var px, py int
	plot := func(x, y int) {
		if s.Mark == Dotted && step%dottedEvery != 0 {
			step++
			return
		}
		step++
		g.set(i, x, y)
	}
	for k := 0; k < n; k++ {
		x, y := s.X[k], s.Y[k]
		if !finite(x) || !finite(y) {
			havePrev = false
			continue
		}
		x, y = clampTo(x, sc.xlo, sc.xhi), clampTo(y, sc.ylo-(sc.yhi-sc.ylo), sc.yhi+(sc.yhi-sc.ylo))
		qx, qy := sc.dot(x, y)
		if !havePrev {
			plot(qx, qy)
		} else if qx != px || qy != py {
			line(px, py, qx, qy, plot)
		}
		px, py, havePrev = qx, qy, true
	}
}

// markers puts the series' glyph in each column, at the row of the mean
// of its values whose x falls in that column.
func (g *grid) markers(i int, s *Series, sc *scale, n int) {
	sum := make([]float64, g.cols)
	cnt := make([]int, g.cols)
	for k := 0; k < n; k++ {
		x, y := s.X[k], s.Y[k]
		if !finite(x) || !finite(y) || y < sc.ylo || y > sc.yhi {
			continue
		}
		px, _ := sc.dot(clampTo(x, sc.xlo, sc.xhi), y)
		c := min(px/2, g.cols-1)
		sum[c] += y
		cnt[c]++
	}
	for c := range sum {
		if cnt[c] == 0 {
			continue
		}
		_, py := sc.dot(sc.xlo, sum[c]/float64(cnt[c]))
		r := min(max(py/4, 0), g.rows-1)
		cl := &g.cells[r*g.cols+c]
		if cl.mowner < 0 || i < cl.mowner {
			cl.marker, cl.mowner = glyph(s), i
		}
	}
}

// line calls plot for each dot from (x0, y0) to (x1, y1), the first left
// out (it was plotted as the end of the previous segment) (Bresenham).
func line(x0, y0, x1, y1 int, plot func(x, y int)) {
	dx, dy := abs(x1-x0), -abs(y1-y0)
	sx, sy := sign(x1-x0), sign(y1-y0)
	e := dx + dy
	for x0 != x1 || y0 != y1 {
		e2 := 2 * e
		if e2 >= dy {
			e += dy
			x0 += sx
		}
		if e2 <= dx {
			e += dx
			y0 += sy
		}
		plot(x0, y0)
	}
}

// writeRow writes row r of the plot area, wrapping runs of cells owned by
// a styled series in its style.
func (g *grid) writeRow(b *strings.Builder, r int, series []Series) {
	owner := -2
	var run strings.Builder
	flush := func() {
		if run.Len() == 0 {
			return
		}
		if owner >= 0 && series[owner].Style != nil {
			b.WriteString(series[owner].Style(run.String()))
		} else {
			b.WriteString(run.String())
		}
		run.Reset()
	}
	for c := 0; c < g.cols; c++ {
		cl := g.cells[r*g.cols+c]
		ch, who := rune(brailleBase)|rune(cl.bits), cl.owner
		// A marker shows unless a series drawn before it has dots here.
		if cl.mowner >= 0 && (cl.owner < 0 || cl.mowner < cl.owner) {
			ch, who = cl.marker, cl.mowner
		}
		if cl.bits == 0 && cl.mowner < 0 {
			ch, who = ' ', -1
		}
		if who != owner {
			flush()
			owner = who
		}
		run.WriteRune(ch)
	}
	flush()
}

func clampTo(v, lo, hi float64) float64 { return math.Min(math.Max(v, lo), hi) }

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}

func sign(v int) int {
	switch {
	case v > 0:
		return 1
	case v < 0:
		return -1
	}
	return 0
}
