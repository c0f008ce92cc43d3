package filter

import (
	"fmt"
	"math"

	"github.com/opsift/opsift/catalog"
)

// railSplitterTemplate is a virtual-ground buffer on a single supply: a
// divider sets ref on the non-inverting input, the op-amp holds its output
// (the board's mid-rail) there and sinks or sources the return currents of
// the circuits referred to it.
//
// Inputs (SI; defaults in brackets):
//
//	ref             V  the mid-rail voltage [mid of the nominal rails]
//	i_source        A  largest return current the output sources [0]
//	i_sink          A  largest return current the output sinks [0]
//	                   (at least one of the two is required)
//	cload           F  capacitance on the output (decoupling) [no check]
//	iso_r           Ω  isolation resistor between the output and cload, feedback
//	                   taken at the load side [none]
//	supply_current  A  allowed supply current of this channel [no check]
//	source_r        Ω  Thevenin resistance of the divider [none]
//	dc_error        V  allowed mid-rail error [no check]
//
// Requirements:
//
//	input_range     the point ref
//	output_range    ref − i_sink·iso_r … ref + i_source·iso_r (the output moves
//	                by the drop across iso_r; the point ref without one)
//	output_current  max(i_source, i_sink)
//	cload           the part's cload ≥ the capacitance; with iso_r the capacitance
//	                sits behind the resistor and the check passes, saying so
//	supply_current  Iq (this channel) + i_source ≤ allowed: the sourced current
//	                comes from the supply through the op-amp
//	dc_error        Vos + Ib·source_r ≤ allowed
type railSplitterTemplate struct{}

func init() { register(railSplitterTemplate{}) }

func (railSplitterTemplate) Kind() string { return "rail_splitter" }
func (railSplitterTemplate) Summary() string {
	return "virtual-ground buffer holding a mid-rail on a single supply"
}

func (railSplitterTemplate) Params() []Param {
	q := func(key, label string, dim catalog.Dim, help string) Param {
		return Param{Key: key, Label: label, Kind: Quantity, Dim: dim, Help: help}
	}
	return []Param{
		q("ref", "mid-rail", catalog.Volt, "the mid-rail voltage the divider sets; default: mid of nominal rails"),
		q("i_source", "source current", catalog.Ampere, "largest return current the output must source"),
		q("i_sink", "sink current", catalog.Ampere, "largest return current the output must sink"),
		q("cload", "output capacitance", catalog.Farad, "capacitance on the output (mid-rail decoupling)"),
		q("iso_r", "isolation resistor", catalog.Ohm, "resistor between the output and the capacitance, feedback taken at the load side"),
		q("supply_current", "supply current budget", catalog.Ampere, "allowed supply current of this channel, Iq + source current"),
		q("source_r", "divider resistance", catalog.Ohm, "Thevenin resistance of the divider at the non-inverting input"),
		q("dc_error", "allowed mid-rail error", catalog.Volt, "allowed mid-rail error, Vos + Ib·source_r; no check when not given"),
	}
}

// noteIsolated is the note of a rail splitter's relaxed cload check.
const noteIsolated = "isolation resistor given: the capacitance sits behind iso_r, so the part's cload rating does not limit; confirm the loop with the part's data"

func (railSplitterTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	sp := StagePlan{NoiseGain: 1}
	if err := tmplOptionalPositive(in, "i_source", "i_sink", "cload", "iso_r", "supply_current", "source_r", "dc_error"); err != nil {
		return sp, err
	}
	isrc, okSrc := in.Num("i_source")
	isnk, okSnk := in.Num("i_sink")
	if !okSrc && !okSnk {
		return sp, fieldErrorf("i_source", "missing, want the return current to source and/or sink (i_source, i_sink) such as \"5 mA\"")
	}
	ref := tmplRef(in, p)
	sp.Ref = ref
	if !(p.Rails.Neg < ref && ref < p.Rails.Pos) {
		return sp, fieldErrorf("ref", "%s is not between the rails %s and %s, want a mid-rail inside the supply",
			catalog.Format(ref, catalog.Volt), catalog.Format(p.Rails.Neg, catalog.Volt), catalog.Format(p.Rails.Pos, catalog.Volt))
	}
	iso, hasIso := in.Num("iso_r")
	sp.SourceR, _ = in.Num("source_r")
	sp.Vo = 0
	V := func(x float64) string { return catalog.Format(x, catalog.Volt) }
	A := func(x float64) string { return catalog.Format(x, catalog.Ampere) }
	add := func(r Requirement) { sp.Requirements = append(sp.Requirements, r) }

	add(Requirement{Key: KeyInputRange, Bound: BoundRange, Low: ref, High: ref, Dim: catalog.Volt,
		Why: fmt.Sprintf("the non-inverting input sits at the mid-rail %s", V(ref))})
	if hasIso {
		add(Requirement{Key: KeyOutputRange, Bound: BoundRange, Low: ref - isnk*iso, High: ref + isrc*iso, Dim: catalog.Volt,
			Why: fmt.Sprintf("ref − i_sink·iso_r … ref + i_source·iso_r = %s − %s·%s … %s + %s·%s",
				V(ref), A(isnk), catalog.Format(iso, catalog.Ohm), V(ref), A(isrc), catalog.Format(iso, catalog.Ohm))})
	} else {
		add(Requirement{Key: KeyOutputRange, Bound: BoundRange, Low: ref, High: ref, Dim: catalog.Volt,
			Why: fmt.Sprintf("the output holds the mid-rail %s", V(ref))})
	}
	add(Requirement{Key: KeyOutputCurrent, Bound: BoundMin, Value: math.Max(isrc, isnk), Dim: catalog.Ampere,
		Why: fmt.Sprintf("max(i_source, i_sink) = max(%s, %s)", A(isrc), A(isnk))})
	if c, ok := in.Num("cload"); ok {
		r := Requirement{Key: KeyCLoad, Bound: BoundMin, Value: c, Dim: catalog.Farad,
			Why: "stable with the mid-rail capacitance " + catalog.Format(c, catalog.Farad) + " on its output"}
		if hasIso {
			r.Why = fmt.Sprintf("relaxed: %s sits behind iso_r = %s, so the part's cload rating does not limit (confirm the loop with the part's data)",
				catalog.Format(c, catalog.Farad), catalog.Format(iso, catalog.Ohm))
			r.Measure = measureIsolated
		}
		add(r)
	}
	if b, ok := in.Num("supply_current"); ok {
		add(Requirement{Key: KeySupplyCurrent, Bound: BoundMax, Value: b, Dim: catalog.Ampere,
			Measure: func(_ *catalog.Part, f *PartFigures) Figure {
				fig := f.Iq
				fig.V += isrc
				return fig
			},
			Why: fmt.Sprintf("Iq + i_source ≤ %s with i_source = %s (the sourced current flows from the supply through the part)", A(b), A(isrc))})
	}
	if v, ok := in.Num("dc_error"); ok {
		add(Requirement{Key: KeyDCError, Bound: BoundMax, Value: v, Dim: catalog.Volt,
			Why: fmt.Sprintf("mid-rail error Vos + Ib·Rs + Ios·Rs/2 ≤ %s with Rs = %s", V(v), catalog.Format(sp.SourceR, catalog.Ohm))})
	}
	return sp, nil
}

// measureIsolated passes a cload check whose capacitance sits behind an
// isolation resistor: the margin is unbounded and the note says why.
func measureIsolated(_ *catalog.Part, _ *PartFigures) Figure {
	return Figure{V: math.Inf(1), Known: true, Basis: BasisGuaranteed, Note: noteIsolated}
}
