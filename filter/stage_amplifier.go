package filter

import (
	"fmt"
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
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
			Help: "allowed output noise, V rms over noise_band (else the closed-loop bandwidth); no check when not given"},
		noiseBandParam(), noiseOrderParam(), thdParam(),
	}
}

// noiseBandParam is the band output noise is integrated over.
func noiseBandParam() Param {
	return Param{Key: "noise_band", Label: "noise band", Kind: Quantity, Dim: catalog.Hertz,
		Help: "measurement or post-filter band the output noise is integrated over; default: the closed-loop bandwidth"}
}

// noiseOrderParam is the order of the filter that sets noise_band.
func noiseOrderParam() Param {
	return Param{Key: "noise_order", Label: "noise filter order", Kind: Quantity, Dim: catalog.Dimensionless,
		Help: "Butterworth order of the filter at noise_band (its brick-wall equivalent is used); 0 or unset: an ideal brick wall"}
}

// maxNoiseOrder is the highest noise_order accepted: beyond 8 the
// brick-wall equivalent differs from the band by under 0.7 %.
const maxNoiseOrder = 8

// readNoiseBand reads noise_band (Hz, 0 when not given) and noise_order.
func readNoiseBand(in *StageInput) (band float64, order int, err error) {
	band, _ = in.Num("noise_band")
	if v, ok := in.Num("noise_band"); ok && !(v > 0) {
		return 0, 0, fieldErrorf("noise_band", "%q is not positive, want a frequency such as \"20 kHz\"", in.Raw("noise_band"))
	}
	if v, ok := in.Num("noise_order"); ok {
		if v != math.Trunc(v) || v < 0 || v > maxNoiseOrder {
			return 0, 0, fieldErrorf("noise_order", "%q is out of range, want a whole number 0 … %d", in.Raw("noise_order"), maxNoiseOrder)
		}
		if band == 0 {
			return 0, 0, fieldErrorf("noise_order", "given without noise_band, want noise_band as well")
		}
		order = int(v)
	}
	return band, order, nil
}

// tiaBandText describes the band of a transimpedance noise check, which
// integrates the filter's own response rather than its brick-wall
// equivalent.
func tiaBandText(band float64, order int) string {
	if band == 0 || order == 0 {
		return noiseBandText(band, order, "the stage's own response")
	}
	return fmt.Sprintf("band: order-%d Butterworth response at %s", order, catalog.Format(band, catalog.Hertz))
}

// noiseBandText describes the band for a why line.
func noiseBandText(band float64, order int, none string) string {
	switch {
	case band == 0:
		return "band: " + none
	case order == 0:
		return "band: brick wall at " + catalog.Format(band, catalog.Hertz)
	}
	return fmt.Sprintf("band: order-%d filter at %s, brick-wall equivalent %s", order,
		catalog.Format(band, catalog.Hertz), catalog.Format(circuit.FilterNoiseBandwidth(band, order), catalog.Hertz))
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
	// resistors names the keys that would give the stage's feedback
	// network ("rf and rg") when the stage gives only its gain; "" when
	// it gives them or has none (StagePlan.Resistors).
	resistors string
}

// deriveAmplifier derives the requirements shared by the follower,
// non-inverting and inverting templates (DESIGN.md "Baseline derivations").
func deriveAmplifier(in *StageInput, p *Plan, a amplifier) (StagePlan, error) {
	sp := StagePlan{Gain: a.gain, NoiseGain: a.noiseGain, Resistors: a.resistors}
	ref := (p.Rails.Pos + p.Rails.Neg) / 2
	if v, ok := in.Num("ref"); ok {
		ref = v
	}
	vp, err := in.Need("signal.peak")
	if err != nil {
		return sp, err
	}
	if vp < 0 {
		return sp, fieldErrorf("signal.peak", "%q is negative, want a peak ≥ 0 V", in.Raw("signal.peak"))
	}
	eps, _ := in.Num("gain_error")
	if eps <= 0 || eps >= 1 {
		return sp, fieldErrorf("gain_error", "%q is out of range, want a ratio between 0 and 100 %% such as \"1 %%\"", in.Raw("gain_error"))
	}
	sp.Peak, sp.GainError, sp.Ref = vp, eps, ref
	sp.Vo = a.gain * vp
	sp.Shape = in.Text("signal.shape")
	sp.SourceR, _ = in.Num("source_r")
	sp.LoadR, _ = in.Num("load_r")
	for _, k := range []string{"source_r", "load_r", "feedback_r", "cload", "dc_error", "noise"} {
		if v, ok := in.Num(k); ok && v <= 0 {
			return sp, fieldErrorf(k, "%q is not positive, want a value > 0", in.Raw(k))
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
			return sp, noted(err, "a sine needs signal.freq")
		}
		if f <= 0 {
			return sp, fieldErrorf("signal.freq", "%q is not positive, want a frequency such as \"1 kHz\"", in.Raw("signal.freq"))
		}
		sp.Freq = f
		Hz := catalog.Format(f, catalog.Hertz)
		add(Requirement{Key: KeySlew, Bound: BoundMin, Value: circuit.SlewForSine(f, vo), Dim: catalog.VoltPerSecond,
			Why: fmt.Sprintf("2π·f·Vo = 2π·%s·%s", Hz, V(vo))})
		floor, err := circuit.GBWForGainError(ng, f, eps, math.Inf(1))
		if err != nil {
			return sp, fmt.Errorf("field \"gain_error\": %w", err)
		}
		split, _, _, err := circuit.GainErrorBudget(ng, f, eps)
		if err != nil {
			return sp, fmt.Errorf("field \"gain_error\": %w", err)
		}
		add(Requirement{Key: KeyGBW, Bound: BoundMin, Value: floor, Dim: catalog.Hertz,
			Need: func(_ *catalog.Part, pf *PartFigures) (float64, string) { return gainErrorGBW(ng, f, eps, pf) },
			Why: fmt.Sprintf("NG·f/√(1/(1−ε)² − (1 + NG/Aol)²) with each part's own Aol; as Aol → ∞ %s·%s·%.4g (ε = %s); %s for a part with no Aol (ε/4 left to it)",
				catalog.Format(ng, catalog.Dimensionless), Hz, floor/(ng*f),
				catalog.Format(eps, catalog.Ratio), catalog.Format(split, catalog.Hertz))})
	case "square":
		rise, err := in.Need("signal.rise")
		if err != nil {
			return sp, noted(err, "a square needs signal.rise")
		}
		if rise <= 0 {
			return sp, fieldErrorf("signal.rise", "%q is not positive, want a time such as \"2 us\"", in.Raw("signal.rise"))
		}
		sp.Rise = rise
		sp.Freq, _ = in.Num("signal.freq")
		s := catalog.Format(rise, catalog.Second)
		add(Requirement{Key: KeySlew, Bound: BoundMin, Value: circuit.SlewForStep(2*vo, rise), Dim: catalog.VoltPerSecond,
			Why: fmt.Sprintf("0.8·2Vo/rise = 0.8·2·%s/%s", V(vo), s)})
		add(Requirement{Key: KeyGBW, Bound: BoundMin, Value: circuit.GBWForRise(ng, rise), Dim: catalog.Hertz,
			Why: fmt.Sprintf("NG·0.35/rise = %s·0.35/%s", catalog.Format(ng, catalog.Dimensionless), s)})
	}
	// The aol floor is what DC alone allows: all of ε (NG·(1−ε)/ε). It is
	// necessary, not sufficient, for a sine: the gbw check then asks for
	// the loop gain at f that the part's own Aol leaves room for.
	epsDC, aolWhy := eps, "20·log10(NG·(1−ε)/ε) = 20·log10(%s·(1 − %s)/%s): all of ε = %s at DC, from NG/(1 + NG/Aol) = NG·(1 − ε); the gbw check counts what the part's Aol spends"
	if sp.Shape == "square" {
		aolWhy = "20·log10(NG·(1−ε)/ε) = 20·log10(%s·(1 − %s)/%s): all of ε = %s on the settled level, from NG/(1 + NG/Aol) = NG·(1 − ε); gbw here follows the rise time"
	}
	_, aolDB, err := circuit.AolForGainError(ng, epsDC)
	if err != nil {
		return sp, fmt.Errorf("field \"gain_error\": %w", err)
	}
	add(Requirement{Key: KeyAol, Bound: BoundMin, Value: aolDB, Dim: catalog.Decibel,
		Why: fmt.Sprintf(aolWhy, catalog.Format(ng, catalog.Dimensionless), catalog.Format(epsDC, catalog.Ratio),
			catalog.Format(epsDC, catalog.Ratio), catalog.Format(eps, catalog.Ratio))})

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
		sp.DriveR = driveR(vo, i)
		add(Requirement{Key: KeyOutputCurrent, Bound: BoundMin, Value: i, Dim: catalog.Ampere, Why: why})
	}
	if c, ok := in.Num("cload"); ok {
		add(Requirement{Key: KeyCLoad, Bound: BoundMin, Value: c, Dim: catalog.Farad,
			Why: "stable with the stage's load capacitance " + catalog.Format(c, catalog.Farad)})
	}
	if err := appendErrorBudgets(in, &sp, p, a.invR); err != nil {
		return sp, err
	}
	if a.invR > 0 {
		useInvertingInputR(&sp, a.invR, a.invName)
	}
	thd, err := readTHD(in, sp.Shape)
	if err != nil {
		return sp, err
	}
	if thd > 0 {
		add(thdRequirement(thd))
	}
	return sp, nil
}

// The notes of a sine stage's gbw check: which Aol its need was computed with.
const (
	noteGBWOwnAol   = "need with the part's own Aol: (1 + NG/Aol)² + (NG·f/GBW)² ≤ 1/(1−ε)²"
	noteGBWNoAol    = "the catalog gives no Aol: need with ε/4 left to an Aol at NG·(1−ε/4)/(ε/4)"
	noteGBWAolShort = "the part's own Aol alone spends the whole gain error (1 + NG/Aol ≥ 1/(1−ε)): no GBW is enough"
)

// gainErrorGBW is the gain-bandwidth a single-pole part of worst-case DC
// gain pf.Aol (dB; pf.AolRatio as a ratio) needs to keep a loop of noise gain ng within gain error
// eps at f (circuit.GBWForGainError with the part's own Aol), and a note.
// Without an Aol it is the ε/4 split (circuit.GainErrorBudget); with one
// that alone spends ε it is +Inf (the check fails by −100 %).
func gainErrorGBW(ng, f, eps float64, pf *PartFigures) (float64, string) {
	if pf.Aol.Known {
		if g, err := circuit.GBWForGainError(ng, f, eps, pf.AolRatio); err == nil {
			return g, noteGBWOwnAol
		}
		// The DC loop-gain error alone reaches ε: even a part whose aol
		// check passes at the limit (TieMargin) has nothing left for GBW.
		return math.Inf(1), noteGBWAolShort
	}
	g, _, _, err := circuit.GainErrorBudget(ng, f, eps)
	if err != nil {
		return math.NaN(), noteGBWNoAol
	}
	return g, noteGBWNoAol
}

// appendErrorBudgets adds the dc_error and noise allowances a stage sets;
// rp is the resistance the inverting input sees (Rf∥Rg), 0 when the stage
// gives no resistors.
func appendErrorBudgets(in *StageInput, sp *StagePlan, p *Plan, rp float64) error {
	ng := catalog.Format(sp.NoiseGain, catalog.Dimensionless)
	rs := catalog.Format(sp.SourceR, catalog.Ohm)
	if v, ok := in.Num("dc_error"); ok {
		sp.Requirements = append(sp.Requirements, Requirement{Key: KeyDCError, Bound: BoundMax, Value: v, Dim: catalog.Volt,
			Why: fmt.Sprintf("NG·(Vos + Ib·Rs + Ios·Rs/2) ≤ %s with NG = %s, Rs = %s", catalog.Format(v, catalog.Volt), ng, rs)})
	}
	v, ok := in.Num("noise")
	if !ok {
		return nil
	}
	band, order, err := readNoiseBand(in)
	if err != nil {
		return err
	}
	nb := noiseSetup{ng: sp.NoiseGain, rs: sp.SourceR, rp: rp, tempC: p.TempHigh, band: band, order: order}
	rpText := "no feedback resistors given"
	if rp > 0 {
		rpText = "Rf∥Rg = " + catalog.Format(rp, catalog.Ohm)
	}
	sp.Requirements = append(sp.Requirements, Requirement{Key: KeyNoise, Bound: BoundMax, Value: v, Dim: catalog.Volt,
		Measure: func(part *catalog.Part, f *PartFigures) Figure { return nb.output(part, f) },
		Why: fmt.Sprintf("NG·√(en²·(B + fe·ln(B/0.1 Hz)) + in²·(Rs² + Rp²)·(B + fi·ln(B/0.1 Hz)) + 4kT·(Rs + Rp)·B) ≤ %s rms with NG = %s, Rs = %s, %s, T = %.4g K, B = GBW/NG·atan(band·NG/GBW) (%s)",
			catalog.Format(v, catalog.Volt), ng, rs, rpText, circuit.KelvinFromCelsius(p.TempHigh),
			noiseBandText(band, order, "none, B = π/2·GBW/NG"))})
	return nil
}

// noiseSetup is what an amplifier's noise check needs besides the part.
type noiseSetup struct {
	ng, rs, rp, tempC, band float64
	order                   int
}

// output is the amplifier's output RMS noise on a part (circuit.AmpNoise)
// over the closed loop (−3 dB at GBW/NG) cascaded with the band's
// brick-wall equivalent (circuit.NoiseBandwidthLoopBand). A larger GBW
// widens the loop's noise bandwidth, so the worst case takes the part's
// largest credible GBW (PartFigures.GBWHigh: the typical, not derated,
// else the limit). in is needed only when a resistance is at an input.
func (n noiseSetup) output(p *catalog.Part, f *PartFigures) Figure {
	if !f.En.Known || !f.GBWHigh.Known || !(n.ng > 0) {
		return Figure{}
	}
	basis := weaker(f.En.Basis, f.GBWHigh.Basis)
	a := circuit.AmpNoise{En: f.En.V, EnCorner: p.EnCorner.V(), Rs: n.rs, Rp: n.rp,
		TempK: circuit.KelvinFromCelsius(n.tempC), NG: n.ng}
	if n.rs > 0 || n.rp > 0 {
		if !f.In.Known {
			return Figure{}
		}
		a.In, a.InCorner = f.In.V, p.InCorner.V()
		basis = weaker(basis, f.In.Basis)
	}
	band := 0.0
	if n.band > 0 {
		band = circuit.FilterNoiseBandwidth(n.band, n.order)
	}
	enbw := circuit.NoiseBandwidthLoopBand(circuit.ClosedLoopBandwidth(f.GBWHigh.V, n.ng), band)
	return Figure{V: a.OutputRMS(enbw), Known: true, Basis: basis, Note: f.En.Note}
}

// amplifierCircuit is the waveform preview of an amplifier stage: circuit
// c driven with the stage's signal around its ref. A square without a
// frequency repeats every squarePeriodRises allowed rise times.
func amplifierCircuit(sp *StagePlan, c sim.Circuit) (StageCircuit, error) {
	b := StageCircuit{Circuit: c}
	switch sp.Shape {
	case "sine":
		b.Input = sim.Input{Shape: sim.Sine, Peak: sp.Peak, Freq: sp.Freq, Offset: sp.Ref}
	case "square":
		f := sp.Freq
		if !(f > 0) {
			f = 1 / (squarePeriodRises * sp.Rise)
			b.Notes = append(b.Notes, fmt.Sprintf("the design gives the square no frequency; %s (a period of %d allowed rise times) is used",
				catalog.Format(f, catalog.Hertz), squarePeriodRises))
		}
		b.Input = sim.Input{Shape: sim.Square, Peak: sp.Peak, Freq: f, Offset: sp.Ref}
	default:
		return b, fmt.Errorf("stage %q: signal shape %q has no waveform preview, want sine or square", sp.Name, sp.Shape)
	}
	return b, nil
}
