package tui

import (
	"bytes"
	"errors"
	"fmt"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
	"github.com/opsift/opsift/filter/schema"
)

// entryForm is the entry form: every key of one catalog part as a grid of
// text fields (a figure's typ, min, max, min_ot, max_ot and source side by
// side), each with its description and unit hint from the catalog schema.
// After every change the fields are decoded as one [[part]] table by the
// catalog decoder (catalog.DecodeTable), so a field's problem reads as
// opsift check says it, and a part that decodes is evaluated in the design
// in force, with the place it would take in the ranking.
//
//	a ─► empty form ─► type… (check on each change) ─► ctrl+s ─► file? ─► append, reload
//	A on a part ─► the part's figures ─► type… ─► ctrl+s ─► its table replaced in its file, reload
type entryForm struct {
	u    *ui
	rows []entryRow
	// row and cell are the cursor; offset is the first grid line shown.
	row, cell, offset int
	// editing is the id of the part being edited ("" adding a new one),
	// file the catalog file it is in.
	editing, file string
	// ask is the question open at the bottom of the form; path is the
	// input of the save-to question.
	ask  entryAsk
	path textinput.Model
	// touched are the keys typed into; their problems show at once, the
	// others' (a required key still empty) after a save was tried.
	touched map[string]bool
	tried   bool
	start   string // the fields as opened, to tell whether anything changed
	saving  bool   // a write is running
	err     string // why the last save failed

	// What the last check found.
	part    *catalog.Part       // the decoded part; nil while it has problems
	probs   map[string][]string // messages of each key's problems
	general []string            // problems not of one key
	result  *filter.Result      // the part in the design in force; nil without a part or a plan
	pos     int                 // its place in the ranking (0-based)
	nPass   int                 // passing parts of the ranking besides it
	nAll    int                 // parts of the ranking besides it
}

// entryRow is one catalog key: a plain value, or the sub-keys of a table
// (or temp's two ends) side by side.
type entryRow struct {
	key   string
	cells []entryCell
}

// entryCell is one field of a row: sub is its sub-key ("" for a plain key).
type entryCell struct {
	sub string
	in  textinput.Model
}

// entryAsk is a question the form asks on its bottom line.
type entryAsk int

const (
	askNone    entryAsk = iota
	askPath             // which file to save the new part into
	askDiscard          // leave with unsaved changes?
)

// entryAction is what a key in the form asks of the root model.
type entryAction int

const (
	entryNone    entryAction = iota
	entryChanged             // a field changed: check it again
	entryClose               // leave the form, nothing saved
	entrySave                // save (to the path asked, or the edited part's file)
)

// tempSubs are the two ends of temp, shown as sub-keys.
var tempSubs = []string{"low", "high"}

// newEntryForm is a form over every catalog key, filled from p when given
// (nil: empty, for a new part). editing is p's id when p is being edited in
// its file, "" when the form adds a new part.
func newEntryForm(u *ui, p *catalog.Part, editing, file string) entryForm {
	f := entryForm{u: u, editing: editing, file: file, touched: map[string]bool{}, probs: map[string][]string{}}
	for _, k := range catalog.PartKeys() {
		r := entryRow{key: k}
		subs := catalog.SubKeys(k)
		if k == "temp" {
			subs = tempSubs
		}
		if subs == nil {
			subs = []string{""}
		}
		for _, s := range subs {
			r.cells = append(r.cells, entryCell{sub: s, in: newInput(u, "", 200)})
		}
		f.rows = append(f.rows, r)
	}
	if p != nil {
		f.fill(p)
	}
	f.start = f.snapshot()
	f.focusCell()
	return f
}

// fill puts p's figures into the fields, as the catalog encoder writes them.
func (f *entryForm) fill(p *catalog.Part) {
	var buf bytes.Buffer
	if err := catalog.Encode(&buf, []*catalog.Part{p}); err != nil {
		return
	}
	var doc struct{ Part []map[string]any }
	if _, err := toml.Decode(buf.String(), &doc); err != nil || len(doc.Part) != 1 {
		return
	}
	t := doc.Part[0]
	for i := range f.rows {
		r := &f.rows[i]
		v, ok := t[r.key]
		if !ok {
			continue
		}
		switch v := v.(type) {
		case map[string]any:
			for j := range r.cells {
				if s, ok := v[r.cells[j].sub]; ok {
					r.cells[j].in.SetValue(tomlText(s))
				}
			}
		case []any:
			if r.key == "temp" && len(v) == 2 {
				r.cells[0].in.SetValue(tomlText(v[0]))
				r.cells[1].in.SetValue(tomlText(v[1]))
				continue
			}
			r.cells[0].in.SetValue(tomlText(v))
		default:
			r.cells[0].in.SetValue(tomlText(v))
		}
	}
}

// tomlText is a decoded TOML value as the form shows it.
func tomlText(v any) string {
	switch v := v.(type) {
	case string:
		return v
	case int64:
		return strconv.FormatInt(v, 10)
	case float64:
		return strconv.FormatFloat(v, 'g', -1, 64)
	case []any:
		s := make([]string, len(v))
		for i, e := range v {
			s[i] = tomlText(e)
		}
		return strings.Join(s, ", ")
	}
	return fmt.Sprint(v)
}

// clearID empties the id field (a copy of a read-only part needs its own).
func (f *entryForm) clearID() {
	for i := range f.rows {
		if f.rows[i].key == "id" {
			f.rows[i].cells[0].in.SetValue("")
		}
	}
}

// snapshot is every field's text, to tell whether the form changed.
func (f *entryForm) snapshot() string {
	var b strings.Builder
	for _, r := range f.rows {
		for _, c := range r.cells {
			b.WriteString(c.in.Value())
			b.WriteByte(0)
		}
	}
	return b.String()
}

// changed reports whether any field differs from when the form opened.
func (f *entryForm) changed() bool { return f.snapshot() != f.start }

// table is the fields as one [[part]] table for the catalog decoder. A
// value that does not read as the key's TOML type (channels = "2x") is
// given as the text, so the decoder says what is wrong with it.
func (f *entryForm) table() map[string]any {
	t := map[string]any{}
	for _, r := range f.rows {
		if len(r.cells) == 1 && r.cells[0].sub == "" {
			v := strings.TrimSpace(r.cells[0].in.Value())
			if v == "" {
				continue
			}
			t[r.key] = plainValue(r.key, v)
			continue
		}
		if r.key == "temp" {
			lo, hi := strings.TrimSpace(r.cells[0].in.Value()), strings.TrimSpace(r.cells[1].in.Value())
			if lo != "" || hi != "" {
				t[r.key] = []any{lo, hi}
			}
			continue
		}
		sub := map[string]any{}
		for _, c := range r.cells {
			if v := strings.TrimSpace(c.in.Value()); v != "" {
				sub[c.sub] = v
			}
		}
		if len(sub) > 0 {
			t[r.key] = sub
		}
	}
	return t
}

// plainValue is the TOML value of a one-field key's text.
func plainValue(key, v string) any {
	switch key {
	case "channels":
		if n, err := strconv.ParseInt(v, 10, 64); err == nil {
			return n
		}
	case "unit_cost":
		if x, err := strconv.ParseFloat(v, 64); err == nil {
			return x
		}
	case "packages":
		fs := strings.FieldsFunc(v, func(r rune) bool { return r == ',' || r == ' ' || r == '\t' })
		l := make([]any, len(fs))
		for i, s := range fs {
			l[i] = s
		}
		return l
	}
	return v
}

// entryContext is the read-only state a check evaluates the part in.
type entryContext struct {
	plan    *filter.Plan    // the plan the ranking was made with; nil: no evaluation
	results []filter.Result // the ranking, in order
	cat     *catalog.Catalog
	sort    filter.SortKey
	strict  bool
}

// check decodes the fields as a part, groups its problems by key, and
// evaluates it in the design: pass or fail, margins, and its place in the
// ranking.
func (f *entryForm) check(ctx entryContext) {
	f.part, f.result, f.general = nil, nil, nil
	f.probs = map[string][]string{}
	p, err := catalog.DecodeTable("", f.table())
	var ps catalog.Problems
	switch {
	case errors.As(err, &ps):
		for _, pr := range ps {
			if pr.Field == "" {
				f.general = append(f.general, pr.Err.Error())
				continue
			}
			f.probs[pr.Field] = append(f.probs[pr.Field], pr.Err.Error())
		}
	case err != nil:
		f.general = append(f.general, err.Error())
	}
	if p != nil && f.editing == "" && ctx.cat != nil {
		if where := idTaken(ctx.cat, p.ID); where != "" {
			f.probs["id"] = append(f.probs["id"], fmt.Sprintf("%q is already in the catalog (%s): give the new part an id of its own, or A edits that part", p.ID, where))
			p = nil
		}
	}
	if p != nil && f.editing != "" && p.ID != f.editing && ctx.cat != nil {
		if where := idTaken(ctx.cat, p.ID); where != "" {
			f.probs["id"] = append(f.probs["id"], fmt.Sprintf("%q is already in the catalog (%s): keep %q or give an id of its own", p.ID, where, f.editing))
			p = nil
		}
	}
	f.part = p
	if p == nil || ctx.plan == nil {
		return
	}
	rs := filter.Evaluate(ctx.plan, []*catalog.Part{p}, filter.Options{Strict: ctx.strict})
	f.result = &rs[0]
	f.pos = filter.RankPosition(ctx.results, f.result, ctx.sort, f.editing)
	f.nPass, f.nAll = 0, 0
	for i := range ctx.results {
		if ctx.results[i].Part.ID == f.editing {
			continue
		}
		f.nAll++
		if ctx.results[i].Pass {
			f.nPass++
		}
	}
}

// idTaken says where a part of the catalog (valid or set aside) has id,
// "" when none has.
func idTaken(c *catalog.Catalog, id string) string {
	if p := c.ByID(id); p != nil {
		return posText(p.Pos)
	}
	for _, s := range c.SetAside {
		if s.ID == id {
			return posText(s.Pos) + ", set aside"
		}
	}
	return ""
}

// posText is FILE:LINE of a position, the file by its base name.
func posText(p catalog.Pos) string {
	if p.File == "" {
		return "catalog"
	}
	if p.Line > 0 {
		return fmt.Sprintf("%s:%d", baseName(p.File), p.Line)
	}
	return baseName(p.File)
}

// problems is how many problems the last check found.
func (f *entryForm) problems() int {
	n := len(f.general)
	for _, ps := range f.probs {
		n += len(ps)
	}
	return n
}

// shown reports whether key's problems are shown: once it was typed into
// or a save was tried.
func (f *entryForm) shown(key string) bool { return f.tried || f.touched[key] }

// update handles one key; rows is how many grid lines are on screen.
func (f entryForm) update(k tea.KeyMsg, rows int) (entryForm, entryAction, tea.Cmd) {
	keys := &f.u.keys
	if f.saving {
		return f, entryNone, nil
	}
	f.err = ""
	switch f.ask {
	case askDiscard:
		switch k.String() {
		case "y", "Y":
			f.ask = askNone
			return f, entryClose, nil
		case "n", "N", "esc":
			f.ask = askNone
		}
		return f, entryNone, nil
	case askPath:
		switch {
		case key.Matches(k, keys.Cancel):
			f.ask = askNone
			f.focusCell()
			return f, entryNone, nil
		case key.Matches(k, keys.Accept):
			return f, entrySave, nil
		}
		var cmd tea.Cmd
		f.path, cmd = f.path.Update(k)
		return f, entryNone, cmd
	}
	switch {
	case key.Matches(k, keys.Cancel), k.String() == "ctrl+c":
		if f.changed() {
			f.ask = askDiscard
			return f, entryNone, nil
		}
		return f, entryClose, nil
	case key.Matches(k, keys.SavePart):
		f.tried = true
		if f.part == nil {
			f.err = fmt.Sprintf("not saved: %s to fix first", plural(f.problems(), "problem"))
			f.goToProblem()
			return f, entryNone, nil
		}
		if f.editing != "" {
			return f, entrySave, nil
		}
		f.ask = askPath
		f.blurAll()
		return f, entryNone, f.path.Focus()
	// Only the arrow and page keys move: every printable key is text.
	case k.Type == tea.KeyUp:
		f.moveRow(-1, rows)
	case k.Type == tea.KeyDown:
		f.moveRow(1, rows)
	case k.Type == tea.KeyPgUp:
		f.moveRow(-max(1, rows-1), rows)
	case k.Type == tea.KeyPgDown:
		f.moveRow(max(1, rows-1), rows)
	case key.Matches(k, keys.Focus), key.Matches(k, keys.Accept):
		f.moveCell(1, rows)
	case key.Matches(k, keys.FocusBack):
		f.moveCell(-1, rows)
	default:
		c := &f.rows[f.row].cells[f.cell]
		before := c.in.Value()
		var cmd tea.Cmd
		c.in, cmd = c.in.Update(k)
		if c.in.Value() != before {
			f.touched[f.rows[f.row].key] = true
			return f, entryChanged, cmd
		}
		return f, entryNone, cmd
	}
	return f, entryNone, nil
}

// moveRow moves the cursor n rows, keeping its column where the row has one.
func (f *entryForm) moveRow(n, rows int) {
	f.row = max(0, min(len(f.rows)-1, f.row+n))
	f.cell = min(f.cell, len(f.rows[f.row].cells)-1)
	f.focusCell()
	f.scrollTo(rows)
}

// moveCell moves the cursor n fields on, across rows.
func (f *entryForm) moveCell(n, rows int) {
	for ; n > 0; n-- {
		if f.cell++; f.cell >= len(f.rows[f.row].cells) {
			f.cell, f.row = 0, (f.row+1)%len(f.rows)
		}
	}
	for ; n < 0; n++ {
		if f.cell--; f.cell < 0 {
			f.row = (f.row + len(f.rows) - 1) % len(f.rows)
			f.cell = len(f.rows[f.row].cells) - 1
		}
	}
	f.focusCell()
	f.scrollTo(rows)
}

// goToProblem puts the cursor on the first row with a problem.
func (f *entryForm) goToProblem() {
	for i, r := range f.rows {
		if len(f.probs[r.key]) > 0 {
			f.row, f.cell = i, 0
			f.focusCell()
			return
		}
	}
}

// focusCell gives the cursor's field the keyboard, the others none.
func (f *entryForm) focusCell() {
	f.blurAll()
	f.rows[f.row].cells[f.cell].in.Focus()
}

func (f *entryForm) blurAll() {
	for i := range f.rows {
		for j := range f.rows[i].cells {
			f.rows[i].cells[j].in.Blur()
		}
	}
}

// setPath readies the save-to question holding path.
func (f *entryForm) setPath(path string) {
	f.path = newInput(f.u, path, 512)
	f.path.Placeholder = "a catalog file of your own, such as my-parts.toml"
}

// grid lines: a section's column heading or a row.
type gridLine struct {
	head []string // column heading: sub-key names; nil for a row
	row  int      // the row drawn on the line
}

// gridLines are the form's lines: each row, with a heading of its
// sub-keys before the first row of each shape (temp, supply, the windows,
// the figures, the single values).
func (f *entryForm) gridLines() []gridLine {
	var out []gridLine
	prev := ""
	for i, r := range f.rows {
		var subs []string
		for _, c := range r.cells {
			subs = append(subs, c.sub)
		}
		sig := strings.Join(subs, " ")
		if sig != prev {
			head := subs
			if sig == "" {
				head = []string{"value"}
			}
			out = append(out, gridLine{head: head})
			prev = sig
		}
		out = append(out, gridLine{row: i})
	}
	return out
}

// lineOf is the grid line of row i.
func (f *entryForm) lineOf(i int) int {
	for n, l := range f.gridLines() {
		if l.head == nil && l.row == i {
			return n
		}
	}
	return 0
}

// scrollTo keeps the cursor's row (and the heading just above it, when it
// starts a section) inside the rows grid lines on screen.
func (f *entryForm) scrollTo(rows int) {
	rows = max(1, rows)
	n := f.lineOf(f.row)
	top := n
	if n > 0 && f.gridLines()[n-1].head != nil {
		top = n - 1
	}
	if top < f.offset {
		f.offset = top
	}
	if n >= f.offset+rows {
		f.offset = n - rows + 1
	}
	f.offset = max(0, min(f.offset, len(f.gridLines())-rows))
}

// Widths of the grid, in cells.
const (
	entryLabelW = 13 // "▸ vos_drift", a problem mark and a space
	entryCols   = 6  // the widest row: a figure's six sub-keys
)

// entryLayout is where the form's parts go in a body of w×h.
type entryLayout struct {
	fieldsW, gridH int // the field list: width, grid lines shown
	evalW, evalH   int // the evaluation: beside (evalH = h) or under the fields
	beside         bool
}

func entryLayoutFor(w, h int) entryLayout {
	const foot = 3 // hint, problem and question lines under the grid
	if w >= wideWidth {
		fw := min(w-44, entryLabelW+entryCols*10)
		return entryLayout{fieldsW: fw, gridH: max(3, h-1-foot), evalW: w - fw - 1, evalH: h - 1, beside: true}
	}
	evalH := max(4, (h-1)/3)
	return entryLayout{fieldsW: w, gridH: max(3, h-1-foot-evalH), evalW: w, evalH: evalH}
}

// settle sizes the inputs and keeps the cursor on screen for a body of w×h.
func (f *entryForm) settle(w, h int) {
	l := entryLayoutFor(w, h)
	cw := max(6, (l.fieldsW-entryLabelW)/entryCols)
	for i := range f.rows {
		r := &f.rows[i]
		for j := range r.cells {
			if len(r.cells) == 1 {
				r.cells[j].in.Width = max(6, l.fieldsW-entryLabelW-2)
			} else {
				r.cells[j].in.Width = cw - 2
			}
		}
	}
	f.path.Width = max(10, l.fieldsW-14)
	f.scrollTo(l.gridH)
}

// title is the form's heading: adding or editing, and where it saves.
func (f *entryForm) title(saveTo string) string {
	if f.editing != "" {
		return "EDIT PART " + safe.Text(f.editing) + " · in " + safe.Text(baseName(f.file))
	}
	if saveTo != "" {
		return "NEW PART · saves into " + safe.Text(baseName(saveTo))
	}
	return "NEW PART"
}

// draw draws the form over the body, w×h.
func (f *entryForm) draw(w, h int) []string {
	st := &f.u.st
	l := entryLayoutFor(w, h)
	out := []string{paneHeading(st, f.title(strings.TrimSpace(f.path.Value())), true, w)}
	fields := f.fieldLines(l)
	eval := f.evalLines(l.evalW, l.evalH)
	if l.beside {
		sep := st.Sep.Render("│")
		for i := 0; i < h-1; i++ {
			left, right := blank(l.fieldsW, 1)[0], blank(l.evalW, 1)[0]
			if i < len(fields) {
				left = fields[i]
			}
			if i < len(eval) {
				right = eval[i]
			}
			out = append(out, left+sep+right)
		}
		return out
	}
	out = append(out, fields...)
	out = append(out, eval...)
	if len(out) > h {
		out = out[:h]
	}
	return append(out, blank(w, h-len(out))...)
}

// fieldLines are the grid (scrolled), then the focused field's hint, its
// problem, and the open question or the form's state.
func (f *entryForm) fieldLines(l entryLayout) []string {
	st := &f.u.st
	w := l.fieldsW
	cw := max(6, (w-entryLabelW)/entryCols)
	grid := f.gridLines()
	var out []string
	for n := f.offset; n < len(grid) && len(out) < l.gridH; n++ {
		g := grid[n]
		if g.head != nil {
			var b strings.Builder
			b.WriteString(strings.Repeat(" ", entryLabelW))
			for _, s := range g.head {
				b.WriteString(fit(s, cw))
			}
			out = append(out, st.Muted.Render(fit(b.String(), w)))
			continue
		}
		out = append(out, f.rowLine(g.row, w, cw))
	}
	out = append(out, blank(w, l.gridH-len(out))...)
	r := f.rows[f.row]
	c := r.cells[f.cell]
	out = append(out, st.Why.Render(fit(" "+fieldHint(r.key, c.sub), w)))
	switch {
	case len(f.probs[r.key]) > 0 && f.shown(r.key):
		out = append(out, st.Error.Render(fit(" ! "+safe.Text(f.probs[r.key][0]), w)))
	case f.err != "":
		out = append(out, st.Error.Render(fit(" ! "+safe.Text(f.err), w)))
	default:
		out = append(out, fit(st.Muted.Render(" "+f.stateText()), w))
	}
	out = append(out, f.askLine(w))
	return out
}

// stateText says how far the part is from saving.
func (f *entryForm) stateText() string {
	switch n := f.problems(); {
	case f.saving:
		return "saving…"
	case n > 0:
		return plural(n, "problem") + " before it can be saved (each row marked !)"
	case f.editing != "":
		return "ready: ctrl+s writes it over the part's table in its file"
	}
	return "ready: ctrl+s saves it into a catalog file"
}

// askLine is the open question, else the keys of the form.
func (f *entryForm) askLine(w int) string {
	st := &f.u.st
	switch f.ask {
	case askDiscard:
		return fit(st.Prompt.Render(" leave the form? the part is not saved ")+st.HelpKey.Render("y")+" leave  "+st.HelpKey.Render("n")+" stay", w)
	case askPath:
		return fit(st.Prompt.Render(" save into ")+f.path.View(), w)
	}
	return blank(w, 1)[0]
}

// rowLine draws row i: the cursor, the key (marked ! when it has a
// problem shown), and its fields.
func (f *entryForm) rowLine(i, w, cw int) string {
	st := &f.u.st
	r := f.rows[i]
	cur := "  "
	if i == f.row {
		cur = "▸ "
	}
	label := fit(cur+r.key, entryLabelW-1)
	if len(f.probs[r.key]) > 0 && f.shown(r.key) {
		label = st.Error.Render(fit(cur+r.key, entryLabelW-2) + "!")
	} else if i == f.row {
		label = st.Value.Render(label)
	}
	label = fit(label, entryLabelW)
	var b strings.Builder
	b.WriteString(label)
	for j, c := range r.cells {
		width := cw
		if len(r.cells) == 1 {
			width = w - entryLabelW
		}
		if i == f.row && j == f.cell && f.ask == askNone {
			if v := c.in.Value(); safe.Text(v) != v {
				// Text with control characters is shown escaped, never
				// as the input draws it raw; validation refuses it.
				b.WriteString(fit(safe.Text(v)+st.InputCursor.Render(" "), width))
				continue
			}
			b.WriteString(fit(c.in.View(), width))
			continue
		}
		v := safe.Text(c.in.Value())
		if v == "" {
			b.WriteString(st.Muted.Render(fit("·", width)))
			continue
		}
		b.WriteString(fit(v, width-1) + " ")
	}
	return fit(b.String(), w)
}

// fieldHint is a field's unit (or its choices) and description, from the
// key's dimension and the catalog schema: `gbw · typ: a frequency such as
// "1 MHz" · typical value at 25 °C (gain-bandwidth product)`.
func fieldHint(key, sub string) string {
	name := key
	if sub != "" {
		name += " · " + sub
	}
	doc := schema.KeyDoc(key, "")
	if sub != "" {
		doc = schema.KeyDoc(key, sub) + " (" + strings.TrimSuffix(schema.KeyDoc(key, ""), " (required)") + ")"
	}
	unit := ""
	switch {
	case key == "tech":
		unit = strings.Join(catalog.Techs(), " | ")
	case key == "lifecycle":
		unit = strings.Join(catalog.Lifecycles(), " | ")
	case sub == "source":
		unit = strings.Join(catalog.Sources(), " | ")
	case key == "packages":
		unit = "separated by commas, such as soic8, dip8"
	case key == "channels":
		unit = "a whole number"
	case key == "unit_cost":
		unit = "a plain number"
	case key == "output" && sub == "load":
		d := catalog.OutputLoadDim
		unit = fmt.Sprintf("%s such as %q", d, d.Example())
	default:
		if d, ok := catalog.KeyDim(key); ok {
			unit = fmt.Sprintf("%s such as %q", d, d.Example())
		}
	}
	if unit == "" {
		return name + ": " + doc
	}
	return name + ": " + unit + " · " + doc
}

// evalLines are the part in the design in force: its would-be place in
// the ranking, its verdict and margins, then its checks.
func (f *entryForm) evalLines(w, h int) []string {
	st := &f.u.st
	out := []string{paneHeading(st, "IN THE DESIGN", false, w)}
	switch {
	case f.part == nil:
		out = append(out, st.Muted.Render(fit(" evaluated once the part reads", w)))
		if n := f.problems(); n > 0 {
			out = append(out, st.Muted.Render(fit(" "+plural(n, "problem")+" left:", w)))
			for _, r := range f.rows {
				for _, p := range f.probs[r.key] {
					for i, l := range wrap(safe.Text(r.key+": "+p), max(10, w-3)) {
						if i == 0 {
							l = st.Error.Render("!") + " " + l
						} else {
							l = "  " + l
						}
						out = append(out, fit(" "+l, w))
					}
				}
			}
			for _, p := range f.general {
				for _, l := range wrap("! "+safe.Text(p), max(10, w-1)) {
					out = append(out, fit(" "+l, w))
				}
			}
		}
	case f.result == nil:
		out = append(out, st.Muted.Render(fit(" the design cannot be derived: nothing to evaluate against", w)))
	default:
		r := f.result
		if r.Pass {
			out = append(out, fit(" "+st.Pass.Render(fmt.Sprintf("✓ would rank %d of %d passing", f.pos+1, f.nPass+1))+
				st.Muted.Render(fmt.Sprintf(" (of %s)", plural(f.nAll+1, "part"))), w))
		} else {
			out = append(out, fit(" "+st.Fail.Render("✗ would not pass")+
				st.Muted.Render(fmt.Sprintf(" · %d of %d in the full list", f.pos+1, f.nAll+1)), w))
		}
		cp := checksPane{u: f.u}
		for _, l := range wrap(cp.summary(r), max(10, w-1)) {
			out = append(out, fit(" "+l, w))
		}
		out = append(out, f.marginLines(r, w)...)
	}
	if len(out) > h {
		out = out[:h]
	}
	return append(out, blank(w, h-len(out))...)
}

// marginLines are r's checks, one a line, tightest first: failing
// filters, then every check with a margin from the smallest, then the
// unknown ones (the catalog lacks the figure).
func (f *entryForm) marginLines(r *filter.Result, w int) []string {
	st := &f.u.st
	var num, unknown, hard []*filter.Check
	for i := range r.Checks {
		c := &r.Checks[i]
		switch {
		case c.Status == filter.StatusUnknown:
			unknown = append(unknown, c)
		case c.HasMargin():
			num = append(num, c)
		case c.Status == filter.StatusFail:
			hard = append(hard, c)
		}
	}
	sort.SliceStable(num, func(i, j int) bool { return num[i].Margin < num[j].Margin })
	const nameW = 21
	out := []string{st.Header.Render(fit(" "+fit("check, tightest first", nameW+2)+fitRight("margin", 8)+"  basis", w))}
	for _, c := range hard {
		out = append(out, fit(" "+st.Fail.Render("✗ "+present.Reason(c)), w))
	}
	for _, c := range num {
		mark, style := "✓ ", st.Pass
		if c.Status == filter.StatusFail {
			mark, style = "✗ ", st.Fail
		}
		basis := c.Basis.String()
		if mk := basisMark(c.Basis); mk != "" {
			basis = mk + " " + basis
		}
		line := " " + style.Render(mark) + fit(present.CheckName(c.Req.Stage, c.Req.Key), nameW) +
			style.Render(fitRight(present.Margin(c.Margin), 8)) + "  " + st.Muted.Render(basis)
		out = append(out, fit(line, w))
	}
	for _, c := range unknown {
		out = append(out, fit(" "+st.Unknown.Render("? ")+fit(present.CheckName(c.Req.Stage, c.Req.Key), nameW)+
			st.Unknown.Render(fitRight("unknown", 8)), w))
	}
	return out
}

// keys of the form, for the bottom line.
func (k *KeyMap) entryKeys() []key.Binding {
	help := func(b key.Binding, desc string) key.Binding {
		return key.NewBinding(key.WithKeys(b.Keys()...), key.WithHelp(b.Help().Key, desc))
	}
	arrow := func(name, desc string) key.Binding {
		return key.NewBinding(key.WithKeys(name), key.WithHelp(name, desc))
	}
	return []key.Binding{help(k.Focus, "next field"), help(k.FocusBack, "previous"), arrow("↑/↓", "row"),
		k.SavePart, help(k.Cancel, "leave")}
}

// baseName is the file name of a path.
func baseName(p string) string { return filepath.Base(p) }
