package report

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
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

// Unclipped is the Doc.Width of a table written to a file or a pipe: no
// column is dropped and no name shortened; notes and the caution are
// folded at DefaultWidth.
const Unclipped = 1 << 20

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
		{head: "MARGIN", right: true, cell: func(_ int, r *filter.Result) string { return present.RowMargin(r) }},
		{head: "BINDING", cell: func(_ int, r *filter.Result) string { return present.RowBinding(r, strict) }},
		{head: "PKGS\nNEEDED", right: true, drop: 3, cell: func(_ int, r *filter.Result) string { return strconv.Itoa(r.Packages) }},
		{head: "COST", right: true, drop: 4, cell: func(_ int, r *filter.Result) string { return cost(r.Cost) }},
		{head: "SUPPLY\nCURRENT", right: true, drop: 5, cell: func(_ int, r *filter.Result) string {
			return quantity(r.SupplyCurrent, catalog.Ampere)
		}},
		{head: "FMAX", right: true, drop: 6, cell: func(_ int, r *filter.Result) string { return fmaxText(p, r) }},
		{head: "UNKNOWN\nCHECKS", right: true, drop: 2, cell: func(_ int, r *filter.Result) string {
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
	prose := width // the width notes and the caution are folded to
	if width >= Unclipped {
		prose = DefaultWidth
	}
	b := bufio.NewWriter(w)
	p := doc.Plan
	listed := doc.Listed()
	fmt.Fprintln(b, present.Clip(oneLine(p.Title), width))
	fmt.Fprintln(b, present.Clip(fmt.Sprintf("%d of %d parts pass · sorted by %s%s", doc.Passing(), len(doc.Results),
		sortName(doc.Sort), strictText(doc.Strict)), width))
	if ws := Warnings(doc.Meta, p); len(ws) > 0 {
		b.WriteByte('\n')
		for _, w := range ws {
			line := present.Wrap("⚠ "+safe.Text(w.String()), width, "  ")
			for _, l := range line {
				if doc.Color {
					l = ansiRed + l + ansiReset
				}
				fmt.Fprintln(b, l)
			}
		}
	}
	if len(listed) == 0 {
		b.WriteByte('\n')
		wrap(b, "no candidate passes; --all lists the failing parts with what they miss", prose)
		b.WriteByte('\n')
		wrap(b, "Caution: "+Caution, prose)
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
		top, bottom := headLines(c.head)
		widths[j] = max(present.Width(top), present.Width(bottom))
		for _, row := range rows {
			widths[j] = max(widths[j], present.Width(row[j]))
		}
	}
	fit := make([]present.Column, len(cols))
	for j, c := range cols {
		fit[j] = present.Column{Width: widths[j], Drop: c.drop}
	}
	// The name is shortened (to 8 columns at least) before it is dropped;
	// the binding, never dropped, is shortened (to 12) only at the last.
	fit[len(fit)-1].Min = min(8, widths[len(fit)-1])
	fit[3].Min = min(12, widths[3])
	widths = present.Fit(fit, width, 2)
	b.WriteByte('\n')
	top, bottom := headRows(cols)
	if strings.TrimSpace(strings.Join(top, "")) != "" {
		writeRow(b, cols, widths, top, doc.Color, ansiBold)
	}
	writeRow(b, cols, widths, bottom, doc.Color, ansiBold)
	for i, r := range listed {
		colour := ""
		if doc.Color {
			colour = ansiGreen
			if !r.Pass {
				colour = ansiRed
			}
		}
		writeRow(b, cols, widths, rows[i], doc.Color, colour)
		if !r.Pass {
			for _, c := range failingOrUnknown(r, doc.Strict) {
				for _, line := range present.Wrap("✗ "+safe.Text(missText(c, r.Part)), prose-6, "  ") {
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
		note := "UNKNOWN CHECKS: checks left unknown (the catalog lacks the figure); --strict fails them"
		if doc.Strict {
			note = "UNKNOWN CHECKS: checks left unknown (the catalog lacks the figure), failed under --strict"
		}
		b.WriteByte('\n')
		wrap(b, note, prose)
	}
	b.WriteByte('\n')
	wrap(b, "Caution: "+Caution, prose)
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
	var out []*filter.Check
	for _, c := range present.FailingFirst(r) {
		if c.Status == filter.StatusFail {
			out = append(out, c)
		}
	}
	if strict {
		for i := range r.Checks {
			if r.Checks[i].Status == filter.StatusUnknown && !r.Checks[i].NotRun {
				out = append(out, &r.Checks[i])
			}
		}
	}
	return out
}

// missText says what a check needs, what the part has and by how much it
// misses: "gain/slew needs ≥ 0.628 V/µs, has 0.35 V/µs (-44 %, typical)";
// a failing hard filter is named by its reason: "package not offered:
// needs soic8 | msop8, has dip8".
func missText(c *filter.Check, p *catalog.Part) string {
	name := present.CheckName(c.Req.Stage, c.Req.Key)
	if present.Hard(c) && c.Status == filter.StatusFail {
		name = present.Reason(c) + ":"
	}
	need, has := CheckNeed(c), Has(c, p)
	if c.Req.Key == filter.KeyCost && has != "?" {
		// The COST column is packages × unit cost; the check is per unit.
		need, has = need+" per unit", has+" per unit"
	}
	s := fmt.Sprintf("%s needs %s, has %s", name, need, has)
	var extra []string
	if c.HasMargin() {
		extra = append(extra, present.Margin(c.Margin))
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

// headLines splits a header written on two lines ("PKGS\nNEEDED"); a
// one-line header is the bottom line.
func headLines(head string) (top, bottom string) {
	if t, b, ok := strings.Cut(head, "\n"); ok {
		return t, b
	}
	return "", head
}

// headRows are the header's two lines, the top one all blank when no
// header needs two.
func headRows(cols []column) (top, bottom []string) {
	top, bottom = make([]string, len(cols)), make([]string, len(cols))
	for i, c := range cols {
		top[i], bottom[i] = headLines(c.head)
	}
	return top, bottom
}

func writeRow(b *bufio.Writer, cols []column, widths []int, cells []string, color bool, colour string) {
	var line strings.Builder
	first := true
	for i, c := range cols {
		if widths[i] == 0 {
			continue
		}
		if !first {
			line.WriteString("  ")
		}
		first = false
		cell := present.Clip(cells[i], widths[i])
		pad := strings.Repeat(" ", widths[i]-present.Width(cell))
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

// wrap writes text in lines of at most width cells, breaking at spaces.
func wrap(b *bufio.Writer, text string, width int) {
	for _, l := range present.Wrap(text, width, "") {
		fmt.Fprintln(b, l)
	}
}
