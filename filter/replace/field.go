package replace

import (
	"fmt"
	"math"

	"github.com/opsift/opsift/catalog"
)

// Verdict is how a candidate's figure compares with the original's.
type Verdict string

// The verdicts a field may have. Unknown means one side (or both) does not
// give the figure.
const (
	Better  Verdict = "better"
	Same    Verdict = "same"
	Worse   Verdict = "worse"
	Unknown Verdict = "unknown"
)

// Direction says which way a figure is better.
type Direction string

// The directions a figure may be better in.
const (
	Higher Direction = "higher"
	Lower  Direction = "lower"
)

// Basis says what kind of datasheet figure a value is.
type Basis string

// The bases a value may have: a guaranteed limit (or a rating), a typical
// figure from a table, or a typical figure read off a graph.
const (
	Guaranteed Basis = "guaranteed"
	Typical    Basis = "typical"
	Graph      Basis = "graph"
)

// Limit names which figure of a catalog entry a Value was taken from, in
// the catalog's own key spelling.
type Limit string

// The limits a Value may come from. LimitRating is a single-valued rating
// (supply span end, temperature end, vdiff_max, cload, common-mode or
// swing limit).
const (
	LimitMin    Limit = "min"
	LimitMax    Limit = "max"
	LimitMinOT  Limit = "min_ot"
	LimitMaxOT  Limit = "max_ot"
	LimitTyp    Limit = "typ"
	LimitRating Limit = "rating"
)

// Value is one side of a Field: the figure compared, in SI units of the
// field's Dim, with where it came from. Set is false when the part does not
// give the figure.
type Value struct {
	V     float64
	Set   bool
	Basis Basis
	Limit Limit
}

// Field is the comparison of one figure between the original and a
// candidate.
type Field struct {
	Key       string      // "slew", "supply_max", …
	Label     string      // "slew rate", for people
	Dim       catalog.Dim // dimension of both values
	Better    Direction   // which way the figure is better
	Original  Value
	Candidate Value
	Verdict   Verdict
	// Note says what to keep in mind when reading the verdict: values on
	// different bases, output swing specified at different loads.
	Note string

	index int // position in fieldDefs
}

// Unit is the SI unit symbol of the field's values ("V", "V/s", "°C", "dB").
func (f Field) Unit() string { return f.Dim.Unit() }

// Format renders one side of the field for people: engineering notation,
// common-mode and swing limits relative to their rail ("V+ − 1.5 V"), "—"
// when the figure is not given.
func (f Field) Format(v Value) string {
	if !v.Set {
		return "—"
	}
	switch f.Key {
	case "input_cm_low", "output_low":
		return railText("V−", v.V)
	case "input_cm_high", "output_high":
		return railText("V+", v.V)
	}
	return catalog.Format(v.V, f.Dim)
}

// railText writes an offset from a rail: "V− + 0.1 V", "V+ − 1.5 V".
func railText(rail string, off float64) string {
	if off < 0 {
		return rail + " − " + catalog.Format(-off, catalog.Volt)
	}
	return rail + " + " + catalog.Format(off, catalog.Volt)
}

// tolKind selects the "same" tolerance of a field (see tuning.go).
type tolKind int

const (
	tolRel  tolKind = iota // relative, relTol
	tolVolt                // relative with an absolute floor of voltTol
	tolTemp                // absolute, tempTol
	tolDB                  // absolute, dBTol
)

// figures is what a part gives for one field, by level of assurance: the
// over-temperature limit, the 25 °C guaranteed limit (or rating), the
// typical figure.
type figures struct {
	ot, g, typ catalog.Opt
	otLimit    Limit
	gLimit     Limit
	src        catalog.Source
}

// def describes one compared field.
type def struct {
	key, label string
	dim        catalog.Dim
	better     Direction
	tol        tolKind
	magnitude  bool // compare |value|: offsets and bias currents may be signed
	get        func(p *catalog.Part) figures
}

// spec extracts the limit that matters for the direction: the minimum when
// higher is better, the maximum when lower is better.
func spec(dir Direction, s func(p *catalog.Part) catalog.Spec) func(p *catalog.Part) figures {
	return func(p *catalog.Part) figures {
		sp := s(p)
		if dir == Higher {
			return figures{ot: sp.MinOT, g: sp.Min, typ: sp.Typ, otLimit: LimitMinOT, gLimit: LimitMin, src: sp.Source}
		}
		return figures{ot: sp.MaxOT, g: sp.Max, typ: sp.Typ, otLimit: LimitMaxOT, gLimit: LimitMax, src: sp.Source}
	}
}

// rating extracts a single-valued rating, which counts as guaranteed.
func rating(o func(p *catalog.Part) catalog.Opt) func(p *catalog.Part) figures {
	return func(p *catalog.Part) figures { return figures{g: o(p), gLimit: LimitRating} }
}

// headroom extracts a common-mode or swing limit: guaranteed when read from
// a table, typical when from a graph or an estimate.
func headroom(o func(p *catalog.Part) (catalog.Opt, catalog.Source)) func(p *catalog.Part) figures {
	return func(p *catalog.Part) figures {
		v, src := o(p)
		if src == "" || src == catalog.SourceTable {
			return figures{g: v, gLimit: LimitRating, src: src}
		}
		return figures{typ: v, src: src}
	}
}

// fieldDefs lists the compared fields in the order they are shown. It is a
// read-only table: nothing writes to it after initialisation.
var fieldDefs = [...]def{
	{"supply_min", "minimum supply", catalog.Volt, Lower, tolRel, false, rating(func(p *catalog.Part) catalog.Opt { return p.Supply.Min })},
	{"supply_max", "maximum supply", catalog.Volt, Higher, tolRel, false, rating(func(p *catalog.Part) catalog.Opt { return p.Supply.Max })},
	{"input_cm_low", "input range at V−", catalog.Volt, Lower, tolVolt, false, headroom(func(p *catalog.Part) (catalog.Opt, catalog.Source) { return p.InputCM.Low, p.InputCM.Source })},
	{"input_cm_high", "input range at V+", catalog.Volt, Higher, tolVolt, false, headroom(func(p *catalog.Part) (catalog.Opt, catalog.Source) { return p.InputCM.High, p.InputCM.Source })},
	{"output_low", "output swing at V−", catalog.Volt, Lower, tolVolt, false, headroom(func(p *catalog.Part) (catalog.Opt, catalog.Source) { return p.Output.Low, p.Output.Source })},
	{"output_high", "output swing at V+", catalog.Volt, Higher, tolVolt, false, headroom(func(p *catalog.Part) (catalog.Opt, catalog.Source) { return p.Output.High, p.Output.Source })},
	{"gbw", "gain-bandwidth", catalog.Hertz, Higher, tolRel, false, spec(Higher, func(p *catalog.Part) catalog.Spec { return p.GBW })},
	{"slew", "slew rate", catalog.VoltPerSecond, Higher, tolRel, false, spec(Higher, func(p *catalog.Part) catalog.Spec { return p.Slew })},
	{"aol", "open-loop gain", catalog.Decibel, Higher, tolDB, false, spec(Higher, func(p *catalog.Part) catalog.Spec { return p.Aol })},
	{"vos", "offset voltage", catalog.Volt, Lower, tolRel, true, spec(Lower, func(p *catalog.Part) catalog.Spec { return p.Vos })},
	{"vos_drift", "offset drift", catalog.VoltPerKelvin, Lower, tolRel, true, spec(Lower, func(p *catalog.Part) catalog.Spec { return p.VosDrift })},
	{"ib", "input bias current", catalog.Ampere, Lower, tolRel, true, spec(Lower, func(p *catalog.Part) catalog.Spec { return p.Ib })},
	{"ios", "input offset current", catalog.Ampere, Lower, tolRel, true, spec(Lower, func(p *catalog.Part) catalog.Spec { return p.Ios })},
	{"en", "voltage noise", catalog.VoltNoise, Lower, tolRel, false, spec(Lower, func(p *catalog.Part) catalog.Spec { return p.En })},
	{"in", "current noise", catalog.CurrentNoise, Lower, tolRel, false, spec(Lower, func(p *catalog.Part) catalog.Spec { return p.In })},
	{"en_corner", "voltage noise 1/f corner", catalog.Hertz, Lower, tolRel, false, rating(func(p *catalog.Part) catalog.Opt { return p.EnCorner })},
	{"in_corner", "current noise 1/f corner", catalog.Hertz, Lower, tolRel, false, rating(func(p *catalog.Part) catalog.Opt { return p.InCorner })},
	{"iq", "quiescent current", catalog.Ampere, Lower, tolRel, false, spec(Lower, func(p *catalog.Part) catalog.Spec { return p.Iq })},
	{"iout", "output current", catalog.Ampere, Higher, tolRel, false, spec(Higher, func(p *catalog.Part) catalog.Spec { return p.Iout })},
	{"temp_low", "lowest rated temperature", catalog.Celsius, Lower, tolTemp, false, rating(func(p *catalog.Part) catalog.Opt { return p.Temp[0] })},
	{"temp_high", "highest rated temperature", catalog.Celsius, Higher, tolTemp, false, rating(func(p *catalog.Part) catalog.Opt { return p.Temp[1] })},
	{"vdiff_max", "largest differential input", catalog.Volt, Higher, tolRel, false, rating(func(p *catalog.Part) catalog.Opt { return p.VdiffMax })},
	{"cload", "largest capacitive load", catalog.Farad, Higher, tolRel, false, rating(func(p *catalog.Part) catalog.Opt { return p.CLoad })},
}

// level is one level of assurance of a figure, best first.
type level struct {
	v     catalog.Opt
	limit Limit
	basis Basis
}

// levels lists what a part gives for a field, best assurance first; the
// over-temperature limit only when overTemp asks for it.
func (f figures) levels(overTemp bool) [3]level {
	typBasis := Typical
	if f.src == catalog.SourceGraph {
		typBasis = Graph
	}
	var ot catalog.Opt
	if overTemp {
		ot = f.ot
	}
	return [3]level{
		{ot, f.otLimit, Guaranteed},
		{f.g, f.gLimit, Guaranteed},
		{f.typ, LimitTyp, typBasis},
	}
}

// pickPair chooses the figure of each side to compare. Where both sides
// give a figure at the same level (over-temperature limit, guaranteed
// limit, typical) the best such shared level is used, so like is compared
// with like; otherwise each side gives its best-assured figure and the
// field carries a note that the bases differ.
func pickPair(o, c figures, overTemp bool) (ov, cv Value) {
	ol, cl := o.levels(overTemp), c.levels(overTemp)
	for i := range ol {
		if ol[i].v.Known() && cl[i].v.Known() {
			return ol[i].value(), cl[i].value()
		}
	}
	return best(ol), best(cl)
}

// value is the level as a set Value.
func (l level) value() Value {
	return Value{V: l.v.V(), Set: true, Basis: l.basis, Limit: l.limit}
}

// best returns the best-assured level that is set, or an unset Value.
func best(ls [3]level) Value {
	for _, l := range ls {
		if l.v.Known() {
			return l.value()
		}
	}
	return Value{}
}

// same reports whether a and b are equal within the field's tolerance.
func (d def) same(a, b float64) bool {
	diff := math.Abs(a - b)
	switch d.tol {
	case tolTemp:
		return diff <= tempTol
	case tolDB:
		return diff <= dBTol
	case tolVolt:
		if diff <= voltTol {
			return true
		}
	}
	return diff <= relTol*math.Max(math.Abs(a), math.Abs(b))
}

// verdict compares two values of the field.
func (d def) verdict(ov, cv Value) Verdict {
	if !ov.Set || !cv.Set {
		return Unknown
	}
	a, b := ov.V, cv.V
	if d.magnitude {
		a, b = math.Abs(a), math.Abs(b)
	}
	switch {
	case d.same(a, b):
		return Same
	case (d.better == Higher) == (b > a):
		return Better
	default:
		return Worse
	}
}

// Compare returns the field-by-field comparison of candidate c against
// original o, in the order of Keys. overTemp prefers the over-temperature
// limits (min_ot, max_ot) where both parts give them.
func Compare(o, c *catalog.Part, overTemp bool) []Field {
	out := make([]Field, len(fieldDefs))
	for i := range fieldDefs {
		d := &fieldDefs[i]
		ov, cv := pickPair(d.get(o), d.get(c), overTemp)
		f := Field{
			index: i,
			Key:   d.key, Label: d.label, Dim: d.dim, Better: d.better,
			Original: ov, Candidate: cv, Verdict: d.verdict(ov, cv),
		}
		f.Note = note(f, o, c)
		out[i] = f
	}
	return out
}

// note says what qualifies a field's verdict, or "".
func note(f Field, o, c *catalog.Part) string {
	if f.Verdict == Unknown {
		return ""
	}
	if f.Key == "output_low" || f.Key == "output_high" {
		ol, cl := o.Output.Load, c.Output.Load
		if ol.Known() && cl.Known() && !(def{tol: tolRel}).same(ol.V(), cl.V()) {
			n := fmt.Sprintf("swing specified at %s against %s", catalog.Format(cl.V(), catalog.Ohm), catalog.Format(ol.V(), catalog.Ohm))
			if cl.V() > ol.V() && f.Verdict == Better {
				n += "; the lighter load flatters the candidate"
			}
			return n
		}
	}
	if f.Original.Basis != f.Candidate.Basis {
		return fmt.Sprintf("compares a %s figure with a %s one", f.Candidate.Basis, f.Original.Basis)
	}
	return ""
}
