package replace

import (
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
)

// FitOf turns a filter evaluation into a Fit: pass, worst margin, binding
// check and the failing checks. A failing part's WorstMargin and Binding
// are those of its worst failing check (present.Worst), so a failing part
// never reads with a positive margin; Failed names a failing hard filter
// by its reason ("package not offered"), worst miss first. Result keeps r
// for a front end that shows every check.
func FitOf(r *filter.Result) Fit {
	f := Fit{Pass: r.Pass, Result: r, Binding: Binding{Stage: r.Binding.Stage, Key: string(r.Binding.Key)}}
	if m := present.ShownMargin(r); !math.IsNaN(m) {
		f.WorstMargin = catalog.Some(m)
	}
	if w := present.Worst(r); w != nil {
		f.Binding = Binding{Stage: w.Req.Stage, Key: string(w.Req.Key)}
	}
	for _, c := range present.FailingFirst(r) {
		if c.Status != filter.StatusFail {
			break
		}
		f.Failed = append(f.Failed, present.Reason(c))
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
