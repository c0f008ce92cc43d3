package sim

import (
	"fmt"
	"math"
)

// Follower is a unity-gain buffer: the input drives the non-inverting
// input, the output is tied to the inverting input.
type Follower struct{}

// Kind names the stage.
func (Follower) Kind() string { return "follower" }

func (Follower) stage(a *ampParams) (*stage, error) {
	s := &stage{kind: kindLinear, inUnit: "V", timeScale: closedLoopTime(a, 1)}
	s.sys = system{n: 1}
	s.sys.c[0] = -1
	s.sys.d = inputs{1, 0}
	s.sys.plus.d = inputs{1, 0}
	s.sys.minus.c[0] = 1
	s.idealOf = func(v float64) float64 { return v }
	return s, nil
}

// NonInverting is a non-inverting amplifier: the input drives the
// non-inverting input; Rf runs from the output to the inverting input and
// Rg from there to Ref. Gain 1 + Rf/Rg about Ref.
type NonInverting struct {
	Rf, Rg float64 // Ω
	Ref    float64 // V
}

// Kind names the stage.
func (NonInverting) Kind() string { return "noninverting" }

func (c NonInverting) stage(a *ampParams) (*stage, error) {
	if err := firstErr(positive("noninverting", "rf", c.Rf), positive("noninverting", "rg", c.Rg),
		finite("noninverting", "ref", c.Ref)); err != nil {
		return nil, err
	}
	beta := c.Rg / (c.Rf + c.Rg)
	gain := 1 + c.Rf/c.Rg
	s := &stage{kind: kindLinear, inUnit: "V", timeScale: closedLoopTime(a, gain)}
	s.sys = system{n: 1}
	// v− = Ref + β·(x − Ref); vd = s − v−.
	s.sys.c[0] = -beta
	s.sys.d = inputs{1, -(1 - beta) * c.Ref}
	s.sys.plus.d = inputs{1, 0}
	s.sys.minus.c[0] = beta
	s.sys.minus.d = inputs{0, (1 - beta) * c.Ref}
	ref := c.Ref
	s.idealOf = func(v float64) float64 { return ref + gain*(v-ref) }
	return s, nil
}

// Inverting is an inverting amplifier: the input reaches the inverting
// input through Rin, Rf runs from the output to the inverting input, and
// the non-inverting input sits at Ref. Gain −Rf/Rin about Ref.
type Inverting struct {
	Rf, Rin float64 // Ω
	Ref     float64 // V
}

// Kind names the stage.
func (Inverting) Kind() string { return "inverting" }

func (c Inverting) stage(a *ampParams) (*stage, error) {
	if err := firstErr(positive("inverting", "rf", c.Rf), positive("inverting", "rin", c.Rin),
		finite("inverting", "ref", c.Ref)); err != nil {
		return nil, err
	}
	sum := c.Rf + c.Rin
	s := &stage{kind: kindLinear, inUnit: "V", timeScale: closedLoopTime(a, 1+c.Rf/c.Rin)}
	s.sys = system{n: 1}
	// v− = (s·Rf + x·Rin)/(Rf + Rin); vd = Ref − v−.
	s.sys.c[0] = -c.Rin / sum
	s.sys.d = inputs{-c.Rf / sum, c.Ref}
	s.sys.plus.d = inputs{0, c.Ref}
	s.sys.minus.c[0] = c.Rin / sum
	s.sys.minus.d = inputs{c.Rf / sum, 0}
	ref, g := c.Ref, c.Rf/c.Rin
	s.idealOf = func(v float64) float64 { return ref - g*(v-ref) }
	return s, nil
}

// Comparator is the amp run open loop: the input drives the non-inverting
// input and the inverting input sits at Threshold. The output is high while
// the input is above the threshold.
type Comparator struct {
	Threshold float64 // V
	// Low and High are the levels the transition time is measured
	// between: the 10 % and 90 % points of High − Low, the definition the
	// comparator's slew requirement uses (0.8·(VOH − VOL)/transition with
	// the stage's out_low and out_high). Both 0: the amp's own swing. They
	// are held within the swing.
	Low, High float64
}

// Kind names the stage.
func (Comparator) Kind() string { return "comparator" }

func (c Comparator) stage(a *ampParams) (*stage, error) {
	if err := finite("comparator", "threshold", c.Threshold); err != nil {
		return nil, err
	}
	s := &stage{kind: kindComparator, inUnit: "V", timeScale: (a.voh-a.vol)/a.slowSlew() + closedLoopTime(a, 1)}
	s.edgeLo, s.edgeHi = a.vol, a.voh
	if c.Low != 0 || c.High != 0 {
		if !(c.Low < c.High) {
			return nil, fmt.Errorf("comparator: low %g V is not below high %g V", c.Low, c.High)
		}
		s.edgeLo, s.edgeHi = math.Max(c.Low, a.vol), math.Min(c.High, a.voh)
	}
	s.sys = system{n: 1}
	s.sys.d = inputs{1, -c.Threshold}
	s.sys.plus.d = inputs{1, 0}
	s.sys.minus.d = inputs{0, c.Threshold}
	th, lo, hi := c.Threshold, a.vol, a.voh
	s.idealOf = func(v float64) float64 {
		if v > th {
			return hi
		}
		return lo
	}
	return s, nil
}
