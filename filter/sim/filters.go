package sim

import "math"

// SallenKeyLowPass is a unity-gain Sallen–Key low-pass: the input runs
// through R1 to node A and R2 to the non-inverting input (node B); C1
// feeds back from the output to A, C2 holds B to ground; the output is
// tied to the inverting input. States: the voltages of C1 and C2.
type SallenKeyLowPass struct {
	R1, R2 float64 // Ω
	C1, C2 float64 // F: C1 the feedback capacitor, C2 to ground
}

// Kind names the stage.
func (SallenKeyLowPass) Kind() string { return "sallen_key_lowpass" }

func (c SallenKeyLowPass) stage(a *ampParams) (*stage, error) {
	const k = "sallen_key_lowpass"
	if err := firstErr(positive(k, "r1", c.R1), positive(k, "r2", c.R2),
		positive(k, "c1", c.C1), positive(k, "c2", c.C2)); err != nil {
		return nil, err
	}
	g1, g2 := 1/c.R1, 1/c.R2
	s := &stage{kind: kindLinear, inUnit: "V"}
	s.timeScale = math.Max(math.Sqrt(c.R1*c.R2*c.C1*c.C2), closedLoopTime(a, 1))
	// y = (x, q1, q2): q1 = vA − x across C1, q2 = vB across C2, vA = q1 + x.
	//   C1·dq1/dt = (s − vA)·g1 − (vA − vB)·g2
	//   C2·dq2/dt = (vA − vB)·g2
	s.sys = system{n: 3}
	s.sys.c = vec{-1, 0, 1}
	s.sys.p[1] = vec{-(g1 + g2) / c.C1, -(g1 + g2) / c.C1, g2 / c.C1}
	s.sys.q[1] = inputs{g1 / c.C1, 0}
	s.sys.p[2] = vec{g2 / c.C2, g2 / c.C2, -g2 / c.C2}
	s.sys.plus.c[2] = 1
	s.sys.minus.c[0] = 1
	// Ideal amp: x = vB = q2; states (q1, q2).
	id := &dyn{n: 2}
	id.m[0] = [maxStates]float64{-(g1 + g2) / c.C1, -g1 / c.C1}
	id.b[0] = inputs{g1 / c.C1, 0}
	id.m[1] = [maxStates]float64{g2 / c.C2, 0}
	s.idealSys = id
	s.idealOut = pin{c: vec{0, 1}}
	return s, nil
}

// Transimpedance turns a photocurrent into a voltage: the photodiode (with
// capacitance Cin) draws the input current from the inverting input; Rf
// parallel Cf runs from the output to it; the non-inverting input sits at
// Ref. Ideal output: Ref + Rf·I through the pole 1/(2π·Rf·Cf). The input of
// Run is the photocurrent in amperes.
type Transimpedance struct {
	Rf  float64 // Ω
	Cf  float64 // F, may be 0
	Cin float64 // F: photodiode and input capacitance
	Ref float64 // V
}

// Kind names the stage.
func (Transimpedance) Kind() string { return "transimpedance" }

func (c Transimpedance) stage(a *ampParams) (*stage, error) {
	const k = "transimpedance"
	if err := firstErr(positive(k, "rf", c.Rf), finite(k, "cf", c.Cf), finite(k, "cin", c.Cin),
		finite(k, "ref", c.Ref), positive(k, "cin + cf", c.Cin+c.Cf)); err != nil {
		return nil, err
	}
	if c.Cf < 0 || c.Cin < 0 {
		return nil, positive(k, "cf and cin", math.Min(c.Cf, c.Cin))
	}
	ct := c.Cin + c.Cf
	s := &stage{kind: kindLinear, inUnit: "A"}
	// Closed loop: a second-order pair at √(GBW/(2π·Rf·Ct)) when Cf is
	// small; the slowest constant is Rf·Cf or the loop's.
	s.timeScale = math.Max(c.Rf*c.Cf, math.Sqrt(c.Rf*ct/(2*math.Pi*a.gbw)))
	// y = (x, vn). KCL at the summing node:
	//   Ct·dvn/dt = (x − vn)/Rf − I + Cf·dx/dt
	s.sys = system{n: 2}
	s.sys.c = vec{0, -1}
	s.sys.d = inputs{0, c.Ref}
	g := 1 / (c.Rf * ct)
	s.sys.p[1] = vec{g, -g}
	s.sys.q[1] = inputs{-1 / ct, 0}
	s.sys.k[1] = c.Cf / ct
	s.sys.plus.d = inputs{0, c.Ref}
	s.sys.minus.c[1] = 1
	ref, rf := c.Ref, c.Rf
	if c.Cf == 0 {
		s.idealOf = func(i float64) float64 { return ref + rf*i }
		return s, nil
	}
	// Ideal: dvo/dt = (Ref + Rf·I − vo)/(Rf·Cf).
	tau := c.Rf * c.Cf
	id := &dyn{n: 1}
	id.m[0][0] = -1 / tau
	id.b[0] = inputs{rf / tau, ref / tau}
	s.idealSys = id
	s.idealOut = pin{c: vec{1}}
	return s, nil
}
