package preview

import (
	"errors"
	"fmt"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/sim"
)

// Basis says which figures a preview ran on.
type Basis string

// The bases of a preview: the engine's worst-case figures (the default,
// so the picture agrees with the margins) or the catalog's typical ones.
const (
	WorstCase Basis = "worst_case"
	Typical   Basis = "typical"
)

// Options tune a preview. The zero value runs worst case with the model's
// default grid and window.
type Options struct {
	// Typical uses the typical figures (not derated) and the nominal rails
	// instead of the worst case.
	Typical bool
	// Sim is passed to sim.Run.
	Sim sim.Options
}

// Figure is one part figure the preview used, as it was resolved
// (filter.SimFigure: the preview and the simulated thd check build their
// amp the same way, filter.BuildAmp).
type Figure = filter.SimFigure

// Result is one part run in one stage.
type Result struct {
	Part  *catalog.Part
	Stage string // the stage's name
	Kind  string // the stage's kind
	Basis Basis
	// Figures are the part figures the amp was built from, with their basis.
	Figures []Figure
	// Amp, Circuit and Input are what the model ran.
	Amp     sim.Amp
	Circuit sim.Circuit
	Input   sim.Input
	// InTrace names Waveform.In when it shares the output's volts and is
	// worth drawing beside it ("input", "capacitor"); "" when it is not
	// (filter.StageCircuit.InTrace).
	InTrace string
	// Metrics are Waveform.Metrics; Waveform holds the sampled arrays.
	Metrics  sim.Metrics
	Waveform *sim.Waveform
	// Notes are the adapter's choices and assumptions followed by the
	// model's findings ("input pins swing … outside the common-mode
	// range", clipping, an oscillator that does not start).
	Notes []string
}

// Run simulates part in the stage of plan called stage. The amp uses the
// figures filter.Figures gives (or the typical ones with opts.Typical);
// the circuit and its drive come from the stage's plan.
func Run(plan *filter.Plan, stage string, part *catalog.Part, opts Options) (*Result, error) {
	if plan == nil || part == nil {
		return nil, errors.New("preview: a plan and a part are needed")
	}
	sp, err := findStage(plan, stage)
	if err != nil {
		return nil, err
	}
	if !filter.HasWaveform(sp.Kind) {
		return nil, fmt.Errorf("stage %q: stage kind %s has %w (pick a stage of kind %s)",
			sp.Name, sp.Kind, filter.ErrNoWaveform, strings.Join(filter.WaveformKinds(), ", "))
	}
	ab, err := filter.BuildAmp(plan, sp, part, opts.Typical)
	if err != nil {
		return nil, fmt.Errorf("stage %q: %w", sp.Name, err)
	}
	sb, err := sp.Circuit(part, &ab.Worst)
	if err != nil {
		return nil, err
	}
	so := opts.Sim
	if so.Duration == 0 {
		so.Duration = sb.Duration
	}
	w, err := sim.Run(sb.Circuit, ab.Amp, sb.Input, so)
	if err != nil {
		return nil, fmt.Errorf("stage %q: part %q: %w", sp.Name, part.ID, err)
	}
	res := &Result{Part: part, Stage: sp.Name, Kind: sp.Kind, Basis: WorstCase, Figures: ab.Figures,
		Amp: ab.Amp, Circuit: sb.Circuit, Input: sb.Input, InTrace: sb.InTrace, Metrics: w.Metrics, Waveform: w}
	if opts.Typical {
		res.Basis = Typical
	}
	res.Notes = append(res.Notes, ab.Notes...)
	res.Notes = append(res.Notes, sb.Notes...)
	res.Notes = append(res.Notes, w.Metrics.Notes...)
	res.Notes = append(res.Notes, ab.CheckCM(&w.Metrics)...)
	return res, nil
}

// Stages lists the names of the plan's stages that have a waveform, in
// design order.
func Stages(plan *filter.Plan) []string {
	var out []string
	for _, s := range plan.Stages {
		if filter.HasWaveform(s.Kind) {
			out = append(out, s.Name)
		}
	}
	return out
}

// FirstStage is the first stage of the plan that has a waveform; ok is
// false when none has.
func FirstStage(plan *filter.Plan) (name string, ok bool) {
	s := Stages(plan)
	if len(s) == 0 {
		return "", false
	}
	return s[0], true
}

func findStage(plan *filter.Plan, name string) (*filter.StagePlan, error) {
	var names []string
	for i := range plan.Stages {
		if plan.Stages[i].Name == name {
			return &plan.Stages[i], nil
		}
		names = append(names, fmt.Sprintf("%q", plan.Stages[i].Name))
	}
	return nil, fmt.Errorf("no stage %q in the design, want one of %s", name, strings.Join(names, ", "))
}
