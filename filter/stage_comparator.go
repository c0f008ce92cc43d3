package filter

import (
	"fmt"
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

func init() { register(comparatorTemplate{}) }

// comparatorTemplate is an op-amp used open loop as a comparator: the
// input signal on one input, the threshold on the other, the output
// saturating toward one rail or the other.
//
// Inputs (SI; defaults in brackets):
//
//	threshold    V   the voltage the input is compared with (required)
//	input        V   [low, high] the input signal spans (required)
//	out_low      V   highest level the next stage reads as low (required)
//	out_high     V   lowest level the next stage reads as high (required)
//	transition   s   allowed 10–90 % output transition time (required)
//	load_r       Ω   load from the output to 0 V [none]
//	source_r     Ω   resistance the inputs see (threshold error) [none]
//	dc_error     V   allowed threshold error, input-referred [no check]
//
// Requirements:
//
//	input_range     min(low, threshold) … max(high, threshold)
//	output_range    out_low … out_high (the output must reach both levels)
//	slew            0.8·(VOH − VOL)/transition
//	vdiff           max(high − threshold, threshold − low)
//	output_current  max(|VOL|, |VOH|)/load_r (when load_r is given)
//	dc_error        Vos + Ib·source_r ≤ allowed (when dc_error is given)
//
// An op-amp is not built to be a comparator: it recovers slowly from
// saturation and its datasheet guarantees no response time, so the slew
// check is necessary but not sufficient; the slew requirement's formula
// says so.
type comparatorTemplate struct{}

func (comparatorTemplate) Kind() string { return "comparator" }
func (comparatorTemplate) Summary() string {
	return "op-amp used open loop as a comparator (threshold, levels, transition time)"
}

func (comparatorTemplate) Params() []Param {
	v := func(key, label, help string) Param {
		return Param{Key: key, Label: label, Kind: Quantity, Dim: catalog.Volt, Required: true, Help: help}
	}
	return []Param{
		v("threshold", "threshold", "the voltage the input is compared with"),
		{Key: "input", Label: "input range", Kind: Pair, Dim: catalog.Volt, Required: true,
			Help: "[low, high] the input signal spans, V"},
		v("out_low", "output low level", "highest output level the next stage reads as low"),
		v("out_high", "output high level", "lowest output level the next stage reads as high"),
		{Key: "transition", Label: "transition time", Kind: Quantity, Dim: catalog.Second, Required: true,
			Help: "allowed 10–90 % output transition time between the levels"},
		{Key: "load_r", Label: "load resistance", Kind: Quantity, Dim: catalog.Ohm,
			Help: "load from the output to 0 V (logic input, LED driver…)"},
		{Key: "source_r", Label: "source resistance", Kind: Quantity, Dim: catalog.Ohm,
			Help: "resistance the inputs see (bias current shifts the threshold)"},
		{Key: "dc_error", Label: "allowed threshold error", Kind: Quantity, Dim: catalog.Volt,
			Help: "allowed shift of the threshold, Vos + Ib·source_r; no check when not given"},
	}
}

func (comparatorTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	sp := StagePlan{NoiseGain: 1}
	th, err := in.Need("threshold")
	if err != nil {
		return sp, err
	}
	lo, hi, err := tmplPair(in, "input")
	if err != nil {
		return sp, err
	}
	vol, err := in.Need("out_low")
	if err != nil {
		return sp, err
	}
	voh, err := in.Need("out_high")
	if err != nil {
		return sp, err
	}
	if vol >= voh {
		return sp, fieldErrorf("out_low", "%q is not below out_high %q, want out_low < out_high", in.Raw("out_low"), in.Raw("out_high"))
	}
	t, err := tmplNeedPositive(in, "transition")
	if err != nil {
		return sp, err
	}
	if err := tmplOptionalPositive(in, "load_r", "source_r", "dc_error"); err != nil {
		return sp, err
	}
	sp.SourceR, _ = in.Num("source_r")
	sp.LoadR, _ = in.Num("load_r")
	sp.Vo = math.Max(math.Abs(voh), math.Abs(vol))
	sp.Rise = t
	sp.Values = map[string]float64{"threshold": th, "input.low": lo, "input.high": hi, "out_low": vol, "out_high": voh}
	V := func(x float64) string { return catalog.Format(x, catalog.Volt) }
	add := func(r Requirement) { sp.Requirements = append(sp.Requirements, r) }

	add(Requirement{Key: KeyInputRange, Bound: BoundRange, Low: math.Min(lo, th), High: math.Max(hi, th), Dim: catalog.Volt,
		Why: fmt.Sprintf("input %s … %s and threshold %s", V(lo), V(hi), V(th))})
	add(Requirement{Key: KeyOutputRange, Bound: BoundRange, Low: vol, High: voh, Dim: catalog.Volt,
		Why: fmt.Sprintf("reach out_low = %s and out_high = %s (the next stage's levels)", V(vol), V(voh))})
	add(Requirement{Key: KeySlew, Bound: BoundMin, Value: circuit.SlewForTransition(vol, voh, t), Dim: catalog.VoltPerSecond,
		Why: fmt.Sprintf("0.8·(VOH − VOL)/t = 0.8·(%s − %s)/%s; open loop the part also needs time to leave saturation, and no response time is guaranteed",
			tmplOperand(voh), tmplOperand(vol), catalog.Format(t, catalog.Second))})
	if d := math.Max(hi-th, th-lo); d > 0 {
		add(Requirement{Key: KeyVdiff, Bound: BoundMin, Value: d, Dim: catalog.Volt, Measure: measureVdiff,
			Why: fmt.Sprintf("max(high − threshold, threshold − low) = max(%s − %s, %s − %s); many op-amps clamp or are damaged by large differential inputs",
				tmplOperand(hi), tmplOperand(th), tmplOperand(th), tmplOperand(lo))})
	}
	if sp.LoadR > 0 {
		add(Requirement{Key: KeyOutputCurrent, Bound: BoundMin, Value: sp.Vo / sp.LoadR, Dim: catalog.Ampere,
			Why: fmt.Sprintf("max(|VOL|, |VOH|)/load_r = %s/%s", V(sp.Vo), catalog.Format(sp.LoadR, catalog.Ohm))})
	}
	if v, ok := in.Num("dc_error"); ok {
		add(Requirement{Key: KeyDCError, Bound: BoundMax, Value: v, Dim: catalog.Volt,
			Why: fmt.Sprintf("threshold error Vos + Ib·Rs + Ios·Rs/2 ≤ %s with Rs = %s", V(v), catalog.Format(sp.SourceR, catalog.Ohm))})
	}
	return sp, nil
}

// noteVdiff is the note of the vdiff checks the templates add.
const noteVdiff = "many op-amps clamp their inputs with diodes or are damaged by a larger differential input; vdiff_max is the guaranteed limit"

// measureVdiff is the part's largest allowed differential input, with the
// warning note the comparator and relaxation templates carry.
func measureVdiff(p *catalog.Part, _ *PartFigures) Figure {
	return Figure{V: p.VdiffMax.V(), Known: p.VdiffMax.Known(), Basis: BasisGuaranteed, Note: noteVdiff}
}

// tmplRef is the stage's ref, default the middle of the nominal rails.
func tmplRef(in *StageInput, p *Plan) float64 {
	if v, ok := in.Num("ref"); ok {
		return v
	}
	return (p.Rails.Pos + p.Rails.Neg) / 2
}

// tmplOperand formats a voltage for a formula, in parentheses when it is
// negative so that "4.5 V − (−4.5 V)" reads right.
func tmplOperand(v float64) string {
	if v < 0 {
		return "(" + catalog.Format(v, catalog.Volt) + ")"
	}
	return catalog.Format(v, catalog.Volt)
}

// tmplNeedPositive returns the quantity under key, an error when it is
// missing or not above zero.
func tmplNeedPositive(in *StageInput, key string) (float64, error) {
	v, err := in.Need(key)
	if err != nil {
		return 0, err
	}
	if !(v > 0) {
		return 0, fieldErrorf(key, "%q is not positive, want a value > 0", in.Raw(key))
	}
	return v, nil
}

// tmplOptionalPositive checks that the optional quantities among keys that
// are given are above zero.
func tmplOptionalPositive(in *StageInput, keys ...string) error {
	for _, k := range keys {
		if v, ok := in.Num(k); ok && !(v > 0) {
			return fieldErrorf(k, "%q is not positive, want a value > 0", in.Raw(k))
		}
	}
	return nil
}

// tmplPair reads a Pair param [low, high], both ends required, low ≤ high.
func tmplPair(in *StageInput, key string) (lo, hi float64, err error) {
	if lo, err = in.Need(key + ".low"); err != nil {
		return 0, 0, err
	}
	if hi, err = in.Need(key + ".high"); err != nil {
		return 0, 0, err
	}
	if lo > hi {
		return 0, 0, fieldErrorf(key, "low %s is above high %s, want [low, high]",
			catalog.Format(lo, catalog.Volt), catalog.Format(hi, catalog.Volt))
	}
	return lo, hi, nil
}

// amplifierResistors reads the resistor form of the non-inverting and
// inverting templates: the feedback resistor rf and the gain (or input)
// resistor under rgKey, given instead of gain. ok is false when neither is
// given; giving them together with gain is an error.
func amplifierResistors(in *StageInput, rgKey string) (rf, rg float64, ok bool, err error) {
	if !in.Given("rf") && !in.Given(rgKey) {
		return 0, 0, false, nil
	}
	if in.Given("gain") {
		return 0, 0, false, fieldErrorf("gain", "give either gain or rf and %s, not both", rgKey)
	}
	if rf, err = tmplNeedPositive(in, "rf"); err != nil {
		return 0, 0, false, noted(err, fmt.Sprintf("with resistors, give rf and %s", rgKey))
	}
	if rg, err = tmplNeedPositive(in, rgKey); err != nil {
		return 0, 0, false, noted(err, fmt.Sprintf("with resistors, give rf and %s", rgKey))
	}
	return rf, rg, true, nil
}

// useInvertingInputR makes a stage's dc_error check count the bias current
// of each input through the resistance it sees: source_r at the
// non-inverting input, rp (Rf ∥ Rg, or Rf ∥ Rin; label names it in the
// formula) at the inverting one. With
// Ib± = Ib ± Ios/2 the output error is NG·(Vos + Ib+·Rs − Ib−·Rp), whose
// worst case over the limits is NG·(Vos + Ib·|Rs − Rp| + Ios·(Rs + Rp)/2)
// (Sedra & Smith, input bias and offset currents; from memory); without an
// Ios figure, NG·(Vos + Ib·(Rs + Rp)).
func useInvertingInputR(sp *StagePlan, rp float64, label string) {
	for i := range sp.Requirements {
		r := &sp.Requirements[i]
		if r.Key != KeyDCError {
			continue
		}
		ng, rs := sp.NoiseGain, sp.SourceR
		r.Measure = func(_ *catalog.Part, f *PartFigures) Figure { return biasDCError(f, ng, rs, rp) }
		r.Why = fmt.Sprintf("NG·(Vos + Ib·|Rs − %s| + Ios·(Rs + %s)/2) ≤ %s with NG = %s, Rs = %s, %s = %s",
			label, label, catalog.Format(r.Value, catalog.Volt), catalog.Format(ng, catalog.Dimensionless),
			catalog.Format(rs, catalog.Ohm), label, catalog.Format(rp, catalog.Ohm))
	}
}

// biasDCError is the dc_error figure of useInvertingInputR.
func biasDCError(f *PartFigures, ng, rs, rp float64) Figure {
	if !f.Vos.Known || !f.Ib.Known {
		return Figure{}
	}
	v, basis, note := f.Vos.V, weaker(f.Vos.Basis, f.Ib.Basis), f.Vos.Note
	if f.Ib.Basis > f.Vos.Basis {
		note = f.Ib.Note
	}
	if f.Ios.Known {
		v += f.Ib.V*math.Abs(rs-rp) + f.Ios.V*(rs+rp)/2
		basis = weaker(basis, f.Ios.Basis)
	} else {
		v += f.Ib.V * (rs + rp)
	}
	return Figure{V: ng * v, Known: true, Basis: basis, Note: note}
}

// circuit is the comparator between the stage's levels, driven by a sine
// over its input range with a period of comparatorPeriodTransitions
// allowed transition times (a design gives the comparator no frequency).
func (comparatorTemplate) circuit(sp *StagePlan, _ *catalog.Part, _ *PartFigures) (StageCircuit, error) {
	v, err := sp.values("threshold", "input.low", "input.high", "out_low", "out_high")
	if err != nil {
		return StageCircuit{}, err
	}
	th, lo, hi, vol, voh := v[0], v[1], v[2], v[3], v[4]
	f := 1 / (comparatorPeriodTransitions * sp.Rise)
	return StageCircuit{
		// The edge is timed between the stage's levels, as its slew
		// requirement counts it.
		Circuit: sim.Comparator{Threshold: th, Low: vol, High: voh},
		Input:   sim.Input{Shape: sim.Sine, Peak: (hi - lo) / 2, Offset: (hi + lo) / 2, Freq: f},
		InTrace: "input",
		Notes: []string{fmt.Sprintf("driven by a sine over the input range %s … %s at %s (the design gives no frequency; a period of %d allowed transition times)",
			catalog.Format(lo, catalog.Volt), catalog.Format(hi, catalog.Volt), catalog.Format(f, catalog.Hertz), comparatorPeriodTransitions)},
	}, nil
}
