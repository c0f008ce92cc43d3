package catalog

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/BurntSushi/toml"

	"github.com/opsift/opsift/catalog/safe"
)

// SyntaxError is a catalog file that is not valid TOML. The problem that
// carries it holds the file and line.
type SyntaxError struct {
	Msg string // the TOML decoder's message, e.g. "expected a comma"
	Err error  // the decoder's own error
}

// Error says the file is not valid TOML and why.
func (e *SyntaxError) Error() string { return "not valid TOML: " + e.Msg }

// Unwrap returns the decoder's error.
func (e *SyntaxError) Unwrap() error { return e.Err }

// Decode reads one catalog file: the [[part]] tables of data, which was
// read from file (used in positions). It returns the parts that decoded
// and validated cleanly, and, when anything is wrong, every problem it
// found as a Problems error. Parts with a problem are left out. A part
// that gives no lifecycle is active.
func Decode(file string, data []byte) ([]*Part, error) {
	parts, probs, _ := decodeFile(file, data, runtime.GOMAXPROCS(0))
	parts, dups := dropDuplicates(parts, map[string]Pos{}, data)
	probs = append(probs, dups...)
	sortProblems(probs)
	return parts, probs.AsError()
}

// MaxProblems is the most problems kept for one file; past it a last
// problem counts the rest, so a hostile file cannot flood the terminal.
const MaxProblems = 50

// UnlistedError is the last problem of a file with more than MaxProblems:
// how many more there are.
type UnlistedError struct{ N int }

// Error says how many problems are not listed.
func (e *UnlistedError) Error() string {
	return fmt.Sprintf("%d more problems in this file not shown (at most %d are listed per file)", e.N, MaxProblems)
}

// Count is the number of problems ps stands for: each listed one, plus
// those an UnlistedError counts.
func (ps Problems) Count() int {
	n := 0
	for _, p := range ps {
		var u *UnlistedError
		if errors.As(p.Err, &u) {
			n += u.N
			continue
		}
		n++
	}
	return n
}

// decodeFile decodes and validates one file, returning its valid parts,
// its problems (at most MaxProblems and a count of the rest) and the
// number of parts left out; duplicate ids are left to the caller, which
// knows the extent of the source. A large file is decoded in up to pieces
// parts on as many cores. The parts kept hold no line map and no text of
// the file (their strings are copies), so the file is garbage once read.
func decodeFile(file string, data []byte, pieces int) ([]*Part, Problems, int) {
	text := string(data)
	if err := Prescan(text); err != nil {
		var le *LimitError
		errors.As(err, &le)
		return nil, Problems{{Pos: Pos{file, le.Line}, Err: err}}, 0
	}
	// A clean file needs only the lines of its [[part]] headers; the full
	// position index is built when there is a problem to place.
	if lines, ok := scanHeaders(text); ok {
		parts, probs, invalid, exact := decodeText(file, text, lines, pieces)
		if exact && len(probs) == 0 {
			return parts, probs, invalid
		}
	}
	parts, probs, invalid, _ := decodeText(file, text, scanLines(text), pieces)
	return parts, probs, invalid
}

// decodeText is decodeFile after the pre-scan, with the positions lines.
// exact reports whether lines held one entry for each part table.
func decodeText(file, text string, lines fileLines, pieces int) (_ []*Part, _ Problems, invalid int, exact bool) {
	doc, err := decodePieces(text, lines, pieces)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			line := pe.Position.Line
			if st := pe.Position.Start; st > 0 && st <= len(text) {
				// The decoder may count a line ended by the offending
				// newline as the next one; the byte offset is exact.
				line = 1 + strings.Count(text[:st], "\n")
			}
			return nil, Problems{{Pos: Pos{file, line}, Err: &SyntaxError{Msg: pe.Message, Err: err}}}, 0, true
		}
		return nil, Problems{{Pos: Pos{File: file}, Err: &SyntaxError{Msg: err.Error(), Err: err}}}, 0, true
	}
	var probs Problems
	for _, k := range sortedKeys(doc) {
		if k != "part" {
			probs = append(probs, Problem{Pos: Pos{file, lines.top[k]},
				Err: fmt.Errorf("unknown key %q %w%s", k, errOutsidePart, didYouMean(k, []string{"part"}))})
		}
	}
	tables, err := partTables(doc["part"])
	if err != nil {
		probs = append(probs, Problem{Pos: Pos{file, lines.top["part"]}, Err: err})
	}
	parts := make([]*Part, 0, len(tables))
	more := 0
	intern := map[string]string{}
	keep := func(ps Problems) {
		n := min(len(ps), max(MaxProblems-len(probs), 0))
		probs = append(probs, ps[:n]...)
		more += len(ps) - n
	}
	for i, t := range tables {
		pl := partLines{line: lines.top["part"], keys: map[string]int{}}
		if len(lines.parts) == len(tables) {
			pl = lines.parts[i]
		}
		d := partDecoder{file: file, index: i + 1, bad: map[string]bool{}, intern: intern}
		p := d.decode(t, pl)
		keep(d.probs)
		vp := validate(p, i+1, d.bad)
		keep(vp)
		if len(d.probs) == 0 && len(vp) == 0 {
			p.Lines = nil // positions past the header are re-derived when needed
			parts = append(parts, p)
		}
	}
	sortProblems(probs)
	if more > 0 {
		probs = append(probs, Problem{Pos: Pos{File: file}, Index: summaryIndex, Err: &UnlistedError{N: more}})
	}
	return parts, probs, len(tables) - len(parts), len(lines.parts) == len(tables)
}

// partTables returns the tables of the "part" array.
func partTables(v any) ([]map[string]any, error) {
	switch v := v.(type) {
	case nil:
		return nil, nil
	case []map[string]any:
		return v, nil
	case []any:
		ts := make([]map[string]any, 0, len(v))
		for i, e := range v {
			t, ok := e.(map[string]any)
			if !ok {
				return ts, fmt.Errorf("part %d is %s, want a table of part keys", i+1, kind(e))
			}
			ts = append(ts, t)
		}
		return ts, nil
	case map[string]any:
		return nil, errors.New(`"part" is a single table; write each part as an array entry [[part]]`)
	default:
		return nil, fmt.Errorf(`"part" is %s, want [[part]] tables`, kind(v))
	}
}

// dropDuplicates removes parts whose id is already in seen (and adds the
// rest to seen), returning a problem for each one removed. data is the
// file the parts were read from: the line of a duplicate id is found in it
// again, as decoded parts keep only their header's line.
func dropDuplicates(parts []*Part, seen map[string]Pos, data []byte) ([]*Part, Problems) {
	var probs Problems
	kept := parts[:0]
	var lines *fileLines
	for _, p := range parts {
		if first, ok := seen[p.ID]; ok {
			if lines == nil {
				fl := scanLines(string(data))
				lines = &fl
			}
			probs = append(probs, Problem{Pos: Pos{p.Pos.File, lines.keyLine(p.Pos.Line, "id")}, Part: p.ID, Field: "id",
				Err: fmt.Errorf("duplicate id %q, first given at %s:%d", p.ID, safe.Text(first.File), first.Line)})
			continue
		}
		seen[p.ID] = p.Pos
		kept = append(kept, p)
	}
	return kept, probs
}

// partDecoder turns one [[part]] table into a Part, collecting a problem
// for every key it cannot read.
type partDecoder struct {
	file  string
	index int
	p     *Part
	probs Problems
	bad   map[string]bool // keys with a decode problem; validation skips them
	// intern holds one copy of the strings many parts of a file repeat
	// (technology, lifecycle, pinout, packages).
	intern map[string]string
}

// fail records a problem with key.
func (d *partDecoder) fail(key string, err error) {
	d.bad[key] = true
	d.probs = append(d.probs, Problem{Pos: Pos{d.file, d.p.Line(key)}, Part: d.p.ID, Index: d.index, Field: key, Err: err})
}

// decode reads the table t, written at the lines pl.
func (d *partDecoder) decode(t map[string]any, pl partLines) *Part {
	p := &Part{Pos: Pos{d.file, pl.line}, Lines: pl.keys, Lifecycle: LifecycleActive}
	d.p = p
	if v, ok := t["id"]; ok {
		p.ID, _ = d.str("id", v, `"xq4-bip"`)
	}
	for _, k := range tableKeys(t) {
		v := t[k]
		switch k {
		case "id":
		case "name":
			p.Name, _ = d.str(k, v, `"Bipolar quad, single-supply"`)
		case "tech":
			s, _ := d.str(k, v, `"cmos"`)
			p.Tech = Tech(d.shared(s))
		case "lifecycle":
			s, _ := d.str(k, v, `"active"`)
			p.Lifecycle = Lifecycle(d.shared(s))
		case "pinout":
			s, _ := d.str(k, v, `"dual-a"`)
			p.Pinout = d.shared(s)
		case "datasheet":
			p.Datasheet, _ = d.str(k, v, `"https://example.invalid/part.pdf"`)
		case "notes":
			p.Notes, _ = d.str(k, v, `"any remarks"`)
		case "channels":
			p.Channels = d.integer(k, v)
		case "packages":
			p.Packages = d.strList(k, v)
		case "unit_cost":
			p.UnitCost = d.number(k, v)
		case "temp":
			p.Temp = d.tempRange(k, v)
		case "supply":
			t := d.table(k, v, spanKeys, `{ min = "3 V", max = "32 V" }`)
			p.Supply.Min = d.quantity(k, "min", t, Volt)
			p.Supply.Max = d.quantity(k, "max", t, Volt)
		case "input_cm":
			t := d.table(k, v, cmKeys, `{ low = "0 V", high = "-1.5 V" }`)
			p.InputCM.Low = d.quantity(k, "low", t, Volt)
			p.InputCM.High = d.quantity(k, "high", t, Volt)
			p.InputCM.Source = d.source(k, t)
		case "output":
			t := d.table(k, v, swingKeys, `{ low = "0.02 V", high = "-1.5 V", load = "10 kOhm" }`)
			p.Output.Low = d.quantity(k, "low", t, Volt)
			p.Output.High = d.quantity(k, "high", t, Volt)
			p.Output.Load = d.quantity(k, "load", t, Ohm)
			p.Output.Source = d.source(k, t)
		default:
			if f, ok := figureByKey(k); ok {
				d.spec(f, v)
			} else if s, ok := scalarByKey(k); ok {
				*s.opt(p) = d.quantity(k, "", map[string]any{"": v}, s.dim)
			} else {
				d.fail(k, errors.New("unknown key"+didYouMean(k, partKeys)))
			}
		}
	}
	return p
}

// spec reads a figure's inline table.
func (d *partDecoder) spec(f figure, v any) {
	t := d.table(f.key, v, specKeys, "{ typ = "+strconv.Quote(f.dim.Example())+" }")
	s := f.spec(d.p)
	s.Typ = d.quantity(f.key, "typ", t, f.dim)
	s.Min = d.quantity(f.key, "min", t, f.dim)
	s.Max = d.quantity(f.key, "max", t, f.dim)
	s.MinOT = d.quantity(f.key, "min_ot", t, f.dim)
	s.MaxOT = d.quantity(f.key, "max_ot", t, f.dim)
	s.Source = d.source(f.key, t)
}

// table returns v as a table, reporting keys outside known; nil when v is
// not a table.
func (d *partDecoder) table(key string, v any, known []string, example string) map[string]any {
	t, ok := v.(map[string]any)
	if !ok {
		d.fail(key, fmt.Errorf("%s, want a table such as %s", got(v), example))
		return nil
	}
	for _, k := range unknownKeys(t, known) {
		d.fail(key, fmt.Errorf("unknown key %q%s", k, didYouMean(k, known)))
	}
	return t
}

// quantity reads t[sub] as a quantity of dimension dim. sub == "" is a
// field that is itself a quantity, such as cload.
func (d *partDecoder) quantity(key, sub string, t map[string]any, dim Dim) Opt {
	v, ok := t[sub]
	if !ok {
		return Opt{}
	}
	prefix := ""
	if sub != "" {
		prefix = sub + " = "
	}
	switch v := v.(type) {
	case string:
		x, err := Parse(v, dim)
		if err != nil {
			d.fail(key, fmt.Errorf("%s%w", prefix, err))
			return Opt{}
		}
		return Some(x)
	case int64, float64:
		d.fail(key, fmt.Errorf("%s%w", prefix, &UnitError{Text: show(v), Want: dim, Msg: "has no unit", Bare: true}))
	default:
		d.fail(key, fmt.Errorf("%s%s, want %s such as %q", prefix, got(v), dim, dim.Example()))
	}
	return Opt{}
}

// source reads the optional source key of a table.
func (d *partDecoder) source(key string, t map[string]any) Source {
	v, ok := t["source"]
	if !ok {
		return ""
	}
	s, ok := v.(string)
	if !ok {
		d.fail(key, fmt.Errorf("source = %s, want one of %s", got(v), enumList(sources)))
		return ""
	}
	return Source(d.shared(s))
}

// str reads a string field. The string is a copy: the decoder's may
// share memory with the whole file's text.
func (d *partDecoder) str(key string, v any, example string) (string, bool) {
	s, ok := v.(string)
	if !ok {
		d.fail(key, fmt.Errorf("%s, want a string such as %s", got(v), example))
	}
	return strings.Clone(s), ok
}

// shared returns the file's one copy of s, a string many parts repeat.
func (d *partDecoder) shared(s string) string {
	if c, ok := d.intern[s]; ok {
		return c
	}
	s = strings.Clone(s)
	if d.intern != nil {
		d.intern[s] = s
	}
	return s
}

// integer reads a whole number field.
func (d *partDecoder) integer(key string, v any) int {
	n, ok := v.(int64)
	if !ok || n > math.MaxInt32 || n < math.MinInt32 {
		d.fail(key, fmt.Errorf("%s, want a whole number such as 2", got(v)))
		return 0
	}
	return int(n)
}

// number reads a plain number field (integer or float).
func (d *partDecoder) number(key string, v any) Opt {
	switch v := v.(type) {
	case int64:
		return Some(float64(v))
	case float64:
		if math.IsNaN(v) || math.IsInf(v, 0) {
			d.fail(key, fmt.Errorf("%s is not a finite number, want a plain number such as 0.18", show(v)))
			return Opt{}
		}
		return Some(v)
	}
	d.fail(key, fmt.Errorf("%s, want a plain number such as 0.18", got(v)))
	return Opt{}
}

// strList reads a list of strings.
func (d *partDecoder) strList(key string, v any) []string {
	const example = `["soic8", "dip8"]`
	l, ok := v.([]any)
	if !ok {
		d.fail(key, fmt.Errorf("%s, want a list such as %s", got(v), example))
		return nil
	}
	out := make([]string, 0, len(l))
	for _, e := range l {
		s, ok := e.(string)
		if !ok {
			d.fail(key, fmt.Errorf("entry %s, want a list of strings such as %s", got(e), example))
			return nil
		}
		out = append(out, d.shared(s))
	}
	return out
}

// tempRange reads ["low C", "high C"].
func (d *partDecoder) tempRange(key string, v any) [2]Opt {
	const example = `["-40 C", "85 C"]`
	l, ok := v.([]any)
	if !ok {
		d.fail(key, fmt.Errorf("%s, want two temperatures such as %s", got(v), example))
		return [2]Opt{}
	}
	if len(l) != 2 {
		d.fail(key, fmt.Errorf("is a list of %d, want two temperatures such as %s", len(l), example))
		return [2]Opt{}
	}
	var r [2]Opt
	for i, name := range []string{"low", "high"} {
		r[i] = d.quantity(key, name, map[string]any{name: l[i]}, Celsius)
	}
	if !r[0].Known() || !r[1].Known() {
		return [2]Opt{}
	}
	return r
}

// figureByKey finds the figure a key names.
func figureByKey(k string) (figure, bool) {
	for _, f := range figures {
		if f.key == k {
			return f, true
		}
	}
	return figure{}, false
}

// scalarByKey finds the single-quantity field a key names.
func scalarByKey(k string) (scalar, bool) {
	for _, s := range scalars {
		if s.key == k {
			return s, true
		}
	}
	return scalar{}, false
}

// sortedPartKeys is partKeys in sorted order.
var sortedPartKeys = func() []string {
	ks := slices.Clone(partKeys)
	slices.Sort(ks)
	return ks
}()

// tableKeys returns the keys of a part table in sorted order, as
// sortedKeys does, but without sorting when every key is a known one
// (the usual case): the known keys are then walked in their sorted order.
func tableKeys(t map[string]any) []string {
	ks := make([]string, 0, len(t))
	for _, k := range sortedPartKeys {
		if _, ok := t[k]; ok {
			ks = append(ks, k)
		}
	}
	if len(ks) == len(t) {
		return ks
	}
	return sortedKeys(t)
}

// unknownKeys returns the keys of t outside known, sorted; nil (without
// allocating) when there are none.
func unknownKeys(t map[string]any, known []string) []string {
	n := 0
	for _, k := range known {
		if _, ok := t[k]; ok {
			n++
		}
	}
	if n == len(t) {
		return nil
	}
	var ks []string
	for k := range t {
		if !slices.Contains(known, k) {
			ks = append(ks, k)
		}
	}
	slices.Sort(ks)
	return ks
}

// sortedKeys returns the keys of m in order, so problems come out the same
// on every run.
func sortedKeys(m map[string]any) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	slices.Sort(ks)
	return ks
}

// kind names the TOML type of a decoded value.
func kind(v any) string {
	switch v.(type) {
	case string:
		return "a string"
	case int64:
		return "a whole number"
	case float64:
		return "a number"
	case bool:
		return "a boolean"
	case []any, []map[string]any:
		return "a list"
	case map[string]any:
		return "a table"
	case time.Time:
		return "a date or time"
	}
	return fmt.Sprintf("a %T", v)
}

// show renders a scalar value roughly as it was written.
func show(v any) string {
	switch v := v.(type) {
	case string:
		return strconv.Quote(v)
	case int64:
		return strconv.FormatInt(v, 10)
	case float64:
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return tomlFloat(v)
		}
		if v == math.Trunc(v) && math.Abs(v) < 1e15 {
			return strconv.FormatFloat(v, 'f', 1, 64) // 4.0, as TOML writes a float
		}
		return strconv.FormatFloat(v, 'g', -1, 64)
	case bool:
		return strconv.FormatBool(v)
	}
	return ""
}

// got describes a value of the wrong type: `5 is a whole number`, or
// `got a list` for values too big to repeat.
func got(v any) string {
	if s := show(v); s != "" {
		return s + " is " + kind(v)
	}
	return "got " + kind(v)
}
