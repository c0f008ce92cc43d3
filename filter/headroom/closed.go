package headroom

import (
	"math"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/circuit"
)

// amplifierKinds are the stage kinds whose slew, gbw, aol, swing and drive
// requirements are the baseline derivations of DESIGN.md in the signal
// frequency, peak and gain, so their inverses below hold.
var amplifierKinds = map[string]bool{"follower": true, "noninverting": true, "inverting": true}

// closedForm returns the limit an input's monotonic requirements put on it
// when raised, and the requirement that sets it: the smallest of the
// inverses that apply. ok is false where no closed form is known (the
// input, the kind, a lowered input).
func closedForm(in input, dir Direction, plan *filter.Plan, base *filter.Result) (float64, filter.Binding, bool) {
	if dir != Up || in.stage == "" {
		return 0, filter.Binding{}, false
	}
	var sp *filter.StagePlan
	for i := range plan.Stages {
		if plan.Stages[i].Name == in.stage {
			sp = &plan.Stages[i]
		}
	}
	if sp == nil || !amplifierKinds[sp.Kind] {
		return 0, filter.Binding{}, false
	}
	checks := stageChecks(base, in.stage)
	var cands map[filter.Key]float64
	switch in.name {
	case "signal.freq":
		cands = freqLimits(sp, checks)
	case "signal.peak":
		cands = peakLimits(sp, checks)
	case "gain":
		cands = gainLimits(sp, checks)
	}
	best, key := math.Inf(1), filter.Key("")
	for k, v := range cands {
		if v > 0 && (v < best || v == best && k < key) {
			best, key = v, k
		}
	}
	if key == "" {
		return 0, filter.Binding{}, false
	}
	return best, filter.Binding{Stage: in.stage, Key: key}, true
}

// stageChecks indexes the known checks of one stage by key.
func stageChecks(r *filter.Result, stage string) map[filter.Key]*filter.Check {
	out := map[filter.Key]*filter.Check{}
	for i := range r.Checks {
		c := &r.Checks[i]
		if c.Stage() == stage && c.Status != filter.StatusUnknown {
			out[c.Key()] = c
		}
	}
	return out
}

// freqLimits: a sine's slew need 2π·f·Vo and its gbw need (circuit's
// GBWForGainError with the part's Aol, or GainErrorBudget without one) are
// linear in f; their inverses are the full-power bandwidth SR/(2π·Vo) and
// f·available/required (the two halves of filter's fmax).
func freqLimits(sp *filter.StagePlan, c map[filter.Key]*filter.Check) map[filter.Key]float64 {
	out := map[filter.Key]float64{}
	if sp.Shape != "sine" {
		return out
	}
	if s := c[filter.KeySlew]; s != nil && sp.Vo > 0 {
		out[filter.KeySlew] = circuit.FullPowerBandwidth(s.Available, sp.Vo)
	}
	if g := c[filter.KeyGBW]; g != nil && g.Required > 0 && sp.Freq > 0 {
		out[filter.KeyGBW] = sp.Freq * g.Available / g.Required
	}
	return out
}

// peakLimits: the output peak is G·Vp. Slew: a sine needs 2π·f·G·Vp, so
// Vp ≤ SR/(2π·f·G); a square 0.8·2·G·Vp/rise, so Vp ≤ SR·rise/(1.6·G).
// Swing and input range: windows ref ± k·Vp (k = G at the output, 1 or 0
// at the inputs) must stay inside what the part reaches, so
// Vp ≤ min(high − ref, ref − low)/k. Drive: Vo/load_r (+ Vo/feedback_r) is
// linear in Vp.
func peakLimits(sp *filter.StagePlan, c map[filter.Key]*filter.Check) map[filter.Key]float64 {
	out := map[filter.Key]float64{}
	if sp.Peak <= 0 || sp.Gain <= 0 {
		return out
	}
	if s := c[filter.KeySlew]; s != nil {
		switch sp.Shape {
		case "sine":
			out[filter.KeySlew] = s.Available / circuit.SlewForSine(sp.Freq, sp.Gain)
		case "square":
			out[filter.KeySlew] = s.Available / circuit.SlewForStep(2*sp.Gain, sp.Rise)
		}
	}
	for _, k := range []filter.Key{filter.KeyOutputRange, filter.KeyInputRange} {
		if w := c[k]; w != nil {
			if lim, ok := windowLimit(w, sp.Peak); ok {
				out[k] = lim
			}
		}
	}
	if i := c[filter.KeyOutputCurrent]; i != nil && i.Required > 0 {
		out[filter.KeyOutputCurrent] = sp.Peak * i.Available / i.Required
	}
	return out
}

// windowLimit inverts a range requirement ref ± k·x in x, k read from the
// requirement at the design's x: x ≤ min(high − ref, ref − low)/k.
func windowLimit(w *filter.Check, x float64) (float64, bool) {
	q := w.Req
	k := (q.High - q.Low) / (2 * x)
	if !(k > 0) || math.IsNaN(w.AvailLow) || math.IsNaN(w.AvailHigh) {
		return 0, false
	}
	ref := (q.High + q.Low) / 2
	return math.Min(w.AvailHigh-ref, ref-w.AvailLow) / k, true
}

// gainLimits: noise gain NG = G + (NG − G) (non-inverting: NG = G;
// inverting: NG = 1 + G). The aol floor is proportional to NG, and so is
// the gbw need of a square (rise) or of a sine on a part checked with the
// ε/4 split; a sine's gbw need with the part's own Aol is not, and its
// limit is the root of the single-pole error in NG
// (circuit.MaxNoiseGainForGainError). Slew, swing and drive are linear in G
// as in peakLimits; the DC error NG·(Vos + Ib·Rs) is linear in NG.
func gainLimits(sp *filter.StagePlan, c map[filter.Key]*filter.Check) map[filter.Key]float64 {
	out := map[filter.Key]float64{}
	g := sp.Gain
	if g <= 0 || sp.NoiseGain <= 0 {
		return out
	}
	off := sp.NoiseGain - g
	// The linear needs (NG·f/√(1/(1−ε)² − 1/(1−ε/4)²), NG·0.35/rise,
	// NG·(1−ε)/ε: circuit.GainErrorBudget, GBWForRise, AolForGainError)
	// scale NG by the check's own ratio available/required.
	if x := c[filter.KeyGBW]; x != nil && x.Required > 0 && (sp.Shape == "sine" || sp.Shape == "square") {
		out[filter.KeyGBW] = sp.NoiseGain*x.Available/x.Required - off
		if ng, ok := ownAolNoiseGain(sp, x, c[filter.KeyAol]); ok {
			out[filter.KeyGBW] = ng - off
		}
	}
	if x := c[filter.KeyAol]; x != nil && x.Required > 0 {
		out[filter.KeyAol] = sp.NoiseGain*circuit.FromDB(x.Available)/circuit.FromDB(x.Required) - off
	}
	if s := c[filter.KeySlew]; s != nil && sp.Peak > 0 {
		switch sp.Shape {
		case "sine":
			out[filter.KeySlew] = s.Available / circuit.SlewForSine(sp.Freq, sp.Peak)
		case "square":
			out[filter.KeySlew] = s.Available / circuit.SlewForStep(2*sp.Peak, sp.Rise)
		}
	}
	if w := c[filter.KeyOutputRange]; w != nil {
		if lim, ok := windowLimit(w, g); ok {
			out[filter.KeyOutputRange] = lim
		}
	}
	if i := c[filter.KeyOutputCurrent]; i != nil && i.Required > 0 {
		out[filter.KeyOutputCurrent] = g * i.Available / i.Required
	}
	if d := c[filter.KeyDCError]; d != nil && d.Available > 0 {
		out[filter.KeyDCError] = sp.NoiseGain*d.Required/d.Available - off
	}
	return out
}

// ownAolNoiseGain is the largest NG at which a sine's gbw check with the
// part's own Aol still passes: ok is false for a square, without a known
// aol check, or when the part's Aol alone spends ε (its gbw need is then
// the linear ε/4 split; filter's gainErrorGBW).
func ownAolNoiseGain(sp *filter.StagePlan, g, a *filter.Check) (float64, bool) {
	if sp.Shape != "sine" || a == nil || !(sp.Freq > 0) {
		return 0, false
	}
	aol := circuit.FromDB(a.Available)
	if _, err := circuit.GBWForGainError(sp.NoiseGain, sp.Freq, sp.GainError, aol); err != nil {
		return 0, false
	}
	ng, err := circuit.MaxNoiseGainForGainError(g.Available, aol, sp.Freq, sp.GainError)
	return ng, err == nil
}
