package filter

import (
	"fmt"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

func init() { register(sallenKeyTemplate{}) }

// sallenKeyTemplate is the unity-gain second-order Sallen–Key low-pass:
// input ─R1─┬─R2─┬─ non-inverting input, output tied to the inverting
// input; C1 (feedback) from the R1–R2 junction to the output, C2 from the
// non-inverting input to ref.
//
// Inputs (SI; defaults in brackets): either the components
//
//	r1, r2, c1, c2  Ω, F  (all four; C1 is the feedback capacitor)
//
// or the response directly
//
//	f0  Hz  natural frequency;  q  quality factor
//
// and
//
//	ref          V    the node the signal is centred on [mid of the nominal rails]
//	signal.peak  V    largest input amplitude around ref, at any frequency (required)
//	gbw_factor   —    k of the rule gbw ≥ k·Q·f0 [100]
//	load_r       Ω    resistive load at the output, to ref [none]
//	cload        F    capacitive load at the output [no check]
//	source_r     Ω    resistance of the source driving R1 [none]
//	dc_error     V    allowed output DC error [no check]
//
// With components, f0 = 1/(2π·√(R1R2C1C2)) and Q = √(R1R2C1C2)/(C2·(R1 + R2))
// (Sallen & Key, 1955; from memory). Peak = Q/√(1 − 1/(4Q²)) for Q > 1/√2,
// else 1, is the largest gain of the response.
//
// Requirements:
//
//	input_range, output_range  ref ± Vp·peak (a follower: the inputs follow the output)
//	slew            2π·f0·Q·Vp: the largest 2π·f·|H(f)|·Vp over all f, reached at f0
//	gbw             k·Q·f0 (rule of thumb, common practice)
//	output_current  Vp·peak/R1 (the most C1 carries, reached at high frequency,
//	                where C1 couples the input through R1 to the output; only with
//	                components) + Vp·peak/load_r
//	cload           the stated load capacitance
//	dc_error        Vos + Ib·(source_r + R1 + R2) ≤ allowed
type sallenKeyTemplate struct{}

func (sallenKeyTemplate) Kind() string { return "sallen_key_lowpass" }
func (sallenKeyTemplate) Summary() string {
	return "unity-gain second-order Sallen–Key low-pass (R1, R2, C1, C2 or f0, Q)"
}

func (sallenKeyTemplate) Params() []Param {
	q := func(key, label string, dim catalog.Dim, help string) Param {
		return Param{Key: key, Label: label, Kind: Quantity, Dim: dim, Help: help}
	}
	return []Param{
		q("r1", "R1", catalog.Ohm, "input resistor R1 (give r1, r2, c1, c2, or f0 and q)"),
		q("r2", "R2", catalog.Ohm, "resistor R2 to the non-inverting input"),
		q("c1", "C1 (feedback)", catalog.Farad, "feedback capacitor C1 from the R1–R2 junction to the output"),
		q("c2", "C2", catalog.Farad, "capacitor C2 from the non-inverting input to ref"),
		q("f0", "natural frequency", catalog.Hertz, "natural frequency f0, when the components are not given"),
		q("q", "quality factor", catalog.Dimensionless, "quality factor Q (0.707 Butterworth), when the components are not given"),
		{Key: "ref", Label: "reference", Kind: Quantity, Dim: catalog.Volt,
			Help: "the node the signal is centred on; default: mid of nominal rails"},
		{Key: "signal.peak", Label: "signal peak", Kind: Quantity, Dim: catalog.Volt, Required: true,
			Help: "largest input amplitude around ref, at any frequency"},
		{Key: "gbw_factor", Label: "GBW factor k", Kind: Quantity, Dim: catalog.Dimensionless, Default: "100",
			Help: "rule of thumb gbw ≥ k·Q·f0"},
		q("load_r", "load resistance", catalog.Ohm, "resistive load at the output, to ref"),
		q("cload", "load capacitance", catalog.Farad, "capacitive load at the output the part must stay stable with"),
		q("source_r", "source resistance", catalog.Ohm, "resistance of the source driving R1 (bias current)"),
		q("dc_error", "allowed DC error", catalog.Volt, "allowed output DC error, Vos + Ib·(source_r + R1 + R2); no check when not given"),
	}
}

func (sallenKeyTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	sp := StagePlan{Gain: 1, NoiseGain: 1}
	comps := in.Given("r1") || in.Given("r2") || in.Given("c1") || in.Given("c2")
	direct := in.Given("f0") || in.Given("q")
	if comps && direct {
		return sp, fieldErrorf("f0", "give either r1, r2, c1, c2 or f0 and q, not both")
	}
	var r1, r2, c1, c2, f0, q float64
	var err error
	if comps {
		for _, f := range []struct {
			key string
			v   *float64
		}{{"r1", &r1}, {"r2", &r2}, {"c1", &c1}, {"c2", &c2}} {
			if *f.v, err = tmplNeedPositive(in, f.key); err != nil {
				return sp, noted(err, "with components, give all of r1, r2, c1, c2")
			}
		}
		f0, q = circuit.SallenKeyF0(r1, r2, c1, c2), circuit.SallenKeyQ(r1, r2, c1, c2)
	} else {
		if f0, err = tmplNeedPositive(in, "f0"); err != nil {
			return sp, noted(err, "give r1, r2, c1, c2, or f0 and q")
		}
		if q, err = tmplNeedPositive(in, "q"); err != nil {
			return sp, noted(err, "give r1, r2, c1, c2, or f0 and q")
		}
	}
	k, err := tmplNeedPositive(in, "gbw_factor")
	if err != nil {
		return sp, err
	}
	vp, err := in.Need("signal.peak")
	if err != nil {
		return sp, err
	}
	if !(vp > 0) {
		return sp, fieldErrorf("signal.peak", "%q is not positive, want a peak > 0 V", in.Raw("signal.peak"))
	}
	if err := tmplOptionalPositive(in, "load_r", "cload", "source_r", "dc_error"); err != nil {
		return sp, err
	}
	ref := tmplRef(in, p)
	pk := circuit.LowPass2Peak(q)
	vo := vp * pk
	src, _ := in.Num("source_r")
	sp.Peak, sp.Vo, sp.Freq, sp.Ref = vp, vo, f0, ref
	if comps {
		sp.Values = map[string]float64{"r1": r1, "r2": r2, "c1": c1, "c2": c2}
	} else {
		sp.Values = map[string]float64{"f0": f0, "q": q}
	}
	sp.SourceR = src + r1 + r2
	sp.LoadR, _ = in.Num("load_r")
	V := func(x float64) string { return catalog.Format(x, catalog.Volt) }
	n := func(x float64) string { return catalog.Format(x, catalog.Dimensionless) }
	Hz := catalog.Format(f0, catalog.Hertz)
	add := func(r Requirement) { sp.Requirements = append(sp.Requirements, r) }

	resp := fmt.Sprintf("f0 = %s, Q = %s", Hz, n(q))
	if comps {
		resp = fmt.Sprintf("f0 = 1/(2π√(R1R2C1C2)) = %s, Q = √(R1R2C1C2)/(C2(R1+R2)) = %s", Hz, n(q))
	}
	swing := fmt.Sprintf("ref ± Vp·peak = %s ± %s·%.4g", V(ref), V(vp), pk)
	add(Requirement{Key: KeyInputRange, Bound: BoundRange, Low: ref - vo, High: ref + vo, Dim: catalog.Volt,
		Why: swing + " (a follower: the inputs follow the output)"})
	add(Requirement{Key: KeyOutputRange, Bound: BoundRange, Low: ref - vo, High: ref + vo, Dim: catalog.Volt,
		Why: swing + " (peak = Q/√(1 − 1/(4Q²)) for Q > 0.707, else 1)"})
	add(Requirement{Key: KeySlew, Bound: BoundMin, Value: circuit.SlewForSine(f0, q*vp), Dim: catalog.VoltPerSecond,
		Why: fmt.Sprintf("2π·f0·Q·Vp = 2π·%s·%s·%s (the steepest output for any input frequency, at f0)", Hz, n(q), V(vp))})
	add(Requirement{Key: KeyGBW, Bound: BoundMin, Value: circuit.SallenKeyGBW(k, q, f0), Dim: catalog.Hertz,
		Why: fmt.Sprintf("k·Q·f0 = %s·%s·%s (rule of thumb); %s", n(k), n(q), Hz, resp)})
	if comps || sp.LoadR > 0 {
		i, why := 0.0, ""
		if comps {
			i = vo / r1
			why = fmt.Sprintf("Vp·peak/R1 = %s/%s (C1 at high frequency)", V(vo), catalog.Format(r1, catalog.Ohm))
		}
		if sp.LoadR > 0 {
			i += vo / sp.LoadR
			if why != "" {
				why += " + "
			}
			why += fmt.Sprintf("Vp·peak/load_r = %s/%s", V(vo), catalog.Format(sp.LoadR, catalog.Ohm))
		}
		add(Requirement{Key: KeyOutputCurrent, Bound: BoundMin, Value: i, Dim: catalog.Ampere, Why: why})
	}
	if c, ok := in.Num("cload"); ok {
		add(Requirement{Key: KeyCLoad, Bound: BoundMin, Value: c, Dim: catalog.Farad,
			Why: "stable with the stage's load capacitance " + catalog.Format(c, catalog.Farad)})
	}
	if v, ok := in.Num("dc_error"); ok {
		add(Requirement{Key: KeyDCError, Bound: BoundMax, Value: v, Dim: catalog.Volt,
			Why: fmt.Sprintf("Vos + Ib·(source_r + R1 + R2) ≤ %s with source_r + R1 + R2 = %s", V(v), catalog.Format(sp.SourceR, catalog.Ohm))})
	}
	return sp, nil
}

// circuit is the filter with the stage's components, or with equal
// resistors previewR and the capacitors for its f0 and Q
// (circuit.SallenKeyEqualR), driven by a sine of the stage's peak at f0.
func (sallenKeyTemplate) circuit(sp *StagePlan, _ *catalog.Part, _ *PartFigures) (StageCircuit, error) {
	var c sim.SallenKeyLowPass
	f0 := sp.Freq
	chosen := false
	if _, ok := sp.Values["r1"]; ok {
		v, err := sp.values("r1", "r2", "c1", "c2")
		if err != nil {
			return StageCircuit{}, err
		}
		c.R1, c.R2, c.C1, c.C2 = v[0], v[1], v[2], v[3]
	} else {
		v, err := sp.values("q")
		if err != nil {
			return StageCircuit{}, err
		}
		c.R1, c.R2 = previewR, previewR
		c.C1, c.C2 = circuit.SallenKeyEqualR(previewR, f0, v[0])
		chosen = true
	}
	b := StageCircuit{Circuit: c,
		Input: sim.Input{Shape: sim.Sine, Peak: sp.Peak, Freq: f0, Offset: sp.Ref},
		Notes: []string{fmt.Sprintf("driven by a sine of the stage's peak at f0 = %s, where the output is steepest", catalog.Format(f0, catalog.Hertz))},
	}
	if chosen {
		b.Notes = append(b.Notes, fmt.Sprintf("components chosen for f0 and Q: R1 = R2 = %s, C1 = %s, C2 = %s",
			catalog.Format(c.R1, catalog.Ohm), catalog.Format(c.C1, catalog.Farad), catalog.Format(c.C2, catalog.Farad)))
	}
	return b, nil
}
