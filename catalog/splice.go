package catalog

import (
	"bytes"
	"errors"
	"fmt"
	"slices"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/opsift/opsift/catalog/tomlpos"
)

// DecodeTable decodes and validates one part given as the table of a
// [[part]] (keys as in a catalog file: "gbw" holds a map with "typ", …),
// with the decoder and the messages of a catalog file. It returns the part,
// or the part's problems as a Problems error (each with its Field). file
// names the source in the problems' positions. The spreadsheet import
// decodes each row with it, and the selector's entry form each keystroke.
func DecodeTable(file string, tbl map[string]any) (*Part, error) {
	var buf bytes.Buffer
	if err := toml.NewEncoder(&buf).Encode(map[string]any{"part": []map[string]any{tbl}}); err != nil {
		return nil, fmt.Errorf("cannot encode the part: %w", err)
	}
	parts, err := Decode(file, buf.Bytes())
	if err != nil {
		return nil, err
	}
	if len(parts) != 1 {
		return nil, fmt.Errorf("the table made %d parts, want 1", len(parts))
	}
	p := parts[0]
	p.Lines = nil
	return p, nil
}

// AppendPart returns the catalog file text data with p's [[part]] table
// (as Encode writes it) added at the end after a blank line; every byte of
// data is kept, comments and layout included. A file using CRLF line ends
// gets them in the new table too. It is an error when the result would not
// read back p (by id, field for field): the caller then writes nothing.
func AppendPart(data []byte, p *Part) ([]byte, error) {
	table := encodeOne(p, data)
	out := append([]byte(nil), data...)
	if len(out) > 0 {
		nl := lineEnd(data)
		if !bytes.HasSuffix(out, []byte("\n")) {
			out = append(out, nl...)
		}
		out = append(out, nl...)
	}
	out = append(out, table...)
	return out, readsBackPart(out, p)
}

// ReplacePart returns data with the [[part]] table of the part with id
// made to hold p, every byte outside that table kept. Where it can, only
// what changed is written: the value of a changed key is replaced in
// place (its comment and alignment stay), a key p no longer has loses its
// line, a new key gets a line after the table's last value, and keys whose
// value did not change keep their text as written. A table written with
// sub-table headers or dotted keys is written anew instead, from the line
// after its [[part]] header (kept as written) to the end of the line of its
// last value, so the comments before the next table stay. It is an error
// when no valid part of data has id, or when the result would not read
// back p.
func ReplacePart(data []byte, id string, p *Part) ([]byte, error) {
	pt, err := findPart(data, id)
	if err != nil {
		return nil, err
	}
	if out, ok := spliceValues(data, pt, p); ok && readsBackPart(out, p) == nil {
		return out, nil
	}
	table := encodeOne(p, data)
	table = table[bytes.IndexByte(table, '\n')+1:] // the header stays as written
	if pt.end == len(data) && !bytes.HasSuffix(data, []byte("\n")) {
		table = bytes.TrimRight(table, "\r\n")
	}
	out := make([]byte, 0, len(data)-(pt.end-pt.start)+len(table))
	out = append(append(append(out, data[:pt.start]...), table...), data[pt.end:]...)
	return out, readsBackPart(out, p)
}

// ErrPartNotInFile is the error of ReplacePart when the file holds no
// valid part of the id (it was removed or renamed since it was read).
var ErrPartNotInFile = errors.New("no such part in the file")

// partPlace is where one valid part is written in a file's text.
type partPlace struct {
	old  *Part          // the part as the file gives it
	ix   *tomlpos.Index // the file's position index
	path string         // its table's key path, "part.N"
	// start is the line after its [[part]] header, end the end of the line
	// of its last value (its newline included).
	start, end int
}

// findPart finds the valid part id in data.
func findPart(data []byte, id string) (partPlace, error) {
	parts, _ := Decode("", data)
	var pt partPlace
	for _, q := range parts {
		if q.ID == id {
			pt.old = q
		}
	}
	if pt.old == nil {
		return pt, fmt.Errorf("part %q: %w", id, ErrPartNotInFile)
	}
	pt.ix = tomlpos.Scan(string(data))
	found := -1
	pt.ix.Elements("part", func(i int, at tomlpos.Pos, _ []tomlpos.Entry) {
		if at.Line == pt.old.Pos.Line {
			found, pt.start = i, at.Offset
		}
	})
	if found < 0 {
		return pt, fmt.Errorf("part %q: its table was not found on line %d: %w", id, pt.old.Pos.Line, ErrPartNotInFile)
	}
	pt.path = tomlpos.Element("part", found)
	pt.start = lineAfter(data, pt.start)
	pt.end = pt.start
	var walk func(path string)
	walk = func(path string) {
		for _, k := range pt.ix.Keys(path) {
			sub := tomlpos.Join(path, k)
			if sp, ok := pt.ix.Value(sub); ok {
				pt.end = max(pt.end, sp.End)
			} else {
				walk(sub)
			}
		}
	}
	walk(pt.path)
	pt.end = lineAfter(data, pt.end)
	return pt, nil
}

// lineAfter is the offset just after the newline that ends the line
// holding offset i (len(data) on the last line).
func lineAfter(data []byte, i int) int {
	if j := bytes.IndexByte(data[i:], '\n'); j >= 0 {
		return i + j + 1
	}
	return len(data)
}

// lineStart is the offset of the start of the line holding offset i.
func lineStart(data []byte, i int) int { return bytes.LastIndexByte(data[:i], '\n') + 1 }

// spliceValues writes p over pt key by key (see ReplacePart); ok is false
// when a changed key is not written as one "key = value" line of its own.
func spliceValues(data []byte, pt partPlace, p *Part) (_ []byte, ok bool) {
	oldKV, _ := encodedKeys(pt.old)
	newKV, order := encodedKeys(p)
	for _, k := range PartKeys() {
		if _, in := newKV[k]; !in {
			order = append(order, k) // keys p drops, after the ones it has
		}
	}
	type edit struct {
		start, end int
		text       string
	}
	var edits []edit
	nl := string(lineEnd(data))
	var added strings.Builder
	for _, k := range order {
		o, inOld := oldKV[k]
		n, inNew := newKV[k]
		if inOld == inNew && o == n {
			continue
		}
		path := tomlpos.Join(pt.path, k)
		at, written := pt.ix.Pos(path)
		sp, hasValue := pt.ix.Value(path)
		switch {
		case written && !hasValue:
			return nil, false // a sub-table or dotted keys
		case written && inNew:
			if subs, ok := subEdits(pt.ix, path, o, n); ok {
				for _, e := range subs {
					edits = append(edits, edit{e.Start, e.End, e.text})
				}
				continue
			}
			edits = append(edits, edit{sp.Start, sp.End, n})
		case written:
			ls := lineStart(data, at.Offset)
			if strings.TrimSpace(string(data[ls:at.Offset])) != "" {
				return nil, false
			}
			edits = append(edits, edit{ls, lineAfter(data, sp.End), ""})
		case inNew:
			added.WriteString(k + " = " + n + nl)
		}
	}
	if added.Len() > 0 {
		text := added.String()
		if pt.end > 0 && data[pt.end-1] != '\n' {
			text = nl + strings.TrimSuffix(text, nl)
		}
		edits = append(edits, edit{pt.end, pt.end, text})
	}
	slices.SortStableFunc(edits, func(a, b edit) int { return b.start - a.start })
	out := append([]byte(nil), data...)
	for _, e := range edits {
		out = append(out[:e.start], append([]byte(e.text), out[e.end:]...)...)
	}
	return out, true
}

// subEdit is a new text for the byte range of a value.
type subEdit struct {
	tomlpos.Span
	text string
}

// subEdits are the edits that turn the inline table at path, encoded as
// old, into new one sub-key at a time, so the unchanged sub-values keep
// their text ("0.8 MHz" stays, not "800 kHz"); ok is false unless both
// are inline tables with the same sub-keys, each written in the file.
func subEdits(ix *tomlpos.Index, path, old, new string) ([]subEdit, bool) {
	o, ok1 := inlineSubs(old)
	n, ok2 := inlineSubs(new)
	if !ok1 || !ok2 || len(o) != len(n) {
		return nil, false
	}
	var out []subEdit
	for k, nv := range n {
		ov, in := o[k]
		if !in {
			return nil, false
		}
		if ov == nv {
			continue
		}
		sp, ok := ix.Value(tomlpos.Join(path, k))
		if !ok {
			return nil, false
		}
		out = append(out, subEdit{sp, nv})
	}
	return out, true
}

// inlineSubs reads an inline table as Encode writes one, `{ typ =
// "1 MHz", source = "graph" }`, into its sub-keys and value texts. The
// values Encode writes in one (quantities and sources) hold no comma.
func inlineSubs(v string) (map[string]string, bool) {
	body, ok := strings.CutPrefix(v, "{ ")
	if !ok {
		return nil, false
	}
	if body, ok = strings.CutSuffix(body, " }"); !ok {
		return nil, false
	}
	out := map[string]string{}
	for _, kv := range strings.Split(body, ", ") {
		k, val, ok := strings.Cut(kv, " = ")
		if !ok {
			return nil, false
		}
		out[k] = val
	}
	return out, true
}

// encodedKeys are the keys of p's table as Encode writes them, each with
// its value text, and the keys in the order written.
func encodedKeys(p *Part) (map[string]string, []string) {
	var buf bytes.Buffer
	_ = Encode(&buf, []*Part{p})
	kv := map[string]string{}
	var order []string
	for _, l := range strings.Split(buf.String(), "\n") {
		if k, v, ok := strings.Cut(l, " = "); ok {
			kv[k] = v
			order = append(order, k)
		}
	}
	return kv, order
}

// encodeOne is p's table as Encode writes it, with the line ends of data.
func encodeOne(p *Part, data []byte) []byte {
	var buf bytes.Buffer
	_ = Encode(&buf, []*Part{p}) // a bytes.Buffer does not fail
	b := buf.Bytes()
	if nl := lineEnd(data); len(nl) == 2 {
		b = bytes.ReplaceAll(b, []byte("\n"), nl)
	}
	return b
}

// lineEnd is the line end data uses: CRLF when its first line ends so.
func lineEnd(data []byte) []byte {
	if i := bytes.IndexByte(data, '\n'); i > 0 && data[i-1] == '\r' {
		return []byte("\r\n")
	}
	return []byte("\n")
}

// readsBackPart checks that the catalog text data decodes to a valid part
// with p's id and exactly p's figures.
func readsBackPart(data []byte, p *Part) error {
	parts, _ := Decode("", data)
	for _, q := range parts {
		if q.ID != p.ID {
			continue
		}
		var a, b bytes.Buffer
		_ = Encode(&a, []*Part{p})
		_ = Encode(&b, []*Part{q})
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			return fmt.Errorf("part %q: the file would read back different figures; nothing written", p.ID)
		}
		return nil
	}
	_, err := Decode("", data)
	return fmt.Errorf("part %q: the file would not read back the part (%v); nothing written", p.ID, firstOf(err))
}

// firstOf is the first problem of a Decode error, or err.
func firstOf(err error) error {
	var ps Problems
	if errors.As(err, &ps) && len(ps) > 0 {
		return ps[0]
	}
	return err
}
