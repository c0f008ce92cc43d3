package filter

import (
	"math"
	"runtime"
	"sync"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
)

// Check notes; constant text so evaluation allocates nothing per check.
const (
	noteUnknown      = "the catalog lacks the figure"
	noteUnknownSide  = "the catalog lacks one side of the range"
	noteScaled       = "swing scaled to the load: headroom × R_spec/R_load (linear output-resistance approximation)"
	noteNoSwingLoad  = "swing load not stated; used as given"
	noteStrict       = "unknown figure counts as a failure (strict)"
	noteNoLifecycle  = "the catalog does not give the lifecycle"
	noteNoCost       = "the catalog does not give the unit cost"
	noteNoTemp       = "the catalog does not give the rated temperature range"
	noteNotSimulated = "not simulated: the part fails a closed-form check"
)

// Evaluate checks every part against every requirement of the plan at
// worst case. The worst-case figures of each part are computed once
// (Figures) and shared by all its checks. Simulated checks (thd) are a
// second pass, run only for a part that passes every closed-form check;
// for any other part they are not run (Check.NotRun). The results are in parts order;
// Rank sorts them. The Checks of all results share one backing array; with
// Options.Summary they are not kept (Result.Checks is nil) and Explain
// fills them in for the results a front end shows.
func Evaluate(plan *Plan, parts []*catalog.Part, o Options) []Result {
	nreq := len(plan.Global)
	for si := range plan.Stages {
		nreq += len(plan.Stages[si].Requirements)
	}
	n := len(plan.Stages)
	results := make([]Result, len(parts))
	var checks []Check
	if !o.Summary {
		checks = make([]Check, len(parts)*nreq)
	}
	fmax := make([]float64, len(parts)*n)
	ev := evaluator{plan: plan, strict: o.Strict, summary: o.Summary}
	run := func(lo, hi int) {
		// One figures buffer per worker: it is passed by pointer to the
		// checks (and to Measure hooks), which would otherwise move a
		// fresh copy to the heap for every part.
		f := new(PartFigures)
		var scratch []Check
		if o.Summary {
			scratch = make([]Check, nreq)
		}
		for i := lo; i < hi; i++ {
			r := &results[i]
			r.Part = parts[i]
			if o.Summary {
				r.Checks = scratch
			} else {
				r.Checks = checks[i*nreq : (i+1)*nreq : (i+1)*nreq]
			}
			r.FMax = fmax[i*n : (i+1)*n : (i+1)*n]
			ev.part(r, f)
			if o.Summary {
				r.Checks = nil
			}
		}
	}
	// Parts are independent: large catalogs are split over the CPUs, each
	// worker writing only its own range of the shared arrays.
	workers := min(runtime.GOMAXPROCS(0), len(parts)/parallelMin)
	if workers < 2 {
		run(0, len(parts))
		return results
	}
	var wg sync.WaitGroup
	chunk := (len(parts) + workers - 1) / workers
	for lo := 0; lo < len(parts); lo += chunk {
		hi := min(lo+chunk, len(parts))
		wg.Go(func() { run(lo, hi) })
	}
	wg.Wait()
	return results
}

// evaluator holds what is fixed for one plan.
type evaluator struct {
	plan    *Plan
	strict  bool
	summary bool // checks are not kept: skip Requirement.Aside
}

func (ev *evaluator) part(r *Result, f *PartFigures) {
	*f = Figures(r.Part, ev.plan)
	ev.totals(r, f)
	r.WorstMargin = math.NaN()
	r.Pass = true
	var g groupSum
	n := len(ev.plan.Global)
	ev.group(&g, r.Checks[:n], ev.plan.Global, nil, r, f)
	r.add(&g)
	for si := range ev.plan.Stages {
		sp := &ev.plan.Stages[si]
		ev.group(&g, r.Checks[n:n+len(sp.Requirements)], sp.Requirements, sp, r, f)
		n += len(sp.Requirements)
		r.add(&g)
		r.FMax[si] = g.fmax
	}
	if !ev.plan.hasSimulated() {
		return
	}
	if !r.Pass {
		return // the simulated checks stay not run (group)
	}
	n = len(ev.plan.Global)
	for si := range ev.plan.Stages {
		sp := &ev.plan.Stages[si]
		if sp.simulatedChecks() > 0 {
			ev.simGroup(&g, r.Checks[n:n+len(sp.Requirements)], sp, r, f)
			r.add(&g)
		}
		n += len(sp.Requirements)
	}
}

// hasSimulated reports whether a stage of the plan has a simulated check.
func (p *Plan) hasSimulated() bool {
	for si := range p.Stages {
		if p.Stages[si].simulatedChecks() > 0 {
			return true
		}
	}
	return false
}

// simulatedChecks counts the stage's simulated requirements.
func (sp *StagePlan) simulatedChecks() int {
	n := 0
	for i := range sp.Requirements {
		if sp.Requirements[i].Simulated {
			n++
		}
	}
	return n
}

// simGroup runs the simulated checks of stage sp into their slots of
// checks (the stage's checks, in requirement order) and sums them into g.
func (ev *evaluator) simGroup(g *groupSum, checks []Check, sp *StagePlan, r *Result, f *PartFigures) {
	*g = groupSum{margin: math.NaN(), fmax: math.NaN()}
	for i := range sp.Requirements {
		if q := &sp.Requirements[i]; q.Simulated {
			ev.check(&checks[i], q, sp, r.Part, f, r)
			ev.count(g, &checks[i], q)
		}
	}
}

// totals fills the part's package count, cost and supply current.
func (ev *evaluator) totals(r *Result, f *PartFigures) {
	p := r.Part
	ch := p.Channels
	if ch < 1 {
		ch = 1
	}
	n := len(ev.plan.Stages)
	r.Packages = (n + ch - 1) / ch
	r.Cost = math.NaN()
	if p.UnitCost.Known() {
		r.Cost = float64(r.Packages) * p.UnitCost.V()
	}
	r.SupplyCurrent = math.NaN()
	if f.Iq.Known {
		r.SupplyCurrent = float64(r.Packages*ch) * f.Iq.V
	}
}

// groupSum is the outcome of one group of a part's checks: the design-level
// requirements, or one stage's. A result is its groups added up in plan
// order (Result.add), so a group whose inputs did not change can be kept.
type groupSum struct {
	failed, unknown int
	fail            bool    // a check failed, or an unknown counts as failing (strict)
	margin          float64 // smallest margin of the group, NaN when none has one
	binding         Binding // the check with that margin, the first one on a tie
	fmax            float64 // a stage group's stageFMax
}

// group evaluates the requirements reqs of one group (sp nil for the
// design-level ones) into checks and g. r must have its totals.
func (ev *evaluator) group(g *groupSum, checks []Check, reqs []Requirement, sp *StagePlan, r *Result, f *PartFigures) {
	*g = groupSum{margin: math.NaN(), fmax: math.NaN()}
	for i := range reqs {
		q, c := &reqs[i], &checks[i]
		if q.Simulated {
			// The second pass (simGroup) fills it in for a part that
			// passes every closed-form check; for any other it stays not
			// run, counted nowhere.
			*c = Check{Req: q, Required: q.Value, Available: math.NaN(), AvailLow: math.NaN(), AvailHigh: math.NaN(),
				Margin: math.NaN(), Status: StatusUnknown, NotRun: true, Note: noteNotSimulated}
			continue
		}
		ev.check(c, q, sp, r.Part, f, r)
		ev.count(g, c, q)
	}
	if sp != nil {
		g.fmax = stageFMax(sp, f)
	}
}

// count adds one evaluated check c of requirement q into g.
func (ev *evaluator) count(g *groupSum, c *Check, q *Requirement) {
	switch c.Status {
	case StatusFail:
		g.failed++
		g.fail = true
	case StatusUnknown:
		g.unknown++
		if ev.strict {
			c.Note = noteStrict
			g.fail = true
		}
	}
	if c.HasMargin() && (math.IsNaN(g.margin) || c.Margin < g.margin) {
		g.margin = c.Margin
		g.binding = Binding{Stage: q.Stage, Key: q.Key}
	}
}

// add counts a group into the result: the worst margin stays the first
// smallest in plan order, as over a single list of every check.
func (r *Result) add(g *groupSum) {
	r.Failed += g.failed
	r.Unknown += g.unknown
	if g.fail {
		r.Pass = false
	}
	if !math.IsNaN(g.margin) && (math.IsNaN(r.WorstMargin) || g.margin < r.WorstMargin) {
		r.WorstMargin = g.margin
		r.Binding = g.binding
	}
}

// stageFMax is the highest sine frequency at the stage's output amplitude
// at which slew and gbw still pass: the inverses of the two requirement
// formulas, circuit.FullPowerBandwidth (of SlewForSine) and GBW over the
// part's gbw need at 1 Hz (gainErrorGBW, linear in f).
func stageFMax(sp *StagePlan, f *PartFigures) float64 {
	if !sp.HasFMax() || !f.Slew.Known || !f.GBW.Known {
		return math.NaN()
	}
	g1, _ := gainErrorGBW(sp.NoiseGain, 1, sp.GainError, f)
	if !(g1 > 0) {
		return math.NaN()
	}
	return math.Min(circuit.FullPowerBandwidth(f.Slew.V, sp.Vo), f.GBW.V/g1)
}

// check evaluates one requirement into c.
func (ev *evaluator) check(c *Check, q *Requirement, sp *StagePlan, p *catalog.Part, f *PartFigures, r *Result) {
	*c = Check{Req: q, Required: q.Value, Available: math.NaN(), AvailLow: math.NaN(), AvailHigh: math.NaN(), Margin: math.NaN()}
	if q.Aside != nil && !ev.summary {
		c.Aside = q.Aside(p, f)
	}
	if q.Need != nil {
		var note string
		c.Required, note = q.Need(p, f)
		ev.figure(c, q, sp, p, f, r)
		if c.Status != StatusUnknown && !ev.summary {
			c.Note = joinNote(c.Note, note)
		}
		return
	}
	ev.figure(c, q, sp, p, f, r)
}

// joinNote puts the note of a part's figure before a requirement's own.
func joinNote(fig, need string) string {
	if fig == "" {
		return need
	}
	return fig + "; " + need
}

// figure evaluates one requirement into c against c.Required.
func (ev *evaluator) figure(c *Check, q *Requirement, sp *StagePlan, p *catalog.Part, f *PartFigures, r *Result) {
	if q.Measure != nil {
		ev.numeric(c, q.Bound, q.Measure(p, f))
		return
	}
	rails := &ev.plan.Rails
	switch q.Key {
	case KeySupply:
		c.Basis = BasisGuaranteed
		ev.window(c, p.Supply.Min, p.Supply.Max, ev.plan.Rails.SpanMin)
	case KeyInputRange:
		w := f.Input
		c.Basis = w.Basis
		ev.window(c, optIf(rails.NegWorst+w.Low, w.LowKnown),
			optIf(rails.PosWorst+w.High, w.HighKnown), rails.SpanMin)
	case KeyOutputRange:
		load := 0.0
		if sp != nil {
			load = sp.SwingLoad()
		}
		w, scaled := f.OutputAt(load)
		c.Basis = w.Basis
		ev.window(c, optIf(rails.NegWorst+w.Low, w.LowKnown),
			optIf(rails.PosWorst+w.High, w.HighKnown), rails.SpanMin)
		if c.Note == "" {
			if scaled {
				c.Note = noteScaled
			} else if load > 0 && f.OutputLoad == 0 {
				c.Note = noteNoSwingLoad
			}
		}
	case KeySlew:
		ev.numeric(c, q.Bound, f.Slew)
	case KeyGBW:
		ev.numeric(c, q.Bound, f.GBW)
	case KeyAol:
		ev.numeric(c, q.Bound, f.Aol)
	case KeyOutputCurrent:
		ev.numeric(c, q.Bound, f.Iout)
	case KeyVos:
		ev.numeric(c, q.Bound, f.Vos)
	case KeyIb:
		ev.numeric(c, q.Bound, f.Ib)
	case KeyVdiff:
		ev.numeric(c, q.Bound, Figure{V: p.VdiffMax.V(), Known: p.VdiffMax.Known(), Basis: BasisGuaranteed})
	case KeyCLoad:
		ev.numeric(c, q.Bound, Figure{V: p.CLoad.V(), Known: p.CLoad.Known(), Basis: BasisGuaranteed})
	case KeyDCError:
		ev.numeric(c, q.Bound, dcError(sp, f))
	case KeyTHD:
		fig := ev.simulatedFigure(q, sp, p, f)
		ev.numeric(c, q.Bound, fig)
		if !fig.Known {
			c.Note = fig.Note
		}
	case KeySupplyCurrent:
		fig := f.Iq
		fig.V = r.SupplyCurrent
		ev.numeric(c, q.Bound, fig)
	case KeyTemperature, KeyPackage, KeyTech, KeyLifecycle, KeyCost:
		ev.hardCheck(c, q, p)
	default:
		ev.unknown(c, noteUnknown)
	}
}

// hardCheck evaluates one hard filter (temperature, package, tech,
// lifecycle, cost) of part p into c.
func (ev *evaluator) hardCheck(c *Check, q *Requirement, p *catalog.Part) {
	switch q.Key {
	case KeyTemperature:
		if !p.Temp[0].Known() || !p.Temp[1].Known() {
			ev.unknown(c, noteNoTemp)
			return
		}
		c.AvailLow, c.AvailHigh = p.Temp[0].V(), p.Temp[1].V()
		ev.hard(c, p.Temp[0].V() <= q.Low && q.High <= p.Temp[1].V())
	case KeyPackage:
		ok := false
		for _, pk := range q.Allowed {
			if p.HasPackage(pk) {
				ok = true
				break
			}
		}
		ev.hard(c, ok)
	case KeyTech:
		ev.hard(c, contains(q.Allowed, string(p.Tech)))
	case KeyLifecycle:
		if p.Lifecycle == "" {
			ev.unknown(c, noteNoLifecycle)
			return
		}
		ev.hard(c, contains(q.Allowed, string(p.Lifecycle)))
	case KeyCost:
		if !p.UnitCost.Known() {
			ev.unknown(c, noteNoCost)
			return
		}
		c.Available = p.UnitCost.V()
		ev.hard(c, p.UnitCost.V() <= q.Value)
	}
}

// dcError is the output-referred DC error of a stage whose inverting input
// sees no resistance, with worst-case figures: NG·(Vos + Ib·Rs + Ios·Rs/2),
// the + input's current being up to Ib + Ios/2 (biasDCError with Rp = 0);
// NG·(Vos + Ib·Rs) without an Ios figure, NG·Vos without a source
// resistance. Its basis is the weakest of the figures used.
func dcError(sp *StagePlan, f *PartFigures) Figure {
	if sp == nil || !f.Vos.Known {
		return Figure{}
	}
	if sp.SourceR > 0 {
		return biasDCError(f, sp.NoiseGain, sp.SourceR, 0)
	}
	return Figure{V: sp.NoiseGain * f.Vos.V, Known: true, Basis: f.Vos.Basis, Note: f.Vos.Note}
}

// weaker returns the weaker of two bases (guaranteed < typical < graph).
func weaker(a, b Basis) Basis {
	if b > a {
		return b
	}
	return a
}

// numeric fills a min or max check from the part's figure.
func (ev *evaluator) numeric(c *Check, b Bound, fig Figure) {
	if !fig.Known {
		ev.unknown(c, noteUnknown)
		return
	}
	c.Available, c.Basis, c.Note = fig.V, fig.Basis, fig.Note
	switch {
	case c.Req.Dim == catalog.Decibel:
		// Gains in dB compare as the linear ratios they stand for.
		d := fig.V - c.Required
		if b == BoundMax {
			d = -d
		}
		c.Margin = circuit.FromDB(d) - 1
	case b == BoundMin:
		c.Margin = fig.V/c.Required - 1
	case b == BoundMax:
		if fig.V <= 0 {
			c.Margin = math.Inf(1)
		} else {
			c.Margin = c.Required/fig.V - 1
		}
	}
	ev.settle(c)
}

// TieMargin is the magnitude below which a margin counts as exactly 0
// (DESIGN.md "Pass at the limit"): a part rated exactly at a limit passes
// although floating point puts its margin at −1e-16.
const TieMargin = 1e-9

// settle rounds a margin within TieMargin of zero to zero and sets Pass and
// Status from it (margin ≥ 0 passes).
func (ev *evaluator) settle(c *Check) {
	if math.Abs(c.Margin) < TieMargin {
		c.Margin = 0
	}
	c.Pass = c.Margin >= 0
	c.Status = StatusFail
	if c.Pass {
		c.Status = StatusPass
	}
}

// window fills a range check: the part's window [lo, hi] must cover the
// requirement's [Low, High]. Margin is the smaller spare in volts over span.
// With one side unknown the check fails if the known side fails, else is
// unknown.
// optIf is v as a figure when known is true, else the unset figure.
func optIf(v float64, known bool) catalog.Opt {
	if !known {
		return catalog.Opt{}
	}
	return catalog.Some(v)
}

func (ev *evaluator) window(c *Check, lo, hi catalog.Opt, span float64) {
	q := c.Req
	spare := math.Inf(1)
	if lo.Known() {
		c.AvailLow = lo.V()
		spare = math.Min(spare, q.Low-lo.V())
	}
	if hi.Known() {
		c.AvailHigh = hi.V()
		spare = math.Min(spare, hi.V()-q.High)
	}
	if !lo.Known() || !hi.Known() {
		if (lo.Known() || hi.Known()) && spare/span <= -TieMargin {
			c.Margin = spare / span
			c.Status, c.Note = StatusFail, noteUnknownSide
			return
		}
		ev.unknown(c, noteUnknownSide)
		return
	}
	c.Margin = spare / span
	ev.settle(c)
}

func (ev *evaluator) hard(c *Check, ok bool) {
	c.Pass = ok
	c.Status = StatusFail
	if ok {
		c.Status = StatusPass
	}
}

func (ev *evaluator) unknown(c *Check, note string) {
	c.Status, c.Note, c.Margin, c.Pass = StatusUnknown, note, math.NaN(), false
}

// Explain fills in r.Checks when r came from a Summary evaluation: it
// evaluates r's part again against plan, with the same outcome.
func Explain(plan *Plan, r *Result, o Options) {
	if r.Checks != nil {
		return
	}
	o.Summary = false
	*r = Evaluate(plan, []*catalog.Part{r.Part}, o)[0]
}
