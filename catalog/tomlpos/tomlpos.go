// Package tomlpos finds where each key of a TOML document is written. The
// TOML decoder opsift uses does not expose key positions, so this package
// reads the text once more with TOML's lexical rules — every string form
// (basic, literal, multi-line basic and literal, escapes), comments, arrays,
// inline tables, dotted and quoted keys, table and array-of-tables headers —
// and records the first position of every key path.
//
//	document text ──► Scan ──► Index ──► Line("stage.1.signal.freq") = 14
//	                                └──► Elements("part"): each [[part]] and its keys, line and column
//
// Paths are the dotted keys as the decoder sees them, unquoted (a quoted
// key holding a dot cannot be named by a path; Line then finds its
// parent). The n-th
// element (from 0) of an array of tables, or of an array value, is a
// numbered segment: the second [[part]] is "part.1", its key slew.typ is
// "part.1.slew.typ"; x = [{a = 1}] gives "x.0.a". The scanner never fails:
// on text that is not valid TOML it still ends, and what it records is a
// best effort, because positions only ever point error messages at lines.
package tomlpos

import (
	"strconv"
	"strings"
	"unicode/utf8"
)

// Pos is where a key is written.
type Pos struct {
	Line   int // 1-based line
	Col    int // 1-based column, in characters
	Offset int // byte offset of the key; of the opening '[' for a table header
}

// Index maps key paths to the place they are first written. It is a tree
// of keys held in one slice (node 0 is the document), so indexing a
// large catalog costs one small lookup per key.
type Index struct {
	nodes []node
}

// node is one key, table or array element. Keys of a node form a list
// (first, next); elements of an array are indexed.
type node struct {
	line, col, off int32 // the position; line 0 for the document itself
	key            string
	first, last    int32 // first and last child key (0: none)
	next           int32 // next key of the same parent (0: none)
	nkeys          int32
	vstart, vend   int32            // the value's byte range; vend 0: not written as a value
	elems          []int32          // elements of an array of tables or array value
	byKey          map[string]int32 // keys by name, once there are many
}

// pos is the node's position.
func (n *node) pos() Pos { return Pos{Line: int(n.line), Col: int(n.col), Offset: int(n.off)} }

// manyKeys is the number of keys from which a node looks its keys up in
// a map instead of by a scan.
const manyKeys = 16

// Scan reads a TOML document and indexes the position of every key.
func Scan(text string) *Index {
	// Every key is followed by "=" or opens a header; arrays add their
	// elements (a catalog's lists are short). A guess: append grows it.
	n := 1 + strings.Count(text, "=") + 3*strings.Count(text, "[")
	s := &scanner{text: text, line: 1, ix: &Index{nodes: make([]node, 1, n)}}
	if strings.HasPrefix(text, bom) {
		// A byte-order mark (editors on some systems write one) is not
		// part of the document: the decoder skips it, and so do we.
		s.i, s.lineStart = len(bom), len(bom)
	}
	s.document()
	return s.ix
}

// bom is the UTF-8 byte-order mark.
const bom = "\ufeff"

// find returns the node at path, or as far along it as is written: the
// node reached and whether it is the whole path.
func (ix *Index) find(path string) (int32, bool) {
	n := int32(0)
	for path != "" {
		seg, rest, _ := strings.Cut(path, ".")
		next, ok := ix.child(n, seg)
		if !ok {
			if es := ix.nodes[n].elems; len(es) > 0 {
				if i, err := strconv.Atoi(seg); err == nil && i >= 0 && i < len(es) {
					next, ok = es[i], true
				}
			}
		}
		if !ok {
			return n, false
		}
		n, path = next, rest
	}
	return n, true
}

// Pos returns the position of path, and whether it was written.
func (ix *Index) Pos(path string) (Pos, bool) {
	n, ok := ix.find(path)
	if !ok || n == 0 {
		return Pos{}, false
	}
	return ix.nodes[n].pos(), true
}

// Span is a byte range [Start, End) of the document text.
type Span struct{ Start, End int }

// Value returns the byte range of the value written for path (a key, an
// inline table, an array or an element of one), and whether it was
// written as a value; a [table] header has none. An editor replaces that
// range to change a value and leaves the rest of the text as it was.
func (ix *Index) Value(path string) (Span, bool) {
	n, ok := ix.find(path)
	if !ok || n == 0 || ix.nodes[n].vend == 0 {
		return Span{}, false
	}
	return Span{int(ix.nodes[n].vstart), int(ix.nodes[n].vend)}, true
}

// Line returns the line of path, else of its nearest written parent, else 0.
func (ix *Index) Line(path string) int {
	n, _ := ix.find(path)
	return int(ix.nodes[n].line)
}

// Keys returns the keys written directly under the table at path ("" is
// the top level), in file order.
func (ix *Index) Keys(path string) []string {
	n, ok := ix.find(path)
	if !ok {
		return nil
	}
	out := make([]string, 0, ix.nodes[n].nkeys)
	for k := ix.nodes[n].first; k != 0; k = ix.nodes[k].next {
		out = append(out, ix.nodes[k].key)
	}
	return out
}

// Entry is a key and where it is first written.
type Entry struct {
	Key string
	Pos Pos
}

// Elements calls fn for each element of the array at path, in order, with
// its position and the keys written directly under it. keys is reused
// between calls.
func (ix *Index) Elements(path string, fn func(i int, at Pos, keys []Entry)) {
	n, ok := ix.find(path)
	if !ok {
		return
	}
	var keys []Entry
	for i, e := range ix.nodes[n].elems {
		keys = keys[:0]
		for k := ix.nodes[e].first; k != 0; k = ix.nodes[k].next {
			keys = append(keys, Entry{ix.nodes[k].key, ix.nodes[k].pos()})
		}
		fn(i, ix.nodes[e].pos(), keys)
	}
}

// Join appends key segments to a path.
func Join(path string, keys ...string) string {
	for _, k := range keys {
		if path == "" {
			path = k
		} else {
			path += "." + k
		}
	}
	return path
}

// Element is the path of the i-th element (from 0) of the array at path.
func Element(path string, i int) string { return Join(path, strconv.Itoa(i)) }

// child finds the key of node n called key.
func (ix *Index) child(n int32, key string) (int32, bool) {
	nd := &ix.nodes[n]
	if nd.byKey != nil {
		k, ok := nd.byKey[key]
		return k, ok
	}
	for k := nd.first; k != 0; k = ix.nodes[k].next {
		if ix.nodes[k].key == key {
			return k, true
		}
	}
	return 0, false
}

// add appends a node at p and returns it.
func (ix *Index) add(key string, p Pos) int32 {
	k := int32(len(ix.nodes))
	ix.nodes = append(ix.nodes, node{line: int32(p.Line), col: int32(p.Col), off: int32(p.Offset), key: key})
	return k
}

// record returns the key of node parent called key, adding it at p when
// it is new (a key keeps its first position).
func (ix *Index) record(parent int32, key string, p Pos) int32 {
	if k, ok := ix.child(parent, key); ok {
		return k
	}
	k := ix.add(key, p)
	nd := &ix.nodes[parent]
	if nd.first == 0 {
		nd.first = k
	} else {
		ix.nodes[nd.last].next = k
	}
	nd.last = k
	nd.nkeys++
	switch {
	case nd.byKey != nil:
		nd.byKey[key] = k
	case nd.nkeys > manyKeys:
		nd.byKey = make(map[string]int32, 2*nd.nkeys)
		for c := nd.first; c != 0; c = ix.nodes[c].next {
			nd.byKey[ix.nodes[c].key] = c
		}
	}
	return k
}

// element adds an element at p to the array at node parent.
func (ix *Index) element(parent int32, p Pos) int32 {
	e := ix.add("", p)
	ix.nodes[parent].elems = append(ix.nodes[parent].elems, e)
	return e
}

// last is the newest element of the array at node n; ok is false when n
// is not an array.
func (ix *Index) last(n int32) (int32, bool) {
	es := ix.nodes[n].elems
	if len(es) == 0 {
		return 0, false
	}
	return es[len(es)-1], true
}

// scanner walks the text once, keeping the line count.
type scanner struct {
	text      string
	i         int      // byte offset of the next character
	line      int      // line of text[i]
	lineStart int      // byte offset where that line starts
	table     int32    // node of the current table
	keys      []string // reused by key
	ix        *Index
}

func (s *scanner) eof() bool { return s.i >= len(s.text) }

func (s *scanner) peek() byte {
	if s.eof() {
		return 0
	}
	return s.text[s.i]
}

// advance moves one byte on, counting lines.
func (s *scanner) advance() {
	if s.text[s.i] == '\n' {
		s.line++
		s.lineStart = s.i + 1
	}
	s.i++
}

// here is the position of the next character.
func (s *scanner) here() Pos {
	return Pos{Line: s.line, Col: 1 + utf8.RuneCountInString(s.text[s.lineStart:s.i]), Offset: s.i}
}

// blank skips spaces and tabs.
func (s *scanner) blank() {
	for !s.eof() && (s.peek() == ' ' || s.peek() == '\t') {
		s.i++
	}
}

// space skips spaces, newlines and comments (inside arrays).
func (s *scanner) space() {
	for !s.eof() {
		switch s.peek() {
		case ' ', '\t', '\r', '\n':
			s.advance()
		case '#':
			s.skipLine()
		default:
			return
		}
	}
}

// skipLine moves to the end of the line (not past the newline).
func (s *scanner) skipLine() {
	if j := strings.IndexByte(s.text[s.i:], '\n'); j >= 0 {
		s.i += j
	} else {
		s.i = len(s.text)
	}
}

// document reads lines: headers, key = value lines, comments, blanks.
func (s *scanner) document() {
	for !s.eof() {
		s.blank()
		switch s.peek() {
		case 0:
			return
		case '\n', '\r':
			s.advance()
			continue
		case '#':
			s.skipLine()
			continue
		case '[':
			s.header()
		default:
			start := s.i
			s.keyval(s.table)
			if s.i == start { // not a key: skip the character
				s.advance()
			}
		}
		s.blank()
		if s.peek() != '\n' {
			s.skipLine() // a comment, or text the scanner cannot place
		}
	}
}

// header reads [a.b] or [[a.b]] and makes it the current table.
func (s *scanner) header() {
	at := s.here()
	s.i++
	array := s.peek() == '['
	if array {
		s.i++
	}
	s.blank()
	keys := s.key()
	s.blank()
	if s.peek() == ']' {
		s.i++
		if array && s.peek() == ']' {
			s.i++
		}
	}
	if len(keys) == 0 {
		return
	}
	path := int32(0)
	for j, k := range keys {
		p := s.ix.record(path, k, at)
		if j == len(keys)-1 && array {
			p = s.ix.element(p, at)
		} else if e, ok := s.ix.last(p); ok {
			p = e // [a.b] after [[a]] is b of the newest a
		}
		path = p
	}
	s.table = path
}

// keyval reads `key = value` under table; it records the key's segments
// (a dotted key records each of them) and reads the value past any
// strings, arrays and inline tables it holds.
func (s *scanner) keyval(table int32) {
	at := s.here()
	keys := s.key()
	if len(keys) == 0 {
		return
	}
	path := table
	for _, k := range keys {
		path = s.ix.record(path, k, at)
	}
	s.blank()
	if s.peek() != '=' {
		return
	}
	s.i++
	s.blank()
	s.value(path)
}

// key reads a dotted key of bare and quoted segments.
func (s *scanner) key() []string {
	keys := s.keys[:0]
	defer func() { s.keys = keys[:0] }()
	for {
		s.blank()
		var k string
		switch c := s.peek(); {
		case c == '"':
			k = s.basic()
		case c == '\'':
			k = s.literal()
		case isBare(c):
			j := s.i
			for !s.eof() && isBare(s.peek()) {
				s.i++
			}
			k = s.text[j:s.i]
		default:
			return keys
		}
		keys = append(keys, k)
		s.blank()
		if s.peek() != '.' {
			return keys
		}
		s.i++
	}
}

// value reads one value of the key at path and records where it is.
func (s *scanner) value(path int32) {
	start := s.i
	s.valueBody(path)
	if nd := &s.ix.nodes[path]; nd.vend == 0 && s.i > start {
		nd.vstart, nd.vend = int32(start), int32(s.i)
	}
}

// valueBody reads the value itself: a string, an array, an inline table
// or a bare word (number, boolean, date).
func (s *scanner) valueBody(path int32) {
	switch c := s.peek(); c {
	case '"':
		if strings.HasPrefix(s.text[s.i:], `"""`) {
			s.multiline('"')
		} else {
			s.basic()
		}
	case '\'':
		if strings.HasPrefix(s.text[s.i:], `'''`) {
			s.multiline('\'')
		} else {
			s.literal()
		}
	case '[':
		s.array(path)
	case '{':
		s.inline(path)
	default:
		for !s.eof() {
			switch s.peek() {
			case ',', ']', '}', '\n', '\r', '#', ' ', '\t':
				return
			}
			s.i++
		}
	}
}

// array reads [v, v, …] over any number of lines; inline tables in it are
// indexed as numbered elements of path.
func (s *scanner) array(path int32) {
	s.i++
	for {
		s.space()
		if s.eof() {
			return
		}
		if s.peek() == ']' {
			s.i++
			return
		}
		start := s.i
		el := s.ix.element(path, s.here())
		s.value(el)
		s.space()
		switch s.peek() {
		case ',':
			s.i++
		case ']':
		default:
			if s.i == start && !s.eof() { // not a value: skip the character
				s.advance()
			}
		}
	}
}

// inline reads { k = v, … }; an inline table belongs on one line, but a
// newline inside one is skipped like a space so a broken file cannot
// stall the scan.
func (s *scanner) inline(path int32) {
	s.i++
	for {
		s.space()
		if s.eof() {
			return
		}
		if s.peek() == '}' {
			s.i++
			return
		}
		start := s.i
		s.keyval(path)
		s.space()
		if s.peek() == ',' {
			s.i++
		} else if s.i == start && s.peek() != '}' && !s.eof() {
			s.advance()
		}
	}
}

// basic reads a "basic string" and returns its text with the escapes
// decoded, so a quoted key matches the decoder's key.
func (s *scanner) basic() string {
	s.i++
	start := s.i
	for !s.eof() && s.peek() != '"' && s.peek() != '\\' && s.peek() != '\n' {
		s.i++
	}
	if s.peek() != '\\' { // no escapes: the text as written
		text := s.text[start:s.i]
		if s.peek() == '"' {
			s.i++
		}
		return text
	}
	var b strings.Builder
	b.WriteString(s.text[start:s.i])
	for !s.eof() {
		c := s.peek()
		switch c {
		case '"':
			s.i++
			return b.String()
		case '\n':
			return b.String() // unterminated: the line ends it
		case '\\':
			s.i++
			s.escape(&b)
			continue
		}
		b.WriteByte(c)
		s.i++
	}
	return b.String()
}

// escapes are the one-character escapes of a basic string.
var escapes = map[byte]byte{'b': '\b', 't': '\t', 'n': '\n', 'f': '\f', 'r': '\r', 'e': 0x1b, '"': '"', '\\': '\\'}

// escape decodes the escape after a backslash into b.
func (s *scanner) escape(b *strings.Builder) {
	if s.eof() || s.peek() == '\n' {
		return
	}
	c := s.peek()
	if e, ok := escapes[c]; ok {
		b.WriteByte(e)
		s.i++
		return
	}
	n := map[byte]int{'x': 2, 'u': 4, 'U': 8}[c]
	if n > 0 && s.i+1+n <= len(s.text) {
		if r, err := strconv.ParseUint(s.text[s.i+1:s.i+1+n], 16, 32); err == nil {
			b.WriteRune(rune(r))
			s.i += 1 + n
			return
		}
	}
	b.WriteByte('\\') // not an escape TOML knows: keep it as written
}

// literal reads a 'literal string', which has no escapes.
func (s *scanner) literal() string {
	s.i++
	j := s.i
	for !s.eof() && s.peek() != '\'' && s.peek() != '\n' {
		s.i++
	}
	k := s.text[j:s.i]
	if s.peek() == '\'' {
		s.i++
	}
	return k
}

// multiline reads a multi-line basic string (three double quotes) or a
// multi-line literal one (three single quotes), which may hold newlines,
// lone or paired quotes, and (basic only) escaped quotes and line-ending
// backslashes. Up to two quotes right before the closing delimiter belong
// to the string.
func (s *scanner) multiline(q byte) {
	s.i += 3
	for !s.eof() {
		c := s.peek()
		if c == '\\' && q == '"' {
			s.i++
			if !s.eof() {
				s.advance()
			}
			continue
		}
		if c == q && strings.HasPrefix(s.text[s.i:], string([]byte{q, q, q})) {
			s.i += 3
			for k := 0; k < 2 && s.peek() == q; k++ {
				s.i++
			}
			return
		}
		s.advance()
	}
}

// isBare reports whether c may appear in a bare key.
func isBare(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '-'
}
