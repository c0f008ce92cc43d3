package report

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
)

// ANSI colours of the table; used only when Doc.Color.
const (
	ansiGreen = "\x1b[32m"
	ansiRed   = "\x1b[31m"
	ansiDim   = "\x1b[2m"
	ansiBold  = "\x1b[1m"
	ansiReset = "\x1b[0m"
)

// DefaultWidth is the table width when the terminal's is not known.
const DefaultWidth = 100

// column is one column of the ranked table.
type column struct {
	head  string
	right bool
	drop  int // drop order when the width is short: higher goes first; 0 never
	cell  func(rank int, r *filter.Result) string
}

func tableColumns(strict bool, p *filter.Plan) []column {
	return []column{
		{head: "#", right: true, cell: func(rank int, r *filter.Result) string {
			if !r.Pass {
				return "–"
			}
			return strconv.Itoa(rank)
		}},
		{head: "PART", cell: func(_ int, r *filter.Result) string { return r.Part.ID }},
		{head: "MARGIN", right: true, cell: func(_ int, r *filter.Result) string { return Margin(r.WorstMargin) }},
		{head: "BINDING", cell: func(_ int, r *filter.Result) string {
			if !r.Pass {
				n := r.Failed
				if strict {
					n += r.Unknown
				}
				return fmt.Sprintf("fails %d check(s)", n)
			}
			if math.IsNaN(r.WorstMargin) {
				return "—"
			}
			return CheckName(r.Binding.Stage, r.Binding.Key)
		}},
		{head: "PKG", right: true, drop: 3, cell: func(_ int, r *filter.Result) string { return strconv.Itoa(r.Packages) }},
		{head: "COST", right: true, drop: 4, cell: func(_ int, r *filter.Result) string { return cost(r.Cost) }},
		{head: "SUPPLY I", right: true, drop: 5, cell: func(_ int, r *filter.Result) string {
			return quantity(r.SupplyCurrent, catalog.Ampere)
		}},
		{head: "FMAX", right: true, drop: 6, cell: func(_ int, r *filter.Result) string { return fmaxText(p, r) }},
		{head: "?", right: true, drop: 2, cell: func(_ int, r *filter.Result) string {
			if r.Unknown == 0 {
				return ""
			}
			return strconv.Itoa(r.Unknown)
		}},
		{head: "NAME", drop: 7, cell: func(_ int, r *filter.Result) string { return r.Part.Name }},
	}
}

// WriteTable writes the ranked table: one row per listed candidate, fitted
// to Doc.Width (columns dropped, then the name shortened, when narrow);
// under each failing candidate a line per failing check with by how much
// it misses; the caution at the end.
func WriteTable(w io.Writer, doc *Doc) error {
	width := doc.Width
	if width <= 0 {
		width = DefaultWidth
	}
	b := bufio.NewWriter(w)
	p := doc.Plan
	listed := doc.Listed()
	fmt.Fprintln(b, clip(oneLine(p.Title), width))
	fmt.Fprintln(b, clip(fmt.Sprintf("%d of %d parts pass · sorted by %s%s", doc.Passing(), len(doc.Results),
		sortName(doc.Sort), strictText(doc.Strict)), width))
	if len(listed) == 0 {
		b.WriteByte('\n')
		wrap(b, "no candidate passes; --all lists the failing parts with what they miss", width)
		b.WriteByte('\n')
		wrap(b, "Caution: "+Caution, width)
		return b.Flush()
	}
	cols := tableColumns(doc.Strict, p)
	rows := make([][]string, len(listed))
	for i, r := range listed {
		rows[i] = make([]string, len(cols))
		for j, c := range cols {
			rows[i][j] = safe.Text(c.cell(i+1, r))
		}
	}
	widths := make([]int, len(cols))
	for j, c := range cols {
		widths[j] = runeLen(c.head)
		for _, row := range rows {
			widths[j] = max(widths[j], runeLen(row[j]))
		}
	}
	keep := fitColumns(cols, widths, width)
	b.WriteByte('\n')
	writeRow(b, cols, keep, widths, headRow(cols), doc.Color, ansiBold)
	for i, r := range listed {
		colour := ""
		if doc.Color {
			colour = ansiGreen
			if !r.Pass {
				colour = ansiRed
			}
		}
		writeRow(b, cols, keep, widths, rows[i], doc.Color, colour)
		if !r.Pass {
			for _, c := range failingOrUnknown(r, doc.Strict) {
				for _, line := range wrapLines("✗ "+safe.Text(missText(c, r.Part)), width-6, "  ") {
					line = "      " + line
					if doc.Color {
						line = ansiDim + line + ansiReset
					}
					fmt.Fprintln(b, line)
				}
			}
		}
	}
	if unknownTotal(listed) > 0 {
		note := "? = checks left unknown (the catalog lacks the figure); --strict fails them"
		if doc.Strict {
			note = "? = checks left unknown (the catalog lacks the figure), failed under --strict"
		}
		b.WriteByte('\n')
		wrap(b, note, width)
	}
	b.WriteByte('\n')
	wrap(b, "Caution: "+Caution, width)
	return b.Flush()
}

func strictText(strict bool) string {
	if strict {
		return " · strict: unknown figures fail"
	}
	return ""
}

func unknownTotal(rs []*filter.Result) int {
	n := 0
	for _, r := range rs {
		n += r.Unknown
	}
	return n
}

// failingOrUnknown lists a failing candidate's failing checks, plus its
// unknown ones under strict evaluation, where they fail it too.
func failingOrUnknown(r *filter.Result, strict bool) []*filter.Check {
	out := r.Failing()
	if strict {
		for i := range r.Checks {
			if r.Checks[i].Status == filter.StatusUnknown {
				out = append(out, &r.Checks[i])
			}
		}
	}
	return out
}

// missText says what a check needs, what the part has and by how much it
// misses: "gain/slew needs ≥ 0.628 V/µs, has 0.35 V/µs (−44 %, typical)".
func missText(c *filter.Check, p *catalog.Part) string {
	need, has := CheckNeed(c), Has(c, p)
	if c.Req.Key == filter.KeyCost && has != "?" {
		// The COST column is packages × unit cost; the check is per unit.
		need, has = need+" per unit", has+" per unit"
	}
	s := fmt.Sprintf("%s needs %s, has %s", CheckName(c.Req.Stage, c.Req.Key), need, has)
	var extra []string
	if c.HasMargin() {
		extra = append(extra, Margin(c.Margin))
	}
	if c.Status == filter.StatusUnknown {
		extra = append(extra, "unknown")
	}
	if b := c.Basis.String(); b != "" {
		extra = append(extra, b)
	}
	if len(extra) > 0 {
		s += " (" + strings.Join(extra, ", ") + ")"
	}
	return s
}

func headRow(cols []column) []string {
	out := make([]string, len(cols))
	for i, c := range cols {
		out[i] = c.head
	}
	return out
}

// fitColumns decides which columns fit width: droppable columns go in
// drop order (highest first) until the row fits; the NAME column is then
// shortened to what is left (at least 8 columns) rather than dropped.
func fitColumns(cols []column, widths []int, width int) []bool {
	keep := make([]bool, len(cols))
	for i := range keep {
		keep[i] = true
	}
	total := func() int {
		t := 0
		for i, k := range keep {
			if k {
				t += widths[i] + 2
			}
		}
		return t - 2
	}
	name := len(cols) - 1
	if over := total() - width; over > 0 && widths[name]-over >= 8 {
		widths[name] -= over
		return keep
	}
	for total() > width {
		best := -1
		for i, c := range cols {
			if keep[i] && c.drop > 0 && (best < 0 || c.drop > cols[best].drop) {
				best = i
			}
		}
		if best < 0 {
			break
		}
		if best == name && keep[name] {
			// Try shortening the name before dropping it.
			keep[name] = false
			rest := width - total() - 2
			if rest >= 8 {
				keep[name] = true
				widths[name] = rest
				return keep
			}
			continue
		}
		keep[best] = false
	}
	return keep
}

func writeRow(b *bufio.Writer, cols []column, keep []bool, widths []int, cells []string, color bool, colour string) {
	var line strings.Builder
	first := true
	for i, c := range cols {
		if !keep[i] {
			continue
		}
		if !first {
			line.WriteString("  ")
		}
		first = false
		cell := clip(cells[i], widths[i])
		pad := strings.Repeat(" ", widths[i]-runeLen(cell))
		if c.right {
			line.WriteString(pad + cell)
		} else {
			line.WriteString(cell + pad)
		}
	}
	s := strings.TrimRight(line.String(), " ")
	if color && colour != "" {
		s = colour + s + ansiReset
	}
	b.WriteString(s)
	b.WriteByte('\n')
}

func runeLen(s string) int { return utf8.RuneCountInString(s) }

// clip shortens s to n runes, ending in "…" when cut.
func clip(s string, n int) string {
	if runeLen(s) <= n {
		return s
	}
	if n <= 1 {
		return string([]rune(s)[:max(n, 0)])
	}
	return string([]rune(s)[:n-1]) + "…"
}

// wrap writes text in lines of at most width runes, breaking at spaces.
func wrap(b *bufio.Writer, text string, width int) {
	for _, l := range wrapLines(text, width, "") {
		fmt.Fprintln(b, l)
	}
}

// wrapLines breaks text at spaces (never between a number and its unit)
// into lines of at most width runes, continuation lines starting with
// indent; a word longer than a line is clipped.
func wrapLines(text string, width int, indent string) []string {
	width = max(width, 10)
	var out []string
	line := ""
	for _, word := range glueUnits(strings.Fields(text)) {
		switch {
		case line == "":
			line = word
		case runeLen(line)+1+runeLen(word) > width:
			out = append(out, clip(line, width))
			line = indent + word
		default:
			line += " " + word
		}
	}
	if line != "" {
		out = append(out, clip(line, width))
	}
	return out
}

// glueUnits joins a number and the unit after it ("0.628" "V/µs,") into
// one word so a line never breaks between them.
func glueUnits(words []string) []string {
	out := words[:0:0]
	for _, w := range words {
		if n := len(out); n > 0 {
			prev, _ := utf8.DecodeLastRuneInString(out[n-1])
			first, _ := utf8.DecodeRuneInString(w)
			if unicode.IsDigit(prev) && (unicode.IsLetter(first) || strings.ContainsRune("%°Ωµ", first)) {
				out[n-1] += " " + w
				continue
			}
		}
		out = append(out, w)
	}
	return out
}
