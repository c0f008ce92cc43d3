// Package tomlpos finds where each key of a TOML document is written. The
// TOML decoder opsift uses does not expose key positions, so this package
// reads the text once more with TOML's lexical rules — every string form
// (basic, literal, multi-line basic and literal, escapes), comments, arrays,
// inline tables, dotted and quoted keys, table and array-of-tables headers —
// and records the first position of every key path.
//
//	document text ──► Scan ──► Index: "stage.1.signal.freq" → line 14, column 1
//
// Paths are the dotted keys as the decoder sees them, unquoted. The n-th
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

// Span is a byte range [Start, End) of the document text.
type Span struct{ Start, End int }

// Index maps key paths to the place they are first written.
type Index struct {
	pos    map[string]Pos
	vals   map[string]Span     // where the value of each key path (and array element) is written
	arrays map[string]int      // element count of each array of tables, by path
	kids   map[string][]string // direct child keys of each table path, in file order
}

// Scan reads a TOML document and indexes the position of every key.
func Scan(text string) *Index {
	s := &scanner{text: text, line: 1, ix: &Index{
		pos:    map[string]Pos{},
		vals:   map[string]Span{},
		arrays: map[string]int{},
		kids:   map[string][]string{},
	}}
	s.document()
	return s.ix
}

// Pos returns the position of path, and whether it was written.
func (ix *Index) Pos(path string) (Pos, bool) {
	p, ok := ix.pos[path]
	return p, ok
}

// Value returns the byte range of the value written for path (a key, an
// inline table, an array or an element of one), and whether it was
// written as a value; a [table] header has none. An editor replaces that
// range to change a value and leaves the rest of the text as it was.
func (ix *Index) Value(path string) (Span, bool) {
	v, ok := ix.vals[path]
	return v, ok
}

// Line returns the line of path, else of its nearest written parent, else 0.
func (ix *Index) Line(path string) int {
	for {
		if p, ok := ix.pos[path]; ok {
			return p.Line
		}
		i := strings.LastIndexByte(path, '.')
		if i < 0 {
			return 0
		}
		path = path[:i]
	}
}

// Count returns how many [[path]] tables the document holds.
func (ix *Index) Count(path string) int { return ix.arrays[path] }

// Keys returns the keys written directly under the table at path ("" is
// the top level), in file order; array-of-tables elements are "0", "1", ….
func (ix *Index) Keys(path string) []string { return ix.kids[path] }

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

// record keeps the first position of path and lists it under its parent.
func (ix *Index) record(parent, key string, p Pos) string {
	path := Join(parent, key)
	if _, ok := ix.pos[path]; !ok {
		ix.pos[path] = p
		ix.kids[parent] = append(ix.kids[parent], key)
	}
	return path
}

// scanner walks the text once, keeping the line count.
type scanner struct {
	text      string
	i         int // byte offset of the next character
	line      int // line of text[i]
	lineStart int // byte offset where that line starts
	table     string
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
	path := ""
	for j, k := range keys {
		p := Join(path, k)
		last := j == len(keys)-1
		switch {
		case last && array:
			n := s.ix.arrays[p]
			s.ix.arrays[p] = n + 1
			s.ix.record(path, k, at)
			p = s.ix.record(p, strconv.Itoa(n), at)
		case s.ix.arrays[p] > 0:
			s.ix.record(path, k, at)
			p = Element(p, s.ix.arrays[p]-1)
		default:
			s.ix.record(path, k, at)
		}
		path = p
	}
	s.table = path
}

// keyval reads `key = value` under table; it records the key's segments
// (a dotted key records each of them) and reads the value past any
// strings, arrays and inline tables it holds.
func (s *scanner) keyval(table string) {
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
	var keys []string
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
func (s *scanner) value(path string) {
	start := s.i
	s.valueBody(path)
	if _, ok := s.ix.vals[path]; !ok && s.i > start {
		s.ix.vals[path] = Span{start, s.i}
	}
}

// valueBody reads the value itself: a string, an array, an inline table
// or a bare word (number, boolean, date).
func (s *scanner) valueBody(path string) {
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
func (s *scanner) array(path string) {
	s.i++
	for n := 0; ; n++ {
		s.space()
		if s.eof() {
			return
		}
		if s.peek() == ']' {
			s.i++
			return
		}
		start := s.i
		if s.peek() == '{' {
			el := s.ix.record(path, strconv.Itoa(n), s.here())
			s.value(el)
		} else {
			s.value(Element(path, n))
		}
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
func (s *scanner) inline(path string) {
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
	var b strings.Builder
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
