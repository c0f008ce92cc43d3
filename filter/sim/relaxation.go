package sim

import (
	"fmt"

	"github.com/opsift/opsift/filter/circuit"
)

// Relaxation is an astable multivibrator: R from the output charges C at
// the inverting input; a divider on the non-inverting input — R1 to Ref,
// R2 to the output — sets the thresholds
//
//	VTH = Ref + β·(VOH − Ref),  VTL = Ref + β·(VOL − Ref),  β = R1/(R1 + R2).
//
// The capacitor voltage is a state beside the amp node, so finite slew
// rate and GBW both lengthen the period. Run ignores its Input.
type Relaxation struct {
	R, C   float64 // Ω, F: the timing network
	R1, R2 float64 // Ω: R1 to Ref, R2 to the output
	Ref    float64 // V
}

// Kind names the stage.
func (Relaxation) Kind() string { return "relaxation" }

// Beta is the divider fraction R1/(R1 + R2) (circuit.HysteresisBeta).
func (c Relaxation) Beta() float64 { return circuit.HysteresisBeta(c.R1, c.R2) }

// Thresholds are the switching levels of the capacitor voltage for an
// output that swings between vol and voh (circuit.Thresholds).
func (c Relaxation) Thresholds(vol, voh float64) (vtl, vth float64) {
	vth, vtl = circuit.Thresholds(c.Ref, c.Beta(), vol, voh)
	return vtl, vth
}

// IdealTimes are the high and low times of the ideal astable (infinite
// slew rate and GBW) between vol and voh (circuit.HighTime, LowTime):
//
//	t_high = RC·ln((VOH − VTL)/(VOH − VTH)),  t_low = RC·ln((VTH − VOL)/(VTL − VOL)).
//
// It wants vol < Ref < voh, which the stage checks before it asks.
func (c Relaxation) IdealTimes(vol, voh float64) (tHigh, tLow float64, err error) {
	vtl, vth := c.Thresholds(vol, voh)
	if tHigh, err = circuit.HighTime(c.R, c.C, voh, vth, vtl); err != nil {
		return 0, 0, fmt.Errorf("sim: relaxation: %w", err)
	}
	if tLow, err = circuit.LowTime(c.R, c.C, vol, vth, vtl); err != nil {
		return 0, 0, fmt.Errorf("sim: relaxation: %w", err)
	}
	return tHigh, tLow, nil
}

func (c Relaxation) stage(a *ampParams) (*stage, error) {
	if err := firstErr(positive("relaxation", "r", c.R), positive("relaxation", "c", c.C),
		positive("relaxation", "r1", c.R1), positive("relaxation", "r2", c.R2),
		finite("relaxation", "ref", c.Ref)); err != nil {
		return nil, err
	}
	if c.Ref <= a.vol || c.Ref >= a.voh {
		return nil, fmt.Errorf("sim: relaxation: ref = %g V, want it inside the output swing %g V … %g V or it cannot oscillate",
			c.Ref, a.vol, a.voh)
	}
	b := c.Beta()
	rc := c.R * c.C
	s := &stage{kind: kindOscillator, inUnit: "V", timeScale: rc}
	s.sys = system{n: 2}
	// vd = v+ − v− = β·x + (1 − β)·Ref − vc.
	s.sys.c = vec{b, -1}
	s.sys.d = inputs{0, (1 - b) * c.Ref}
	// dvc/dt = (x − vc)/(RC).
	s.sys.p[1] = vec{1 / rc, -1 / rc}
	s.sys.plus.c[0] = b
	s.sys.plus.d = inputs{0, (1 - b) * c.Ref}
	s.sys.minus.c[1] = 1
	s.inTrace = &pin{c: vec{0, 1}}
	vtl, _ := c.Thresholds(a.vol, a.voh)
	th, tl, err := c.IdealTimes(a.vol, a.voh)
	if err != nil {
		return nil, err
	}
	s.osc = &astable{init: vec{a.voh, vtl}, tHigh: th, tLow: tl}
	return s, nil
}
