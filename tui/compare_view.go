package tui

import (
	"fmt"
	"slices"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/present"
	"github.com/opsift/opsift/filter/report"
)

// comparePane is the compare detail: the 2–6 marked parts side by side
// for the ranked design (filter/compare), the rows and cells the same as
// opsift compare prints (report.CompareCells).
type comparePane struct {
	u      *ui
	offset int
	colOff int            // first part column on screen, when not all fit (←/→)
	table  *compare.Table // nil when fewer than 2 or more than 6 marked parts are ranked
	plan   *filter.Plan   // the plan table is for
	ids    []string       // the parts table is for, in rank order
}

// settle rebuilds the table when the plan or the marked parts changed,
// and keeps the offsets inside the lines and part columns for a pane of
// w×h.
func (c *comparePane) settle(plan *filter.Plan, marked []filter.Result, strict bool, w, h int) {
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
	n, cols, shown := 0, 0, 0
	if c.table != nil {
		head, lines := report.CompareCells(c.table)
		n, cols = len(lines), len(head)-1
		_, _, shown = compareLayout(head, lines, w)
	}
	// Under the heading, the part ids and the key (wrapped).
	c.offset = max(0, min(c.offset, n-max(0, h-2-len(wrap(report.CompareKey, w)))))
	c.colOff = max(0, min(c.colOff, cols-shown))
}

// scroll moves the rows by n lines; settle applies the lower end.
func (c *comparePane) scroll(n int) { c.offset = max(0, c.offset+max(-1<<20, min(1<<20, n))) }

// scrollCols moves the part columns by n; settle applies the right end.
func (c *comparePane) scrollCols(n int) { c.colOff = max(0, c.colOff+n) }

// compareLayout fits the compare table into w cells: the label column as
// wide as its longest label (up to a quarter of w), every part column as
// wide as its widest cell, and as many part columns as fit whole — the
// rest are reached with ←/→ rather than cut. When even one does not fit,
// one column takes what is left.
func compareLayout(head []string, lines [][]string, w int) (labelW, cellW, shown int) {
	labelW, cellW = 12, 6
	for _, l := range append([][]string{head}, lines...) {
		labelW = max(labelW, present.Width(l[0]))
		for _, cell := range l[1:] {
			cellW = max(cellW, present.Width(cell))
		}
	}
	labelW = min(labelW, max(16, w/4)) // a longer label is cut, as opsift compare does
	n := len(head) - 1
	shown = max(1, min(n, (w-labelW)/(cellW+1)))
	if shown == 1 {
		cellW = min(cellW, max(6, w-labelW-1))
	}
	return labelW, cellW, shown
}

// draw draws the compare pane into h lines of w cells: the part ids, the
// pass/margin/binding head, then the rows from offset, the best of each
// row marked ◆ (a character, not colour).
func (c *comparePane) draw(focused bool, w, h int) []string {
	st := &c.u.st
	title := "COMPARE · marked parts side by side"
	if c.table == nil {
		out := []string{paneHeading(st, title, focused, w)}
		out = append(out, fit(st.Muted.Render("mark 2 to 6 parts with space to compare them here (= toggles)"), w))
		return append(out, blank(w, h-len(out))...)
	}
	head, lines := report.CompareCells(c.table)
	labelW, cellW, shown := compareLayout(head, lines, w)
	n := len(head) - 1
	from := max(0, min(c.colOff, n-shown))
	if shown < n {
		title += fmt.Sprintf(" · parts %d–%d of %d (←/→)", from+1, from+shown, n)
	}
	out := []string{paneHeading(st, title, focused, w)}
	render := func(l []string) string {
		var b strings.Builder
		b.WriteString(fit(l[0], labelW))
		for _, cell := range l[1+from : 1+from+shown] {
			b.WriteString(" " + fitRight(narrowCell(cell, cellW), cellW))
		}
		return fit(b.String(), w)
	}
	out = append(out, st.Header.Render(render(head)))
	for _, l := range wrap(report.CompareKey, w) {
		out = append(out, st.Muted.Render(fit(l, w)))
	}
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
