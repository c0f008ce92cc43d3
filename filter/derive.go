package filter

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// Derive checks the design's inputs and derives every requirement: the
// design-level ones (supply span, temperature, hard filters, supply current
// budget) and each stage's through its template. Errors name the design
// file, the line where known, the stage and the field.
func Derive(d *Design) (*Plan, error) {
	p := &Plan{Design: d, Title: d.Title, sims: &simMemo{}}
	if err := p.deriveSupply(d); err != nil {
		return nil, err
	}
	if err := p.deriveEnvironment(d); err != nil {
		return nil, err
	}
	if err := p.deriveFilters(d); err != nil {
		return nil, err
	}
	if err := p.deriveLimits(d); err != nil {
		return nil, err
	}
	seen := map[string]bool{}
	for _, s := range d.Stages {
		if seen[s.Name] {
			return nil, &Error{File: d.file(), Line: s.Line, Stage: s.Name, Err: errors.New("duplicate stage name")}
		}
		seen[s.Name] = true
		t, ok := TemplateFor(s.Kind)
		if !ok {
			return nil, &Error{File: d.file(), Line: s.Line, Stage: s.Name, Field: "kind", Err: unknownKind(s.Kind)}
		}
		sp, err := t.Derive(NewStageInput(s, t), p)
		if err != nil {
			return nil, inStage(d.file(), s, err)
		}
		// Templates with a narrower rule for ref (rail splitter, astable)
		// have reported it above; this catches a ref off the supply in any.
		if v, ok := s.Values["ref"]; ok && v.Set && (v.V < p.Rails.Neg || v.V > p.Rails.Pos) {
			return nil, &Error{File: d.file(), Line: cmp.Or(v.Line, s.Line), Stage: s.Name, Field: "ref",
				Err: fmt.Errorf("%s is outside the rails %s … %s, want a reference inside the supply",
					catalog.Format(v.V, catalog.Volt), catalog.Format(p.Rails.Neg, catalog.Volt), catalog.Format(p.Rails.Pos, catalog.Volt))}
		}
		sp.Stage, sp.Name, sp.Kind = s, s.Name, s.Kind
		for i := range sp.Requirements {
			sp.Requirements[i].Stage = s.Name
			sp.Requirements[i].Unit = sp.Requirements[i].Dim.Unit()
		}
		p.Stages = append(p.Stages, sp)
	}
	if len(p.Stages) == 0 {
		return nil, &Error{File: d.file(), Err: errors.New("no [[stage]]: a design needs at least one stage")}
	}
	p.Warnings = p.designWarnings(d)
	if b := d.Choose.SupplyCurrent; b.Set {
		p.Global = append(p.Global, Requirement{Key: KeySupplyCurrent, Bound: BoundMax, Value: b.V,
			Dim: catalog.Ampere, Unit: "A",
			Why: fmt.Sprintf("packages × channels × Iq ≤ %s (every channel of a package draws Iq, used or not; %d stage(s))",
				catalog.Format(b.V, catalog.Ampere), len(p.Stages))})
	}
	return p, nil
}

// file names the design in errors.
func (d *Design) file() string {
	if d.Name == "" {
		return "design"
	}
	return d.Name
}

// errAt is an error about a design-level field, on line (0: not known).
func (d *Design) errAt(line int, field, format string, a ...any) error {
	return &Error{File: d.file(), Line: line, Field: field, Err: fmt.Errorf(format, a...)}
}

func (p *Plan) deriveSupply(d *Design) error {
	s := d.Supply
	if !s.Pos.Set {
		return d.errAt(0, "supply.pos", "missing, want a voltage such as \"3.3 V\"")
	}
	neg := 0.0
	if s.Neg.Set {
		neg = s.Neg.V
	}
	if s.Pos.V <= neg {
		return d.errAt(s.Pos.Line, "supply.pos", "%q is not above supply.neg (%s), want V+ > V−",
			s.Pos.Raw, catalog.Format(neg, catalog.Volt))
	}
	tol := 0.0
	if s.Tolerance.Set {
		tol = s.Tolerance.V
	}
	if tol < 0 || tol >= 0.5 {
		return d.errAt(s.Tolerance.Line, "supply.tolerance", "%q is out of range, want a ratio from 0 %% to 50 %% such as \"5 %%\"", s.Tolerance.Raw)
	}
	r := Rails{Pos: s.Pos.V, Neg: neg, Tol: tol, Span: s.Pos.V - neg}
	r.PosWorst, r.NegWorst = RailsInward(s.Pos.V, neg, tol)
	posOut, negOut := RailsOutward(s.Pos.V, neg, tol)
	r.SpanMin, r.SpanMax = r.PosWorst-r.NegWorst, posOut-negOut
	p.Rails = r
	V := func(x float64) string {
		if x < 0 {
			return "(" + catalog.Format(x, catalog.Volt) + ")"
		}
		return catalog.Format(x, catalog.Volt)
	}
	why := fmt.Sprintf("rails inward %s − %s = %s … outward %s − %s = %s (each rail ∓ %s of itself)",
		V(r.PosWorst), V(r.NegWorst), V(r.SpanMin), V(posOut), V(negOut), V(r.SpanMax),
		catalog.Format(tol, catalog.Ratio))
	p.Global = append(p.Global, Requirement{Key: KeySupply, Bound: BoundRange, Low: r.SpanMin, High: r.SpanMax,
		Dim: catalog.Volt, Unit: "V", Why: why})
	return nil
}

func (p *Plan) deriveEnvironment(d *Design) error {
	p.TempLow, p.TempHigh = RoomTemp, RoomTemp
	if d.Temp[0].Set {
		p.TempLow = d.Temp[0].V
	}
	if d.Temp[1].Set {
		p.TempHigh = d.Temp[1].V
	}
	if p.TempLow > p.TempHigh {
		return d.errAt(d.Temp[0].Line, "environment.temp", "low %s is above high %s, want [low, high]",
			catalog.Format(p.TempLow, catalog.Celsius), catalog.Format(p.TempHigh, catalog.Celsius))
	}
	if p.TempLow < -273.15 {
		return d.errAt(d.Temp[0].Line, "environment.temp", "%q is below absolute zero", d.Temp[0].Raw)
	}
	p.Global = append(p.Global, Requirement{Key: KeyTemperature, Bound: BoundHard, Low: p.TempLow, High: p.TempHigh,
		Dim: catalog.Celsius, Unit: "°C",
		Why: fmt.Sprintf("rated range covers %s … %s", catalog.Format(p.TempLow, catalog.Celsius), catalog.Format(p.TempHigh, catalog.Celsius))})
	p.DerateTyp, p.InflateTyp = DefaultDerateTyp, DefaultInflateTyp
	if v := d.Policy.DerateTyp; v.Set {
		if v.V <= 0 || v.V > 1 {
			return d.errAt(v.Line, "policy.derate_typ", "%q is out of range, want a factor in (0, 1] such as \"0.7\"", v.Raw)
		}
		p.DerateTyp = v.V
	}
	if v := d.Policy.InflateTyp; v.Set {
		if v.V < 1 {
			return d.errAt(v.Line, "policy.inflate_typ", "%q is out of range, want a factor ≥ 1 such as \"2\"", v.Raw)
		}
		p.InflateTyp = v.V
	}
	p.SpeedTempco, p.IbColdTempco = DefaultSpeedTempco, DefaultIbColdTempco
	if v := d.Policy.SpeedTempco; v.Set {
		if v.V < 0 || v.V > 0.01 {
			return d.errAt(v.Line, "policy.speed_tempco", "%q is out of range, want a fraction per kelvin from 0 to 0.01 such as \"0.002\"", v.Raw)
		}
		p.SpeedTempco = v.V
	}
	if v := d.Policy.IbColdTempco; v.Set {
		if v.V < 0 || v.V > 0.1 {
			return d.errAt(v.Line, "policy.ib_cold_tempco", "%q is out of range, want a fraction per kelvin from 0 to 0.1 such as \"0.0125\"", v.Raw)
		}
		p.IbColdTempco = v.V
	}
	return nil
}

func (p *Plan) deriveFilters(d *Design) error {
	c := d.Choose
	if v := c.MaxUnitCost; v.Set && (v.V < 0 || v.V > MaxUnitCost) {
		return d.errAt(v.Line, "choose.max_unit_cost", "%q is out of range, want a budget from 0 to %g", v.Raw, float64(MaxUnitCost))
	}
	life := c.Lifecycle.List()
	why := "lifecycle is one of " + strings.Join(life, ", ")
	if len(life) == 0 {
		life = []string{string(catalog.LifecycleActive), string(catalog.LifecycleNRND)}
		why = "lifecycle is not obsolete (default)"
	}
	p.Global = append(p.Global, Requirement{Key: KeyLifecycle, Bound: BoundHard, Allowed: life, Why: why})
	if l := c.Packages.List(); len(l) > 0 {
		p.Global = append(p.Global, Requirement{Key: KeyPackage, Bound: BoundHard, Allowed: l,
			Why: "comes in any of " + strings.Join(l, ", ")})
	}
	if l := c.Tech.List(); len(l) > 0 {
		p.Global = append(p.Global, Requirement{Key: KeyTech, Bound: BoundHard, Allowed: l,
			Why: "input technology is any of " + strings.Join(l, ", ")})
	}
	if v := c.MaxUnitCost; v.Set {
		p.Global = append(p.Global, Requirement{Key: KeyCost, Bound: BoundHard, Value: v.V,
			Why: "unit cost ≤ " + catalog.Format(v.V, catalog.Dimensionless)})
	}
	return nil
}

// MaxUnitCost is the largest choose.max_unit_cost accepted, the same as
// the largest unit_cost a catalog part may give.
const MaxUnitCost = 1e6

// RailsInward returns the rails at their tolerance extreme for headroom
// checks: each moves by tol × its own magnitude toward the other rail, so
// the span between them shrinks. With 0 V between the rails (a bipolar or a
// single supply) that is "toward 0 V", the wording of DESIGN.md; with both
// rails on one side of 0 V the rail nearer 0 moves away from it (V+ 12 V,
// V− 2 V, 10 %: 10.8 V and 2.2 V), because moving it toward 0 V would widen
// the headroom the check is meant to take away.
func RailsInward(pos, neg, tol float64) (posWorst, negWorst float64) {
	return pos - tol*math.Abs(pos), neg + tol*math.Abs(neg)
}

// RailsOutward returns the rails at the other tolerance extreme: each moves
// by tol × its own magnitude away from the other rail, so the span between
// them is the largest the part must stand (V+ 12 V, V− 2 V, 10 %: 13.2 V
// and 1.8 V, span 11.4 V). With 0 V between the rails both spans are the
// nominal span × (1 ∓ tol); with both rails on one side of 0 V they are not
// (the same rails give 8.6 … 11.4 V, not 9 … 11 V).
func RailsOutward(pos, neg, tol float64) (posHigh, negLow float64) {
	return pos + tol*math.Abs(pos), neg - tol*math.Abs(neg)
}
