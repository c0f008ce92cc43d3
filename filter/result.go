package filter

import (
	"math"

	"github.com/opsift/opsift/catalog"
)

// Status is the outcome of one check.
type Status uint8

// The outcomes of a check. StatusUnknown means the catalog lacks a figure
// the check needs: neither pass nor fail unless Options.Strict; or, with
// Check.NotRun, a simulated check not run on a part that fails anyway.
const (
	StatusPass Status = iota
	StatusFail
	StatusUnknown
)

// String returns "pass", "fail" or "unknown".
func (s Status) String() string {
	switch s {
	case StatusPass:
		return "pass"
	case StatusFail:
		return "fail"
	}
	return "unknown"
}

// Check is one requirement evaluated for one part. Numbers are SI. Margin
// is NaN when there is none (hard filters, unknown figures); otherwise
// Margin ≥ 0 ⇔ Pass.
type Check struct {
	Req       *Requirement // the requirement checked (Stage, Key, Bound, Why)
	Required  float64      // BoundMin/BoundMax: the requirement's value
	Available float64      // BoundMin/BoundMax: the part's worst-case figure (NaN unknown)
	// BoundRange: the part's window [AvailLow, AvailHigh] against the
	// requirement's [Req.Low, Req.High] (NaN for an unknown side).
	AvailLow, AvailHigh float64
	Margin              float64
	Pass                bool
	Status              Status
	Basis               Basis
	// NotRun marks a simulated check (Requirement.Simulated) left out
	// because the part fails a closed-form check: Status is unknown, but
	// it is not a missing figure, so it is not counted in Result.Unknown
	// and does not fail under Options.Strict.
	NotRun bool
	// Note explains an adjustment or why the check is unknown; constant text.
	Note string
	// Aside is the requirement's per-part quantity (Requirement.Aside),
	// zero when it has none or the evaluation kept no checks.
	Aside Aside
}

// Stage returns the stage the check belongs to ("" design-level).
func (c *Check) Stage() string { return c.Req.Stage }

// Key returns the requirement key checked.
func (c *Check) Key() Key { return c.Req.Key }

// HasMargin reports whether the check has a numeric margin.
func (c *Check) HasMargin() bool { return !math.IsNaN(c.Margin) }

// Binding names the check that sets a candidate's worst margin.
type Binding struct {
	Stage string
	Key   Key
}

// Result is one part evaluated against a plan.
type Result struct {
	Part *catalog.Part
	Pass bool
	// WorstMargin is the smallest numeric margin over every check, NaN when
	// no check has one. Binding names that check.
	WorstMargin float64
	Binding     Binding
	Packages    int     // ⌈stages / channels⌉
	Cost        float64 // Packages × unit cost; NaN when the unit cost is unknown
	// SupplyCurrent is Packages × channels × worst-case Iq, A; NaN unknown.
	SupplyCurrent float64
	Failed        int // number of failing checks
	Unknown       int // number of unknown checks
	Checks        []Check
	// FMax holds per stage (plan order) the highest sine frequency at the
	// stage's amplitude at which the slew and gbw checks still pass; NaN
	// when the stage has no sine signal or a figure is unknown.
	FMax []float64
}

// MinFMax returns the smallest FMax over the stages (NaN when none is known).
func (r *Result) MinFMax() float64 {
	m := math.NaN()
	for _, f := range r.FMax {
		if !math.IsNaN(f) && (math.IsNaN(m) || f < m) {
			m = f
		}
	}
	return m
}

// Failing returns the checks that fail, in check order.
func (r *Result) Failing() []*Check {
	var out []*Check
	for i := range r.Checks {
		if r.Checks[i].Status == StatusFail {
			out = append(out, &r.Checks[i])
		}
	}
	return out
}

// Options tune Evaluate.
type Options struct {
	// Strict makes an unknown check a failure.
	Strict bool
	// Summary keeps only each result's summary (pass, worst margin,
	// binding, counts, fmax), not its Checks: the per-keystroke path of an
	// interactive front end, which calls Explain for the rows it shows.
	Summary bool
}
