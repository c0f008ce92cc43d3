package filter

import (
	"context"
	"fmt"
	"math"
	"runtime"
	"sort"
	"strings"
	"sync"
	"sync/atomic"

	"github.com/opsift/opsift/catalog"
)

// Incremental evaluates one set of parts against plan after plan, the way
// an interactive front end re-ranks on every keystroke, and re-computes
// only what an edit can have changed:
//
//   - each part's worst-case figures, kept while the temperature range and
//     the policy stay the same;
//   - the design-level checks (supply, temperature, hard filters, cost,
//     supply current), kept while the supply, environment, [choose],
//     policy and number of stages stay the same; they also decide once
//     which parts can pass at all (the candidates);
//   - each stage's checks, kept while that stage's inputs and the
//     design-level inputs stay the same, and evaluated part by part only
//     as far as they are asked for: Rank evaluates a stage only for the
//     candidates that passed the stages before it, Ranked and Evaluate for
//     every part;
//   - each part's simulated checks (thd) of a stage, with that stage's
//     checks: run in a second pass only for the parts that pass every
//     closed-form check, and only once per part while the stage is kept;
//   - each part's simulated figures of a stage, kept while what a
//     simulation reads stays the same (simKey: the figures' inputs, the
//     rails, the stage's kind and inputs other than the thd bound), so an
//     edit elsewhere — another stage, [choose], the thd allowance itself —
//     re-judges the kept figures instead of simulating again.
//
// Its results are those of Evaluate with Options.Summary, bit for bit.
// Work is split over the CPUs. Its methods may be called from several
// goroutines; the calls run one at a time, and a call whose context is
// cancelled stops early (what it finished is kept for the next call).
type Incremental struct {
	parts  []*catalog.Part
	strict bool

	mu     sync.Mutex
	figKey figureKey
	figs   []PartFigures // nil until computed
	global cachedGroup
	stages []stageGroup
	// keys and keyBuf are Ranked's rank keys and merge buffer, kept from
	// call to call (only Ranked, under mu, touches them).
	keys, keyBuf []rankKey
}

// NewIncremental returns an Incremental for parts; o.Strict applies to
// every evaluation (o.Summary is implied).
func NewIncremental(parts []*catalog.Part, o Options) *Incremental {
	return &Incremental{parts: parts, strict: o.Strict}
}

// Parts returns the parts the Incremental evaluates.
func (in *Incremental) Parts() []*catalog.Part { return in.parts }

// figureKey is everything of a plan that Figures reads.
type figureKey struct {
	tempLow, tempHigh, derate, inflate, speed, ibCold float64
}

func figureKeyOf(p *Plan) figureKey {
	return figureKey{p.TempLow, p.TempHigh, p.DerateTyp, p.InflateTyp, p.SpeedTempco, p.IbColdTempco}
}

// cachedGroup is the design-level group of checks evaluated for every part,
// with the key of the inputs it was evaluated from.
type cachedGroup struct {
	key  string
	sums []groupSum // nil when not evaluated
	// totals of each part: packages, cost, current.
	totals []partTotals
	// cand lists, in parts order, the parts whose design-level checks do
	// not fail: the only ones a stage can still let pass.
	cand []int
}

// stageGroup is one stage's group of checks, evaluated part by part.
type stageGroup struct {
	key  string
	sums []groupSum
	have []bool // have[k]: sums[k] is evaluated for key
	all  bool   // every have is true
	// nsim counts the stage's simulated checks; sims holds each part's
	// sum of them and simFigs their figures (nsim per part), filled in by
	// the second pass (simulated[k] says which).
	nsim      int
	sims      []groupSum
	simFigs   []Figure
	simulated []bool
	// simKey is what the stage's simulations were run from; figHave[k]
	// says simFigs holds part k's figures for it. They outlive a change of
	// key that keeps simKey, when sims are re-judged from the figures.
	simKey  string
	figHave []bool
}

type partTotals struct {
	packages      int
	cost, current float64
}

// designKey renders everything of a plan outside its stages that a check
// can depend on: figures, rails, the design-level requirements and the
// number of stages.
func designKey(p *Plan, strict bool) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%v|%v|%d|%t", figureKeyOf(p), p.Rails, len(p.Stages), strict)
	for i := range p.Global {
		q := &p.Global[i]
		fmt.Fprintf(&b, "|%s %s %d %v %v %v %v %v", q.Stage, q.Key, q.Bound, q.Value, q.Low, q.High, q.Dim, q.Allowed)
	}
	return b.String()
}

// stageKey renders the inputs a stage's checks are derived from: the
// design-level key, the stage's place, and its inputs as written.
func stageKey(design string, i int, s *Stage) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s|%d|%s|%s", design, i, s.Name, s.Kind)
	writeValues(&b, s, "")
	return b.String()
}

// writeValues renders the stage's inputs as written, in key order, all
// but the one named skip.
func writeValues(b *strings.Builder, s *Stage, skip string) {
	keys := make([]string, 0, len(s.Values))
	for k := range s.Values {
		if k != skip {
			keys = append(keys, k)
		}
	}
	sort.Strings(keys)
	for _, k := range keys {
		v := s.Values[k]
		fmt.Fprintf(b, "|%s=%q %v %t", k, v.Raw, v.V, v.Set)
	}
}

// simKeyOf renders everything a stage's simulations read (simulatedTHD:
// the part's figures, the rails, the stage plan its template derives from
// the stage's inputs, the rails and the temperature): the figures' key, the
// rails, the stage's kind and its inputs as written except thd, which is
// only the bound the figure is held to. The stage's name and place are
// left out: equal inputs simulate alike.
func simKeyOf(p *Plan, s *Stage) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%v|%v|%s", figureKeyOf(p), p.Rails, s.Kind)
	writeValues(&b, s, "thd")
	return b.String()
}

// checkEvery is how many parts a worker evaluates between looks at its
// context.
const checkEvery = 512

// Evaluate returns the summary results of every part against plan in
// parts order, as Evaluate(plan, parts, Options{Summary: true, Strict})
// does. When ctx is cancelled first it returns ctx's error and no results.
func (in *Incremental) Evaluate(ctx context.Context, plan *Plan) ([]Result, error) {
	in.mu.Lock()
	defer in.mu.Unlock()
	if err := in.evaluate(ctx, plan, true); err != nil {
		return nil, err
	}
	n, ns := len(in.parts), len(in.stages)
	out := make([]Result, n)
	fmax := make([]float64, n*ns)
	_ = inParallel(context.Background(), n, func(lo, hi int) {
		for k := lo; k < hi; k++ {
			in.result(&out[k], k, fmax[k*ns:(k+1)*ns:(k+1)*ns])
		}
	})
	return out, nil
}

// evaluate brings the kept figures and groups up to plan: the figures and
// the design-level group for every part, the stage groups for every part
// when every is true, else for the candidates only and for each of them
// only up to its first failing stage. The caller holds in.mu.
func (in *Incremental) evaluate(ctx context.Context, plan *Plan, every bool) error {
	n := len(in.parts)
	fk := figureKeyOf(plan)
	newFigs := in.figs == nil || fk != in.figKey
	dk := designKey(plan, in.strict)
	ev := evaluator{plan: plan, strict: in.strict, summary: true}
	maxReqs := len(plan.Global)
	for i := range plan.Stages {
		maxReqs = max(maxReqs, len(plan.Stages[i].Requirements))
	}
	if newFigs || in.global.sums == nil || in.global.key != dk {
		figs := in.figs
		if newFigs {
			figs = make([]PartFigures, n)
		}
		global := cachedGroup{key: dk, sums: make([]groupSum, n), totals: make([]partTotals, n)}
		err := inParallel(ctx, n, func(lo, hi int) {
			scratch := make([]Check, maxReqs)
			var r Result
			for k := lo; k < hi; k++ {
				f := &figs[k]
				if newFigs {
					*f = Figures(in.parts[k], plan)
				}
				r.Part = in.parts[k]
				ev.totals(&r, f)
				global.totals[k] = partTotals{r.Packages, r.Cost, r.SupplyCurrent}
				ev.group(&global.sums[k], scratch, plan.Global, nil, &r, f)
			}
		})
		if err != nil {
			return err // nothing of this step is kept
		}
		for k := range global.sums {
			if !global.sums[k].fail {
				global.cand = append(global.cand, k)
			}
		}
		in.figKey, in.figs, in.global = fk, figs, global
	}
	stages := in.stages
	if len(stages) != len(plan.Stages) {
		stages = make([]stageGroup, len(plan.Stages))
		copy(stages, in.stages)
	}
	var redo []int // stages with work left
	for i := range plan.Stages {
		st := plan.Stages[i].Stage
		if st == nil {
			st = &Stage{Name: plan.Stages[i].Name, Kind: plan.Stages[i].Kind}
		}
		g := &stages[i]
		if key := stageKey(dk, i, st); plan.Stages[i].Stage == nil || g.sums == nil || g.key != key {
			g.key, g.all = key, false
			if len(g.sums) != n {
				g.sums, g.have = make([]groupSum, n), make([]bool, n)
			} else {
				clear(g.have)
			}
			g.resetSims(plan, st, &plan.Stages[i], n)
		}
		if !g.all {
			redo = append(redo, i)
		}
	}
	in.stages = stages
	if len(redo) == 0 {
		return in.simulate(ctx, plan)
	}
	work := len(in.global.cand)
	if every {
		work = n
	}
	err := inParallel(ctx, work, func(lo, hi int) {
		scratch := make([]Check, maxReqs)
		var r Result
		for j := lo; j < hi; j++ {
			k := j
			if !every {
				k = in.global.cand[j]
			}
			if !every && in.failsKept(k) {
				continue // a stage kept from before fails it already
			}
			t := in.global.totals[k]
			r.Part, r.Packages, r.Cost, r.SupplyCurrent = in.parts[k], t.packages, t.cost, t.current
			for _, i := range redo {
				g := &stages[i]
				if !g.have[k] {
					sp := &plan.Stages[i]
					ev.group(&g.sums[k], scratch, sp.Requirements, sp, &r, &in.figs[k])
					g.have[k] = true
				}
				if !every && g.sums[k].fail {
					break // the part fails: later stages cannot make it pass
				}
			}
		}
	})
	if err != nil {
		return err // what was evaluated stays, marked in have
	}
	if every {
		for _, i := range redo {
			stages[i].all = true
		}
	}
	return in.simulate(ctx, plan) // the simulations finished are kept
}

// resetSims readies the group's simulated checks for a new stage key:
// every part's sum is to be judged again, and the figures are kept when
// the simulations they came from read the same inputs (simKeyOf) and the
// stage has as many simulated checks, else dropped. st is the stage's
// inputs (only its name and kind when sp.Stage is nil).
func (g *stageGroup) resetSims(plan *Plan, st *Stage, sp *StagePlan, n int) {
	k := sp.simulatedChecks()
	if k == 0 {
		g.nsim, g.sims, g.simFigs, g.simulated, g.simKey, g.figHave = 0, nil, nil, nil, "", nil
		return
	}
	key := simKeyOf(plan, st)
	if sp.Stage == nil || k != g.nsim || key != g.simKey || len(g.figHave) != n {
		// A stage without its inputs (a plan not from Derive) keeps nothing.
		g.simFigs, g.figHave = make([]Figure, n*k), make([]bool, n)
	}
	g.nsim, g.simKey = k, key
	g.sims, g.simulated = make([]groupSum, n), make([]bool, n)
}

// result assembles the summary result of part k from the kept groups,
// with fmax (one per stage) as its FMax. Every stage group must have k.
// The simulated checks of a part that passes every closed-form group are
// added after those groups, as Evaluate adds them.
func (in *Incremental) result(r *Result, k int, fmax []float64) {
	t := in.global.totals[k]
	*r = Result{Part: in.parts[k], Pass: true, WorstMargin: math.NaN(),
		Packages: t.packages, Cost: t.cost, SupplyCurrent: t.current, FMax: fmax}
	r.add(&in.global.sums[k])
	for i := range in.stages {
		g := &in.stages[i].sums[k]
		r.add(g)
		r.FMax[i] = g.fmax
	}
	if !r.Pass {
		return // the simulated checks were not run
	}
	for i := range in.stages {
		if st := &in.stages[i]; st.nsim > 0 {
			r.add(&st.sims[k])
		}
	}
}

// failsKept reports whether a stage group already evaluated for part k
// fails it.
func (in *Incremental) failsKept(k int) bool {
	for i := range in.stages {
		if g := &in.stages[i]; g.have[k] && g.sums[k].fail {
			return true
		}
	}
	return false
}

// passes reports whether candidate k passes every stage evaluated so far
// (after a candidates-only evaluate: every stage), its simulated checks
// included.
func (in *Incremental) passes(k int) bool {
	if !in.closedPass(k) {
		return false
	}
	for i := range in.stages {
		if g := &in.stages[i]; g.nsim > 0 && (!g.simulated[k] || g.sims[k].fail) {
			return false
		}
	}
	return true
}

// closedPass reports whether part k passes the design-level group and
// every stage group, each evaluated for it (the closed-form checks).
func (in *Incremental) closedPass(k int) bool {
	if in.global.sums[k].fail {
		return false
	}
	for i := range in.stages {
		if g := &in.stages[i]; !g.have[k] || g.sums[k].fail {
			return false
		}
	}
	return true
}

// Ranking is one plan's ranked evaluation: the passing candidates at
// once, in rank order, and every part in rank order on demand (All). It
// is what a front end shows on a keystroke when failing parts are hidden.
type Ranking struct {
	// Passing holds the results of the parts that pass, in rank order:
	// the first results of All, the same in every field.
	Passing []Result
	// Parts is the number of parts evaluated (passing or not).
	Parts int

	in   *Incremental
	plan *Plan
	key  SortKey
}

// All returns every part's result in rank order, failing parts included,
// as Ranked(ctx, plan, key) does for the Ranking's plan and key.
func (rk *Ranking) All(ctx context.Context) ([]Result, error) {
	return rk.in.Ranked(ctx, rk.plan, rk.key)
}

// Rank evaluates plan as far as the passing parts need (the design-level
// checks decide the candidates; a stage is evaluated only for candidates
// that passed the stages before it) and returns them ranked by key. Its
// Passing are the passing prefix of Ranked(ctx, plan, key).
func (in *Incremental) Rank(ctx context.Context, plan *Plan, key SortKey) (*Ranking, error) {
	in.mu.Lock()
	defer in.mu.Unlock()
	if err := in.evaluate(ctx, plan, false); err != nil {
		return nil, err
	}
	var pass []int
	for _, k := range in.global.cand {
		if in.passes(k) {
			pass = append(pass, k)
		}
	}
	// The passing results in parts order, then ranked: Rank's order is
	// total with the input order last, which here is the parts order, so
	// this is the passing prefix of Ranked.
	results := in.assemble(pass)
	Rank(results, key)
	return &Ranking{Passing: results, Parts: len(in.parts), in: in, plan: plan, key: key}, nil
}

// assemble returns the results of the parts idx names, in idx order.
func (in *Incremental) assemble(idx []int) []Result {
	ns := len(in.stages)
	results := make([]Result, len(idx))
	fmax := make([]float64, len(idx)*ns)
	_ = inParallel(context.Background(), len(idx), func(lo, hi int) {
		for i := lo; i < hi; i++ {
			in.result(&results[i], idx[i], fmax[i*ns:(i+1)*ns:(i+1)*ns])
		}
	})
	return results
}

// Ranked is Evaluate followed by Rank(results, key), the same results in
// the same order, without moving results: the rank keys are made from the
// kept groups and the results assembled in rank order.
func (in *Incremental) Ranked(ctx context.Context, plan *Plan, key SortKey) ([]Result, error) {
	in.mu.Lock()
	defer in.mu.Unlock()
	if err := in.evaluate(ctx, plan, true); err != nil {
		return nil, err
	}
	n, ns := len(in.parts), len(in.stages)
	if len(in.keys) != n {
		in.keys, in.keyBuf = make([]rankKey, n), make([]rankKey, n)
	}
	keys := in.keys
	if err := inParallel(ctx, n, func(lo, hi int) {
		var r Result
		fmax := make([]float64, ns)
		for k := lo; k < hi; k++ {
			in.result(&r, k, fmax)
			keys[k] = newRankKey(&r, k, key)
		}
	}); err != nil {
		return nil, err
	}
	sortParallelIn(keys, in.keyBuf, rankOrder(key))
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	idx := make([]int, n)
	for i := range keys {
		idx[i] = keys[i].idx
	}
	return in.assemble(idx), nil
}

// inParallel runs work over [0, n) in ranges on up to GOMAXPROCS
// goroutines, each range at most checkEvery long so that a cancelled ctx
// stops the work soon; it returns ctx's error when it was cancelled.
func inParallel(ctx context.Context, n int, work func(lo, hi int)) error {
	workers := max(1, min(runtime.GOMAXPROCS(0), n/parallelMin))
	var wg sync.WaitGroup
	var mu sync.Mutex
	next := 0
	take := func() (int, int, bool) {
		mu.Lock()
		defer mu.Unlock()
		if next >= n || ctx.Err() != nil {
			return 0, 0, false
		}
		lo := next
		next = min(n, next+checkEvery)
		return lo, next, true
	}
	for range workers {
		wg.Go(func() {
			for {
				lo, hi, ok := take()
				if !ok {
					return
				}
				work(lo, hi)
			}
		})
	}
	wg.Wait()
	return ctx.Err()
}

// lendSims puts the figures of the simulations kept from earlier plans
// into plan's memo, so that Explain on plan finds them and the second pass
// judges them without simulating again.
func (in *Incremental) lendSims(plan *Plan) {
	if plan.sims == nil {
		return
	}
	for i := range in.stages {
		st := &in.stages[i]
		if st.nsim == 0 {
			continue
		}
		sp := &plan.Stages[i]
		for k, done := range st.figHave {
			if !done {
				continue
			}
			j := 0
			for q := range sp.Requirements {
				if sp.Requirements[q].Simulated {
					plan.sims.put(&sp.Requirements[q], in.parts[k], st.simFigs[k*st.nsim+j])
					j++
				}
			}
		}
	}
}

// simulate is the second pass: it runs the simulated checks of every
// stage that has them for each part that passes every closed-form check
// and has not been simulated in that stage yet. The parts are spread over
// the CPUs one at a time (a simulation costs milliseconds); a cancelled
// ctx stops it between parts, and the parts finished are kept. The caller
// holds in.mu.
func (in *Incremental) simulate(ctx context.Context, plan *Plan) error {
	if !plan.hasSimulated() {
		return nil
	}
	in.lendSims(plan)
	var todo []int
	for k := range in.parts {
		if !in.closedPass(k) {
			continue
		}
		for i := range in.stages {
			if in.stages[i].nsim > 0 && !in.stages[i].simulated[k] {
				todo = append(todo, k)
				break
			}
		}
	}
	if len(todo) == 0 {
		return ctx.Err()
	}
	ev := evaluator{plan: plan, strict: in.strict, summary: true}
	maxReqs := 0
	for i := range plan.Stages {
		maxReqs = max(maxReqs, len(plan.Stages[i].Requirements))
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), len(todo)) {
		wg.Go(func() {
			scratch := make([]Check, maxReqs)
			var r Result
			for ctx.Err() == nil {
				j := int(next.Add(1)) - 1
				if j >= len(todo) {
					return
				}
				k := todo[j]
				t := in.global.totals[k]
				r = Result{Part: in.parts[k], Packages: t.packages, Cost: t.cost, SupplyCurrent: t.current}
				for i := range in.stages {
					st := &in.stages[i]
					if st.nsim == 0 || st.simulated[k] {
						continue
					}
					sp := &plan.Stages[i]
					ev.simGroup(&st.sims[k], scratch, sp, &r, &in.figs[k])
					j := 0
					for q := range sp.Requirements {
						if sp.Requirements[q].Simulated {
							st.simFigs[k*st.nsim+j], _ = plan.sims.get(&sp.Requirements[q], in.parts[k])
							j++
						}
					}
					st.simulated[k], st.figHave[k] = true, true
				}
			}
		})
	}
	wg.Wait()
	return ctx.Err()
}
