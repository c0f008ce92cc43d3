package filter

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/catalog/tomlpos"
)

// DecodeDesign reads a design TOML file. name is used in error messages,
// which look like
//
//	probe.toml:14: stage "gain": field "signal.freq": "20 kHz/s" is a slew rate, want a frequency such as "1 MHz"
//
// Unknown keys are errors with a did-you-mean. When a file has several
// problems the first in file order is returned. Semantic checks that need
// the whole design (V+ above V−, a sine needs a frequency) happen in Derive.
func DecodeDesign(name string, data []byte) (*Design, error) {
	if err := catalog.Prescan(string(data)); err != nil {
		e := &Error{File: name, Err: err}
		var le *catalog.LimitError
		if errors.As(err, &le) {
			e.Line = le.Line
		}
		return nil, e
	}
	var raw map[string]any
	if _, err := toml.Decode(string(data), &raw); err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			return nil, &Error{File: name, Line: pe.Position.Line, Err: &catalog.SyntaxError{Msg: safe.Text(pe.Message), Err: err}}
		}
		return nil, &Error{File: name, Err: err}
	}
	dec := &designDecoder{name: name, lines: tomlpos.Scan(string(data))}
	d := dec.design(raw)
	if len(dec.errs) > 0 {
		sort.SliceStable(dec.errs, func(i, j int) bool { return dec.errs[i].Line < dec.errs[j].Line })
		e := dec.errs[0]
		e.File = name
		return nil, e
	}
	return d, nil
}

// designDecoder turns the decoded TOML of a design into a Design,
// collecting an error for every key it cannot read.
type designDecoder struct {
	name  string
	lines *tomlpos.Index // where each key path is written
	errs  []*Error
}

// fail records an error about the key at path (the file's dotted key,
// "stage.0.signal.freq"), which is field of stage ("" at design level).
func (dec *designDecoder) fail(path, stage, field string, format string, a ...any) {
	dec.errs = append(dec.errs, &Error{Line: dec.lines.Line(path), Stage: stage, Field: field, Err: fmt.Errorf(format, a...)})
}

// topKeys are the tables and keys a design file may have at its top level.
func topKeys() []string {
	return []string{"title", "supply", "environment", "choose", "policy", "stage"}
}

func (dec *designDecoder) design(raw map[string]any) *Design {
	d := &Design{Name: dec.name}
	params := d.designParams()
	byPath := map[string]designParam{}
	for _, p := range params {
		byPath[p.Key] = p
	}
	for _, k := range sortedKeys(raw) {
		v := raw[k]
		switch k {
		case "title":
			s, ok := v.(string)
			if !ok {
				dec.fail(k, "", k, "want a string")
				continue
			}
			d.Title = s
		case "supply", "choose", "policy", "environment":
			tbl, ok := v.(map[string]any)
			if !ok {
				dec.fail(k, "", "", "%q must be a table [%s]", k, k)
				continue
			}
			for _, sub := range sortedKeys(tbl) {
				path := k + "." + sub
				if path == "choose.limit" {
					dec.limits(d, tbl[sub])
					continue
				}
				if path == "environment.temp" {
					dec.pair(path, tbl[sub], "", func(lo, hi Value) { d.Temp = [2]Value{lo, hi} }, byPath["environment.temp.low"].Param)
					continue
				}
				p, ok := byPath[path]
				if !ok {
					dec.unknown("", path, sub, tableKeys(params, k+"."))
					continue
				}
				if val, ok := dec.value(path, "", p.Param, tbl[sub]); ok {
					*p.v = val
				}
			}
		case "stage":
			list, ok := v.([]map[string]any)
			if !ok {
				dec.fail(k, "", "", "\"stage\" must be an array of tables [[stage]]")
				continue
			}
			for i, st := range list {
				if s := dec.stage(i, st); s != nil {
					d.Stages = append(d.Stages, s)
				}
			}
		default:
			dec.unknown("", k, k, topKeys())
		}
	}
	seen := map[string]int{}
	for i, s := range d.Stages {
		if j, dup := seen[s.Name]; dup {
			dec.errs = append(dec.errs, &Error{Line: s.Line, Stage: s.Name, Err: fmt.Errorf("duplicate name (stage %d has it too)", j+1)})
		}
		seen[s.Name] = i
	}
	return d
}

// validStageName reports whether a stage name is letters, digits, _ or -:
// it becomes part of field paths ("stage.gain.signal.freq") and columns.
func validStageName(s string) bool {
	for _, c := range s {
		ok := c == '_' || c == '-' || (c >= '0' && c <= '9') || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z')
		if !ok {
			return false
		}
	}
	return s != ""
}

func (dec *designDecoder) stage(i int, raw map[string]any) *Stage {
	base := tomlpos.Element("stage", i)
	s := &Stage{Line: dec.lines.Line(base), Values: map[string]Value{}}
	name, ok := raw["name"].(string)
	if !ok || name == "" {
		dec.errs = append(dec.errs, &Error{Line: s.Line, Index: i + 1, Field: "name", Err: errors.New("missing, want a name such as \"gain\"")})
		return nil
	}
	if !validStageName(name) {
		dec.fail(base+".name", name, "name", "want letters, digits, _ or -")
		return nil
	}
	s.Name = name
	kind, _ := raw["kind"].(string)
	t, ok := TemplateFor(kind)
	if !ok {
		dec.fail(base+".kind", name, "kind", "%w", unknownKind(kind))
		return nil
	}
	s.Kind = kind
	params := map[string]Param{}
	var keys []string
	for _, p := range t.Params() {
		params[p.Key] = p
		keys = append(keys, p.Key)
	}
	keys = append(keys, "name", "kind")
	for _, lf := range flatten("", raw) {
		if lf.key == "name" || lf.key == "kind" {
			continue
		}
		path := base + "." + lf.key
		p, ok := params[lf.key]
		if !ok && lf.key == "thd" {
			dec.fail(path, name, "thd", "kind %s has no sine output whose distortion could be checked, want thd only on a sine stage of kind %s",
				kind, strings.Join(thdKinds(), ", "))
			continue
		}
		if !ok {
			dec.unknown(name, path, lf.key, keys)
			continue
		}
		if p.Kind == Pair {
			dec.pair(path, lf.val, name, func(lo, hi Value) {
				s.Values[p.Key+".low"], s.Values[p.Key+".high"] = lo, hi
			}, p)
			continue
		}
		if v, ok := dec.value(path, name, p, lf.val); ok {
			s.Values[p.Key] = v
		}
	}
	return s
}

type leaf struct {
	key string
	val any
}

// flatten turns nested tables into dotted keys, in sorted order.
func flatten(prefix string, m map[string]any) []leaf {
	var out []leaf
	for _, k := range sortedKeys(m) {
		key := k
		if prefix != "" {
			key = prefix + "." + k
		}
		if sub, ok := m[k].(map[string]any); ok {
			out = append(out, flatten(key, sub)...)
			continue
		}
		out = append(out, leaf{key, m[k]})
	}
	return out
}

func sortedKeys(m map[string]any) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return ks
}

// tableKeys lists the keys under prefix of the design-level params.
func tableKeys(ps []designParam, prefix string) []string {
	var out []string
	for _, p := range ps {
		if k, ok := strings.CutPrefix(p.Key, prefix); ok {
			k, _, _ = strings.Cut(k, ".")
			if !contains(out, k) {
				out = append(out, k)
			}
		}
	}
	return out
}

func (dec *designDecoder) unknown(stage, path, key string, known []string) {
	field, prefix := path, ""
	if stage != "" {
		field = key
	} else if i := strings.LastIndexByte(path, '.'); i >= 0 {
		prefix = path[:i+1]
	}
	if s := nearest(key, known); s != "" {
		dec.fail(path, stage, "", "unknown field %q (did you mean %q?)", field, prefix+s)
		return
	}
	dec.fail(path, stage, "", "unknown field %q, want one of %s", field, strings.Join(known, ", "))
}

// fieldName is the field as messages show it: the path inside the stage
// for stage fields, the full dotted key for design-level ones.
func fieldName(stage, path string) string {
	if stage == "" {
		return path
	}
	_, rest, _ := strings.Cut(strings.TrimPrefix(path, "stage."), ".")
	return rest
}

// value reads one input: a string, or a TOML number for plain-number and
// ratio fields, or an array of strings for lists.
func (dec *designDecoder) value(path, stage string, p Param, v any) (Value, bool) {
	field := fieldName(stage, path)
	var raw string
	switch x := v.(type) {
	case string:
		raw = x
	case int64:
		raw = strconv.FormatInt(x, 10)
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			dec.fail(path, stage, field, "%v is not a finite number", x)
			return Value{}, false
		}
		raw = strconv.FormatFloat(x, 'g', -1, 64)
	case []any:
		if p.Kind != List {
			dec.fail(path, stage, field, "is a list, want %s", wantOf(p))
			return Value{}, false
		}
		items := make([]string, 0, len(x))
		for _, it := range x {
			s, ok := it.(string)
			if !ok {
				dec.fail(path, stage, field, "list item %v is not a string, want %s", it, wantOf(p))
				return Value{}, false
			}
			items = append(items, s)
		}
		raw = strings.Join(items, ", ")
	default:
		dec.fail(path, stage, field, "want %s", wantOf(p))
		return Value{}, false
	}
	if p.Kind == List {
		if _, isList := v.([]any); !isList {
			dec.fail(path, stage, field, "%q is not a list, want %s", raw, wantOf(p))
			return Value{}, false
		}
	}
	val, err := parseParam(p, raw)
	if err == nil && p.Kind == List && len(val.List()) == 0 {
		val = Value{}
	}
	if err != nil {
		dec.fail(path, stage, field, "%w", err)
		return Value{}, false
	}
	val.Line = dec.lines.Line(path)
	return val, true
}

// pair reads a two-element array of quantities.
func (dec *designDecoder) pair(path string, v any, stage string, set func(lo, hi Value), p Param) {
	field := fieldName(stage, path)
	arr, ok := v.([]any)
	if !ok || len(arr) != 2 {
		lo, hi := pairExample(p)
		dec.fail(path, stage, field, "want two values [low, high] such as [%q, %q]", lo, hi)
		return
	}
	q := p
	q.Kind, q.Required = Quantity, false
	var out [2]Value
	for i, it := range arr {
		val, ok := dec.value(path, stage, q, it)
		if !ok {
			return
		}
		out[i] = val
	}
	set(out[0], out[1])
}

// wantOf says what a param wants, for messages.
func wantOf(p Param) string {
	switch p.Kind {
	case Choice:
		return "one of " + strings.Join(p.Choices, ", ")
	case List:
		if p.Choices != nil {
			return "a list of " + strings.Join(p.Choices, ", ")
		}
		return "a list of names such as [\"soic8\"]"
	}
	return fmt.Sprintf("%s such as %q", p.Dim, p.Dim.Example())
}

// pairExample is a well-formed [low, high] pair for messages.
func pairExample(p Param) (string, string) {
	switch p.Dim {
	case catalog.Celsius:
		return "-40 C", "85 C"
	case catalog.Volt:
		return "0 V", "3.3 V"
	}
	return p.Dim.Example(), p.Dim.Example()
}
