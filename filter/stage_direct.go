package filter

import (
	"fmt"

	"github.com/opsift/opsift/catalog"
)

// directTemplate is a stage that states its needs itself: the user has
// worked them out (or takes them from another tool) and opsift only checks
// parts against them.
type directTemplate struct{}

func init() { register(directTemplate{}) }

func (directTemplate) Kind() string    { return "direct" }
func (directTemplate) Summary() string { return "needs stated directly (no circuit template)" }
func (directTemplate) Params() []Param {
	q := func(key, label string, dim catalog.Dim, help string) Param {
		return Param{Key: key, Label: label, Kind: Quantity, Dim: dim, Help: help}
	}
	return []Param{
		{Key: "noise_gain", Label: "noise gain", Kind: Quantity, Dim: catalog.Dimensionless, Default: "1",
			Help: "noise gain NG, V/V (for dc_error and noise)"},
		{Key: "input", Label: "input range", Kind: Pair, Dim: catalog.Volt,
			Help: "[low, high] the inputs must be able to sit at, V"},
		{Key: "output", Label: "output range", Kind: Pair, Dim: catalog.Volt,
			Help: "[low, high] the output must reach, V"},
		q("load_r", "load resistance", catalog.Ohm, "load the output range is needed at (scales the swing)"),
		q("source_r", "source resistance", catalog.Ohm, "resistance the input sees (dc_error, noise)"),
		q("slew", "slew rate", catalog.VoltPerSecond, "slew rate needed"),
		q("gbw", "gain-bandwidth", catalog.Hertz, "gain-bandwidth product needed"),
		q("aol", "open-loop gain", catalog.Decibel, "open-loop gain needed"),
		q("iout", "output current", catalog.Ampere, "output current needed"),
		q("ib_max", "max bias current", catalog.Ampere, "largest input bias current allowed"),
		q("vos_max", "max offset", catalog.Volt, "largest input offset voltage allowed"),
		q("vdiff", "differential input", catalog.Volt, "largest differential voltage the inputs see"),
		q("cload", "load capacitance", catalog.Farad, "capacitive load the part must stay stable with"),
		q("dc_error", "allowed DC error", catalog.Volt, "allowed output-referred DC error"),
		q("noise", "allowed noise", catalog.Volt, "allowed output noise, V rms"),
		noiseBandParam(), noiseOrderParam(),
	}
}

func (directTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	ng, _ := in.Num("noise_gain")
	if ng < 1 {
		return StagePlan{}, fieldErrorf("noise_gain", "%q is below 1, want NG ≥ 1 V/V", in.Raw("noise_gain"))
	}
	sp := StagePlan{NoiseGain: ng}
	sp.SourceR, _ = in.Num("source_r")
	sp.LoadR, _ = in.Num("load_r")
	add := func(r Requirement) { sp.Requirements = append(sp.Requirements, r) }
	for _, w := range []struct {
		key string
		k   Key
	}{{"input", KeyInputRange}, {"output", KeyOutputRange}} {
		lo, okL := in.Num(w.key + ".low")
		hi, okH := in.Num(w.key + ".high")
		if okL != okH {
			return sp, fieldErrorf(w.key, "want both ends [low, high]")
		}
		if !okL {
			continue
		}
		if lo > hi {
			return sp, fieldErrorf(w.key, "low %s is above high %s, want [low, high]",
				catalog.Format(lo, catalog.Volt), catalog.Format(hi, catalog.Volt))
		}
		add(Requirement{Key: w.k, Bound: BoundRange, Low: lo, High: hi, Dim: catalog.Volt,
			Why: fmt.Sprintf("stated: %s … %s", catalog.Format(lo, catalog.Volt), catalog.Format(hi, catalog.Volt))})
	}
	for _, s := range []struct {
		key   string
		k     Key
		bound Bound
		dim   catalog.Dim
	}{
		{"slew", KeySlew, BoundMin, catalog.VoltPerSecond},
		{"gbw", KeyGBW, BoundMin, catalog.Hertz},
		{"aol", KeyAol, BoundMin, catalog.Decibel},
		{"iout", KeyOutputCurrent, BoundMin, catalog.Ampere},
		{"ib_max", KeyIb, BoundMax, catalog.Ampere},
		{"vos_max", KeyVos, BoundMax, catalog.Volt},
		{"vdiff", KeyVdiff, BoundMin, catalog.Volt},
		{"cload", KeyCLoad, BoundMin, catalog.Farad},
	} {
		v, ok := in.Num(s.key)
		if !ok {
			continue
		}
		if v <= 0 && s.dim != catalog.Decibel {
			return sp, fieldErrorf(s.key, "%q is not positive, want a value > 0", in.Raw(s.key))
		}
		add(Requirement{Key: s.k, Bound: s.bound, Value: v, Dim: s.dim, Why: "stated: " + s.key + " = " + in.Raw(s.key)})
	}
	if err := appendErrorBudgets(in, &sp, p, 0); err != nil {
		return sp, err
	}
	return sp, nil
}
