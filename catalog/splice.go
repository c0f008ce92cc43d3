package catalog

import (
	"bytes"
	"errors"
	"fmt"

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
// replaced by p's table (as Encode writes it), every byte outside that
// table kept. The table's keys run from the line after its [[part]]
// header (kept as written, with its comment) to the end of the line
// holding its last value, so the comments and blank lines before the next
// table stay where they are; comments among the replaced keys are not
// kept. It is an error when no valid part of data has id, or when the
// result would not read back p.
func ReplacePart(data []byte, id string, p *Part) ([]byte, error) {
	start, end, err := partSpan(data, id)
	if err != nil {
		return nil, err
	}
	table := encodeOne(p, data)
	table = table[bytes.IndexByte(table, '\n')+1:] // the header stays as written
	if end == len(data) && !bytes.HasSuffix(data, []byte("\n")) {
		table = bytes.TrimRight(table, "\r\n")
	}
	out := make([]byte, 0, len(data)-(end-start)+len(table))
	out = append(append(append(out, data[:start]...), table...), data[end:]...)
	return out, readsBackPart(out, p)
}

// ErrPartNotInFile is the error of ReplacePart when the file holds no
// valid part of the id (it was removed or renamed since it was read).
var ErrPartNotInFile = errors.New("no such part in the file")

// partSpan is the byte range [start, end) of the [[part]] table of the
// valid part id in data: from the line after its [[part]] header to the
// end of the line of its last value (its newline included).
func partSpan(data []byte, id string) (start, end int, err error) {
	parts, _ := Decode("", data)
	line := 0
	for _, q := range parts {
		if q.ID == id {
			line = q.Pos.Line
		}
	}
	if line == 0 {
		return 0, 0, fmt.Errorf("part %q: %w", id, ErrPartNotInFile)
	}
	text := string(data)
	ix := tomlpos.Scan(text)
	found := -1
	ix.Elements("part", func(i int, at tomlpos.Pos, _ []tomlpos.Entry) {
		if at.Line == line {
			found, start = i, at.Offset
		}
	})
	if found < 0 {
		return 0, 0, fmt.Errorf("part %q: its table was not found on line %d: %w", id, line, ErrPartNotInFile)
	}
	if i := bytes.IndexByte(data[start:], '\n'); i >= 0 {
		start += i + 1
	} else {
		start = len(data)
	}
	end = start
	var walk func(path string)
	walk = func(path string) {
		for _, k := range ix.Keys(path) {
			sub := tomlpos.Join(path, k)
			if sp, ok := ix.Value(sub); ok {
				end = max(end, sp.End)
			} else {
				walk(sub)
			}
		}
	}
	walk(tomlpos.Element("part", found))
	if i := bytes.IndexByte(data[end:], '\n'); i >= 0 {
		end += i + 1
	} else {
		end = len(data)
	}
	return start, end, nil
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
