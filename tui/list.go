package tui

import (
	"fmt"
	"math"
	"strings"

	"github.com/charmbracelet/x/ansi"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
)

// list is the candidate pane: the rows the narrowing lets through, in
// rank order, with a cursor. Only the rows on screen are ever drawn.
type list struct {
	u      *ui
	view   []int // indices into ranking.results
	cursor int   // index into view
	offset int   // first row on screen
	// selID is the part selected: the first row of the first ranking,
	// then the part the user chose (by moving or clicking). It survives
	// re-rankings, re-sorts and filters that hide it: while it is not shown
	// the cursor stays at the same position, and when it shows again the
	// cursor goes back to it.
	selID string
	// gone is selID while it is not shown (its drop-out was reported).
	gone string
}

// selected returns the result under the cursor, or nil.
func (l *list) selected(results []filter.Result) *filter.Result {
	if l.cursor < 0 || l.cursor >= len(l.view) {
		return nil
	}
	return &results[l.view[l.cursor]]
}

// setRows shows rows (indices into results) and puts the cursor back on
// the selected part; rows is how many fit on screen. It returns the id of
// the selected part when it has just dropped out of the rows, else "".
func (l *list) setRows(view []int, results []filter.Result, rows int) (dropped string) {
	l.view = view
	return l.reselect(results, rows)
}

// reselect puts the cursor back on the selected part (by id) after the
// rows changed; while that part is not shown the cursor keeps its
// position. The first rows shown pin their first part. It returns the
// selected part's id when it has just dropped out.
func (l *list) reselect(results []filter.Result, rows int) (dropped string) {
	if l.selID == "" && len(l.view) > 0 {
		l.selID = results[l.view[0]].Part.ID
	}
	found := false
	if l.selID != "" {
		for i, ri := range l.view {
			if results[ri].Part.ID == l.selID {
				l.cursor, found = i, true
				break
			}
		}
	}
	switch {
	case found:
		l.gone = ""
	case l.selID != "" && l.gone != l.selID && len(results) > 0:
		l.gone, dropped = l.selID, l.selID
	}
	if !found {
		l.cursor = max(0, min(l.cursor, len(l.view)-1))
	}
	l.scrollTo(rows)
	return dropped
}

// move moves the cursor by n rows and remembers the part it lands on.
func (l *list) move(n int, results []filter.Result, rows int) {
	if len(l.view) == 0 {
		return
	}
	l.cursor = max(0, min(len(l.view)-1, l.cursor+n))
	l.selID, l.gone = results[l.view[l.cursor]].Part.ID, ""
	l.scrollTo(rows)
}

// scrollTo keeps the cursor inside the rows on screen.
func (l *list) scrollTo(rows int) {
	rows = max(1, rows)
	if l.cursor < l.offset {
		l.offset = l.cursor
	}
	if l.cursor >= l.offset+rows {
		l.offset = l.cursor - rows + 1
	}
	l.offset = max(0, min(l.offset, len(l.view)-rows))
}

// listColumns are the candidate pane's columns; the id column is idW
// wide and grows to idMax when the pane has room.
func listColumns(idW, idMax int) []column {
	return []column{
		{title: "", width: 2, prio: 100},
		{title: "#", width: 3, prio: 90, right: true},
		{title: "id", width: idW, prio: 95, grow: idMax},
		{title: "name", width: 12, prio: 1, flex: true},
		{title: "tech", width: 7, prio: 3},
		{title: "ch", width: 2, prio: 2, right: true},
		{title: "margin", width: 8, prio: 92, right: true}, // "-35 % g"
		{title: "", width: barCells, prio: 4},
		{title: "binding", width: 20, prio: 80},
		{title: "fmax", width: 10, prio: 5, right: true}, // "27.5 kHz g"
		{title: "pkg×cost", width: 8, prio: 6, right: true},
	}
}

// idWidths are the id column's widths for a catalog: the least, its
// longest id kept between 6 and idMinCap cells, and the most, its longest
// id up to idMaxCap, which the column grows to when the pane has room.
func idWidths(parts []*catalog.Part) (least, most int) {
	w := 6
	for _, p := range parts {
		w = max(w, ansi.StringWidth(safe.Text(p.ID)))
	}
	return min(w, idMinCap), min(w, idMaxCap)
}

// idMinCap and idMaxCap bound the id column: a longer id is cut in its
// middle (fitID).
const (
	idMinCap = 16
	idMaxCap = 32
)

// listIDCol is the index of the id column in listColumns.
const listIDCol = 2

// visible is the range of view indices on screen for rows candidate rows.
func (l *list) visible(rows int) (from, to int) {
	return l.offset, min(len(l.view), l.offset+rows)
}

// explainVisible fills in the checks of the rows on screen and of the
// selected row, which are what the list and the checks pane draw.
func (l *list) explainVisible(rs *ranking, rows int) {
	from, to := l.visible(rows)
	for i := from; i < to; i++ {
		rs.explain(l.view[i])
	}
	if l.cursor >= 0 && l.cursor < len(l.view) {
		rs.explain(l.view[l.cursor])
	}
}

// listRowsIn is how many candidate rows a list pane of h lines holds.
func listRowsIn(h int) int { return max(0, h-2) }

// draw draws the candidate pane into h lines of w cells. The rows on
// screen must have been explained (explainVisible) in Update.
func (l *list) draw(rs *ranking, n *narrowing, marks *shortlist, idW, idMax int, focused bool, w, h int) []string {
	st := &l.u.st
	out := make([]string, 0, h)
	out = append(out, paneHeading(st, l.title(rs, n, marks), focused, w))
	cols := listColumns(idW, idMax)
	widths := fitColumns(cols, w)
	out = append(out, st.Header.Render(fit(header(cols, widths), w)))
	switch {
	case rs.loading != "":
		out = append(out, st.Muted.Render(fit(rs.loading, w)))
	case rs.plan == nil:
		out = append(out, st.Error.Render(fit("no ranking: the design cannot be derived (see the design pane)", w)))
	case len(l.view) == 0 && rs.running:
		out = append(out, st.Muted.Render(fit("ranking…", w)))
	case len(l.view) == 0:
		hint := emptyHint(n)
		if len(rs.warnings) > 0 {
			hint += " · ⚠ see the warnings atop the design pane"
		}
		out = append(out, st.Muted.Render(fit(hint, w)))
	}
	from, to := l.visible(listRowsIn(h))
	for i := from; i < to; i++ {
		out = append(out, l.row(&rs.results[l.view[i]], i, marks, cols, widths, w))
	}
	for len(out) < h {
		out = append(out, strings.Repeat(" ", w))
	}
	return out[:h]
}

// title is the candidate pane's heading: what is shown and how.
func (l *list) title(rs *ranking, n *narrowing, marks *shortlist) string {
	var b strings.Builder
	if n.shortlist {
		fmt.Fprintf(&b, "SHORTLIST %d marked", marks.len())
	} else {
		fmt.Fprintf(&b, "CANDIDATES %d of %d pass", rs.nPass, rs.parts)
	}
	fmt.Fprintf(&b, " · sort %s", n.sortKey())
	if n.failing && !n.shortlist {
		// The sort key orders the passing parts only (filter.Rank).
		b.WriteString(" · +failing by fewest misses")
	}
	if n.tech != "" {
		b.WriteString(" · tech " + n.tech)
	}
	if n.pkg != "" {
		b.WriteString(" · pkg " + n.pkg)
	}
	if n.find != "" {
		fmt.Fprintf(&b, " · find %q", n.find)
	}
	if len(l.view) > 0 {
		fmt.Fprintf(&b, " · %d/%d", l.cursor+1, len(l.view))
	}
	return b.String()
}

// emptyHint says why the list is empty and what to try.
func emptyHint(n *narrowing) string {
	switch {
	case n.shortlist:
		return "the shortlist is empty: mark parts with space, l to go back"
	case n.active():
		return "no part matches the filters: c clears them"
	case !n.failing:
		return "no part passes: f shows the failing parts and why"
	}
	return "the catalog holds no parts"
}

// row draws one candidate.
func (l *list) row(r *filter.Result, i int, marks *shortlist, cols []column, widths []int, w int) string {
	st := &l.u.st
	sel := i == l.cursor
	plain := sel // the selected row is one style, so cells stay unstyled
	style := func(s string, styleOf func() string) string {
		if plain {
			return s
		}
		return styleOf()
	}
	cur := " "
	if sel {
		cur = "▸"
	}
	mark := " "
	if marks.has(r.Part.ID) {
		mark = "●"
	}
	if !plain && mark != " " {
		mark = st.Mark.Render(mark)
	}

	margin, binding := marginCells(r)
	marginCell := style(margin, func() string {
		if r.Pass {
			return margin
		}
		return st.Fail.Render(margin)
	})
	barCell := bar(r.WorstMargin, barCells)
	if !r.Pass {
		barCell = bar(-1, barCells)
	}
	barCell = style(barCell, func() string {
		if r.Pass {
			return st.Pass.Render(barCell)
		}
		return st.Fail.Render(barCell)
	})
	fm := r.MinFMax()
	fmax := "—"
	if !math.IsNaN(fm) {
		fmax = markedCell(catalog.Format(fm, catalog.Hertz), fmaxBasis(r))
	}
	cells := []string{
		cur + mark,
		fmt.Sprint(i + 1),
		fitID(safe.Text(r.Part.ID), widths[listIDCol]),
		safe.Text(r.Part.Name),
		string(r.Part.Tech),
		fmt.Sprint(r.Part.Channels),
		marginCell,
		barCell,
		style(binding, func() string {
			if r.Pass {
				return binding
			}
			return st.Fail.Render(binding)
		}),
		fmax,
		costText(r),
	}
	line := fit(row(cols, widths, cells), w)
	if sel {
		return st.Selected.Render(line)
	}
	return line
}

// marginCells are a result's margin (with its basis marker) and binding
// cells, written by filter/present like every front end. For a failing
// part they name the worst failing check, by how far it misses, or the
// hard filter it fails by its reason ("package not offered"), and how many
// more fail; a failing part never shows a positive margin.
func marginCells(r *filter.Result) (margin, binding string) {
	if r.Pass {
		if math.IsNaN(r.WorstMargin) {
			return present.None, ""
		}
		b := filter.BasisGuaranteed
		if c := bindingCheck(r); c != nil {
			b = c.Basis
		}
		return markedCell(present.Margin(r.WorstMargin), b), present.CheckName(r.Binding.Stage, r.Binding.Key)
	}
	worst := present.Worst(r)
	if worst == nil { // strict: failing on unknown figures only
		return present.None, fmt.Sprintf("? %d unknown", r.Unknown)
	}
	binding = "✗ " + present.Reason(worst)
	if n := len(r.Failing()); n > 1 {
		binding += fmt.Sprintf(" +%d", n-1)
	}
	if !worst.HasMargin() {
		return "✗", binding
	}
	return markedCell(present.Margin(worst.Margin), worst.Basis), binding
}
