package headroom

import (
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// stageInputs are the stage keys searched, in report order, where the
// stage's kind takes them and the stage gives them (or they have a
// default): the continuous inputs of DESIGN.md "Contract additions".
// gain is searched where the stage gives it; rf where it sets the gain
// instead (the resistor form, the transimpedance gain).
var stageInputs = []string{
	"signal.freq", "signal.peak", "signal.rise", "gain", "rf", "source_r", "load_r", "cload",
	"gain_error", "freq_error", "bandwidth", "transition", "i_max",
}

// Temperature steps: the search moves a temperature end by tempUnit·2^k/64
// and looks at most searchSpan·tempUnit away.
const tempUnit = 10.0 // K

// inputs lists the searchable inputs of d: every stage's (stage order,
// then stageInputs order), then the rails and the temperature ends.
func inputs(d *filter.Design, plan *filter.Plan) []input {
	var out []input
	for i := range plan.Stages {
		sp := &plan.Stages[i]
		if sp.Stage == nil {
			continue
		}
		t, ok := filter.TemplateFor(sp.Kind)
		if !ok {
			continue
		}
		dims := map[string]catalog.Dim{}
		for _, p := range t.Params() {
			if p.Kind == filter.Quantity {
				dims[p.Key] = p.Dim
			}
		}
		in := filter.NewStageInput(sp.Stage, t)
		for _, key := range stageInputs {
			dim, ok := dims[key]
			if !ok || !in.Has(key) {
				continue
			}
			if key == "rf" && in.Given("gain") {
				continue
			}
			v, _ := in.Num(key)
			if !(v > 0) {
				continue
			}
			out = append(out, stageInput(sp.Name, key, dim, v))
		}
	}
	r := plan.Rails
	out = append(out,
		input{name: "supply.pos", dim: catalog.Volt, value: r.Pos, additive: true, unit: r.Span,
			min: math.NaN(), max: math.NaN(),
			set: func(d *filter.Design, v float64) { d.Supply.Pos = quantity(v, catalog.Volt) }},
		input{name: "supply.neg", dim: catalog.Volt, value: r.Neg, additive: true, unit: r.Span,
			min: math.NaN(), max: math.NaN(),
			set: func(d *filter.Design, v float64) { d.Supply.Neg = quantity(v, catalog.Volt) }},
		input{name: "environment.temp_low", dim: catalog.Celsius, value: plan.TempLow, additive: true, unit: tempUnit,
			min: -273.15, max: plan.TempHigh, only: Down,
			set: func(d *filter.Design, v float64) { d.Temp[0] = quantity(v, catalog.Celsius) }},
		input{name: "environment.temp_high", dim: catalog.Celsius, value: plan.TempHigh, additive: true, unit: tempUnit,
			min: plan.TempLow, max: math.NaN(), only: Up,
			set: func(d *filter.Design, v float64) { d.Temp[1] = quantity(v, catalog.Celsius) }},
	)
	return out
}

// stageInput is the searchable input key of stage name.
func stageInput(name, key string, dim catalog.Dim, v float64) input {
	return input{stage: name, name: key, key: key, dim: dim, value: v, min: 0, max: math.NaN(),
		set: func(d *filter.Design, x float64) {
			if s := d.Stage(name); s != nil {
				s.Values[key] = quantity(x, dim)
			}
		}}
}

// quantity is a design value holding x as if the user had written it.
func quantity(x float64, dim catalog.Dim) filter.Value {
	return filter.Value{Raw: catalog.Format(x, dim), V: x, Set: true}
}
