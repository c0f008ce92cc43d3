package filter

import (
	"fmt"
	"math"

	"github.com/opsift/opsift/catalog"
)

// signalParams are the inputs every amplifier template shares.
func signalParams() []Param {
	return []Param{
		{Key: "ref", Label: "reference", Kind: Quantity, Dim: catalog.Volt,
			Help: "the node the signal is centred on; default: mid of nominal rails"},
		{Key: "signal.shape", Label: "signal shape", Kind: Choice, Choices: []string{"sine", "square"},
			Default: "sine", Help: "sine, or square with a rise time"},
		{Key: "signal.peak", Label: "signal peak", Kind: Quantity, Dim: catalog.Volt, Required: true,
			Help: "peak of the signal at the stage input, around ref"},
		{Key: "signal.freq", Label: "signal frequency", Kind: Quantity, Dim: catalog.Hertz,
			Help: "highest signal frequency (sine)"},
		{Key: "signal.rise", Label: "rise time", Kind: Quantity, Dim: catalog.Second,
			Help: "allowed 10–90 % rise time at the output (square)"},
	}
}

// loadParams are the inputs about what surrounds the amplifier.
func loadParams() []Param {
	return []Param{
		{Key: "source_r", Label: "source resistance", Kind: Quantity, Dim: catalog.Ohm,
			Help: "resistance the non-inverting input sees (bias current, noise)"},
		{Key: "load_r", Label: "load resistance", Kind: Quantity, Dim: catalog.Ohm,
			Help: "resistive load at the output, to ref"},
		{Key: "cload", Label: "load capacitance", Kind: Quantity, Dim: catalog.Farad,
			Help: "capacitive load at the output the part must stay stable with"},
		{Key: "gain_error", Label: "allowed gain error", Kind: Quantity, Dim: catalog.Ratio, Default: "1 %",
			Help: "allowed gain error at the signal frequency"},
		{Key: "dc_error", Label: "allowed DC error", Kind: Quantity, Dim: catalog.Volt,
			Help: "allowed output-referred DC error; no check when not given"},
		{Key: "noise", Label: "allowed noise", Kind: Quantity, Dim: catalog.Volt,
			Help: "allowed output noise, V rms over the closed-loop bandwidth; no check when not given"},
	}
}

// feedbackParam is the resistance the output drives through the feedback network.
func feedbackParam(help string) Param {
	return Param{Key: "feedback_r", Label: "feedback resistance", Kind: Quantity, Dim: catalog.Ohm, Help: help}
}

// amplifier is what an amplifier template passes to deriveAmplifier.
type amplifier struct {
	gain, noiseGain float64
	// inputAtRef: the op-amp inputs sit at ref (inverting); otherwise they
	// follow the signal (ref ± Vp).
	inputAtRef bool
	// feedbackR is the resistance the output drives besides the load (0 none).
	feedbackR float64
	// invR is the resistance the inverting input sees (Rf ∥ Rg, Rf ∥ Rin)
	// when the stage gives its resistors; 0 unknown. The dc_error check
	// then counts each input's bias current (useInvertingInputR).
	invR    float64
	invName string
}

// deriveAmplifier derives the requirements shared by the follower,
// non-inverting and inverting templates (DESIGN.md "Baseline derivations").
func deriveAmplifier(in *StageInput, p *Plan, a amplifier) (StagePlan, error) {
	sp := StagePlan{Gain: a.gain, NoiseGain: a.noiseGain}
	ref := (p.Rails.Pos + p.Rails.Neg) / 2
	if v, ok := in.Num("ref"); ok {
		ref = v
	}
	vp, err := in.Need("signal.peak")
	if err != nil {
		return sp, err
	}
	if vp < 0 {
		return sp, fmt.Errorf("field \"signal.peak\": %q is negative, want a peak ≥ 0 V", in.Raw("signal.peak"))
	}
	eps, _ := in.Num("gain_error")
	if eps <= 0 || eps >= 1 {
		return sp, fmt.Errorf("field \"gain_error\": %q is out of range, want a ratio between 0 and 100 %% such as \"1 %%\"", in.Raw("gain_error"))
	}
	sp.Peak, sp.GainError = vp, eps
	sp.Vo = a.gain * vp
	sp.Shape = in.Text("signal.shape")
	sp.SourceR, _ = in.Num("source_r")
	sp.LoadR, _ = in.Num("load_r")
	for _, k := range []string{"source_r", "load_r", "feedback_r", "cload", "dc_error", "noise"} {
		if v, ok := in.Num(k); ok && v <= 0 {
			return sp, fmt.Errorf("field %q: %q is not positive, want a value > 0", k, in.Raw(k))
		}
	}
	vo, ng := sp.Vo, a.noiseGain
	V := func(x float64) string { return catalog.Format(x, catalog.Volt) }
	add := func(r Requirement) { sp.Requirements = append(sp.Requirements, r) }

	// Where the op-amp's inputs and output must be able to go.
	if a.inputAtRef {
		add(Requirement{Key: KeyInputRange, Bound: BoundRange, Low: ref, High: ref, Dim: catalog.Volt,
			Why: fmt.Sprintf("inputs sit at ref = %s", V(ref))})
	} else {
		add(Requirement{Key: KeyInputRange, Bound: BoundRange, Low: ref - vp, High: ref + vp, Dim: catalog.Volt,
			Why: fmt.Sprintf("ref ± Vp = %s ± %s", V(ref), V(vp))})
	}
	outWhy := fmt.Sprintf("ref ± G·Vp = %s ± %s·%s", V(ref), catalog.Format(a.gain, catalog.Dimensionless), V(vp))
	add(Requirement{Key: KeyOutputRange, Bound: BoundRange, Low: ref - vo, High: ref + vo, Dim: catalog.Volt, Why: outWhy})

	// Speed: slew and loop gain at the signal frequency or edge.
	switch sp.Shape {
	case "sine":
		f, err := in.Need("signal.freq")
		if err != nil {
			return sp, fmt.Errorf("%w (a sine needs signal.freq)", err)
		}
		if f <= 0 {
			return sp, fmt.Errorf("field \"signal.freq\": %q is not positive, want a frequency such as \"1 kHz\"", in.Raw("signal.freq"))
		}
		sp.Freq = f
		Hz := catalog.Format(f, catalog.Hertz)
		add(Requirement{Key: KeySlew, Bound: BoundMin, Value: 2 * math.Pi * f * vo, Dim: catalog.VoltPerSecond,
			Why: fmt.Sprintf("2π·f·Vo = 2π·%s·%s", Hz, V(vo))})
		k := gbwFactor(eps)
		add(Requirement{Key: KeyGBW, Bound: BoundMin, Value: ng * f * k, Dim: catalog.Hertz,
			Why: fmt.Sprintf("NG·f/√(1/(1−ε)²−1) = %s·%s·%.3g (ε = %s)",
				catalog.Format(ng, catalog.Dimensionless), Hz, k, catalog.Format(eps, catalog.Ratio))})
	case "square":
		rise, err := in.Need("signal.rise")
		if err != nil {
			return sp, fmt.Errorf("%w (a square needs signal.rise)", err)
		}
		if rise <= 0 {
			return sp, fmt.Errorf("field \"signal.rise\": %q is not positive, want a time such as \"2 us\"", in.Raw("signal.rise"))
		}
		sp.Rise = rise
		sp.Freq, _ = in.Num("signal.freq")
		s := catalog.Format(rise, catalog.Second)
		add(Requirement{Key: KeySlew, Bound: BoundMin, Value: SlewFraction * 2 * vo / rise, Dim: catalog.VoltPerSecond,
			Why: fmt.Sprintf("0.8·2Vo/rise = 0.8·2·%s/%s", V(vo), s)})
		add(Requirement{Key: KeyGBW, Bound: BoundMin, Value: ng * RiseBandwidth / rise, Dim: catalog.Hertz,
			Why: fmt.Sprintf("NG·0.35/rise = %s·0.35/%s", catalog.Format(ng, catalog.Dimensionless), s)})
	}
	add(Requirement{Key: KeyAol, Bound: BoundMin, Value: 20 * math.Log10(ng/eps), Dim: catalog.Decibel,
		Why: fmt.Sprintf("20·log10(NG/ε) = 20·log10(%s/%s)", catalog.Format(ng, catalog.Dimensionless), catalog.Format(eps, catalog.Ratio))})

	// Drive: the load and the feedback network, both at the output peak.
	if sp.LoadR > 0 || a.feedbackR > 0 {
		i, why := 0.0, ""
		if sp.LoadR > 0 {
			i += vo / sp.LoadR
			why = fmt.Sprintf("Vo/load_r = %s/%s", V(vo), catalog.Format(sp.LoadR, catalog.Ohm))
		}
		if a.feedbackR > 0 {
			i += vo / a.feedbackR
			if why != "" {
				why += " + "
			}
			why += fmt.Sprintf("Vo/feedback_r = %s/%s", V(vo), catalog.Format(a.feedbackR, catalog.Ohm))
		}
		add(Requirement{Key: KeyOutputCurrent, Bound: BoundMin, Value: i, Dim: catalog.Ampere, Why: why})
	}
	if c, ok := in.Num("cload"); ok {
		add(Requirement{Key: KeyCLoad, Bound: BoundMin, Value: c, Dim: catalog.Farad,
			Why: "stable with the stage's load capacitance " + catalog.Format(c, catalog.Farad)})
	}
	appendErrorBudgets(in, &sp, p)
	if a.invR > 0 {
		useInvertingInputR(&sp, a.invR, a.invName)
	}
	return sp, nil
}

// appendErrorBudgets adds the dc_error and noise allowances a stage sets.
func appendErrorBudgets(in *StageInput, sp *StagePlan, p *Plan) {
	ng := catalog.Format(sp.NoiseGain, catalog.Dimensionless)
	rs := catalog.Format(sp.SourceR, catalog.Ohm)
	if v, ok := in.Num("dc_error"); ok {
		sp.Requirements = append(sp.Requirements, Requirement{Key: KeyDCError, Bound: BoundMax, Value: v, Dim: catalog.Volt,
			Why: fmt.Sprintf("NG·(Vos + Ib·Rs) ≤ %s with NG = %s, Rs = %s", catalog.Format(v, catalog.Volt), ng, rs)})
	}
	if v, ok := in.Num("noise"); ok {
		sp.Requirements = append(sp.Requirements, Requirement{Key: KeyNoise, Bound: BoundMax, Value: v, Dim: catalog.Volt,
			Why: fmt.Sprintf("√(en² + (in·Rs)² + 4kTRs)·NG·√(π/2·GBW/NG) ≤ %s rms with NG = %s, Rs = %s, T = %.4g K",
				catalog.Format(v, catalog.Volt), ng, rs, p.TempHigh+ZeroCelsius)})
	}
}
