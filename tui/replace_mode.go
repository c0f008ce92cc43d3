package tui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
	"github.com/opsift/opsift/filter/replace"
	"github.com/opsift/opsift/filter/report"
)

// replacer is replacement mode: what could take the selected part's place
// (package filter/replace), as a list of candidates above a side-by-side
// comparison of the original with the candidate under the cursor. It takes
// the whole body of the screen while it has the keyboard.
//
//	R on a part ─► replace.Find(orig, catalog, plan in force) ─► replacer
//	      ↑/↓ candidate · tab: the comparison scrolls instead · space marks
//	      enter: select the candidate in the main list · esc/R back
type replacer struct {
	u   *ui
	res replace.Result
	// cursor is the candidate under the cursor, offset the first candidate
	// row on screen, scroll the first comparison line on screen.
	cursor, offset, scroll int
	// onCompare is true when the movement keys scroll the comparison.
	onCompare bool
}

// replaceAction is what a key in replacement mode asks the root model to
// do beyond moving inside the mode.
type replaceAction int

const (
	replaceStay   replaceAction = iota // nothing more
	replaceBack                        // leave the mode
	replaceQuit                        // quit the program
	replaceMark                        // toggle the candidate's shortlist mark
	replaceSelect                      // leave and select the candidate in the list
)

// newReplacer finds the replacements of orig among parts. With a plan
// every candidate is also evaluated in the design (strict: unknown checks
// fail); Find leaves orig itself and obsolete parts out.
func newReplacer(u *ui, orig *catalog.Part, parts []*catalog.Part, plan *filter.Plan, strict bool) replacer {
	res := replace.Find(orig, parts, replace.Options{Plan: plan, Strict: strict})
	return replacer{u: u, res: res}
}

// selected returns the candidate under the cursor, or nil.
func (r *replacer) selected() *replace.Candidate {
	if r.cursor < 0 || r.cursor >= len(r.res.Candidates) {
		return nil
	}
	return &r.res.Candidates[r.cursor]
}

// update handles a key: movement inside the mode, or an action for the
// root model. rows is how many candidate rows are on screen.
func (r replacer) update(k tea.KeyMsg, rows int) (replacer, replaceAction) {
	keys := &r.u.keys
	switch {
	case k.String() == "ctrl+c":
		return r, replaceQuit
	case key.Matches(k, keys.Cancel), key.Matches(k, keys.Replace), key.Matches(k, keys.Quit):
		return r, replaceBack
	case key.Matches(k, keys.Focus), key.Matches(k, keys.FocusBack):
		r.onCompare = !r.onCompare
	case key.Matches(k, keys.Up):
		r.move(-1, rows)
	case key.Matches(k, keys.Down):
		r.move(1, rows)
	case key.Matches(k, keys.PageUp):
		r.move(-max(1, rows-1), rows)
	case key.Matches(k, keys.PageDn):
		r.move(max(1, rows-1), rows)
	case key.Matches(k, keys.Top):
		r.move(-1<<30, rows)
	case key.Matches(k, keys.Bottom):
		r.move(1<<30, rows)
	case key.Matches(k, keys.Mark):
		if r.selected() != nil {
			return r, replaceMark
		}
	case key.Matches(k, keys.Accept):
		if r.selected() != nil {
			return r, replaceSelect
		}
	}
	return r, replaceStay
}

// move moves the candidate cursor (or scrolls the comparison) by n.
func (r *replacer) move(n, rows int) {
	if r.onCompare {
		// The upper bound is applied when the comparison is drawn and
		// its length known.
		r.scroll = max(0, r.scroll+max(-1<<20, min(1<<20, n)))
		return
	}
	if len(r.res.Candidates) == 0 {
		return
	}
	old := r.cursor
	r.cursor = max(0, min(len(r.res.Candidates)-1, r.cursor+n))
	if r.cursor != old {
		r.scroll = 0 // another candidate's comparison starts at the top
	}
	rows = max(1, rows)
	if r.cursor < r.offset {
		r.offset = r.cursor
	}
	if r.cursor >= r.offset+rows {
		r.offset = r.cursor - rows + 1
	}
}

// settle keeps the offsets inside what a body of w×h draws: the
// candidate rows and the comparison of the selected candidate.
func (r *replacer) settle(w, h int) {
	rows := replaceListRows(h)
	r.offset = max(0, min(r.offset, len(r.res.Candidates)-rows))
	c := r.selected()
	if c == nil {
		return
	}
	body := r.compareLines(c, w)
	fixed := min(2, len(body))
	ch := h - (rows + 2) // the comparison pane's lines
	r.scroll = max(0, min(r.scroll, len(body)-fixed-max(0, ch-1-fixed)))
}

// replaceListRows is how many candidate rows replacement mode shows in a
// body of h lines: about a quarter of it, so at 40 lines the comparison
// holds every field and the first regressions without scrolling.
func replaceListRows(h int) int { return max(3, h/4-2) }

// draw draws the mode into h lines of w cells: the candidates pane, then
// the comparison pane. marked says which parts are on the shortlist. The
// offsets are settled in Update (settle).
func (r *replacer) draw(w, h int, marked func(id string) bool) []string {
	listH := replaceListRows(h) + 2
	out := r.listLines(w, listH, marked)
	return append(out, r.compareView(w, h-len(out))...)
}

// title is the candidates pane's heading.
func (r *replacer) title() string {
	res := &r.res
	var b strings.Builder
	fmt.Fprintf(&b, "REPLACE %s — %s", res.Original.ID, plural(len(res.Candidates), "candidate"))
	drop, strict, pass := 0, 0, 0
	for i := range res.Candidates {
		c := &res.Candidates[i]
		if c.DropIn {
			drop++
		}
		if c.Strict {
			strict++
		}
		if c.Design != nil && c.Design.Pass {
			pass++
		}
	}
	fmt.Fprintf(&b, " · %d drop-in · %d strict", drop, strict)
	if res.Designed {
		fmt.Fprintf(&b, " · %d pass the design", pass)
	}
	if res.ObsoleteLeftOut > 0 {
		fmt.Fprintf(&b, " · %d obsolete left out", res.ObsoleteLeftOut)
	}
	if n := len(res.Candidates); n > 0 {
		fmt.Fprintf(&b, " · %d/%d", r.cursor+1, n)
	}
	return b.String()
}

// replaceColumns are the candidates pane's columns; the id column is idW
// wide and grows to idMax when there is room, and
// designed adds the design column.
func replaceColumns(idW, idMax int, designed bool) []column {
	cols := []column{
		{title: "", width: 2, prio: 100},
		{title: "#", width: 3, prio: 60, right: true},
		{title: "id", width: idW, prio: 99, grow: idMax},
		{title: "footprint", width: 9, prio: 97},
		{title: "strict", width: 6, prio: 96},
	}
	if designed {
		cols = append(cols, column{title: "design", width: 27, prio: 98})
	}
	return append(cols,
		column{title: "worse than the original", width: 20, prio: 95, flex: true},
		column{title: "better", width: 6, prio: 50, right: true},
	)
}

// replaceIDCol is the index of the id column in replaceColumns.
const replaceIDCol = 2

// listLines draws the candidates pane into h lines of w cells.
func (r *replacer) listLines(w, h int, marked func(id string) bool) []string {
	st := &r.u.st
	out := []string{paneHeading(st, r.title(), !r.onCompare, w)}
	parts := make([]*catalog.Part, len(r.res.Candidates))
	for i := range r.res.Candidates {
		parts[i] = r.res.Candidates[i].Part
	}
	idW, idMax := idWidths(parts)
	cols := replaceColumns(idW, idMax, r.res.Designed)
	widths := fitColumns(cols, w)
	out = append(out, st.Header.Render(fit(header(cols, widths), w)))
	if len(r.res.Candidates) == 0 {
		out = append(out, st.Muted.Render(fit("no part in the catalog could take its place (esc goes back)", w)))
	}
	for i := r.offset; i < len(r.res.Candidates) && len(out) < h; i++ {
		c := &r.res.Candidates[i]
		sel := i == r.cursor
		cur, mark := " ", " "
		if sel {
			cur = "▸"
		}
		if marked(c.Part.ID) {
			mark = "●"
		}
		foot := "footprint"
		if c.DropIn {
			foot = "drop-in"
		}
		strict := "—"
		if c.Strict {
			strict = "strict"
		}
		cells := []string{cur + mark, fmt.Sprint(i + 1), fitID(safe.Text(c.Part.ID), widths[replaceIDCol]), foot, strict}
		if r.res.Designed {
			cells = append(cells, designCell(c.Design))
		}
		cells = append(cells, regressionSummary(c), fmt.Sprintf("▲%d", len(c.Improvements)))
		line := fit(row(cols, widths, cells), w)
		if sel {
			line = st.Selected.Render(line)
		}
		out = append(out, line)
	}
	return append(out, blank(w, h-len(out))...)
}

// designCell is a candidate's fit to the design in words, as the CLI
// writes it: "✓ +31 % gain/gbw" (the worst margin and the check it is on),
// "✗ -32 % gain/slew +2" (the worst failing check, by how far it misses,
// and how many more fail), "✗ package not offered" (a hard filter, by its
// reason), "—" without a design.
func designCell(f *replace.Fit) string {
	if f == nil {
		return "—"
	}
	if f.Pass {
		if !f.WorstMargin.Known() {
			return "✓ pass"
		}
		return "✓ " + present.Margin(f.WorstMargin.V()) + " " + present.CheckName(f.Binding.Stage, filter.Key(f.Binding.Key))
	}
	if len(f.Failed) == 0 {
		return "✗ FAIL"
	}
	s := "✗ " + f.Failed[0]
	if f.WorstMargin.Known() && f.WorstMargin.V() < 0 {
		s = "✗ " + present.Margin(f.WorstMargin.V()) + " " + f.Failed[0]
	}
	if len(f.Failed) > 1 {
		s += fmt.Sprintf(" +%d", len(f.Failed)-1)
	}
	return s
}

// regressionSummary is a candidate's regressions in one cell: how many,
// then the first two reasons without their consequence ("▼3 lower maximum
// supply: 18 V against 26 V; slew rate worse: …"), and how many figures
// it lacks. "none" when nothing is worse or missing.
func regressionSummary(c *replace.Candidate) string {
	var parts []string
	for i, ch := range c.Regressions {
		if i == 2 {
			break
		}
		reason, _, _ := strings.Cut(ch.Reason(), " — ")
		parts = append(parts, reason)
	}
	s := ""
	if n := len(c.Regressions); n > 0 {
		s = fmt.Sprintf("▼%d %s", n, strings.Join(parts, "; "))
		if n > 2 {
			s += "; …"
		}
	}
	if n := len(c.Missing); n > 0 {
		if s != "" {
			s += " · "
		}
		s += fmt.Sprintf("%d not given: %s", n, strings.Join(c.Missing, " "))
	}
	if s == "" {
		return "none"
	}
	return s
}

// verdictText is a field's verdict as a symbol and a word, so it reads
// without colour.
func verdictText(v replace.Verdict) string {
	switch v {
	case replace.Better:
		return "▲ better"
	case replace.Worse:
		return "▼ worse"
	case replace.Same:
		return "= same"
	}
	return "? unknown"
}

// valueText is one side of a field: the figure with the basis marker the
// rest of the selector uses (~ typical, g graph), "—" when not given.
func valueText(f *replace.Field, v replace.Value) string {
	s := f.Format(v)
	if !v.Set {
		return s
	}
	switch v.Basis {
	case replace.Typical:
		s = report.WithBasis(s, filter.BasisTypical)
	case replace.Graph:
		s = report.WithBasis(s, filter.BasisGraph)
	}
	return s
}

// basisText is one side's basis in words and which limit it is ("guaranteed
// min", "typical"), "" when not given.
func basisText(v replace.Value) string {
	if !v.Set {
		return ""
	}
	if v.Limit == "" || v.Limit == replace.LimitTyp || v.Limit == replace.LimitRating {
		return string(v.Basis)
	}
	return string(v.Basis) + " " + string(v.Limit)
}

// compareColumns are the comparison pane's columns for w cells and
// their widths. The two basis columns come and go together: where they do
// not fit, the values' ~ and g markers still tell a typical or graph
// figure from a guaranteed one.
func compareColumns(w int) ([]column, []int) {
	cols := []column{
		{title: "verdict", width: 9, prio: 100},
		{title: "field", width: 13, prio: 99},
		{title: "original", width: 13, prio: 98, right: true},
		{title: "basis", width: 17, prio: 40},
		{title: "candidate", width: 13, prio: 97, right: true},
		{title: "basis", width: 17, prio: 40},
		{title: "what it is · note", width: 12, prio: 50, flex: true},
	}
	widths := fitColumns(cols, w)
	if widths[3] == 0 || widths[5] == 0 {
		cols[3].prio, cols[5].prio = 0, 0
		widths = fitColumns(cols, w)
	}
	return cols, widths
}

// compareLines is the comparison of the original with candidate c: a
// footprint and design line, one row per field, then the regressions in
// full and what the candidate lacks.
func (r *replacer) compareLines(c *replace.Candidate, w int) []string {
	st := &r.u.st
	cols, widths := compareColumns(w)
	out := []string{fit(c.Footprint+" · "+strictText(c)+designLine(c.Design), w)}
	out = append(out, st.Header.Render(fit(header(cols, widths), w)))
	for i := range c.Fields {
		f := &c.Fields[i]
		verdict := verdictText(f.Verdict)
		switch f.Verdict {
		case replace.Worse:
			verdict = st.Fail.Render(verdict)
		case replace.Better:
			verdict = st.Pass.Render(verdict)
		case replace.Unknown:
			verdict = st.Unknown.Render(verdict)
		default:
			verdict = st.Muted.Render(verdict)
		}
		note := f.Label
		if f.Note != "" {
			note += " · " + f.Note
		}
		cells := []string{verdict, f.Key, valueText(f, f.Original), basisText(f.Original),
			valueText(f, f.Candidate), basisText(f.Candidate), st.Why.Render(note)}
		out = append(out, fit(row(cols, widths, cells), w))
	}
	if len(c.Regressions) > 0 {
		out = append(out, st.Section.Render(fit("regressions, most circuit-breaking first", w)))
		for _, ch := range c.Regressions {
			out = append(out, fit("  ▼ "+ch.Reason(), w))
		}
	}
	if len(c.Missing) > 0 {
		out = append(out, fit(st.Unknown.Render("  ? not given by the candidate: "+strings.Join(c.Missing, ", ")), w))
	}
	return out
}

// strictText says whether c is strict, in words.
func strictText(c *replace.Candidate) string {
	if c.Strict {
		return "strict: nothing worse or missing"
	}
	return fmt.Sprintf("not strict: %d worse, %d not given", len(c.Regressions), len(c.Missing))
}

// designLine is the design fit for the comparison's first line.
func designLine(f *replace.Fit) string {
	if f == nil {
		return ""
	}
	s := " · design " + designCell(f)
	if !f.Pass && len(f.Failed) > 1 {
		s += " (" + strings.ReplaceAll(strings.Join(f.Failed, ", "), "/", ".") + ")"
	}
	return s
}

// compareView draws the comparison pane into h lines of w cells, the
// footprint line and column header staying put while the rows scroll.
func (r *replacer) compareView(w, h int) []string {
	st := &r.u.st
	c := r.selected()
	if h <= 0 {
		return nil
	}
	if c == nil {
		out := []string{paneHeading(st, "COMPARE", r.onCompare, w)}
		return append(out, blank(w, h-1)...)
	}
	o := r.res.Original
	title := fmt.Sprintf("COMPARE original %s (%s) · candidate %s (%s, %s)", o.ID, o.Lifecycle, c.Part.ID, c.Part.Tech, c.Part.Lifecycle)
	out := []string{paneHeading(st, title, r.onCompare, w)}
	body := r.compareLines(c, w)
	fixed := min(2, len(body))
	out = append(out, body[:fixed]...)
	for i := fixed + r.scroll; i < len(body) && len(out) < h; i++ {
		out = append(out, body[i])
	}
	if len(out) > h {
		out = out[:h]
	}
	return append(out, blank(w, h-len(out))...)
}

// replaceKeys are the bottom line in replacement mode.
func (k *KeyMap) replaceKeys() []key.Binding {
	return []key.Binding{
		key.NewBinding(key.WithKeys("up", "down"), key.WithHelp("↑/↓", "candidate")),
		key.NewBinding(key.WithKeys("tab"), key.WithHelp("tab", "scroll comparison")),
		k.Mark,
		key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "select in list")),
		key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "back")),
	}
}

// openReplace opens replacement mode for the selected candidate.
func (m *Model) openReplace() tea.Cmd {
	r := m.list.selected(m.rank.results)
	if r == nil {
		m.setMessage("select a part first; R lists what could take its place")
		return nil
	}
	m.repl = newReplacer(m.ui, r.Part, m.cat.Parts, m.rank.plan, m.cfg.Strict)
	m.mode = modeReplace
	m.setMessage("replacements for %s: ▼ worse ▲ better = same ? unknown; ~ typical, g graph", r.Part.ID)
	return nil
}

// updateReplace handles a key in replacement mode.
func (m *Model) updateReplace(k tea.KeyMsg) tea.Cmd {
	var act replaceAction
	m.repl, act = m.repl.update(k, replaceListRows(m.bodyH()))
	switch act {
	case replaceQuit:
		return m.requestQuit()
	case replaceBack:
		m.mode = modeBrowse
		m.setMessage("back from replacement mode")
	case replaceMark:
		m.markPart(m.repl.selected().Part.ID, "")
	case replaceSelect:
		id := m.repl.selected().Part.ID
		m.mode = modeBrowse
		m.list.selID = id
		m.applyNarrowing()
		if s := m.list.selected(m.rank.results); s == nil || s.Part.ID != id {
			m.setMessage("%s is hidden by the filters (f shows failing parts, c clears filters)", id)
		} else {
			m.focus = paneList
			m.setMessage("selected %s", id)
		}
	}
	return nil
}
