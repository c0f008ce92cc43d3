package filter

import (
	"errors"
	"fmt"
	"sync"
	"sync/atomic"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/sim"
)

// thdParam is the optional distortion limit of an amplifier stage.
func thdParam() Param {
	return Param{Key: "thd", Label: "allowed THD", Kind: Quantity, Dim: catalog.Ratio,
		Help: "largest allowed total harmonic distortion of the output (sine only; harmonics 2…10), checked by simulation on the parts that pass every other check; no check when not given"}
}

// The notes of a thd check: what the simulation found besides the number,
// or why it could not run. Constant text (Check.Note).
const (
	noteTHDFloor     = "under 0.0001 %, the model's floor: its only distortions are the slew clamp and the swing limits, and this output reaches neither"
	noteTHDClipped   = "the output reaches the swing limit in the simulation"
	noteTHDSlewing   = "the output is slew-limited for part of each period in the simulation"
	noteTHDNoFigures = "the catalog lacks gbw or slew, which the simulation needs"
	noteTHDNoRun     = "the simulation could not run this part in this stage"
)

// thdSimOptions are the time-domain model's settings for the thd check: a
// fixed grid (no adaptive refinement, to keep the check fast), with the
// model's default settling and window.
var thdSimOptions = sim.Options{PointsPerPeriod: thdPointsPerPeriod, SettlePeriods: thdSettlePeriods,
	MeasurePeriods: thdMeasurePeriods, MaxPoints: 2}

// thdWindowText states how the thd check measures, for why lines and docs.
var thdWindowText = fmt.Sprintf("harmonics 2…10 over the fundamental, DFT of %d periods after %d periods of settling, %d points per period",
	thdMeasurePeriods, thdSettlePeriods, thdPointsPerPeriod)

// THDMethod says how the thd check measures distortion: the harmonics
// counted and the window, as the check's why line states it.
func THDMethod() string { return thdWindowText }

// thdKinds lists the stage kinds that take a thd key, in KnownKinds order.
func thdKinds() []string {
	var out []string
	for _, k := range KnownKinds() {
		t, _ := TemplateFor(k)
		for _, p := range t.Params() {
			if p.Key == "thd" {
				out = append(out, k)
				break
			}
		}
	}
	return out
}

// readTHD reads a stage's thd (a fraction; 0 when not given) and checks it
// against the signal: a positive ratio, on a sine.
func readTHD(in *StageInput, shape string) (float64, error) {
	v, ok := in.Num("thd")
	if !ok {
		return 0, nil
	}
	if !(v > 0) {
		return 0, fieldErrorf("thd", "%q is not positive, want the largest allowed distortion such as \"1 %%\"", in.Raw("thd"))
	}
	if v >= 1 {
		return 0, fieldErrorf("thd", "%q is 100 %% or more, want the largest allowed distortion such as \"1 %%\"", in.Raw("thd"))
	}
	if shape != "sine" {
		return 0, fieldErrorf("thd", "given on a %s signal: THD is checked on a sine only, want signal.shape = \"sine\" or no thd", shape)
	}
	return v, nil
}

// thdRequirement is the simulated thd check of an amplifier stage with
// allowed distortion v (fraction).
func thdRequirement(v float64) Requirement {
	return Requirement{Key: KeyTHD, Bound: BoundMax, Value: v, Dim: catalog.Ratio, Simulated: true,
		Why: fmt.Sprintf("THD ≤ %s: simulated at worst-case figures and rails at tolerance, %s",
			catalog.Format(v, catalog.Ratio), thdWindowText)}
}

// simulatedTHD runs the stage on part p at its worst-case figures f (the
// amp BuildAmp makes, the circuit StagePlan.Circuit makes) and returns the
// THD the model measures, basis BasisSimulated. It is not Known when the
// part lacks a figure the model needs or the model cannot run it.
func simulatedTHD(plan *Plan, sp *StagePlan, p *catalog.Part, f *PartFigures) Figure {
	simRuns.Add(1)
	if sp == nil || !f.GBW.Known || !f.Slew.Known {
		return Figure{Note: noteTHDNoFigures}
	}
	b, err := buildAmp(plan, sp, p, f, false)
	if err != nil {
		return Figure{Note: noteTHDNoRun}
	}
	sc, err := sp.Circuit(p, f)
	if err != nil {
		return Figure{Note: noteTHDNoRun}
	}
	w, err := sim.Run(sc.Circuit, b.Amp, sc.Input, thdSimOptions)
	if err != nil || w.Metrics.THD == nil {
		return Figure{Note: noteTHDNoRun}
	}
	fig := Figure{V: *w.Metrics.THD, Known: true, Basis: BasisSimulated}
	switch {
	case fig.V < thdFloor:
		fig.V, fig.Note = thdFloor, noteTHDFloor
	case w.Metrics.Clipped:
		fig.Note = noteTHDClipped
	case w.Metrics.SlewingFraction > 0:
		fig.Note = noteTHDSlewing
	}
	return fig
}

// simRuns counts the calls of simulatedTHD, so that tests can tell which
// edits simulate again.
var simRuns atomic.Int64

// SimulatedTHD is the thd check's measurement of part p in the stage of
// plan named stage: the THD the time-domain model measures at worst-case
// figures, as the check uses it. It is an error when the stage does not
// exist or the part cannot be simulated there.
func SimulatedTHD(plan *Plan, stage string, p *catalog.Part) (float64, error) {
	for i := range plan.Stages {
		sp := &plan.Stages[i]
		if sp.Name != stage {
			continue
		}
		f := Figures(p, plan)
		fig := simulatedTHD(plan, sp, p, &f)
		if !fig.Known {
			return 0, fmt.Errorf("stage %q: part %q: %s", stage, p.ID, fig.Note)
		}
		return fig.V, nil
	}
	return 0, errors.New("no stage " + fmt.Sprintf("%q", stage) + " in the plan")
}

// simMemo keeps the figures of a plan's simulated checks, by requirement
// (a pointer into the plan) and part. A simulation's figure depends only
// on the plan and the part, so the ranking's second pass, Explain and the
// incremental evaluator's kept stages share it. Safe for concurrent use;
// a nil memo keeps nothing.
type simMemo struct {
	mu sync.Mutex
	m  map[simKey]Figure
}

type simKey struct {
	q *Requirement
	p *catalog.Part
}

func (s *simMemo) get(q *Requirement, p *catalog.Part) (Figure, bool) {
	if s == nil {
		return Figure{}, false
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	f, ok := s.m[simKey{q, p}]
	return f, ok
}

func (s *simMemo) put(q *Requirement, p *catalog.Part, f Figure) {
	if s == nil {
		return
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.m == nil {
		s.m = map[simKey]Figure{}
	}
	s.m[simKey{q, p}] = f
}

// simulatedFigure is the figure of simulated requirement q of stage sp on
// part p, from the plan's memo or, the first time, by simulation.
func (ev *evaluator) simulatedFigure(q *Requirement, sp *StagePlan, p *catalog.Part, f *PartFigures) Figure {
	if fig, ok := ev.plan.sims.get(q, p); ok {
		return fig
	}
	fig := simulatedTHD(ev.plan, sp, p, f)
	ev.plan.sims.put(q, p, fig)
	return fig
}
