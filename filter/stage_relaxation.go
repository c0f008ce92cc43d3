package filter

import (
	"fmt"
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

func init() { register(relaxationTemplate{}) }

// relaxationTemplate is the op-amp relaxation oscillator (astable
// multivibrator): timing R from the output to the inverting input, timing C
// from there to ref; hysteresis divider R1 (non-inverting input to ref) and
// R2 (non-inverting input to the output), β = R1/(R1 + R2).
//
// Inputs (SI; defaults in brackets):
//
//	r, c        Ω, F  timing resistor and capacitor (required)
//	r1, r2      Ω     hysteresis divider (required)
//	ref         V     reference the capacitor and R1 return to [mid of the nominal rails]
//	out_low     V     output low level assumed, VOL [the nominal V− rail]
//	out_high    V     output high level assumed, VOH [the nominal V+ rail]
//	freq_error  ratio allowed frequency error ε below the ideal: f ≥ (1 − ε)·f0,
//	                  so the period may grow to T/(1 − ε) [5 %]
//	load_r      Ω     load from the output to ref [none]
//
// Ideal timing (Sedra & Smith, astable multivibrator; from memory), with
// VTH = ref + β·(VOH − ref), VTL = ref + β·(VOL − ref):
//
//	t_high = RC·ln((VOH − VTL)/(VOH − VTH))
//	t_low  = RC·ln((VTH − VOL)/(VTL − VOL))
//	f      = 1/(t_high + t_low)   (symmetric levels: T = 2RC·ln((1+β)/(1−β)))
//
// Requirements:
//
//	input_range     VTL … VTH (both inputs move between the thresholds)
//	output_range    out_low … out_high, only when the stage states the levels
//	slew            2·(VOH − VOL)/(T·ε/(1 − ε)): both transitions within the period's
//	                allowed growth (circuit.PeriodStretch)
//	gbw             the GBW at which a single-pole op-amp with unlimited slew rate runs
//	                at (1 − ε)·f0 (circuit.GBWForAstable): after each switch the output
//	                leaves its level as e^(2π·GBW·β·t), several time constants
//	                1/(2π·GBW·β) of regeneration before it moves far
//	vdiff           β·(VOH − VOL): the step at each switching instant
//	output_current  max((VOH − VTL)/R + (VOH − ref)/(R1+R2), (VTH − VOL)/R + (ref − VOL)/(R1+R2))
//	                + max(VOH − ref, ref − VOL)/load_r
//
// The ideal frequency is in the slew requirement's formula; a candidate's
// predicted frequency with its own swing, slew and GBW (astable.predicted)
// is reported beside its gbw check (Aside "predicted_freq"). Each of slew and
// gbw may use the whole freq_error, so each is necessary, not sufficient; a
// part at both limits runs slower (the demo clock: 6.6 % for 5 % in
// ngspice). The two period lengthenings overlap (75 % of their sum there),
// so their sum is no exact combined check; the predicted frequency shows
// the combined effect.
type relaxationTemplate struct{}

func (relaxationTemplate) Kind() string { return "relaxation" }
func (relaxationTemplate) Summary() string {
	return "op-amp relaxation oscillator (astable: timing RC, hysteresis divider R1/R2)"
}

func (relaxationTemplate) Params() []Param {
	r := func(key, label string, dim catalog.Dim, help string) Param {
		return Param{Key: key, Label: label, Kind: Quantity, Dim: dim, Required: true, Help: help}
	}
	return []Param{
		r("r", "timing resistor", catalog.Ohm, "timing resistor R from the output to the inverting input"),
		r("c", "timing capacitor", catalog.Farad, "timing capacitor C from the inverting input to ref"),
		r("r1", "divider resistor to ref", catalog.Ohm, "hysteresis resistor R1 from the non-inverting input to ref"),
		r("r2", "divider resistor to output", catalog.Ohm, "hysteresis resistor R2 from the non-inverting input to the output"),
		{Key: "ref", Label: "reference", Kind: Quantity, Dim: catalog.Volt,
			Help: "the node C and R1 return to; default: mid of nominal rails"},
		{Key: "out_low", Label: "output low level", Kind: Quantity, Dim: catalog.Volt,
			Help: "output low level VOL assumed for the ideal frequency; default: the nominal V− rail"},
		{Key: "out_high", Label: "output high level", Kind: Quantity, Dim: catalog.Volt,
			Help: "output high level VOH assumed for the ideal frequency; default: the nominal V+ rail"},
		{Key: "freq_error", Label: "allowed frequency error", Kind: Quantity, Dim: catalog.Ratio, Default: "5 %",
			Help: "allowed frequency error below the ideal: f ≥ (1 − ε)·f0"},
		{Key: "load_r", Label: "load resistance", Kind: Quantity, Dim: catalog.Ohm,
			Help: "resistive load at the output, to ref"},
	}
}

// astable is a relaxation stage's circuit values.
type astable struct {
	r, c, r1, r2, ref, vol, voh, share, loadR float64
	levelsGiven                               bool
	// driveR is the resistance the output drives just after a switch
	// (Vo over the output current then), at which its swing is judged.
	driveR float64
}

// readAstable reads and checks a relaxation stage's inputs.
func readAstable(in *StageInput, p *Plan) (astable, error) {
	var a astable
	var err error
	for _, f := range []struct {
		key string
		v   *float64
	}{{"r", &a.r}, {"c", &a.c}, {"r1", &a.r1}, {"r2", &a.r2}} {
		if *f.v, err = tmplNeedPositive(in, f.key); err != nil {
			return a, err
		}
	}
	if err := tmplOptionalPositive(in, "load_r"); err != nil {
		return a, err
	}
	a.loadR, _ = in.Num("load_r")
	a.ref = tmplRef(in, p)
	a.vol, a.voh = p.Rails.Neg, p.Rails.Pos
	if v, ok := in.Num("out_low"); ok {
		a.vol, a.levelsGiven = v, true
	}
	if v, ok := in.Num("out_high"); ok {
		a.voh, a.levelsGiven = v, true
	}
	if !(a.vol < a.ref && a.ref < a.voh) {
		return a, fieldErrorf("ref", "%s is not between the output levels %s and %s, want out_low < ref < out_high",
			catalog.Format(a.ref, catalog.Volt), catalog.Format(a.vol, catalog.Volt), catalog.Format(a.voh, catalog.Volt))
	}
	a.share, _ = in.Num("freq_error")
	if !(a.share > 0 && a.share < 1) {
		return a, fieldErrorf("freq_error", "%q is out of range, want a ratio between 0 and 100 %% such as \"5 %%\"", in.Raw("freq_error"))
	}
	return a, nil
}

func (relaxationTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	sp := StagePlan{}
	a, err := readAstable(in, p)
	if err != nil {
		return sp, err
	}
	beta := circuit.HysteresisBeta(a.r1, a.r2)
	vth, vtl := circuit.Thresholds(a.ref, beta, a.vol, a.voh)
	th, err := circuit.HighTime(a.r, a.c, a.voh, vth, vtl)
	if err != nil {
		return sp, fmt.Errorf("astable timing: %w", err)
	}
	tl, err := circuit.LowTime(a.r, a.c, a.vol, vth, vtl)
	if err != nil {
		return sp, fmt.Errorf("astable timing: %w", err)
	}
	period := th + tl
	sp.Freq = 1 / period
	sp.Vo = math.Max(a.voh-a.ref, a.ref-a.vol)
	sp.LoadR = a.loadR
	// The output current peaks just after a switch, with the output at
	// its level: the swing is judged at that current (SwingLoad).
	iOut := circuit.AstableOutputCurrent(a.r, a.r1, a.r2, a.ref, a.vol, a.voh)
	if a.loadR > 0 {
		iOut += sp.Vo / a.loadR
	}
	a.driveR = driveR(sp.Vo, iOut)
	sp.DriveR = a.driveR
	sp.Ref = a.ref
	sp.Values = map[string]float64{"r": a.r, "c": a.c, "r1": a.r1, "r2": a.r2}
	V := func(x float64) string { return catalog.Format(x, catalog.Volt) }
	W := tmplOperand
	s := func(x float64) string { return catalog.Format(x, catalog.Second) }
	b := catalog.Format(beta, catalog.Dimensionless)
	add := func(r Requirement) { sp.Requirements = append(sp.Requirements, r) }

	add(Requirement{Key: KeyInputRange, Bound: BoundRange, Low: vtl, High: vth, Dim: catalog.Volt,
		Why: fmt.Sprintf("VTL … VTH = ref + β·(VOL − ref) … ref + β·(VOH − ref) = %s + %s·(%s − %s) … %s + %s·(%s − %s), β = R1/(R1+R2)",
			V(a.ref), b, W(a.vol), W(a.ref), V(a.ref), b, W(a.voh), W(a.ref))})
	if a.levelsGiven {
		add(Requirement{Key: KeyOutputRange, Bound: BoundRange, Low: a.vol, High: a.voh, Dim: catalog.Volt,
			Why: fmt.Sprintf("the output levels the timing assumes, %s … %s", V(a.vol), V(a.voh))})
	}
	levels := "out_low … out_high"
	if !a.levelsGiven {
		levels = "the rails"
	}
	stretch := circuit.PeriodStretch(a.share)
	add(Requirement{Key: KeySlew, Bound: BoundMin, Value: circuit.SlewForAstable(a.vol, a.voh, period, stretch), Dim: catalog.VoltPerSecond,
		Why: fmt.Sprintf("2·(VOH − VOL)/(T·ε/(1 − ε)) = 2·(%s − %s)/(%s·%s), f ≥ (1 − ε)·f0 with ε = %s; ideal T = t_high + t_low = %s + %s, f0 = %s (levels: %s)",
			W(a.voh), W(a.vol), s(period), catalog.Format(stretch, catalog.Ratio), catalog.Format(a.share, catalog.Ratio), s(th), s(tl),
			catalog.Format(sp.Freq, catalog.Hertz), levels)})
	gbw, err := circuit.GBWForAstable(a.r, a.c, a.ref, beta, a.vol, a.voh, a.share)
	if err != nil {
		return sp, fmt.Errorf("astable gbw: %w", err)
	}
	add(Requirement{Key: KeyGBW, Bound: BoundMin, Value: gbw, Dim: catalog.Hertz,
		Aside: func(_ *catalog.Part, f *PartFigures) Aside {
			if fr, ok := a.predicted(p, f); ok {
				return Aside{Kind: AsidePredictedFreq, V: fr}
			}
			return Aside{}
		},
		Why: fmt.Sprintf("f ≥ (1 − ε)·f0, period ≤ T/(1 − ε) on a single-pole op-amp, ε = %s, β = %s: after each switch the output regenerates as e^(2π·GBW·β·t), τ = 1/(2π·GBW·β) = %s at this GBW (ideal f = %s; the check shows the part's predicted f with its GBW and slew)",
			catalog.Format(a.share, catalog.Ratio), b, s(circuit.RegenerationTimeConstant(gbw, beta)), catalog.Format(sp.Freq, catalog.Hertz))})
	add(Requirement{Key: KeyVdiff, Bound: BoundMin, Value: circuit.AstableVdiff(beta, a.vol, a.voh), Dim: catalog.Volt, Measure: measureVdiff,
		Why: fmt.Sprintf("β·(VOH − VOL) = %s·(%s − %s), the step at each switching instant", b, W(a.voh), W(a.vol))})
	why := fmt.Sprintf("just after a switch: max((VOH − VTL)/R + (VOH − ref)/(R1+R2), (VTH − VOL)/R + (ref − VOL)/(R1+R2)), R = %s, R1+R2 = %s",
		catalog.Format(a.r, catalog.Ohm), catalog.Format(a.r1+a.r2, catalog.Ohm))
	if a.loadR > 0 {
		why += fmt.Sprintf(", + %s/load_r %s", V(sp.Vo), catalog.Format(a.loadR, catalog.Ohm))
	}
	add(Requirement{Key: KeyOutputCurrent, Bound: BoundMin, Value: iOut, Dim: catalog.Ampere, Why: why})
	return sp, nil
}

// predicted returns the frequency a relaxation stage with circuit values a
// runs at on a part with worst-case figures f: the output moves between the
// part's own swing (at the stage's load, on the plan's nominal rails, no
// further than the levels the stage states), limited by the part's
// worst-case slew rate and, when the catalog gives it, its worst-case GBW,
// with the single-pole model of circuit.AstablePeriodLimited (without a GBW
// figure, the ramp model circuit.AstablePeriodSlewLimited). It is an
// optimistic prediction (saturation recovery and the rounding near the
// rails slow a real part further). ok is false when the part's slew or
// swing is unknown, or the part cannot complete a full swing before the
// capacitor reaches the next threshold. The gbw check shows it beside the
// part (Aside "predicted_freq").
func (a astable) predicted(p *Plan, f *PartFigures) (freq float64, ok bool) {
	if !f.Slew.Known || !(f.Slew.V > 0) {
		return 0, false
	}
	w, _ := f.OutputAt(a.driveR)
	if !w.LowKnown || !w.HighKnown {
		return 0, false
	}
	vol := math.Max(a.vol, p.Rails.Neg+w.Low)
	voh := math.Min(a.voh, p.Rails.Pos+w.High)
	beta := circuit.HysteresisBeta(a.r1, a.r2)
	gbw := math.Inf(1)
	if f.GBW.Known && f.GBW.V > 0 {
		gbw = f.GBW.V
	}
	t, err := circuit.AstablePeriodLimited(a.r, a.c, a.ref, beta, vol, voh, f.Slew.V, gbw)
	if err != nil {
		return 0, false
	}
	return 1 / t, true
}

// circuit is the free-running astable with the stage's timing network and
// divider; the model's output swings between the part's own limits.
func (relaxationTemplate) circuit(sp *StagePlan, _ *catalog.Part, _ *PartFigures) (StageCircuit, error) {
	v, err := sp.values("r", "c", "r1", "r2")
	if err != nil {
		return StageCircuit{}, err
	}
	return StageCircuit{
		Circuit: sim.Relaxation{R: v[0], C: v[1], R1: v[2], R2: v[3], Ref: sp.Ref},
		InTrace: "capacitor",
		Notes:   []string{"free-running: the output swings between the part's own limits; \"in\" is the capacitor voltage"},
	}, nil
}
