package filter

import (
	"fmt"
	"maps"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// Design is a circuit described in a design TOML file: the supply, the
// environment, hard filters on the parts, worst-case policy and the stages
// that each need one op-amp channel. Every input keeps its text as written
// (Value.Raw) beside its parsed value, so a front end can edit it in place
// with Set and save it with EncodeDesign.
type Design struct {
	Name   string // file name for messages, e.g. "probe.toml"
	Title  string
	Supply Supply
	Temp   [2]Value // environment.temp: [low, high] ambient, °C
	Choose Choose
	Policy Policy
	Stages []*Stage
}

// Supply is the design's [supply] table.
type Supply struct {
	Pos       Value // nominal V+ against 0 V
	Neg       Value // nominal V−
	Tolerance Value // fraction each rail may move by
}

// Choose holds the hard filters of the design's [choose] table.
type Choose struct {
	Packages      Value // List: any of
	Tech          Value // List: any of
	Lifecycle     Value // List: any of; not set = anything but obsolete
	MaxUnitCost   Value // plain number in the catalog's currency
	SupplyCurrent Value // A, budget for every channel of the packages used
	// Limits are the figure bounds of [choose.limit], by catalog figure
	// key ("vos", "gbw", …).
	Limits map[string]Limit
}

// Policy holds the worst-case rules of the design's [policy] table.
type Policy struct {
	DerateTyp  Value // bigger-is-better figure known only as typical: × this
	InflateTyp Value // smaller-is-better figure known only as typical: × this
	// SpeedTempco lowers 25 °C GBW and slew figures by this fraction per
	// kelvin away from 25 °C.
	SpeedTempco Value
	// IbColdTempco raises 25 °C bipolar Ib and Ios figures by this
	// fraction per kelvin below 25 °C.
	IbColdTempco Value
}

// Stage is one [[stage]] of a design: a name, a template kind and the
// inputs the template takes, keyed by Param.Key (a Pair param is held as
// Key+".low" and Key+".high").
type Stage struct {
	Name   string
	Kind   string
	Line   int // line of the stage's [[stage]] header, 0 when unknown
	Values map[string]Value
}

// Value returns the stage input under key (zero Value when not given).
func (s *Stage) Value(key string) Value { return s.Values[key] }

// Stage returns the stage called name, or nil.
func (d *Design) Stage(name string) *Stage {
	for _, s := range d.Stages {
		if s.Name == name {
			return s
		}
	}
	return nil
}

// Clone returns a deep copy of d that can be edited independently.
func (d *Design) Clone() *Design {
	c := *d
	c.Choose.Limits = maps.Clone(d.Choose.Limits)
	c.Stages = make([]*Stage, len(d.Stages))
	for i, s := range d.Stages {
		cs := *s
		cs.Values = maps.Clone(s.Values)
		if cs.Values == nil {
			cs.Values = map[string]Value{}
		}
		c.Stages[i] = &cs
	}
	return &c
}

// designParam ties one design-level field to where it is held.
type designParam struct {
	Param
	v *Value
}

// designParams lists the design-level inputs in file order. Paths are the
// TOML keys joined with dots; the temperature pair is split into .low/.high.
func (d *Design) designParams() []designParam {
	return []designParam{
		{Param{Key: "supply.pos", Label: "V+ rail", Kind: Quantity, Dim: catalog.Volt, Required: true,
			Help: "nominal positive rail against 0 V"}, &d.Supply.Pos},
		{Param{Key: "supply.neg", Label: "V− rail", Kind: Quantity, Dim: catalog.Volt, Default: "0 V",
			Help: "nominal negative rail against 0 V"}, &d.Supply.Neg},
		{Param{Key: "supply.tolerance", Label: "rail tolerance", Kind: Quantity, Dim: catalog.Ratio, Default: "0 %",
			Help: "each rail moves by this × its own magnitude; span min/max = both rails inward/outward"}, &d.Supply.Tolerance},
		{Param{Key: "environment.temp.low", Label: "ambient low", Kind: Quantity, Dim: catalog.Celsius, Default: "25 C",
			Help: "lowest ambient temperature"}, &d.Temp[0]},
		{Param{Key: "environment.temp.high", Label: "ambient high", Kind: Quantity, Dim: catalog.Celsius, Default: "25 C",
			Help: "highest ambient temperature"}, &d.Temp[1]},
		{Param{Key: "choose.packages", Label: "packages", Kind: List,
			Help: "any of these packages; empty = any"}, &d.Choose.Packages},
		{Param{Key: "choose.tech", Label: "technology", Kind: List,
			Choices: []string{"bipolar", "cmos", "jfet", "bicmos"},
			Help:    "any of these input technologies; empty = any"}, &d.Choose.Tech},
		{Param{Key: "choose.lifecycle", Label: "lifecycle", Kind: List,
			Choices: []string{"active", "nrnd", "obsolete"},
			Help:    "any of these lifecycle states; empty = anything but obsolete"}, &d.Choose.Lifecycle},
		{Param{Key: "choose.max_unit_cost", Label: "max unit cost", Kind: Quantity, Dim: catalog.Dimensionless,
			Help: "highest unit cost, in the catalog's currency"}, &d.Choose.MaxUnitCost},
		{Param{Key: "choose.supply_current", Label: "supply current budget", Kind: Quantity, Dim: catalog.Ampere,
			Help: "budget for all channels of the packages used"}, &d.Choose.SupplyCurrent},
		{Param{Key: "policy.derate_typ", Label: "typical derating", Kind: Quantity, Dim: catalog.Dimensionless,
			Default: fmt.Sprint(DefaultDerateTyp),
			Help:    "bigger-is-better figure known only as typical is multiplied by this"}, &d.Policy.DerateTyp},
		{Param{Key: "policy.inflate_typ", Label: "typical inflation", Kind: Quantity, Dim: catalog.Dimensionless,
			Default: fmt.Sprint(DefaultInflateTyp),
			Help:    "smaller-is-better figure known only as typical is multiplied by this"}, &d.Policy.InflateTyp},
		{Param{Key: "policy.speed_tempco", Label: "GBW/slew loss /K", Kind: Quantity, Dim: catalog.Dimensionless,
			Default: fmt.Sprint(DefaultSpeedTempco),
			Help:    "a 25 °C GBW or slew figure is lowered by this fraction per K away from 25 °C"}, &d.Policy.SpeedTempco},
		{Param{Key: "policy.ib_cold_tempco", Label: "bipolar Ib cold/K", Kind: Quantity, Dim: catalog.Dimensionless,
			Default: fmt.Sprint(DefaultIbColdTempco),
			Help:    "a 25 °C bipolar Ib or Ios figure is raised by this fraction per K below 25 °C"}, &d.Policy.IbColdTempco},
	}
}

// Fields lists every editable input of the design in form order: the
// design-level inputs, each stage's kind and template parameters, then a
// [choose.limit] row per catalog figure ("choose.limit.vos", edited as
// "max 6 mV", "min 1 MHz" or both joined by a comma).
func (d *Design) Fields() []Field {
	var out []Field
	for _, p := range d.designParams() {
		out = append(out, fieldOf(p.Key, p.Param, *p.v))
	}
	kinds := KnownKinds()
	for _, s := range d.Stages {
		prefix := "stage." + s.Name + "."
		out = append(out, Field{Path: prefix + "kind", Label: s.Name + ": kind", Kind: Choice,
			Choices: kinds, Raw: s.Kind, Set: true, Help: "stage template"})
		t, ok := TemplateFor(s.Kind)
		if !ok {
			continue
		}
		for _, p := range t.Params() {
			if p.Kind == Pair {
				for _, side := range []string{"low", "high"} {
					q := p
					q.Kind, q.Label = Quantity, p.Label+" ("+side+")"
					q.Default = ""
					out = append(out, fieldOf(prefix+p.Key+"."+side, q, s.Values[p.Key+"."+side]))
					out[len(out)-1].Label = s.Name + ": " + q.Label
				}
				continue
			}
			f := fieldOf(prefix+p.Key, p, s.Values[p.Key])
			f.Label = s.Name + ": " + p.Label
			out = append(out, f)
		}
	}
	return append(out, d.limitFields()...)
}

func fieldOf(path string, p Param, v Value) Field {
	return Field{Path: path, Label: p.Label, Kind: p.Kind, Dim: p.Dim, Choices: p.Choices,
		Raw: v.Raw, Set: v.Set, Default: p.Default, Help: p.Help}
}

// Set parses raw as the input at path (see Field.Path) and stores it. An
// empty raw clears the input so its default applies. On error the old value
// stays in force and the error (naming the field, the bad text and what was
// wanted) is returned for inline display.
func (d *Design) Set(path, raw string) error {
	raw = strings.TrimSpace(raw)
	if key, ok := strings.CutPrefix(path, "choose.limit."); ok {
		return d.setLimit(key, raw)
	}
	for _, p := range d.designParams() {
		if p.Key == path {
			v, err := parseParam(p.Param, raw)
			if err != nil {
				return &Error{Field: path, Err: err}
			}
			*p.v = v
			return nil
		}
	}
	rest, ok := strings.CutPrefix(path, "stage.")
	if !ok {
		return fmt.Errorf("no field %q", path)
	}
	var s *Stage
	for _, c := range d.Stages {
		if r, ok := strings.CutPrefix(rest, c.Name+"."); ok && (s == nil || len(c.Name) > len(s.Name)) {
			s, path = c, r
		}
	}
	if s == nil {
		return fmt.Errorf("no stage in field path %q", "stage."+rest)
	}
	if path == "kind" {
		if _, ok := TemplateFor(raw); !ok {
			return &Error{Stage: s.Name, Field: "kind", Err: unknownKind(raw)}
		}
		s.Kind = raw
		return nil
	}
	t, ok := TemplateFor(s.Kind)
	if !ok {
		return &Error{Stage: s.Name, Err: unknownKind(s.Kind)}
	}
	p, key, ok := stageParam(t, path)
	if !ok {
		return &Error{Stage: s.Name, Err: fmt.Errorf("no field %q for kind %q", path, s.Kind)}
	}
	v, err := parseParam(p, raw)
	if err != nil {
		return &Error{Stage: s.Name, Field: path, Err: err}
	}
	if s.Values == nil {
		s.Values = map[string]Value{}
	}
	if v.Set {
		s.Values[key] = v
	} else {
		delete(s.Values, key)
	}
	return nil
}

// stageParam finds the param of t a stage field path names; for a Pair the
// path is Key+".low" or Key+".high" and the param comes back as a Quantity.
func stageParam(t Template, path string) (Param, string, bool) {
	for _, p := range t.Params() {
		if p.Kind == Pair {
			if path == p.Key+".low" || path == p.Key+".high" {
				q := p
				q.Kind = Quantity
				return q, path, true
			}
			continue
		}
		if p.Key == path {
			return p, path, true
		}
	}
	return Param{}, "", false
}

// parseParam reads raw text as a value of p. Empty text is "not given".
func parseParam(p Param, raw string) (Value, error) {
	if raw == "" {
		if p.Required {
			return Value{}, fmt.Errorf("is required, want %s", wantOf(p))
		}
		return Value{}, nil
	}
	switch p.Kind {
	case Choice:
		if c, ok := choiceOf(p.Choices, raw); ok {
			return Value{Raw: c, Set: true}, nil
		}
		return Value{}, choiceError(p.Choices, raw)
	case List:
		v := Value{Raw: raw, Set: true}
		items := v.List()
		if p.Choices != nil {
			for i, it := range items {
				c, ok := choiceOf(p.Choices, it)
				if !ok {
					return Value{}, choiceError(p.Choices, it)
				}
				items[i] = c
			}
		}
		v.Raw = strings.Join(items, ", ")
		return v, nil
	}
	x, err := catalog.Parse(raw, p.Dim)
	if err != nil {
		return Value{}, err
	}
	return Value{Raw: raw, V: x, Set: true}, nil
}

// choiceOf finds raw among choices the way names are matched everywhere
// (catalog.PackageKey: case and separators do not count) and returns the
// choice as spelled in the list.
func choiceOf(choices []string, raw string) (string, bool) {
	k := catalog.PackageKey(raw)
	for _, c := range choices {
		if catalog.PackageKey(c) == k {
			return c, true
		}
	}
	return "", false
}

// choiceError says a word is not one of the choices, with a did-you-mean.
func choiceError(choices []string, raw string) error {
	if s := nearest(catalog.PackageKey(raw), choices); s != "" {
		return fmt.Errorf("%q is not one of %s (did you mean %q?)", raw, strings.Join(choices, ", "), s)
	}
	return fmt.Errorf("%q is not one of %s", raw, strings.Join(choices, ", "))
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
