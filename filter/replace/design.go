package replace

import (
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// FitOf turns a filter evaluation into a Fit: pass, worst margin, binding
// check and the failing checks. Result keeps r for a front end that shows
// every check.
func FitOf(r *filter.Result) Fit {
	f := Fit{Pass: r.Pass, Result: r, Binding: Binding{Stage: r.Binding.Stage, Key: string(r.Binding.Key)}}
	if !math.IsNaN(r.WorstMargin) {
		f.WorstMargin = catalog.Some(r.WorstMargin)
	}
	for _, c := range r.Failing() {
		name := string(c.Key())
		if c.Stage() != "" {
			name = c.Stage() + "/" + name
		}
		f.Failed = append(f.Failed, name)
	}
	return f
}

// evaluatePlan evaluates the candidates in plan in one batch and attaches
// each Fit.
func evaluatePlan(cs []Candidate, plan *filter.Plan, strict bool) {
	parts := make([]*catalog.Part, len(cs))
	for i := range cs {
		parts[i] = cs[i].Part
	}
	rs := filter.Evaluate(plan, parts, filter.Options{Strict: strict})
	for i := range cs {
		fit := FitOf(&rs[i])
		cs[i].Design = &fit
	}
}

// leavesRoom reports whether the plan's temperature range leaves 25 °C,
// where the over-temperature limits are the ones that apply.
func leavesRoom(plan *filter.Plan) bool {
	return plan.TempLow < filter.RoomTemp || plan.TempHigh > filter.RoomTemp
}
