package tui

import (
	"slices"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/report"
)

// comparePane is the compare detail: the 2–6 marked parts side by side
// for the ranked design (filter/compare), the rows and cells the same as
// opsift compare prints (report.CompareCells).
type comparePane struct {
	u      *ui
	offset int
	table  *compare.Table // nil when fewer than 2 or more than 6 marked parts are ranked
	plan   *filter.Plan   // the plan table is for
	ids    []string       // the parts table is for, in rank order
}

// settle rebuilds the table when the plan or the marked parts changed,
// and keeps the offset inside the lines for a pane of h lines.
func (c *comparePane) settle(plan *filter.Plan, marked []filter.Result, strict bool, h int) {
	ids := make([]string, len(marked))
	parts := make([]*catalog.Part, len(marked))
	for i := range marked {
		ids[i], parts[i] = marked[i].Part.ID, marked[i].Part
	}
	if plan != c.plan || !slices.Equal(ids, c.ids) {
		c.plan, c.ids, c.table = plan, ids, nil
		if plan != nil && len(parts) >= compare.MinParts && len(parts) <= compare.MaxParts {
			c.table, _ = compare.Build(plan, parts, filter.Options{Strict: strict})
		}
	}
	n := 0
	if c.table != nil {
		_, lines := report.CompareCells(c.table)
		n = len(lines)
	}
	c.offset = max(0, min(c.offset, n-checksBodyRows(h)))
}

// scroll moves the rows by n lines; settle applies the lower end.
func (c *comparePane) scroll(n int) { c.offset = max(0, c.offset+max(-1<<20, min(1<<20, n))) }

// draw draws the compare pane into h lines of w cells: the part ids, the
// pass/margin/binding head, then the rows from offset, the best of each
// row marked ◆ (a character, not colour).
func (c *comparePane) draw(focused bool, w, h int) []string {
	st := &c.u.st
	out := []string{paneHeading(st, "COMPARE · marked parts side by side", focused, w)}
	if c.table == nil {
		out = append(out, fit(st.Muted.Render("mark 2 to 6 parts with space to compare them here (= toggles)"), w))
		return append(out, blank(w, h-len(out))...)
	}
	head, lines := report.CompareCells(c.table)
	labelW := 12
	for _, l := range lines {
		labelW = max(labelW, len([]rune(l[0])))
	}
	n := len(head) - 1
	need := 6
	for _, l := range lines {
		for _, cell := range l[1:] {
			need = max(need, len([]rune(cell)))
		}
	}
	labelW = min(labelW, max(14, w-n*(need+1)))
	cellW := max(6, (w-labelW)/n-1)
	render := func(l []string) string {
		var b strings.Builder
		b.WriteString(fit(l[0], labelW))
		for _, cell := range l[1:] {
			b.WriteString(" " + fitRight(narrowCell(cell, cellW), cellW))
		}
		return fit(b.String(), w)
	}
	out = append(out, st.Header.Render(render(head)))
	out = append(out, fit(st.Muted.Render(report.CompareKey), w))
	for i := c.offset; i < len(lines) && len(out) < h; i++ {
		out = append(out, render(lines[i]))
	}
	return append(out, blank(w, h-len(out))...)
}

// toggleCompareView switches the detail area between the checks and the
// marked parts side by side.
func (m *Model) toggleCompareView() {
	if m.detail == detailCompare {
		m.detail = detailChecks
		m.setMessage("detail: checks")
		return
	}
	if n := m.marks.len(); n < compare.MinParts || n > compare.MaxParts {
		m.setMessage("mark %d to %d parts with space to compare them side by side (%d marked)", compare.MinParts, compare.MaxParts, n)
		return
	}
	m.detail, m.cmp.offset = detailCompare, 0
	if m.ui.layout().stacked && m.focus == paneDesign {
		m.focus = paneList
	}
	m.setMessage("detail: %d marked parts side by side (= back to checks)", m.marks.len())
}

// cmpTable lays the results' parts side by side for the ranked plan, nil
// when they cannot be (fewer than 2 or more than 6).
func (m *Model) cmpTable(res []filter.Result) *compare.Table {
	parts := make([]*catalog.Part, len(res))
	for i := range res {
		parts[i] = res[i].Part
	}
	t, err := compare.Build(m.rank.resPlan, parts, filter.Options{Strict: m.rank.strict})
	if err != nil {
		return nil
	}
	return t
}

// narrowCell shortens a cell that does not fit w cells so that the best
// mark at its end stays visible: the value is cut, the mark kept.
func narrowCell(cell string, w int) string {
	if len([]rune(cell)) <= w {
		return cell
	}
	mark := " " + report.BestMark
	if v, ok := strings.CutSuffix(cell, mark); ok && w > len([]rune(mark)) {
		return fit(v, w-len([]rune(mark))) + mark
	}
	return cell
}
