package replace

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// Options tune Find. The zero value compares catalog figures only and
// leaves obsolete parts out.
type Options struct {
	// IncludeObsolete lists parts whose lifecycle is obsolete too.
	IncludeObsolete bool
	// OverTemperature compares the over-temperature limits (min_ot,
	// max_ot) where both parts give them; set it when the circuit's
	// temperature range leaves 25 °C.
	OverTemperature bool
	// Plan, when set, evaluates every candidate in the derived design
	// (filter.Evaluate) and ranks them by their worst margin. When the
	// plan's temperature range leaves 25 °C the over-temperature limits
	// are compared too, as if OverTemperature were set.
	Plan *filter.Plan
	// Strict, with Plan, makes a check whose figure the catalog lacks fail.
	Strict bool
	// Evaluate, when set and Plan is not, supplies the design fit of a
	// candidate itself: for a front end that already holds evaluated
	// results (FitOf turns one into a Fit).
	Evaluate func(p *catalog.Part) Fit
}

// Binding names the check that sets a candidate's worst margin.
type Binding struct {
	Stage string
	Key   string
}

// Fit is a candidate's evaluation against a design.
type Fit struct {
	Pass bool
	// WorstMargin is the smallest numeric margin over all stages (a
	// fraction; ≥ 0 passes); for a failing part that of its worst failing
	// check; unset when there is no such number.
	WorstMargin catalog.Opt
	Binding     Binding
	// Failed lists the checks that fail, worst miss first, as "stage/key"
	// ("key" for a design-level check) or, for a hard filter, its reason
	// ("package not offered").
	Failed []string
	// Result is the full evaluation when it came from filter (every check
	// with its margin and basis); nil otherwise.
	Result *filter.Result
}

// Candidate is one part that might take the original's place.
type Candidate struct {
	Part *catalog.Part
	// DropIn is true for the same non-empty pinout family, at least one
	// package in common and at least as many channels.
	DropIn bool
	// Footprint says why the part is or is not a drop-in, for people.
	Footprint string
	// Shared lists the packages both parts come in.
	Shared []string
	// Strict is true when no figure the original gives is worse or
	// missing in the candidate.
	Strict bool
	// Fields compares every figure, in the order of Keys.
	Fields []Field
	// Regressions and Improvements are the worse and better fields, most
	// circuit-breaking first.
	Regressions  []Change
	Improvements []Change
	// Missing lists the keys of figures the original gives and the
	// candidate's catalog entry does not: they cannot be shown to be no
	// worse, so they keep the candidate from being strict.
	Missing []string
	// Design is the evaluation against the design; nil without one.
	Design *Fit
}

// Result is everything Find found for one original part.
type Result struct {
	Original *catalog.Part
	// Candidates, best first. With a design: the passing parts, drop-ins
	// first, each group by worst margin (largest first), then the failing
	// ones in the same order. Without a design: drop-ins first; in each
	// group the strict parts, then the others by how mild their worst
	// regression is and how few regressions they have.
	Candidates []Candidate
	// ObsoleteLeftOut counts the obsolete parts Options.IncludeObsolete
	// would have listed.
	ObsoleteLeftOut int
	// Designed is true when the candidates were evaluated against a design.
	Designed bool
}

// Find lists the parts that could take orig's place, compared field by
// field. It never lists orig itself (by id) and leaves obsolete parts out
// unless opts ask for them. parts is not modified.
func Find(orig *catalog.Part, parts []*catalog.Part, opts Options) Result {
	res := Result{Original: orig, Designed: opts.Plan != nil || opts.Evaluate != nil}
	if opts.Plan != nil {
		opts.OverTemperature = opts.OverTemperature || leavesRoom(opts.Plan)
		opts.Evaluate = nil
	}
	for _, p := range parts {
		if p == nil || p == orig || p.ID == orig.ID {
			continue
		}
		if p.Lifecycle == catalog.LifecycleObsolete && !opts.IncludeObsolete {
			res.ObsoleteLeftOut++
			continue
		}
		res.Candidates = append(res.Candidates, candidate(orig, p, opts))
	}
	if opts.Plan != nil {
		evaluatePlan(res.Candidates, opts.Plan, opts.Strict)
	}
	sort.SliceStable(res.Candidates, func(i, j int) bool {
		return less(&res.Candidates[i], &res.Candidates[j])
	})
	return res
}

// candidate compares one part with the original.
func candidate(orig, p *catalog.Part, opts Options) Candidate {
	c := Candidate{Part: p, Fields: Compare(orig, p, opts.OverTemperature)}
	c.DropIn, c.Shared, c.Footprint = footprint(orig, p)
	c.Regressions = changes(c.Fields, Worse)
	c.Improvements = changes(c.Fields, Better)
	for _, f := range c.Fields {
		if f.Original.Set && !f.Candidate.Set {
			c.Missing = append(c.Missing, f.Key)
		}
	}
	c.Strict = len(c.Regressions) == 0 && len(c.Missing) == 0
	if opts.Evaluate != nil {
		fit := opts.Evaluate(p)
		c.Design = &fit
	}
	return c
}

// footprint decides whether p drops into orig's place and says why.
func footprint(orig, p *catalog.Part) (dropIn bool, shared []string, why string) {
	for _, pkg := range orig.Packages {
		if p.HasPackage(pkg) {
			shared = append(shared, pkg)
		}
	}
	var not []string
	switch {
	case orig.Pinout == "":
		not = append(not, "the original has no pinout family")
	case p.Pinout == "":
		not = append(not, "no pinout family given")
	case p.Pinout != orig.Pinout:
		not = append(not, fmt.Sprintf("pinout %s, not %s", p.Pinout, orig.Pinout))
	}
	if len(shared) == 0 {
		not = append(not, fmt.Sprintf("no package in common (%s)", listOr(p.Packages, "none given")))
	}
	if p.Channels < orig.Channels {
		s := "s"
		if p.Channels == 1 {
			s = ""
		}
		not = append(not, fmt.Sprintf("%d channel%s, not %d", p.Channels, s, orig.Channels))
	}
	if len(not) > 0 {
		return false, shared, "footprint change: " + strings.Join(not, "; ")
	}
	return true, shared, fmt.Sprintf("drop-in: pinout %s, %s", p.Pinout, strings.Join(shared, ", "))
}

func listOr(xs []string, empty string) string {
	if len(xs) == 0 {
		return empty
	}
	return strings.Join(xs, ", ")
}

// less orders candidates: with a design, passing ones first; then
// drop-ins first; then by design margin (largest first) or, without a
// design, strict first and by the mildness of the worst regression; then
// by id.
func less(a, b *Candidate) bool {
	if a.Design != nil && b.Design != nil && a.Design.Pass != b.Design.Pass {
		return a.Design.Pass
	}
	if a.DropIn != b.DropIn {
		return a.DropIn
	}
	if a.Design != nil && b.Design != nil {
		am, bm := a.Design.WorstMargin, b.Design.WorstMargin
		if am.Known() != bm.Known() {
			return am.Known()
		}
		if am.Known() && am.V() != bm.V() {
			return am.V() > bm.V()
		}
	}
	if a.Strict != b.Strict {
		return a.Strict
	}
	if ac, bc := worstClass(a), worstClass(b); ac != bc {
		return ac > bc
	}
	if len(a.Regressions) > 0 && len(b.Regressions) > 0 && a.Regressions[0].Key == b.Regressions[0].Key {
		// The same figure is worst for both: the smaller shortfall first
		// (a 16 V maximum supply before a 5.5 V one against 32 V).
		if sa, sb := shortfall(a.Regressions[0].Field), shortfall(b.Regressions[0].Field); sa != sb {
			return sa < sb
		}
	}
	if len(a.Regressions) != len(b.Regressions) {
		return len(a.Regressions) < len(b.Regressions)
	}
	if len(a.Missing) != len(b.Missing) {
		return len(a.Missing) < len(b.Missing)
	}
	return a.Part.ID < b.Part.ID
}

// worstClass is the class of the most circuit-breaking regression, or one
// past the last class when there is none.
func worstClass(c *Candidate) int {
	if len(c.Regressions) == 0 {
		return 8
	}
	return c.Regressions[0].Class
}

// shortfall measures how much worse a field is, comparable only between
// fields of the same key: the log ratio for figures compared relatively,
// the difference for rail offsets, temperatures and dB.
func shortfall(f *Field) float64 {
	a, b := math.Abs(f.Original.V), math.Abs(f.Candidate.V)
	if fieldDefs[f.index].tol == tolRel && a > 0 && b > 0 {
		return math.Abs(math.Log(b / a))
	}
	return math.Abs(f.Candidate.V - f.Original.V)
}
