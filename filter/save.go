package filter

import (
	"errors"
	"fmt"
	"maps"
	"slices"
	"sort"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/tomlpos"
)

// UpdateDesignText writes the inputs of d into orig, the design file's
// text as it was read, in place: a changed value replaces the text of the
// old one and nothing else, so comments, blank lines, key order and
// alignment stay as the user wrote them; an input given for the first time
// is inserted beside its neighbours in form order (inside the stage's
// inline table when it has one, in a new [table] placed in file order when
// the table is missing); an input cleared is removed with its line. The
// stages of d must be those of orig (same names, same order): the
// selector edits values, it does not add or remove stages.
//
// The result is decoded once more and must give exactly the inputs of d;
// when it does not, an error is returned and nothing should be written.
func UpdateDesignText(orig []byte, d *Design) ([]byte, error) {
	base, err := DecodeDesign(d.file(), orig)
	if err != nil {
		return nil, fmt.Errorf("the file as read does not decode: %w", err)
	}
	if !slices.Equal(stageNames(base), stageNames(d)) {
		return nil, fmt.Errorf("the stages differ from the file's (%s against %s); save can only change values",
			strings.Join(stageNames(d), ", "), strings.Join(stageNames(base), ", "))
	}
	old, now := designLeaves(base), designLeaves(d)
	text := string(orig)
	e := &textEditor{text: text, ix: tomlpos.Scan(text), old: byPath(old), now: byPath(now)}
	for _, l := range now {
		o, ok := e.old[l.path]
		switch {
		case !ok:
			e.insert(l)
		case o.text != l.text:
			sp, ok := e.ix.Value(l.path)
			if !ok {
				return nil, fmt.Errorf("cannot find the value of %s in the file", l.path)
			}
			e.add(sp.Start, sp.End, l.text)
		}
	}
	for _, l := range old {
		if _, ok := e.now[l.path]; !ok {
			e.remove(l)
		}
	}
	e.flushTables()
	if e.err != nil {
		return nil, e.err
	}
	out := e.apply()
	check, err := DecodeDesign(d.file(), []byte(out))
	if err != nil {
		return nil, fmt.Errorf("the edited text would not decode (%w); nothing saved", err)
	}
	if got := byPath(designLeaves(check)); !maps.EqualFunc(got, e.now, func(a, b saveLeaf) bool { return a.text == b.text }) {
		return nil, errors.New("the edited text would not read back as the inputs edited; nothing saved")
	}
	// Every input of the form, not only those written above, must still be
	// given (or not) after the save: an input kind this writer does not know
	// is an error, never a value silently left out. (The text of the inputs
	// written above was compared as TOML, where "a b" and "a, b" agree.)
	if path, ok := sameFields(check, d); !ok {
		return nil, fmt.Errorf("the edited text would not keep %s; nothing saved", path)
	}
	return []byte(out), nil
}

// sameFields reports whether a and b give the same inputs, and the first
// path where they do not.
func sameFields(a, b *Design) (string, bool) {
	fa, fb := a.Fields(), b.Fields()
	if len(fa) != len(fb) {
		return "every input", false
	}
	for i := range fa {
		if fa[i].Path != fb[i].Path || fa[i].Set != fb[i].Set {
			return fb[i].Path, false
		}
	}
	return "", true
}

func stageNames(d *Design) []string {
	out := make([]string, len(d.Stages))
	for i, s := range d.Stages {
		out[i] = s.Name
	}
	return out
}

// saveLeaf is one input as the file writes it: its TOML path, the table
// holding it ("" top level, "supply", "stage.0"), its key inside that
// table (dotted for a stage's nested inputs, "signal.freq"), the TOML
// text of its value and its rank among the table's keys in form order.
type saveLeaf struct {
	path, table, key, text string
	rank                   int
}

// designLeaves lists every input d gives, as EncodeDesign would write it.
func designLeaves(d *Design) []saveLeaf {
	var out []saveLeaf
	if d.Title != "" {
		out = append(out, saveLeaf{path: "title", key: "title", text: quoteTOML(d.Title)})
	}
	for i, p := range d.designParams() {
		table, key, _ := strings.Cut(p.Key, ".")
		if p.Key == "environment.temp.low" {
			if d.Temp[0].Set || d.Temp[1].Set {
				out = append(out, saveLeaf{path: "environment.temp", table: table, key: "temp",
					text: pairTOML(d.Temp[0], d.Temp[1], "25 C"), rank: i})
			}
			continue
		}
		if p.Key == "environment.temp.high" || !p.v.Set {
			continue
		}
		out = append(out, saveLeaf{path: p.Key, table: table, key: key, text: valueTOML(p.Param, *p.v), rank: i})
	}
	for i, fk := range catalog.FigureKeys() {
		if l, ok := d.Choose.Limits[fk.Key]; ok && (l.Min.Set || l.Max.Set) {
			out = append(out, saveLeaf{path: "choose.limit." + fk.Key, table: "choose.limit", key: fk.Key,
				text: limitTOML(l), rank: i})
		}
	}
	for si, s := range d.Stages {
		table := tomlpos.Element("stage", si)
		out = append(out, saveLeaf{path: table + ".name", table: table, key: "name", text: quoteTOML(s.Name)},
			saveLeaf{path: table + ".kind", table: table, key: "kind", text: quoteTOML(s.Kind), rank: 1})
		t, ok := TemplateFor(s.Kind)
		if !ok {
			continue
		}
		for i, p := range t.Params() {
			l := saveLeaf{path: table + "." + p.Key, table: table, key: p.Key, rank: 2 + i}
			if p.Kind == Pair {
				lo, hi := s.Values[p.Key+".low"], s.Values[p.Key+".high"]
				if !lo.Set && !hi.Set {
					continue
				}
				l.text = pairTOML(lo, hi, "0 V")
			} else {
				v := s.Values[p.Key]
				if !v.Set {
					continue
				}
				l.text = valueTOML(p, v)
			}
			out = append(out, l)
		}
	}
	return out
}

func byPath(ls []saveLeaf) map[string]saveLeaf {
	m := make(map[string]saveLeaf, len(ls))
	for _, l := range ls {
		m[l.path] = l
	}
	return m
}

// textEdit replaces text[start:end] with repl; seq orders edits at one
// place (the earlier one ends up first).
type textEdit struct {
	start, end int
	repl       string
	seq        int
}

// textEditor collects the edits of one save.
type textEditor struct {
	text     string
	ix       *tomlpos.Index
	old, now map[string]saveLeaf
	edits    []textEdit
	tables   map[string][]saveLeaf // inputs of tables the file lacks
	inlines  map[string][]saveLeaf // stage inputs whose parent key the file lacks, by parent path
	err      error
}

func (e *textEditor) add(start, end int, repl string) {
	e.edits = append(e.edits, textEdit{start, end, repl, len(e.edits)})
}

// apply makes the edits, from the end of the text backwards.
func (e *textEditor) apply() string {
	sort.SliceStable(e.edits, func(i, j int) bool {
		a, b := e.edits[i], e.edits[j]
		if a.start != b.start {
			return a.start > b.start
		}
		return a.seq > b.seq
	})
	out := e.text
	for _, ed := range e.edits {
		out = out[:ed.start] + ed.repl + out[ed.end:]
	}
	return out
}

// lineEnd is the offset of the newline ending the line at off (or the end).
func (e *textEditor) lineEnd(off int) int {
	if i := strings.IndexByte(e.text[off:], '\n'); i >= 0 {
		return off + i
	}
	return len(e.text)
}

// lineStart is the offset where the line holding off starts.
func (e *textEditor) lineStart(off int) int { return strings.LastIndexByte(e.text[:off], '\n') + 1 }

// indent is the leading white space of the line holding off.
func (e *textEditor) indent(off int) string {
	ls := e.lineStart(off)
	i := ls
	for i < len(e.text) && (e.text[i] == ' ' || e.text[i] == '\t') {
		i++
	}
	return e.text[ls:i]
}

// written reports whether the key path is in the file.
func (e *textEditor) written(path string) bool {
	_, ok := e.ix.Pos(path)
	return ok
}

// inlineParent returns the inline table a stage input belongs in, when
// its key is dotted and the file writes the parent as { … }.
func (e *textEditor) inlineParent(l saveLeaf) (string, tomlpos.Span, bool) {
	parent, _, dotted := strings.Cut(l.key, ".")
	if !dotted {
		return "", tomlpos.Span{}, false
	}
	p := l.table + "." + parent
	sp, ok := e.ix.Value(p)
	if !ok || e.text[sp.Start] != '{' {
		return p, tomlpos.Span{}, false
	}
	return p, sp, true
}

// insert places an input the file does not give yet.
func (e *textEditor) insert(l saveLeaf) {
	if p, sp, ok := e.inlineParent(l); ok {
		_, sub, _ := strings.Cut(l.key, ".")
		end := sp.End - 1 // the closing brace
		for end > sp.Start+1 && (e.text[end-1] == ' ' || e.text[end-1] == '\t') {
			end--
		}
		sep := ", "
		if strings.TrimSpace(e.text[sp.Start+1:sp.End-1]) == "" && !e.anyKept(p) {
			sep = " "
		}
		e.add(end, end, sep+sub+" = "+l.text)
		return
	} else if parent, _, dotted := strings.Cut(l.key, "."); dotted && !e.written(p) {
		if e.inlines == nil {
			e.inlines = map[string][]saveLeaf{}
		}
		if len(e.inlines[p]) == 0 {
			// One inline table for every new input under the parent, written
			// where the parent's first input belongs.
			e.insertLine(saveLeaf{path: p, table: l.table, key: parent, rank: l.rank}, "\x00"+p)
		}
		e.inlines[p] = append(e.inlines[p], l)
		return
	}
	if l.table != "" && !e.written(l.table) {
		if e.tables == nil {
			e.tables = map[string][]saveLeaf{}
		}
		e.tables[l.table] = append(e.tables[l.table], l)
		return
	}
	e.insertLine(l, l.key+" = "+l.text)
}

// anyKept reports whether some input under the inline table at parent
// stays in the file.
func (e *textEditor) anyKept(parent string) bool {
	for path := range e.old {
		if strings.HasPrefix(path, parent+".") {
			if _, ok := e.now[path]; ok {
				return true
			}
		}
	}
	return false
}

// insertLine writes line as a line of its own in l's table: after the
// nearest key before it in form order that stays in the file, else before
// the nearest one after it, else right under the table's header. A line
// starting with NUL stands for the inline table of that parent, filled in
// by apply time (see fillInline).
func (e *textEditor) insertLine(l saveLeaf, line string) {
	var before, after *saveLeaf
	for _, o := range e.old {
		if o.table != l.table || o.path == l.path {
			continue
		}
		if _, stays := e.now[o.path]; !stays {
			continue
		}
		o := o
		if o.rank < l.rank && (before == nil || o.rank > before.rank) {
			before = &o
		}
		if o.rank > l.rank && (after == nil || o.rank < after.rank) {
			after = &o
		}
	}
	switch {
	case before != nil:
		sp, ok := e.valueOf(*before)
		if !ok {
			e.err = fmt.Errorf("cannot find %s in the file", before.path)
			return
		}
		at := e.lineEnd(sp.End)
		e.addLine(at, "\n"+e.indent(sp.Start), line, "")
	case after != nil:
		pos, _ := e.ix.Pos(after.path)
		at := e.lineStart(pos.Offset)
		e.addLine(at, e.indent(pos.Offset), line, "\n")
	case l.table == "":
		at := e.firstTable()
		e.addLine(at, "", line, "\n")
	default:
		pos, _ := e.ix.Pos(l.table)
		e.addLine(e.lineEnd(pos.Offset), "\n", line, "")
	}
}

// valueOf is the span of a written input; a dotted stage input written
// inside an inline table is placed by that table.
func (e *textEditor) valueOf(l saveLeaf) (tomlpos.Span, bool) {
	if p, sp, ok := e.inlineParent(l); ok && p != "" {
		return sp, true
	}
	return e.ix.Value(l.path)
}

// addLine records an inserted line; an inline-table placeholder is kept
// as such and filled in by flushTables.
func (e *textEditor) addLine(at int, pre, line, post string) {
	e.add(at, at, pre+line+post)
}

// flushTables writes the new tables and new inline tables collected by
// insert.
func (e *textEditor) flushTables() {
	for i, ed := range e.edits {
		p, ok := placeholder(ed.repl)
		if !ok {
			continue
		}
		var items []string
		for _, l := range e.inlines[p] {
			_, sub, _ := strings.Cut(l.key, ".")
			items = append(items, sub+" = "+l.text)
		}
		key := p[strings.LastIndexByte(p, '.')+1:]
		e.edits[i].repl = strings.Replace(ed.repl, "\x00"+p, key+" = { "+strings.Join(items, ", ")+" }", 1)
	}
	order := []string{"supply", "environment", "choose", "choose.limit", "policy"}
	for i, table := range order {
		ls := e.tables[table]
		if len(ls) == 0 {
			continue
		}
		sort.Slice(ls, func(a, b int) bool { return ls[a].rank < ls[b].rank })
		var b strings.Builder
		fmt.Fprintf(&b, "[%s]\n", table)
		for _, l := range ls {
			fmt.Fprintf(&b, "%s = %s\n", l.key, l.text)
		}
		at := -1
		for _, next := range append(order[i+1:], "stage") {
			if pos, ok := e.ix.Pos(next); ok {
				at = e.commentsAbove(pos.Offset)
				break
			}
		}
		if at < 0 {
			sep := "\n"
			if !strings.HasSuffix(e.text, "\n") {
				sep = "\n\n"
			}
			e.add(len(e.text), len(e.text), sep+b.String())
			continue
		}
		e.add(at, at, b.String()+"\n")
	}
}

// placeholder reports the parent path of an inline-table placeholder.
func placeholder(s string) (string, bool) {
	i := strings.IndexByte(s, 0)
	if i < 0 {
		return "", false
	}
	rest := s[i+1:]
	if j := strings.IndexAny(rest, "\n"); j >= 0 {
		rest = rest[:j]
	}
	return rest, true
}

// firstTable is where a new top-level key goes: before the first table
// header (and the comments right above it), else at the end.
func (e *textEditor) firstTable() int {
	first := -1
	for _, k := range e.ix.Keys("") {
		if pos, ok := e.ix.Pos(k); ok {
			if _, isValue := e.ix.Value(k); !isValue && (first < 0 || pos.Offset < first) {
				first = pos.Offset
			}
		}
	}
	if first < 0 {
		return len(e.text)
	}
	return e.commentsAbove(first)
}

// commentsAbove moves from the start of a header line up over the comment
// lines directly above it, which describe that table.
func (e *textEditor) commentsAbove(off int) int {
	at := e.lineStart(off)
	for at > 0 {
		prev := e.lineStart(at - 1)
		if !strings.HasPrefix(strings.TrimSpace(e.text[prev:at-1]), "#") {
			break
		}
		at = prev
	}
	return at
}

// remove takes out an input the design no longer gives: its key and value
// from an inline table, or its whole line (with any comment on it).
func (e *textEditor) remove(l saveLeaf) {
	pos, ok := e.ix.Pos(l.path)
	sp, okv := e.ix.Value(l.path)
	if !ok || !okv {
		e.err = fmt.Errorf("cannot find %s in the file", l.path)
		return
	}
	if _, _, inline := e.inlineParent(l); inline {
		start, end := pos.Offset, sp.End
		j := end
		for j < len(e.text) && e.text[j] == ' ' {
			j++
		}
		if j < len(e.text) && e.text[j] == ',' {
			end = j + 1
			for end < len(e.text) && e.text[end] == ' ' {
				end++
			}
		} else {
			i := start
			for i > 0 && e.text[i-1] == ' ' {
				i--
			}
			if i > 0 && e.text[i-1] == ',' {
				start = i - 1
			}
		}
		e.add(start, end, "")
		return
	}
	start, end := e.lineStart(pos.Offset), e.lineEnd(sp.End)
	if end < len(e.text) {
		end++
	}
	e.add(start, end, "")
}
