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
	parts, probs, _ := decodeFile(file, data, runtime.GOMAXPROCS(0), nil)
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
// knows the extent of the source. A file is decoded in pieces of a few
// [[part]] tables on up to workers goroutines, each piece holding one of
// sem's tokens (when sem is not nil) while it works. The parts kept hold
// no line map and no text of the file (their strings are copies), so the
// file is garbage once read.
func decodeFile(file string, data []byte, workers int, sem chan struct{}) ([]*Part, Problems, int) {
	text := string(data)
	if err := Prescan(text); err != nil {
		var le *LimitError
		errors.As(err, &le)
		return nil, Problems{{Pos: Pos{file, le.Line}, Err: err}}, 0
	}
	// A plain file needs only the lines of its [[part]] headers; the full
	// position index is built when the quick scan cannot be trusted or
	// there is a problem to place.
	lines, plain := scanHeaders(text)
	if !plain {
		lines = scanLines(text)
	}
	if parts, ok := decodeInPieces(file, text, lines, pieceParts, workers, sem); ok {
		return parts, nil, 0
	}
	if plain {
		lines = scanLines(text)
	}
	var parts []*Part
	var probs Problems
	var invalid int
	holding(sem, func() { parts, probs, invalid = decodeText(file, text, lines) })
	return parts, probs, invalid
}

// decodeText is decodeFile after the pre-scan, in one piece, with the
// positions lines.
func decodeText(file, text string, lines fileLines) (_ []*Part, _ Problems, invalid int) {
	doc, err := decodeWhole(text)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			line := pe.Position.Line
			if st := pe.Position.Start; st > 0 && st <= len(text) {
				// The decoder may count a line ended by the offending
				// newline as the next one; the byte offset is exact.
				line = 1 + strings.Count(text[:st], "\n")
			}
			return nil, Problems{{Pos: Pos{file, line}, Err: &SyntaxError{Msg: pe.Message, Err: err}}}, 0
		}
		return nil, Problems{{Pos: Pos{File: file}, Err: &SyntaxError{Msg: err.Error(), Err: err}}}, 0
	}
	return partsOf(file, doc, lines)
}

// partsOf turns the decoded document of a file into its valid parts and
// problems, as decodeText returns them.
func partsOf(file string, doc map[string]any, lines fileLines) (_ []*Part, _ Problems, invalid int) {
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
	keep := func(ps Problems) {
		n := min(len(ps), max(MaxProblems-len(probs), 0))
		probs = append(probs, ps[:n]...)
		more += len(ps) - n
	}
	var f fileDecoder
	for i, t := range tables {
		pl := partLines{line: lines.top["part"], keys: map[string]int{}}
		if len(lines.parts) == len(tables) {
			pl = lines.parts[i]
		}
		p, dp, vp := f.part(file, i+1, t, pl)
		keep(dp)
		keep(vp)
		if p != nil {
			parts = append(parts, p)
		}
	}
	sortProblems(probs)
	if more > 0 {
		probs = append(probs, Problem{Pos: Pos{File: file}, Index: summaryIndex, Err: &UnlistedError{N: more}})
	}
	return parts, probs, len(tables) - len(parts)
}

// fileDecoder holds what the parts of one file share while they are
// decoded on one goroutine.
type fileDecoder struct {
	// intern holds one copy of the strings many parts of a file repeat
	// (technology, lifecycle, pinout, packages).
	intern map[string]string
	units  unitMemo // the file's unit spellings, read once each
}

// part decodes and validates the table t of the index'th part of file,
// written at the lines pl. It returns the part when it has no problem,
// else nil and the decoding and validation problems.
func (f *fileDecoder) part(file string, index int, t map[string]any, pl partLines) (*Part, Problems, Problems) {
	if f.intern == nil {
		f.intern = map[string]string{}
	}
	d := partDecoder{file: file, index: index, intern: f.intern, units: &f.units}
	p := d.decode(t, pl)
	vp := validate(p, index, d.bad)
	if len(d.probs) > 0 || len(vp) > 0 {
		return nil, d.probs, vp
	}
	p.Lines = nil // positions past the header are re-derived when needed
	return p, nil, nil
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
	units  *unitMemo // the file's unit spellings, read once each
}

// fail records a problem with key.
func (d *partDecoder) fail(key string, err error) {
	if d.bad == nil {
		d.bad = map[string]bool{}
	}
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
	// Each known key's value goes to its slot; the slots are then read in
	// sorted key order, so problems come out in the same order as with
	// sortedKeys. A table with an unknown key takes the slow path, which
	// reports it.
	var vals [maxPartKeys]any
	if len(partKeys) <= maxPartKeys && pick(t, partKeys, vals[:len(partKeys)]) {
		for _, i := range sortedPartSlots {
			if vals[i] != nil {
				d.field(i, partKeys[i], vals[i])
			}
		}
		return p
	}
	for _, k := range tableKeys(t) {
		if i, ok := partKeySlot[k]; ok {
			d.field(i, k, t[k])
		} else {
			d.fail(k, errors.New("unknown key"+didYouMean(k, partKeys)))
		}
	}
	return p
}

// field reads the value v of the part key k, partKeys[i].
func (d *partDecoder) field(i int, k string, v any) {
	p := d.p
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
		var f [2]any
		d.fields(k, v, spanKeys, `{ min = "3 V", max = "32 V" }`, f[:])
		p.Supply.Min = d.quantity(k, "min", f[0], Volt)
		p.Supply.Max = d.quantity(k, "max", f[1], Volt)
	case "input_cm":
		var f [3]any
		d.fields(k, v, cmKeys, `{ low = "0 V", high = "-1.5 V" }`, f[:])
		p.InputCM.Low = d.quantity(k, "low", f[0], Volt)
		p.InputCM.High = d.quantity(k, "high", f[1], Volt)
		p.InputCM.Source = d.source(k, f[2])
	case "output":
		var f [4]any
		d.fields(k, v, swingKeys, `{ low = "0.02 V", high = "-1.5 V", load = "10 kOhm" }`, f[:])
		p.Output.Low = d.quantity(k, "low", f[0], Volt)
		p.Output.High = d.quantity(k, "high", f[1], Volt)
		p.Output.Load = d.quantity(k, "load", f[2], Ohm)
		p.Output.Source = d.source(k, f[3])
	default:
		if f := partKeyFigure[i]; f != nil {
			d.spec(*f, v)
		} else if s := partKeyScalar[i]; s != nil {
			*s.opt(p) = d.quantity(k, "", v, s.dim)
		}
	}
}

// spec reads a figure's inline table.
func (d *partDecoder) spec(f figure, v any) {
	var t [6]any // specKeys order
	if !d.fields(f.key, v, specKeys, "", t[:]) {
		d.fail(f.key, fmt.Errorf("%s, want a table such as { typ = %s }", got(v), strconv.Quote(f.dim.Example())))
	}
	s := f.spec(d.p)
	s.Typ = d.quantity(f.key, "typ", t[0], f.dim)
	s.Min = d.quantity(f.key, "min", t[1], f.dim)
	s.Max = d.quantity(f.key, "max", t[2], f.dim)
	s.MinOT = d.quantity(f.key, "min_ot", t[3], f.dim)
	s.MaxOT = d.quantity(f.key, "max_ot", t[4], f.dim)
	s.Source = d.source(f.key, t[5])
}

// fields reads the inline table v of the key key into vals, one value per
// name of known (nil where absent), and reports a problem for every key
// outside known, in sorted order. When v is not a table it reports that,
// with example, unless example is "" (the caller words it), and returns
// false.
func (d *partDecoder) fields(key string, v any, known []string, example string, vals []any) bool {
	t, ok := v.(map[string]any)
	if !ok {
		if example != "" {
			d.fail(key, fmt.Errorf("%s, want a table such as %s", got(v), example))
		}
		return false
	}
	if pick(t, known, vals) {
		return true
	}
	for _, k := range unknownKeys(t, known) {
		d.fail(key, fmt.Errorf("unknown key %q%s", k, didYouMean(k, known)))
	}
	return true // pick has filled vals with the known keys
}

// pick puts t[known[i]] in vals[i] for every name of known and reports
// whether t holds no other key. Values absent from t stay nil: the TOML
// decoder never gives a nil value. Looking each name up is quicker than
// ranging over t, whose iterator costs more to start than the few lookups
// of a small table.
func pick(t map[string]any, known []string, vals []any) bool {
	n := 0
	for i, k := range known {
		if x, ok := t[k]; ok {
			vals[i] = x
			n++
		}
	}
	return n == len(t)
}

// quantity reads v, the value of key (or of its sub-key sub), as a
// quantity of dimension dim; unset when v is nil (absent). sub == "" is a
// field that is itself a quantity, such as cload.
func (d *partDecoder) quantity(key, sub string, v any, dim Dim) Opt {
	if v == nil {
		return Opt{}
	}
	if s, ok := v.(string); ok {
		x, err := d.units.parse(s, dim)
		if err == nil {
			return Some(x)
		}
		d.fail(key, fmt.Errorf("%s%w", subPrefix(sub), err))
		return Opt{}
	}
	prefix := subPrefix(sub)
	switch v := v.(type) {
	case int64, float64:
		d.fail(key, fmt.Errorf("%s%w", prefix, &UnitError{Text: show(v), Want: dim, Msg: "has no unit", Bare: true}))
	default:
		d.fail(key, fmt.Errorf("%s%s, want %s such as %q", prefix, got(v), dim, dim.Example()))
	}
	return Opt{}
}

// subPrefix is "sub = " for messages about a sub-key, "" for none.
func subPrefix(sub string) string {
	if sub == "" {
		return ""
	}
	return sub + " = "
}

// source reads v, the optional source key of a table (nil when absent).
func (d *partDecoder) source(key string, v any) Source {
	if v == nil {
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
		r[i] = d.quantity(key, name, l[i], Celsius)
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

// maxPartKeys bounds len(partKeys) for decode's array of slots; a test
// holds partKeys to it (with more keys decode takes its slow path).
const maxPartKeys = 48

// Tables by slot, the index of a key in partKeys: partKeySlot finds the
// slot of a key, sortedPartSlots lists the slots in sorted key order, and
// partKeyFigure and partKeyScalar hold what each slot's key describes
// (nil for the other keys).
var (
	partKeySlot     = map[string]int{}
	sortedPartSlots []int
	partKeyFigure   = make([]*figure, len(partKeys))
	partKeyScalar   = make([]*scalar, len(partKeys))
)

func init() {
	for i, k := range partKeys {
		partKeySlot[k] = i
		if j := slices.IndexFunc(figures, func(f figure) bool { return f.key == k }); j >= 0 {
			partKeyFigure[i] = &figures[j]
		}
		if j := slices.IndexFunc(scalars, func(s scalar) bool { return s.key == k }); j >= 0 {
			partKeyScalar[i] = &scalars[j]
		}
	}
	for _, k := range sortedPartKeys {
		sortedPartSlots = append(sortedPartSlots, partKeySlot[k])
	}
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
