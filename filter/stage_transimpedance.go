package filter

import (
	"fmt"
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

func init() { register(transimpedanceTemplate{}) }

// transimpedanceTemplate is a photodiode amplifier: the photocurrent flows
// into the inverting input, Rf ∥ Cf from there to the output, the
// non-inverting input at ref; Vout = ref ± I·Rf.
//
// Inputs (SI; defaults in brackets):
//
//	rf         Ω   feedback resistor (required)
//	cin        F   capacitance at the inverting input: detector + wiring (required);
//	               the part's own input capacitance (catalog cin) is added per part
//	bandwidth  Hz  wanted −3 dB bandwidth (required)
//	i_max      A   largest photocurrent (required)
//	ref        V   the non-inverting input's (and the dark output's) level [mid of the nominal rails]
//	polarity   —   positive: the output rises above ref with light; negative: falls [positive]
//	shunt_r    Ω   detector shunt resistance, sets the DC noise gain 1 + Rf/shunt_r [open]
//	load_r     Ω   resistive load at the output, to ref [none]
//	dc_error   V   allowed output DC error [no check]
//	noise      V   allowed output noise, rms [no check]
//	noise_band Hz  measurement or post-filter band the noise is integrated over [none:
//	               the stage's own response]
//	noise_order —  Butterworth order of that filter; 0 an ideal brick wall [0]
//
// Requirements (Graeme, Photodiode Amplifiers, 1996; from memory):
//
//	input_range     the point ref (the inputs sit at ref)
//	output_range    ref … ref ± i_max·Rf
//	gbw             the worst-case GBW at which the response with its Cf in the loop
//	                reaches f on every GBW from that worst case up to the part's
//	                typical (circuit.GBWForTIAFitted; Cin including the part's own
//	                cin), Cf the smallest without peaking over that span
//	                (circuit.FeedbackCapForTIASpan: in the usual stage the maximally
//	                flat Cf, Q = 1/√2, at the worst case): a per-part need
//	                (Requirement.Need), as the amplifier's gbw with its Aol. Each
//	                candidate's check carries that Cf (Aside "cf"); the floor with no
//	                spread is circuit.GBWForTIA
//	noise           with noise: output noise of en (gain peaking 1 + Cin/Cf), in and
//	                the thermal noise of Rf and shunt_r (circuit.TIANoise) ≤ allowed,
//	                with the same Cf on the part's typical (fastest credible) GBW
//	slew            0.8·i_max·Rf/(0.35/f): the full step within the rise time the
//	                bandwidth sets
//	output_current  i_max + i_max·Rf/load_r
//	dc_error        Vos·(1 + Rf/shunt_r) + Ib·Rf ≤ allowed
type transimpedanceTemplate struct{}

func (transimpedanceTemplate) Kind() string { return "transimpedance" }
func (transimpedanceTemplate) Summary() string {
	return "photodiode transimpedance amplifier (Rf, input capacitance, bandwidth)"
}

func (transimpedanceTemplate) Params() []Param {
	r := func(key, label string, dim catalog.Dim, help string) Param {
		return Param{Key: key, Label: label, Kind: Quantity, Dim: dim, Required: true, Help: help}
	}
	q := func(key, label string, dim catalog.Dim, help string) Param {
		return Param{Key: key, Label: label, Kind: Quantity, Dim: dim, Help: help}
	}
	return []Param{
		r("rf", "feedback resistor", catalog.Ohm, "feedback resistor Rf from the inverting input to the output"),
		r("cin", "input capacitance", catalog.Farad, "detector + wiring capacitance at the inverting input (the part's own cin is added)"),
		r("bandwidth", "bandwidth", catalog.Hertz, "wanted −3 dB bandwidth"),
		r("i_max", "largest photocurrent", catalog.Ampere, "largest photocurrent"),
		q("ref", "reference", catalog.Volt, "the non-inverting input and the dark output level; default: mid of nominal rails"),
		{Key: "polarity", Label: "output polarity", Kind: Choice, Choices: []string{"positive", "negative"}, Default: "positive",
			Help: "positive: the output rises above ref with light; negative: it falls below"},
		q("shunt_r", "detector shunt resistance", catalog.Ohm, "detector shunt resistance (DC noise gain 1 + Rf/shunt_r)"),
		q("load_r", "load resistance", catalog.Ohm, "resistive load at the output, to ref"),
		q("dc_error", "allowed DC error", catalog.Volt, "allowed output DC error, Vos·(1 + Rf/shunt_r) + Ib·Rf; no check when not given"),
		q("noise", "allowed noise", catalog.Volt, "allowed output noise, V rms (en with the Cin gain peaking, in, Rf thermal); no check when not given"),
		noiseBandParam(), noiseOrderParam(),
	}
}

// Notes of the transimpedance gbw check.
const (
	noteTIACin   = "the need counts the part cin beside the stage's: the part's own input capacitance adds to the detector's"
	noteTIANoCin = "the catalog gives no input capacitance; only the stage's cin is counted"
	// noteTIAFitted says which Cf the check judges and why the need can
	// exceed the derived floor.
	noteTIAFitted = "Cf is fitted maximally flat at the worst-case GBW (or, where a faster part would then peak, to the smallest Cf without peaking up to the typical GBW); the bandwidth holds only near the GBW it was fitted at (with the same Cf a faster part is overdamped and slower, up to −29 %), so the need covers the part's GBW up to its typical"
)

// tia is a transimpedance stage's circuit values.
type tia struct {
	rf, cin, f, imax, ng, rsh float64
}

func readTIA(in *StageInput) (tia, error) {
	var t tia
	var err error
	for _, f := range []struct {
		key string
		v   *float64
	}{{"rf", &t.rf}, {"cin", &t.cin}, {"bandwidth", &t.f}, {"i_max", &t.imax}} {
		if *f.v, err = tmplNeedPositive(in, f.key); err != nil {
			return t, err
		}
	}
	if err := tmplOptionalPositive(in, "shunt_r", "load_r", "dc_error", "noise", "noise_band"); err != nil {
		return t, err
	}
	t.ng = 1
	if rsh, ok := in.Num("shunt_r"); ok {
		t.ng = 1 + t.rf/rsh
		t.rsh = rsh
	}
	return t, nil
}

func (transimpedanceTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	sp := StagePlan{}
	t, err := readTIA(in)
	if err != nil {
		return sp, err
	}
	ref := tmplRef(in, p)
	vo := t.imax * t.rf
	sp.NoiseGain, sp.Vo, sp.Freq, sp.Ref = t.ng, vo, t.f, ref
	sp.Values = map[string]float64{"rf": t.rf, "cin": t.cin, "i_max": t.imax}
	sp.Texts = map[string]string{"polarity": in.Text("polarity")}
	sp.Rise = circuit.RiseBandwidth / t.f
	sp.LoadR, _ = in.Num("load_r")
	V := func(x float64) string { return catalog.Format(x, catalog.Volt) }
	Ohm := func(x float64) string { return catalog.Format(x, catalog.Ohm) }
	F := func(x float64) string { return catalog.Format(x, catalog.Farad) }
	Hz := catalog.Format(t.f, catalog.Hertz)
	I := catalog.Format(t.imax, catalog.Ampere)
	add := func(r Requirement) { sp.Requirements = append(sp.Requirements, r) }

	add(Requirement{Key: KeyInputRange, Bound: BoundRange, Low: ref, High: ref, Dim: catalog.Volt,
		Why: fmt.Sprintf("inputs sit at ref = %s", V(ref))})
	lo, hi, sign := ref, ref+vo, "+"
	if in.Text("polarity") == "negative" {
		lo, hi, sign = ref-vo, ref, "−"
	}
	add(Requirement{Key: KeyOutputRange, Bound: BoundRange, Low: lo, High: hi, Dim: catalog.Volt,
		Why: fmt.Sprintf("ref … ref %s i_max·Rf = %s … %s %s %s·%s", sign, V(ref), V(ref), sign, I, Ohm(t.rf))})
	gbw := circuit.GBWForTIA(t.rf, t.cin, t.f)
	cf := circuit.FeedbackCapForTIAFlat(t.rf, t.cin, gbw)
	gwhy := fmt.Sprintf("maximally flat (Q = 1/√2) with Cf in the loop: f = √(GBW/(2π·Rf·(Cin + Cf))) = %s with Rf = %s, Cin = %s (+ the part's own cin), Cf = %s; the shortcut 2π·Rf·Cin·f² = %s leaves Cf out; per part more, when its typical GBW is above the worst case (the Cf fitted there is slower on it)",
		Hz, Ohm(t.rf), F(t.cin), F(cf), catalog.Format(circuit.GBWForTIANoCf(t.rf, t.cin, t.f), catalog.Hertz))
	tc := t
	add(Requirement{Key: KeyGBW, Bound: BoundMin, Value: gbw, Dim: catalog.Hertz,
		Need: func(part *catalog.Part, f *PartFigures) (float64, string) { return tiaGBWNeed(part, f, tc, gbw) },
		Aside: func(part *catalog.Part, f *PartFigures) Aside {
			cf, _, ok := tiaFitCf(tc.rf, tc.cin, part, f)
			if !ok {
				return Aside{}
			}
			return Aside{Kind: AsideCf, V: cf}
		},
		Why: gwhy})
	add(Requirement{Key: KeySlew, Bound: BoundMin, Value: circuit.SlewForStep(vo, sp.Rise), Dim: catalog.VoltPerSecond,
		Why: fmt.Sprintf("0.8·i_max·Rf/(0.35/f) = 0.8·%s·%s/(0.35/%s)", I, Ohm(t.rf), Hz)})
	i, why := t.imax, "i_max = "+I
	if sp.LoadR > 0 {
		i += vo / sp.LoadR
		why = fmt.Sprintf("i_max + i_max·Rf/load_r = %s + %s/%s", I, V(vo), Ohm(sp.LoadR))
	}
	sp.DriveR = driveR(vo, i)
	add(Requirement{Key: KeyOutputCurrent, Bound: BoundMin, Value: i, Dim: catalog.Ampere, Why: why})
	if v, ok := in.Num("dc_error"); ok {
		rf, ng := t.rf, t.ng
		add(Requirement{Key: KeyDCError, Bound: BoundMax, Value: v, Dim: catalog.Volt,
			Measure: func(_ *catalog.Part, f *PartFigures) Figure { return tiaDCError(f, rf, ng) },
			Why: fmt.Sprintf("Vos·(1 + Rf/shunt_r) + (Ib + Ios/2)·Rf ≤ %s with 1 + Rf/shunt_r = %s, Rf = %s",
				V(v), catalog.Format(ng, catalog.Dimensionless), Ohm(rf))})
	}
	if v, ok := in.Num("noise"); ok {
		band, order, err := readNoiseBand(in)
		if err != nil {
			return sp, err
		}
		temp := p.TempHigh
		add(Requirement{Key: KeyNoise, Bound: BoundMax, Value: v, Dim: catalog.Volt,
			Measure: func(part *catalog.Part, f *PartFigures) Figure { return tiaNoise(part, f, tc, temp, band, order) },
			Why: fmt.Sprintf("√∫(en²·|1 + Zf/Zin|² + (in² + 4kT/Rf + 4kT/shunt_r)·|Zf|²)·|loop|² df ≤ %s rms: en sees the gain peaking 1 + Cin/Cf, Rf = %s, Cin = %s (+ part cin), the gbw check's Cf per part on its typical GBW, T = %.4g K, %s",
				V(v), Ohm(t.rf), F(t.cin), circuit.KelvinFromCelsius(temp), tiaBandText(band, order))})
	}
	return sp, nil
}

// partCin is the part's own input capacitance, 0 when the catalog lacks it.
func partCin(p *catalog.Part) float64 {
	if p != nil && p.Cin.Known() && p.Cin.V() > 0 {
		return p.Cin.V()
	}
	return 0
}

// tiaNoise is the transimpedance output noise on a part: its worst-case en
// and in (with their 1/f corners when given), on the circuit the user is
// told to build — tiaFitCf, the gbw check's "cf" — with the op-amp at its
// largest credible GBW (tiaFastGBW: with Cf fixed, more GBW carries the
// en·Cin gain peaking further up, so more noise).
func tiaNoise(p *catalog.Part, f *PartFigures, t tia, tempC, band float64, order int) Figure {
	cf, cin, ok := tiaFitCf(t.rf, t.cin, p, f)
	if !f.En.Known || !f.In.Known || !ok {
		return Figure{}
	}
	n := circuit.TIANoise{En: f.En.V, In: f.In.V, EnCorner: p.EnCorner.V(), InCorner: p.InCorner.V(),
		Rf: t.rf, Cf: cf, Cin: cin, Rsh: t.rsh, GBW: tiaFastGBW(f),
		TempK: circuit.KelvinFromCelsius(tempC), Band: band, Order: order}
	basis := weaker(weaker(weaker(f.En.Basis, f.In.Basis), f.GBWHigh.Basis), f.GBW.Basis)
	return Figure{V: n.OutputRMS(), Known: true, Basis: basis, Note: f.En.Note}
}

// tiaGBWNeed is the worst-case GBW the part needs
// (circuit.GBWForTIAFitted): the response with the Cf fitted as tiaFitCf
// fits it reaches the bandwidth at the stage's cin plus the part's own, on
// any GBW from the worst case up to the typical (the spread GBWHigh/GBW).
// Without a GBW figure the spread is 1 and the check is unknown anyway.
// floor is the need at the stage's cin with no spread (the requirement's
// Value), which a part without cin and spread needs, unsolved again.
func tiaGBWNeed(p *catalog.Part, f *PartFigures, t tia, floor float64) (float64, string) {
	spread := 1.0
	if f.GBW.Known && f.GBW.V > 0 {
		spread = tiaFastGBW(f) / f.GBW.V
	}
	c := partCin(p)
	if c > 0 {
		return circuit.GBWForTIAFitted(t.rf, t.cin+c, t.f, spread), noteTIAFitted + "; " + noteTIACin
	}
	if spread == 1 {
		return floor, noteTIAFitted + "; " + noteTIANoCin
	}
	return circuit.GBWForTIAFitted(t.rf, t.cin, t.f, spread), noteTIAFitted + "; " + noteTIANoCin
}

// tiaDCError is Vos·NG + (Ib + Ios/2)·Rf with worst-case figures: the
// inverting input's bias current, up to Ib + Ios/2 (Ib alone without an
// Ios figure), flows through Rf; the offset is amplified by the DC noise
// gain.
func tiaDCError(f *PartFigures, rf, ng float64) Figure {
	if !f.Vos.Known || !f.Ib.Known {
		return Figure{}
	}
	note := f.Vos.Note
	if f.Ib.Basis > f.Vos.Basis {
		note = f.Ib.Note
	}
	basis, ib := weaker(f.Vos.Basis, f.Ib.Basis), f.Ib.V
	if f.Ios.Known {
		ib += f.Ios.V / 2
		basis = weaker(basis, f.Ios.Basis)
	}
	return Figure{V: ng*f.Vos.V + ib*rf, Known: true, Basis: basis, Note: note}
}

// tiaFitCf is the feedback capacitor the user is told to fit on part p
// with worst-case figures f (the gbw check's "cf"), and the total input
// capacitance it was fitted with (the stage's cin plus the part's own):
// the smallest Cf that keeps the response free of peaking on every GBW
// from the part's worst case up to its typical
// (circuit.FeedbackCapForTIASpan) — in the usual stage the maximally flat
// Cf at the worst-case GBW. ok is false without a GBW figure.
func tiaFitCf(rf, cin float64, p *catalog.Part, f *PartFigures) (cf, cinTotal float64, ok bool) {
	if !f.GBW.Known || !(f.GBW.V > 0) {
		return 0, 0, false
	}
	cinTotal = cin + partCin(p)
	return circuit.FeedbackCapForTIASpan(rf, cinTotal, f.GBW.V, tiaFastGBW(f)), cinTotal, true
}

// tiaFastGBW is the part's largest credible GBW: the typical (GBWHigh)
// when it is above the worst case, else the worst case.
func tiaFastGBW(f *PartFigures) float64 {
	if f.GBWHigh.Known && f.GBWHigh.V > f.GBW.V {
		return f.GBWHigh.V
	}
	return f.GBW.V
}

// tiaFeedbackCap returns the feedback capacitor the user is told to fit on
// a part with worst-case figures f (tiaFitCf) and the −3 dB bandwidth it
// gives at the part's worst-case GBW (circuit.TIAResponse and
// LowPass2Bandwidth; = circuit.BandwidthTIA where that Cf is the flat
// one). ok is false when sp is not a derived transimpedance stage or the
// GBW is unknown.
func tiaFeedbackCap(sp *StagePlan, part *catalog.Part, f *PartFigures) (cf, bw float64, ok bool) {
	if sp == nil || sp.Kind != "transimpedance" {
		return 0, 0, false
	}
	v, err := sp.values("rf", "cin")
	if err != nil {
		return 0, 0, false
	}
	rf := v[0]
	cf, cin, ok := tiaFitCf(rf, v[1], part, f)
	if !ok {
		return 0, 0, false
	}
	f0, q := circuit.TIAResponse(rf, cin, cf, f.GBW.V)
	bw = circuit.LowPass2Bandwidth(f0, q)
	if math.IsNaN(bw) {
		return 0, 0, false
	}
	return cf, bw, true
}

// circuit is the stage with the Cf the user is told to fit
// (tiaFeedbackCap: the circuit as it would be built for the part; a
// typical run keeps it), driven by a light step of i_max
// shown over tiaStepRises rise times of the stage's bandwidth, so that
// parts share one time axis and a slow part is seen not to settle in time.
func (transimpedanceTemplate) circuit(sp *StagePlan, part *catalog.Part, f *PartFigures) (StageCircuit, error) {
	v, err := sp.values("rf", "cin", "i_max")
	if err != nil {
		return StageCircuit{}, err
	}
	rf, cin, imax := v[0], v[1], v[2]
	bw := sp.Freq
	cf, fit, ok := tiaFeedbackCap(sp, part, f)
	if !ok {
		return StageCircuit{}, fmt.Errorf("stage %q: part %q: no feedback capacitor can be chosen without a gbw figure", sp.Name, part.ID)
	}
	cin += partCin(part)
	step := imax
	if sp.Texts["polarity"] == "negative" {
		step = -imax
	}
	dur := tiaStepRises * sp.Rise // sp.Rise = 0.35/bandwidth
	return StageCircuit{
		Circuit:  sim.Transimpedance{Rf: rf, Cf: cf, Cin: cin, Ref: sp.Ref},
		Input:    sim.Input{Shape: sim.Step, Peak: step, At: tiaStepAt * dur},
		Duration: dur,
		Notes: []string{
			fmt.Sprintf("driven by a light step 0 … %s at %s, shown over %d rise times of the %s bandwidth; \"in\" is the photocurrent, A",
				catalog.Format(imax, catalog.Ampere), catalog.Format(tiaStepAt*dur, catalog.Second), tiaStepRises, catalog.Format(bw, catalog.Hertz)),
			tiaFitNote(rf, cin, cf, fit, f),
		},
	}, nil
}

// tiaFitNote says which Cf the stage is built with and that its bandwidth
// (fit, at the worst-case GBW) holds only near the GBW it was fitted at,
// with the bandwidth the same Cf gives at the typical GBW when that is
// higher.
func tiaFitNote(rf, cin, cf, fit float64, f *PartFigures) string {
	Hz := func(x float64) string { return catalog.Format(x, catalog.Hertz) }
	F := func(x float64) string { return catalog.Format(x, catalog.Farad) }
	fast := tiaFastGBW(f)
	if !(fast > f.GBW.V) {
		return fmt.Sprintf("Cf = %s, maximally flat at the part's worst-case gbw %s with Cin = %s: bandwidth %s; it holds only near that gbw (with the same Cf a faster part is overdamped and slower)",
			F(cf), Hz(f.GBW.V), F(cin), Hz(fit))
	}
	at := circuit.LowPass2Bandwidth(circuit.TIAResponse(rf, cin, cf, fast))
	sign := "+"
	if at < fit {
		sign = "−"
	}
	return fmt.Sprintf("Cf = %s, the smallest without peaking from the part's worst-case gbw %s to its typical %s, with Cin = %s: bandwidth %s at the worst case, %s at the typical (%s%.1f %%); it holds only near the gbw Cf was fitted at",
		F(cf), Hz(f.GBW.V), Hz(fast), F(cin), Hz(fit), Hz(at), sign, math.Abs(100*(at/fit-1)))
}
