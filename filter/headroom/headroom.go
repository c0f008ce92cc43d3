// Package headroom finds how far each continuous design input can move
// before a candidate stops passing: for each input a stage uses (signal
// frequency and peak, gain or the resistor that sets it, source and load
// resistance, capacitive load, allowed errors, bandwidth), each rail and
// each end of the temperature range, the value at which the part first
// fails with every other input held, and the requirement that breaks there.
//
// Where the breaking requirement is a monotonic closed form of the input
// (slew and gbw in the signal frequency, slew, output swing and input range
// in the signal peak, gbw, slew and swing in the gain; see closed.go) the
// limit is the formula's inverse, confirmed by evaluating the part just
// inside and just outside it. Everything else — and a closed form that the
// confirmation rejects — is found by bisection on the evaluator itself
// (filter.Derive + filter.Evaluate), to a relative tolerance of RelTol.
package headroom

import (
	"math"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// Method says how a limit was found.
type Method uint8

// The methods.
const (
	ClosedForm Method = iota // the inverse of a requirement formula, confirmed by evaluation
	Bisection                // bisection on the evaluator
)

// String returns "closed_form" or "bisection" (the JSON values of DESIGN.md).
func (m Method) String() string {
	if m == ClosedForm {
		return "closed_form"
	}
	return "bisection"
}

// Direction says on which side of the design's value a limit lies.
type Direction int8

// The directions.
const (
	Up   Direction = 1  // the part fails above Limit
	Down Direction = -1 // the part fails below Limit
)

// String returns "up" or "down".
func (d Direction) String() string {
	if d == Up {
		return "up"
	}
	return "down"
}

// Limit is one headroom figure of a candidate.
type Limit struct {
	Stage string // stage the input belongs to, "" for a design-level input
	// Input names the design key: "signal.freq", "gain", "supply.pos",
	// "environment.temp_high" (DESIGN.md "Contract additions").
	Input  string
	Dim    catalog.Dim
	Dir    Direction
	Value  float64        // the design's value of the input, SI
	Limit  float64        // the last value (SI) at which the part still passes
	Breaks filter.Binding // the requirement that fails beyond Limit
	Method Method
}

// Text is a short phrase for the limit: "good to 34.2 kHz — slew",
// "down to 4.4 V — photo/output_range" (the breaking check's stage is
// named when it is not the input's own).
func (l Limit) Text() string {
	word := "good to "
	if l.Dir == Down {
		word = "down to "
	}
	brk := string(l.Breaks.Key)
	if l.Breaks.Stage != "" && l.Breaks.Stage != l.Stage {
		brk = l.Breaks.Stage + "/" + brk
	}
	return word + catalog.Format(l.Limit, l.Dim) + " — " + brk
}

// Label names the input for text: "sense: signal.freq", "supply.pos".
func (l Limit) Label() string {
	if l.Stage == "" {
		return l.Input
	}
	return l.Stage + ": " + l.Input
}

// The search's tuning. The tolerances bound the bracket that bisection
// leaves; the reported limit is its passing end.
const (
	// RelTol is the bisection tolerance relative to the limit's magnitude
	// (for rails and temperatures: to the supply span and to 1 K).
	RelTol = 1e-5
	// confirmTol is how far inside and outside a closed-form limit the
	// part is evaluated to confirm it.
	confirmTol = 1e-5
	// maxRatio bounds the search of a positive input: ×/÷ this from the
	// design's value.
	maxRatio = 1e4
	// bisectSteps caps bisection iterations (2^-60 of the bracket).
	bisectSteps = 60
)

// input is one searchable design input.
type input struct {
	stage string // "" design-level
	name  string // contract name
	key   string // stage Values key, or "" for design-level
	dim   catalog.Dim
	value float64
	// additive inputs (rails, temperatures) step by unit·2^k; positive
	// inputs scale by 2^k.
	additive bool
	unit     float64
	// min, max bound the value the design accepts (NaN: none).
	min, max float64
	set      func(d *filter.Design, v float64)
	// only, when not 0, is the one direction searched (a temperature end
	// moved inward only narrows the range).
	only Direction
}

// dirs lists the directions searched for in.
func (in *input) dirs() []Direction {
	if in.only != 0 {
		return []Direction{in.only}
	}
	return []Direction{Up, Down}
}

// Find returns the headroom of part against the design d (already derived
// into plan): for every input, in each direction where the part fails
// within the searched range, the limit and what breaks there. A part that
// does not pass the design as it stands has no headroom (nil). o is the
// evaluation's options (Strict counts).
func Find(d *filter.Design, plan *filter.Plan, part *catalog.Part, o filter.Options) []Limit {
	o.Summary = false
	base := filter.Evaluate(plan, []*catalog.Part{part}, o)[0]
	if !base.Pass {
		return nil
	}
	s := &searcher{design: d, part: part, opts: o}
	var out []Limit
	for _, in := range inputs(d, plan) {
		for _, dir := range in.dirs() {
			if l, ok := s.limit(in, dir, plan, &base); ok {
				out = append(out, l)
			}
		}
	}
	return out
}

// First returns the limit of ls nearest to the design's value, relative
// to that value (the input with the least room), and false for none.
func First(ls []Limit) (Limit, bool) {
	best, bestR, ok := Limit{}, math.Inf(1), false
	for _, l := range ls {
		r := room(l)
		if r < bestR {
			best, bestR, ok = l, r, true
		}
	}
	return best, ok
}

// room is how far a limit lies from the design's value, as a fraction:
// the ratio's logarithm for a positive input, the distance over the
// value's magnitude (at least 1 V) for a rail, the distance over 100 K for
// a temperature.
func room(l Limit) float64 {
	switch {
	case l.Dim == catalog.Celsius:
		return math.Abs(l.Limit-l.Value) / 100
	case strings.HasPrefix(l.Input, "supply."):
		return math.Abs(l.Limit-l.Value) / math.Max(1, math.Abs(l.Value))
	case l.Value > 0 && l.Limit > 0:
		return math.Abs(math.Log(l.Limit / l.Value))
	}
	return math.Inf(1)
}

// searcher evaluates one part against edited copies of a design.
type searcher struct {
	design *filter.Design
	part   *catalog.Part
	opts   filter.Options
	evals  int // evaluations made, for tests and benchmarks
}

// outcome is the part's verdict with the input at one value.
type outcome struct {
	valid  bool           // the edited design derives
	pass   bool           // the part passes it
	breaks filter.Binding // a failing check when !pass
	fails  []filter.Binding
}

// at evaluates the part with in set to v.
func (s *searcher) at(in *input, v float64) outcome {
	s.evals++
	if !(in.min <= v) && !math.IsNaN(in.min) || !(v <= in.max) && !math.IsNaN(in.max) {
		return outcome{}
	}
	d := s.design.Clone()
	in.set(d, v)
	plan, err := filter.Derive(d)
	if err != nil {
		return outcome{}
	}
	r := filter.Evaluate(plan, []*catalog.Part{s.part}, s.opts)[0]
	o := outcome{valid: true, pass: r.Pass}
	if !r.Pass {
		o.breaks, o.fails = breaking(&r, s.opts.Strict)
	}
	return o
}

// breaking names the check that fails: a hard filter first (it has no
// margin), else the most negative margin; and lists every failing check.
// Under Options.Strict an unknown check fails too.
func breaking(r *filter.Result, strict bool) (filter.Binding, []filter.Binding) {
	var best filter.Binding
	bestM, hard := math.Inf(1), false
	var all []filter.Binding
	for i := range r.Checks {
		c := &r.Checks[i]
		if c.Status == filter.StatusPass || c.Status == filter.StatusUnknown && (!strict || c.NotRun) {
			continue
		}
		b := filter.Binding{Stage: c.Stage(), Key: c.Key()}
		all = append(all, b)
		switch {
		case !c.HasMargin() && !hard:
			best, hard = b, true
		case c.HasMargin() && !hard && c.Margin < bestM:
			best, bestM = b, c.Margin
		}
	}
	return best, all
}

// limit searches one input in one direction: a closed form when one
// applies and evaluation confirms it, else a bracket by stepping away from
// the design's value and bisection inside it.
func (s *searcher) limit(in input, dir Direction, plan *filter.Plan, base *filter.Result) (Limit, bool) {
	l := Limit{Stage: in.stage, Input: in.name, Dim: in.dim, Dir: dir, Value: in.value}
	if cf, key, ok := closedForm(in, dir, plan, base); ok && s.confirm(&in, dir, cf, key) {
		l.Limit, l.Breaks, l.Method = cf, key, ClosedForm
		return l, true
	}
	pass, fail, ok := s.bracket(&in, dir)
	if !ok {
		return l, false
	}
	lim, breaks := s.bisect(&in, pass, fail)
	l.Limit, l.Breaks, l.Method = lim, breaks, Bisection
	return l, true
}

// confirm evaluates the part just inside a closed-form limit (it must
// pass) and just outside it (it must fail on key).
func (s *searcher) confirm(in *input, dir Direction, lim float64, key filter.Binding) bool {
	if !(lim > 0) && !in.additive || math.IsInf(lim, 0) || math.IsNaN(lim) {
		return false
	}
	inside, outside := s.nudge(in, lim, -float64(dir)), s.nudge(in, lim, float64(dir))
	if a := s.at(in, inside); !a.valid || !a.pass {
		return false
	}
	b := s.at(in, outside)
	if !b.valid || b.pass {
		return false
	}
	for _, f := range b.fails {
		if f == key {
			return true
		}
	}
	return false
}

// nudge moves v by confirmTol (relative, or of the input's unit for an
// additive input) in direction sign.
func (s *searcher) nudge(in *input, v, sign float64) float64 {
	if in.additive {
		return v + sign*confirmTol*math.Max(in.unit, math.Abs(v))
	}
	return v * (1 + sign*confirmTol)
}

// step is the k-th trial value away from the design's value.
func step(in *input, dir Direction, k int) float64 {
	if in.additive {
		return in.value + float64(dir)*in.unit*math.Ldexp(1, k)/64
	}
	return in.value * math.Pow(2, float64(dir)*float64(k))
}

// bracket steps away from the design's value until the part fails; it
// returns the last passing and the first failing value. Where the edited
// design stops deriving (a rail past ref, a gain below 1) it closes in on
// that edge by halving, and gives up when no failure lies before it.
func (s *searcher) bracket(in *input, dir Direction) (pass, fail float64, ok bool) {
	pass = in.value
	for k := 0; ; k++ {
		v := step(in, dir, k)
		if !in.additive && (v/in.value > maxRatio || in.value/v > maxRatio) {
			return 0, 0, false
		}
		if in.additive && math.Abs(v-in.value) > in.unit*searchSpan {
			return 0, 0, false
		}
		o := s.at(in, v)
		if o.valid && o.pass {
			pass = v
			continue
		}
		if o.valid {
			return pass, v, true
		}
		// Past the design's own domain: look between the last pass and here.
		bad := v
		for range edgeSteps {
			mid := (pass + bad) / 2
			o := s.at(in, mid)
			switch {
			case !o.valid:
				bad = mid
			case o.pass:
				pass = mid
			default:
				return pass, mid, true
			}
		}
		return 0, 0, false
	}
}

// edgeSteps caps the halvings toward the edge of the design's domain
// (1/65536 of the last step).
const edgeSteps = 16

// searchSpan bounds an additive input's search: this many units either side.
const searchSpan = 40

// bisect narrows [pass, fail] to RelTol and returns the passing end and
// the requirement that breaks at the failing end.
func (s *searcher) bisect(in *input, pass, fail float64) (float64, filter.Binding) {
	var breaks filter.Binding
	o := s.at(in, fail)
	breaks = o.breaks
	scale := func() float64 {
		if in.additive {
			return math.Max(in.unit, math.Abs(pass))
		}
		return math.Abs(pass)
	}
	for range bisectSteps {
		if math.Abs(fail-pass) <= RelTol*scale() {
			break
		}
		mid := (pass + fail) / 2
		o := s.at(in, mid)
		if o.valid && o.pass {
			pass = mid
			continue
		}
		if o.valid {
			fail, breaks = mid, o.breaks
			continue
		}
		// An invalid design between a pass and a failure: treat as failing
		// ground and keep the requirement last seen failing.
		fail = mid
	}
	return pass, breaks
}
