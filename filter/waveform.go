package filter

import (
	"errors"
	"fmt"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/sim"
)

// StageCircuit is a stage turned into the time-domain model's terms
// (filter/sim): the circuit around the op-amp, its drive, and what a front
// end needs to show the run.
type StageCircuit struct {
	Circuit sim.Circuit
	Input   sim.Input
	// Duration is the run length of a Step input, s (0: the model's default).
	Duration float64
	// InTrace names the waveform's In trace when it shares the output's
	// volts and is worth drawing beside it ("input" of a comparator,
	// "capacitor" of an oscillator); "" when it is not.
	InTrace string
	// Notes are the choices and assumptions made building the circuit.
	Notes []string
}

// previewer is a template whose stages have a waveform preview: it builds
// the stage's circuit from what its Derive resolved into sp. part and f
// (the part's worst-case figures) are there for kinds whose circuit
// depends on the part (the transimpedance stage's feedback capacitor).
type previewer interface {
	circuit(sp *StagePlan, part *catalog.Part, f *PartFigures) (StageCircuit, error)
}

// ErrNoWaveform is wrapped by StagePlan.Circuit's error for a stage kind
// that has no waveform preview (direct, rail_splitter).
var ErrNoWaveform = errors.New("no waveform preview")

// HasWaveform reports whether stages of kind have a waveform preview.
// direct stages state their needs without a circuit, and a rail splitter
// holds a DC level: neither has one.
func HasWaveform(kind string) bool {
	t, ok := TemplateFor(kind)
	if !ok {
		return false
	}
	_, ok = t.(previewer)
	return ok
}

// WaveformKinds lists the stage kinds that have a waveform preview, in the
// order of KnownKinds.
func WaveformKinds() []string {
	var out []string
	for _, k := range KnownKinds() {
		if HasWaveform(k) {
			out = append(out, k)
		}
	}
	return out
}

// Circuit builds the stage's circuit for the time-domain model on part,
// whose worst-case figures are f (Figures). A kind without a template is
// an error, and so is one without a waveform (wrapping ErrNoWaveform).
func (sp *StagePlan) Circuit(part *catalog.Part, f *PartFigures) (StageCircuit, error) {
	t, ok := TemplateFor(sp.Kind)
	if !ok {
		return StageCircuit{}, fmt.Errorf("stage %q: %w", sp.Name, unknownKind(sp.Kind))
	}
	pv, ok := t.(previewer)
	if !ok {
		return StageCircuit{}, fmt.Errorf("stage %q: stage kind %s has %w", sp.Name, sp.Kind, ErrNoWaveform)
	}
	return pv.circuit(sp, part, f)
}

// values returns the circuit values under keys, as Derive resolved them;
// a missing one (a plan not made by Derive) is an error naming the stage
// and field.
func (sp *StagePlan) values(keys ...string) ([]float64, error) {
	out := make([]float64, len(keys))
	for i, k := range keys {
		v, ok := sp.Values[k]
		if !ok {
			return nil, fmt.Errorf("stage %q: field %q: not in the derived plan", sp.Name, k)
		}
		out[i] = v
	}
	return out, nil
}
