package tui

import (
	"fmt"
	"slices"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/listing"
	"github.com/opsift/opsift/filter/report"
)

// explorer is explorer mode: every part of the catalog, passing or not,
// with its verdict for the design in force and the columns the user picks
// from every catalog figure (filter/listing, the same table `opsift list`
// prints), sorted on any column, found by id or name, marked into the
// shortlist. It draws over the main screen like replacement mode.
type explorer struct {
	u       *ui
	cols    []listing.Column
	typical bool
	sort    listing.SortKey
	rows    []listing.Row // every part, sorted
	view    []int         // rows that match find, in order
	widths  []int         // each column's widest cell
	find    string
	finding bool
	input   textinput.Model
	cursor  int // index into view
	offset  int // first row on screen
	colCur  int // column the sort key acts on: -1 the id, else an index into cols
	colOff  int // first data column on screen
	picking bool
	pick    int // cursor over listing.Columns() in the picker
}

// explorerAction is what a key in explorer mode asks of the root model.
type explorerAction int

const (
	exploreNone    explorerAction = iota
	exploreBack                   // leave explorer mode
	exploreQuit                   // quit the program
	exploreMark                   // toggle the shortlist mark of the selected part
	exploreColumns                // the columns changed: remember them
)

// newExplorer returns an explorer showing the column keys (unknown ones
// dropped; none: the listing's defaults), sorted by id.
func newExplorer(u *ui, keys []string) explorer {
	e := explorer{u: u, sort: listing.SortKey{Key: "id"}, colCur: -1}
	for _, k := range keys {
		if c, err := listing.Lookup(k); err == nil {
			e.cols = append(e.cols, c)
		}
	}
	if len(e.cols) == 0 {
		e.cols, _ = listing.ParseColumns("")
	}
	return e
}

// keys returns the chosen column keys, for the settings file.
func (e *explorer) keys() []string {
	out := make([]string, len(e.cols))
	for i, c := range e.cols {
		out[i] = c.Key
	}
	return out
}

// refresh rebuilds the rows from the ranking in force (no ranking: the
// bare parts at 25 °C), keeping the cursor on the same part. With the
// margin column shown the failing results are explained first: their
// worst miss needs their checks, which a summary ranking leaves out.
func (e *explorer) refresh(rs *ranking, parts []*catalog.Part) {
	sel := e.selectedID()
	plan, results := rs.resPlan, rs.results
	if plan == nil {
		results = nil
	}
	if slices.ContainsFunc(e.cols, func(c listing.Column) bool { return c.Key == "margin" }) {
		for i := range results {
			if !results[i].Pass {
				rs.explain(i)
			}
		}
	}
	e.rows = listing.Build(plan, results, parts, e.cols, e.typical)
	listing.Sort(e.rows, e.sort, e.typical)
	e.widths = make([]int, len(e.cols))
	for j, c := range e.cols {
		e.widths[j] = len([]rune(c.Head))
		for i := range e.rows {
			e.widths[j] = max(e.widths[j], len([]rune(report.ListCell(c, e.rows[i].Cells[j]))))
		}
	}
	e.filter()
	for i, ri := range e.view {
		if e.rows[ri].Part.ID == sel {
			e.cursor = i
		}
	}
}

// filter narrows the rows to those whose id or name holds the find text.
func (e *explorer) filter() {
	e.view = e.view[:0]
	q := strings.ToLower(strings.TrimSpace(e.find))
	for i := range e.rows {
		p := e.rows[i].Part
		if q == "" || strings.Contains(strings.ToLower(p.ID), q) || strings.Contains(strings.ToLower(p.Name), q) {
			e.view = append(e.view, i)
		}
	}
	e.cursor = max(0, min(e.cursor, len(e.view)-1))
}

// selected is the row under the cursor, or nil.
func (e *explorer) selected() *listing.Row {
	if e.cursor < 0 || e.cursor >= len(e.view) {
		return nil
	}
	return &e.rows[e.view[e.cursor]]
}

func (e *explorer) selectedID() string {
	if r := e.selected(); r != nil {
		return r.Part.ID
	}
	return ""
}

// explorerRows is how many part rows fit in a body of h lines: a heading,
// the column header and the find line.
func explorerRows(h int) int { return max(1, h-3) }

// update handles one key; rows is how many part rows are on screen. The
// ranking in force rebuilds the rows when the sort or the columns change.
func (e explorer) update(k tea.KeyMsg, rows int, rs *ranking, parts []*catalog.Part) (explorer, explorerAction, tea.Cmd) {
	keys := &e.u.keys
	if e.finding {
		switch k.String() {
		case "enter":
			e.finding = false
		case "esc":
			e.finding, e.find = false, ""
			e.filter()
		default:
			var cmd tea.Cmd
			e.input, cmd = e.input.Update(k)
			e.find = e.input.Value()
			e.filter()
			return e, exploreNone, cmd
		}
		return e, exploreNone, nil
	}
	if e.picking {
		all := listing.Columns()
		switch {
		case key.Matches(k, keys.Up):
			e.pick = max(0, e.pick-1)
		case key.Matches(k, keys.Down):
			e.pick = min(len(all)-1, e.pick+1)
		case key.Matches(k, keys.Mark):
			e.toggleColumn(all[e.pick])
			e.refresh(rs, parts)
		case key.Matches(k, keys.Cancel), key.Matches(k, keys.Accept), key.Matches(k, keys.ExploreColumns):
			e.picking = false
			return e, exploreColumns, nil
		}
		return e, exploreNone, nil
	}
	switch {
	case key.Matches(k, keys.Quit) && k.String() == "ctrl+c":
		return e, exploreQuit, nil
	case key.Matches(k, keys.ExploreBack):
		return e, exploreBack, nil
	case key.Matches(k, keys.Up):
		e.cursor = max(0, e.cursor-1)
	case key.Matches(k, keys.Down):
		e.cursor = max(0, min(len(e.view)-1, e.cursor+1))
	case key.Matches(k, keys.PageUp):
		e.cursor = max(0, e.cursor-max(1, rows-1))
	case key.Matches(k, keys.PageDn):
		e.cursor = max(0, min(len(e.view)-1, e.cursor+max(1, rows-1)))
	case key.Matches(k, keys.Top):
		e.cursor = 0
	case key.Matches(k, keys.Bottom):
		e.cursor = max(0, len(e.view)-1)
	case key.Matches(k, keys.ColumnLeft):
		e.colCur = max(-1, e.colCur-1)
	case key.Matches(k, keys.ColumnRight):
		e.colCur = min(len(e.cols)-1, e.colCur+1)
	case key.Matches(k, keys.Sort):
		name := "id"
		if e.colCur >= 0 {
			name = e.cols[e.colCur].Key
		}
		if e.sort.Key == name {
			e.sort.Desc = !e.sort.Desc
		} else {
			e.sort = listing.SortKey{Key: name}
		}
		e.refresh(rs, parts)
	case key.Matches(k, keys.Typical):
		e.typical = !e.typical
		e.refresh(rs, parts)
	case key.Matches(k, keys.Find):
		e.finding = true
		e.input = newInput(e.u, e.find, 64)
		e.input.Placeholder = "id or name"
		return e, exploreNone, e.input.Focus()
	case key.Matches(k, keys.ExploreColumns):
		e.picking = true
	case key.Matches(k, keys.Mark):
		if e.selected() != nil {
			return e, exploreMark, nil
		}
	}
	return e, exploreNone, nil
}

// toggleColumn adds c to the shown columns (at the end) or takes it out;
// the last column stays.
func (e *explorer) toggleColumn(c listing.Column) {
	for i, have := range e.cols {
		if have.Key == c.Key {
			if len(e.cols) > 1 {
				e.cols = append(e.cols[:i:i], e.cols[i+1:]...)
				e.colCur = min(e.colCur, len(e.cols)-1)
			}
			return
		}
	}
	e.cols = append(e.cols, c)
}

// settle keeps the cursor row and the column cursor on screen for a body
// of w × h cells.
func (e *explorer) settle(idW, w, h int) {
	rows := explorerRows(h)
	if e.cursor < e.offset {
		e.offset = e.cursor
	}
	if e.cursor >= e.offset+rows {
		e.offset = e.cursor - rows + 1
	}
	e.offset = max(0, min(e.offset, len(e.view)-rows))
	if e.colCur >= 0 && e.colCur < e.colOff {
		e.colOff = e.colCur
	}
	for e.colCur >= 0 && e.colOff < e.colCur && !e.fits(e.colOff, e.colCur, idW, w) {
		e.colOff++
	}
	e.colOff = max(0, min(e.colOff, len(e.cols)-1))
}

// explorerIDW is the explorer's id column width on a screen w cells wide:
// the catalog's longest id (up to idMaxCap) while it takes no more than a
// sixth of the width, else down to the least (idWidths); longer ids are
// cut in the middle.
func explorerIDW(c *catalogState, w int) int { return min(c.idMax, max(c.idW, w/6)) }

// fixedW is the width of the columns always shown: cursor and mark, id,
// verdict.
func fixedW(idW int) int { return 2 + idW + 1 + verdictW + 1 }

const verdictW = 8

// fits reports whether data columns from..to fit beside the fixed ones.
func (e *explorer) fits(from, to, idW, w int) bool {
	used := fixedW(idW)
	for j := from; j <= to && j < len(e.widths); j++ {
		used += e.widths[j] + 2
	}
	return used <= w
}

// verdict is the row's verdict cell: ✓ pass, ✗ and the failing count, or
// blank without a design.
func verdict(r *listing.Row) string {
	pass, known := r.Pass()
	switch {
	case !known:
		return ""
	case pass:
		return "✓ pass"
	}
	return fmt.Sprintf("✗ %d", r.Result.Failed)
}

// draw draws explorer mode into h lines of w cells; marked says which
// parts are in the shortlist.
func (e *explorer) draw(plan *filter.Plan, idW, w, h int, marked func(string) bool) []string {
	st := &e.u.st
	out := make([]string, 0, h)
	what := "worst case"
	if e.typical {
		what = "typical"
	}
	if plan != nil && !e.typical {
		what += fmt.Sprintf(" over %s … %s", catalog.Format(plan.TempLow, catalog.Celsius), catalog.Format(plan.TempHigh, catalog.Celsius))
	}
	heading := fmt.Sprintf("EXPLORER %d of %d parts · %s · sort %s", len(e.view), len(e.rows), what, e.sort)
	out = append(out, paneHeading(st, heading, true, w))
	if e.picking {
		return append(out, e.drawPicker(w, h-1)...)
	}
	// Columns on screen: from colOff while they fit; the name takes the rest.
	last := e.colOff - 1
	for j := e.colOff; j < len(e.cols) && e.fits(e.colOff, j, idW, w); j++ {
		last = j
	}
	used := fixedW(idW)
	for j := e.colOff; j <= last; j++ {
		used += e.widths[j] + 2
	}
	nameW := w - used
	mark := func(name string, j int) string {
		if e.sort.Key == name {
			if e.sort.Desc {
				return "▼"
			}
			return "▲"
		}
		if j == e.colCur {
			return "·"
		}
		return ""
	}
	head := "  " + fit(mark("id", -1)+"id", idW) + " " + fit("verdict", verdictW)
	for j := e.colOff; j <= last; j++ {
		c := e.cols[j]
		h := mark(c.Key, j) + c.Head
		if j == e.colCur {
			h = "[" + h + "]"
		}
		head += "  " + fitRight(h, e.widths[j])
	}
	if nameW >= 6 {
		head += "  " + fit("name", nameW-2)
	}
	out = append(out, st.Header.Render(fit(head, w)))
	rows := explorerRows(h)
	for i := e.offset; i < min(len(e.view), e.offset+rows); i++ {
		r := &e.rows[e.view[i]]
		cur, mk := " ", " "
		if i == e.cursor {
			cur = "▸"
		}
		if marked(r.Part.ID) {
			mk = "●"
		}
		line := cur + mk + fitID(safe.Text(r.Part.ID), idW) + " " + fit(verdict(r), verdictW)
		for j := e.colOff; j <= last; j++ {
			line += "  " + fitRight(report.ListCell(e.cols[j], r.Cells[j]), e.widths[j])
		}
		if nameW >= 6 {
			line += "  " + fit(safe.Text(r.Part.Name), nameW-2)
		}
		line = fit(line, w)
		switch pass, known := r.Pass(); {
		case i == e.cursor:
			line = st.Selected.Render(line)
		case known && !pass:
			line = st.Muted.Render(line)
		}
		out = append(out, line)
	}
	for len(out) < h-1 {
		out = append(out, strings.Repeat(" ", w))
	}
	foot := "~ typical (derated or inflated) · g read from a graph · — not given"
	if e.typical {
		foot = "typical figures as the catalog gives them (T: worst case) · g read from a graph · — not given"
	}
	if e.find != "" || e.finding {
		foot = "find: " + e.find
		if e.finding {
			foot = "find: " + e.input.View()
		}
	}
	return append(out, st.Muted.Render(fit(foot, w)))[:h]
}

// drawPicker is the column picker: every column a listing can show, the
// chosen ones ticked.
func (e *explorer) drawPicker(w, h int) []string {
	st := &e.u.st
	all := listing.Columns()
	on := map[string]bool{}
	for _, c := range e.cols {
		on[c.Key] = true
	}
	out := []string{st.Muted.Render(fit("columns: space shows or hides one, enter or esc closes (remembered)", w))}
	rows := max(1, h-1)
	from := max(0, min(e.pick-rows/2, len(all)-rows))
	for i := from; i < min(len(all), from+rows); i++ {
		c := all[i]
		box := "[ ]"
		if on[c.Key] {
			box = "[x]"
		}
		line := fit(fmt.Sprintf(" %s %-15s %s", box, c.Key, c.Label), w)
		if i == e.pick {
			line = st.Selected.Render(line)
		}
		out = append(out, line)
	}
	for len(out) < h {
		out = append(out, strings.Repeat(" ", w))
	}
	return out[:h]
}

// openExplorer opens explorer mode on the ranking in force.
func (m *Model) openExplorer() tea.Cmd {
	m.expl.refresh(&m.rank, m.cat.Parts)
	m.mode = modeExplore
	m.setMessage("explorer: every part · ←/→ column, s sort, c columns, T typical, / find, space mark, esc back")
	return nil
}

// updateExplore handles a key in explorer mode.
func (m *Model) updateExplore(k tea.KeyMsg) tea.Cmd {
	if key.Matches(k, m.ui.keys.Help) && !m.expl.finding && !m.expl.picking {
		m.openHelp()
		return nil
	}
	var act explorerAction
	var cmd tea.Cmd
	m.expl, act, cmd = m.expl.update(k, explorerRows(m.bodyH()), &m.rank, m.cat.Parts)
	switch act {
	case exploreQuit:
		m.quitting = true
		return tea.Quit
	case exploreBack:
		m.mode = modeBrowse
		m.setMessage("back from the explorer")
	case exploreMark:
		m.markPart(m.expl.selectedID(), "")
	case exploreColumns:
		if m.cfg.SettingsFile == "" {
			m.setMessage("columns set for this session (no config directory to remember them in)")
			return nil
		}
		return saveSettings(m.cfg.SettingsFile, Settings{ExplorerColumns: m.expl.keys()})
	}
	return cmd
}
