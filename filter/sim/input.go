package sim

import (
	"fmt"
	"math"
)

// Shape selects the waveform of an Input.
type Shape int

// The input shapes. A free-running circuit (Relaxation) ignores its input.
const (
	// None is no input; only free-running circuits accept it.
	None Shape = iota
	// Sine is Offset + Peak·sin(2π·Freq·t), starting at phase 0.
	Sine
	// Square starts low (Offset − Peak) with a rising edge at t = 0 and
	// a falling edge at half the period. Edges are linear ramps whose
	// 10–90 % time is Rise.
	Square
	// Step holds Offset until At, then ramps to Offset + Peak with a 10–90 %
	// time of Rise and stays there.
	Step
)

// String names the shape as design files spell it.
func (s Shape) String() string {
	switch s {
	case None:
		return "none"
	case Sine:
		return "sine"
	case Square:
		return "square"
	case Step:
		return "step"
	}
	return fmt.Sprintf("shape(%d)", int(s))
}

// Input is the signal at a stage input: a voltage, or for Transimpedance
// the photocurrent in amperes.
type Input struct {
	Shape Shape
	// Peak is the amplitude about Offset (V or A); for Step the size of
	// the step, which may be negative.
	Peak float64
	// Freq is the repetition frequency of Sine and Square, Hz.
	Freq float64
	// Offset is the level the signal is centred on (usually the stage's
	// ref), or the level before a Step.
	Offset float64
	// Rise is the 10–90 % time of Square and Step edges, s. Zero means an
	// edge of one millionth of the period (Square) or of the run (Step).
	Rise float64
	// At is the time of a Step, s.
	At float64
}

// validate checks the input for a driven circuit.
func (in Input) validate() error {
	fin := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	if !fin(in.Peak) || !fin(in.Offset) || !fin(in.Rise) || !fin(in.At) || !fin(in.Freq) {
		return fmt.Errorf("sim: input: values must be finite numbers, got peak %g, offset %g, freq %g, rise %g, at %g",
			in.Peak, in.Offset, in.Freq, in.Rise, in.At)
	}
	switch in.Shape {
	case Sine, Square:
		if in.Freq <= 0 {
			return fmt.Errorf("sim: input: %s freq = %g Hz, want above 0 Hz", in.Shape, in.Freq)
		}
		if in.Peak < 0 {
			return fmt.Errorf("sim: input: %s peak = %g, want 0 or more", in.Shape, in.Peak)
		}
		if in.Shape == Square && (in.Rise < 0 || in.Rise/0.8 >= 0.5/in.Freq) {
			return fmt.Errorf("sim: input: square rise = %g s, want 0 or more and shorter than 0.8 × half the period (%g s)",
				in.Rise, 0.4/in.Freq)
		}
	case Step:
		if in.Rise < 0 || in.At < 0 {
			return fmt.Errorf("sim: input: step rise = %g s, at = %g s, want both 0 or more", in.Rise, in.At)
		}
	case None:
		return fmt.Errorf("sim: input: shape none, want sine, square or step for a driven stage")
	default:
		return fmt.Errorf("sim: input: unknown shape %d, want sine, square or step", int(in.Shape))
	}
	return nil
}

// source is an Input prepared for the integrator: piecewise-linear edges
// with known breakpoints, and a sine evaluated exactly at any time.
type source struct {
	in    Input
	per   float64 // period, s (Sine, Square)
	ramp  float64 // 0–100 % edge duration, s (Square, Step)
	level float64 // held value when Shape is None
}

func newSource(in Input, duration float64) source {
	s := source{in: in}
	switch in.Shape {
	case Sine:
		s.per = 1 / in.Freq
	case Square:
		s.per = 1 / in.Freq
		s.ramp = math.Max(in.Rise/0.8, 1e-6*s.per)
	case Step:
		s.ramp = math.Max(in.Rise/0.8, 1e-9*duration)
	}
	return s
}

// at is the input value at time t.
func (s *source) at(t float64) float64 {
	in := &s.in
	switch in.Shape {
	case Sine:
		return in.Offset + in.Peak*math.Sin(2*math.Pi*in.Freq*t)
	case Square:
		p := t - math.Floor(t/s.per)*s.per
		half := s.per / 2
		lo, hi := in.Offset-in.Peak, in.Offset+in.Peak
		switch {
		case p < s.ramp:
			return lo + (hi-lo)*p/s.ramp
		case p < half:
			return hi
		case p < half+s.ramp:
			return hi - (hi-lo)*(p-half)/s.ramp
		default:
			return lo
		}
	case Step:
		switch {
		case t <= in.At:
			return in.Offset
		case t < in.At+s.ramp:
			return in.Offset + in.Peak*(t-in.At)/s.ramp
		default:
			return in.Offset + in.Peak
		}
	}
	return s.level
}

// nextBreak is the first corner of the piecewise-linear input after time
// t, and whether there is one. A sine has none: between grid points it is
// taken as a chord.
func (s *source) nextBreak(t float64) (float64, bool) {
	in := &s.in
	switch in.Shape {
	case Square:
		half := s.per / 2
		base := math.Floor(t/half) * half
		for _, c := range [...]float64{base, base + s.ramp, base + half, base + half + s.ramp} {
			if c > t {
				return c, true
			}
		}
	case Step:
		for _, c := range [...]float64{in.At, in.At + s.ramp} {
			if c > t {
				return c, true
			}
		}
	}
	return 0, false
}
