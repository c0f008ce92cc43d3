// Package sheet reads a spreadsheet of parts (CSV, as spreadsheets save
// it) into catalog parts: `opsift import`.
//
// Columns map to catalog keys by their header — "GBW (MHz)" is gbw.typ in
// MHz, "Ib max (nA)" ib.max in nA, "gbw.min" gbw.min — or by a map file.
// Units come from the cell ("1.2 MHz"), else from the header or the map
// file. Each row is built into one [[part]] table and decoded and
// validated by the catalog decoder, so an imported part obeys exactly the
// rules `opsift check` applies; a row that cannot be read is reported as
// FILE:ROW:COLUMN and left out, and the other rows are imported.
//
// Spreadsheet dialects: a UTF-8 byte-order mark is dropped; the separator
// is the one of `,`, `;` or tab the header row uses most (or the map
// file's); with `;` the decimal separator is a comma unless the map file
// says otherwise ("1,5 MHz" is 1.5 MHz).
package sheet

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
)

// Target is the catalog key a column fills: Key with Sub ("gbw", "typ";
// "supply", "min"; "temp", "low"; "name", ""), and the unit of its bare
// numbers ("" when the cells carry their own).
type Target struct {
	Key, Sub string
	Unit     string
}

// String renders the target as key.sub.
func (t Target) String() string {
	if t.Sub == "" {
		return t.Key
	}
	return t.Key + "." + t.Sub
}

// Column is one column of the sheet: its 1-based number, its header as
// written, and what it maps to (ok false: unmapped).
type Column struct {
	N      int
	Header string
	Target Target
	ok     bool
}

// Problem is a cell or row that cannot be read: it renders as
// FILE:ROW:COLUMN: column "HEADER": what is wrong (no COLUMN when the
// problem is the row's as a whole, such as a missing required key).
type Problem struct {
	File   string
	Row    int // 1-based, the header being row 1
	Column int // 1-based; 0 for the row as a whole
	Header string
	Err    error
}

// Error renders the problem on one line.
func (p Problem) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s:%d:", safe.Text(p.File), p.Row)
	if p.Column > 0 {
		fmt.Fprintf(&b, "%d: column %q:", p.Column, safe.Text(p.Header))
	}
	b.WriteString(" " + safe.Text(p.Err.Error()))
	return b.String()
}

// Unwrap returns the underlying error.
func (p Problem) Unwrap() error { return p.Err }

// Result is what Read made of a sheet.
type Result struct {
	Parts    []*catalog.Part
	Problems []Problem
	Columns  []Column // every column, mapped or not
	// Rows counts the data rows read (empty rows are not counted).
	Rows      int
	Separator rune
	Decimal   rune
}

// Unmapped returns the columns that map to no catalog key and are not
// ignored by the map file.
func (r *Result) Unmapped() []Column {
	var out []Column
	for _, c := range r.Columns {
		if !c.ok && c.Target.Key != ignore {
			out = append(out, c)
		}
	}
	return out
}

// ignore is the target of a column the map file says to skip ("-").
const ignore = "-"

// Read reads the sheet data, named file in problems, with the column map
// m (nil: headers only). A sheet that cannot be read at all (not UTF-8, no
// header, bad CSV quoting) is an error; problems of single rows are in
// the Result.
func Read(file string, data []byte, m *Map) (*Result, error) {
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	if !utf8.Valid(data) {
		return nil, fmt.Errorf("%s: not UTF-8 text; save the sheet as CSV UTF-8", safe.Text(file))
	}
	if m == nil {
		m = &Map{}
	}
	res := &Result{Separator: m.Separator, Decimal: m.Decimal}
	if res.Separator == 0 {
		res.Separator = sniffSeparator(data)
	}
	if res.Decimal == 0 {
		res.Decimal = '.'
		if res.Separator == ';' {
			res.Decimal = ','
		}
	}
	r := csv.NewReader(bytes.NewReader(data))
	r.Comma = res.Separator
	r.FieldsPerRecord = -1
	header, err := r.Read()
	if errors.Is(err, io.EOF) {
		return nil, fmt.Errorf("%s: empty; want a header row naming the columns", safe.Text(file))
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", safe.Text(file), err)
	}
	for i, h := range header {
		c := Column{N: i + 1, Header: strings.TrimSpace(h)}
		c.Target, c.ok = m.target(c.Header)
		res.Columns = append(res.Columns, c)
	}
	if err := checkColumns(file, res.Columns); err != nil {
		return nil, err
	}
	seen := map[string]int{} // id → row
	for row := 2; ; row++ {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("%s: %w", safe.Text(file), err)
		}
		if blank(rec) {
			continue
		}
		res.Rows++
		p, probs := res.row(file, row, rec)
		if p != nil {
			if first, dup := seen[p.ID]; dup {
				c := res.column("id")
				probs = append(probs, Problem{File: file, Row: row, Column: c.N, Header: c.Header,
					Err: fmt.Errorf("duplicate id %q, first in row %d", p.ID, first)})
				p = nil
			} else {
				seen[p.ID] = row
			}
		}
		res.Problems = append(res.Problems, probs...)
		if p != nil {
			res.Parts = append(res.Parts, p)
		}
	}
	return res, nil
}

// checkColumns refuses a sheet two of whose columns fill the same key.
func checkColumns(file string, cols []Column) error {
	at := map[string]Column{}
	for _, c := range cols {
		if !c.ok {
			continue
		}
		if first, dup := at[c.Target.String()]; dup {
			return fmt.Errorf("%s:1:%d: column %q fills %s, as column %d %q does; map one of them to another key or to \"-\"",
				safe.Text(file), c.N, safe.Text(c.Header), c.Target, first.N, safe.Text(first.Header))
		}
		at[c.Target.String()] = c
	}
	return nil
}

// blank reports whether every cell of a record is empty.
func blank(rec []string) bool {
	for _, s := range rec {
		if strings.TrimSpace(s) != "" {
			return false
		}
	}
	return true
}

// column returns the first column filling key, or a zero Column.
func (r *Result) column(key string) Column {
	for _, c := range r.Columns {
		if c.ok && c.Target.Key == key {
			return c
		}
	}
	return Column{}
}

// sniffSeparator picks the separator the header row uses most, outside
// quotes: ',', ';' or tab (',' when none).
func sniffSeparator(data []byte) rune {
	counts := map[rune]int{}
	quoted := false
	for _, c := range string(data) {
		if c == '"' {
			quoted = !quoted
		}
		if !quoted && (c == '\n' || c == '\r') {
			break
		}
		if !quoted && (c == ',' || c == ';' || c == '\t') {
			counts[c]++
		}
	}
	best := ','
	for _, c := range []rune{';', '\t'} {
		if counts[c] > counts[best] {
			best = c
		}
	}
	return best
}

// row builds one record into a part: a [[part]] table decoded by the
// catalog decoder, whose problems are mapped back to the columns.
func (r *Result) row(file string, row int, rec []string) (*catalog.Part, []Problem) {
	tbl := map[string]any{}
	var probs []Problem
	fieldCol := map[string]Column{} // catalog key → first column filling it
	var temp [2]string
	var tempCol Column
	for i, cell := range rec {
		if i >= len(r.Columns) || !r.Columns[i].ok {
			continue
		}
		c := r.Columns[i]
		cell = strings.TrimSpace(cell)
		if empty(cell) {
			continue
		}
		if _, ok := fieldCol[c.Target.Key]; !ok {
			fieldCol[c.Target.Key] = c
		}
		t := c.Target
		v, err := r.value(t, cell)
		if err != nil {
			probs = append(probs, Problem{File: file, Row: row, Column: c.N, Header: c.Header, Err: err})
			continue
		}
		switch {
		case t.Key == "temp":
			temp[subIndex(t.Sub)], tempCol = v.(string), c
		case t.Sub != "":
			sub, _ := tbl[t.Key].(map[string]any)
			if sub == nil {
				sub = map[string]any{}
				tbl[t.Key] = sub
			}
			sub[t.Sub] = v
		default:
			tbl[t.Key] = v
		}
	}
	switch {
	case temp[0] != "" && temp[1] != "":
		tbl["temp"] = []any{temp[0], temp[1]}
	case temp[0] != "" || temp[1] != "":
		probs = append(probs, Problem{File: file, Row: row, Column: tempCol.N, Header: tempCol.Header,
			Err: errors.New("temp needs both the low and the high end of the rated range")})
	}
	if len(probs) > 0 {
		return nil, probs
	}
	p, err := catalog.DecodeTable(file, tbl)
	var ps catalog.Problems
	if errors.As(err, &ps) {
		for _, p := range ps {
			c := fieldCol[p.Field]
			msg := p.Err
			if p.Field != "" {
				msg = fmt.Errorf("field %q: %w%s", p.Field, p.Err, unitHint(p.Err, c))
			}
			probs = append(probs, Problem{File: file, Row: row, Column: c.N, Header: c.Header, Err: msg})
		}
		return nil, probs
	}
	if err != nil {
		return nil, []Problem{{File: file, Row: row, Err: fmt.Errorf("row did not make one part: %w", err)}}
	}
	p.Pos = catalog.Pos{File: file, Line: row}
	return p, nil
}

// unitHint adds where a unit may be given to a "has no unit" problem.
func unitHint(err error, c Column) string {
	var ue *catalog.UnitError
	if errors.As(err, &ue) && strings.Contains(ue.Msg, "no unit") && c.N > 0 {
		return fmt.Sprintf(` (give the unit in the cell, in the header as "%s (%s)", or in the map file)`,
			strings.TrimSpace(stripUnit(c.Header)), unitOf(ue.Want))
	}
	return ""
}

// unitOf is a unit to suggest for a dimension, from its example.
func unitOf(d catalog.Dim) string {
	_, u, _ := strings.Cut(d.Example(), " ")
	return u
}

// empty reports whether a cell says nothing: blank, or a dash or n/a as
// spreadsheets fill unknown figures with.
func empty(cell string) bool {
	switch strings.ToLower(cell) {
	case "", "-", "—", "–", "n/a", "na", "?":
		return true
	}
	return false
}

// subIndex is 0 for the low end of temp, 1 for the high end.
func subIndex(sub string) int {
	if sub == "high" || sub == "max" {
		return 1
	}
	return 0
}

// value turns a cell into the TOML value of its target: a quantity
// string (with the column's unit when the cell is a bare number), a
// number, an integer, a list of packages or text.
func (r *Result) value(t Target, cell string) (any, error) {
	switch {
	case t.Key == "channels":
		n, err := strconv.ParseInt(r.number(cell), 10, 64)
		if err != nil {
			return nil, fmt.Errorf("%q is not a whole number", cell)
		}
		return n, nil
	case t.Key == "unit_cost":
		x, err := strconv.ParseFloat(r.number(cell), 64)
		if err != nil {
			return nil, fmt.Errorf("%q is not a plain number", cell)
		}
		return x, nil
	case t.Key == "packages":
		f := strings.FieldsFunc(cell, func(c rune) bool {
			return c == ',' || c == ';' || c == '/' || c == '|' || c == ' ' || c == '\t' || c == '\n'
		})
		l := make([]any, len(f))
		for i, s := range f {
			l[i] = strings.ToLower(s)
		}
		return l, nil
	case t.Sub == "source" || t.Key == "tech" || t.Key == "lifecycle":
		return strings.ToLower(cell), nil
	case isQuantity(t):
		q := r.number(cell)
		if t.Unit != "" && bareNumber(q) {
			q += " " + t.Unit
		}
		return q, nil
	}
	return cell, nil
}

// isQuantity reports whether the target holds a quantity with a unit.
func isQuantity(t Target) bool {
	_, ok := catalog.KeyDim(t.Key)
	return ok
}

// number rewrites a decimal comma to a point when the sheet uses one:
// "1,5 MHz" → "1.5 MHz" (only a comma between digits, and only when the
// number has no point of its own).
func (r *Result) number(cell string) string {
	if r.Decimal != ',' || strings.Contains(cell, ".") {
		return cell
	}
	b := []rune(cell)
	for i := 1; i+1 < len(b); i++ {
		if b[i] == ',' && isDigit(b[i-1]) && isDigit(b[i+1]) {
			b[i] = '.'
			break
		}
	}
	return string(b)
}

func isDigit(c rune) bool { return c >= '0' && c <= '9' }

// bareNumber reports whether s is a number with nothing after it.
func bareNumber(s string) bool {
	_, err := strconv.ParseFloat(strings.Replace(strings.TrimSpace(s), "−", "-", 1), 64)
	return err == nil
}
