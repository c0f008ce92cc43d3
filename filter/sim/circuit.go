package sim

import (
	"fmt"
	"math"
)

// Circuit is a stage built around one amp: Follower, NonInverting,
// Inverting, Comparator, Relaxation, SallenKeyLowPass or Transimpedance.
// The set is closed; each type turns its component values into the linear
// network the integrator works on.
type Circuit interface {
	// Kind names the circuit for messages, in the words design files use
	// for the stage it models ("follower", …); the stage kinds themselves
	// live in package filter, which picks the circuit for each stage.
	Kind() string
	stage(a *ampParams) (*stage, error)
}

// stageKind selects which metrics apply.
type stageKind int

const (
	kindLinear     stageKind = iota // an amplifier or filter: peak error, THD
	kindComparator                  // open loop: transition time
	kindOscillator                  // free-running: frequency, duty
)

// stage is a Circuit prepared for one amp.
type stage struct {
	kind   stageKind
	sys    system
	inUnit string // unit of the input signal, "V" or "A"

	// The ideal response: an algebraic function of the input, or a linear
	// network integrated beside the stage, or (oscillators) the analytic
	// astable in osc.
	idealOf  func(s float64) float64
	idealSys *dyn
	idealOut pin
	osc      *astable

	// inTrace, when set, is what Waveform.In shows instead of the input
	// signal (the capacitor voltage of an oscillator).
	inTrace *pin

	// timeScale is the stage's slowest time constant, s: the default run
	// after a Step is stepTimeConstants of it.
	timeScale float64

	// edgeLo, edgeHi are the levels a comparator's transition time is
	// measured between (10–90 % of edgeHi − edgeLo), V.
	edgeLo, edgeHi float64
}

// astable is the ideal relaxation oscillator: infinite slew rate and GBW,
// output switching between the swing limits.
type astable struct {
	init  vec     // start: output at VOH, capacitor at the lower threshold
	tHigh float64 // s
	tLow  float64 // s
}

func positive(kind, field string, v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
		return fmt.Errorf("sim: %s: %s = %g, want a value above 0", kind, field, v)
	}
	return nil
}

func finite(kind, field string, v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return fmt.Errorf("sim: %s: %s = %g, want a finite number", kind, field, v)
	}
	return nil
}

func firstErr(errs ...error) error {
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

// closedLoopTime is 1/(2π·GBW/NG), the time constant of a resistive
// feedback stage, s.
func closedLoopTime(a *ampParams, noiseGain float64) float64 {
	return noiseGain / (2 * math.Pi * a.gbw)
}
