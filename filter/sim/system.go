package sim

// system is the network of a stage around the amp. The state y holds the
// amp's internal node y[0] — the output, since the node is clamped to the
// swing — and up to two capacitor voltages y[1:]. Everything else is
// linear in y and in u = (signal, 1):
//
//	vd            = c·y + d·u                        differential input v+ − v−
//	dy[i]/dt      = p[i]·y + q[i]·u + k[i]·dx/dt       i ≥ 1 (k: a capacitor tied to the output)
//	v+, v−        = plus/minus (for the common-mode check)
type system struct {
	n     int
	c     vec
	d     inputs
	p     [maxStates]vec
	q     [maxStates]inputs
	k     vec
	plus  pin
	minus pin
}

// pin is a node voltage linear in the state and the input.
type pin struct {
	c vec
	d inputs
}

func (p *pin) at(y *vec, u inputs) float64 {
	v := p.d[0]*u[0] + p.d[1]*u[1]
	for i := range y {
		v += p.c[i] * y[i]
	}
	return v
}

// regime is the state of the amp's nonlinearity over an interval.
type regime uint8

// The regimes. In each one the whole stage is linear, so a step has an
// exact solution.
const (
	linear   regime = iota // dx/dt = ωp·(Aol·vd − x)
	slewUp                 // dx/dt = +SR_rise
	slewDown               // dx/dt = −SR_fall
	railHigh               // x held at VOH
	railLow                // x held at VOL
)

// tableIndex maps a regime to its step table; both rails share one.
func (r regime) tableIndex() int {
	if r == railLow {
		return int(railHigh)
	}
	return int(r)
}

func (r regime) slewing() bool { return r == slewUp || r == slewDown }
func (r regime) onRail() bool  { return r == railHigh || r == railLow }

// dynamics is the stage's linear system in regime r.
func (s *system) dynamics(r regime, a *ampParams) dyn {
	d := dyn{n: s.n}
	switch r {
	case linear:
		for j := 0; j < s.n; j++ {
			d.m[0][j] = a.wp * a.aol * s.c[j]
		}
		d.m[0][0] -= a.wp
		for l := 0; l < numInputs; l++ {
			d.b[0][l] = a.wp * a.aol * s.d[l]
		}
	case slewUp:
		d.b[0][1] = a.srUp
	case slewDown:
		d.b[0][1] = -a.srDown
	}
	for i := 1; i < s.n; i++ {
		for j := 0; j < s.n; j++ {
			d.m[i][j] = s.p[i][j] + s.k[i]*d.m[0][j]
		}
		for l := 0; l < numInputs; l++ {
			d.b[i][l] = s.q[i][l] + s.k[i]*d.b[0][l]
		}
	}
	return d
}

// rate is the unclamped rate of the amp node, ωp·(Aol·vd − x), V/s. The
// model's dx/dt is this rate clamped to [−SR_fall, SR_rise].
func (s *system) rate(y *vec, u inputs, a *ampParams) float64 {
	vd := s.d[0]*u[0] + s.d[1]*u[1]
	for i := 0; i < s.n; i++ {
		vd += s.c[i] * y[i]
	}
	return a.wp * (a.aol*vd - y[0])
}

// valid reports whether regime r still holds at (y, u). NaN or Inf (an
// overflowing growth step) is never valid.
func (s *system) valid(r regime, y *vec, u inputs, a *ampParams) bool {
	x, rt := y[0], s.rate(y, u, a)
	switch r {
	case linear:
		return rt <= a.srUp && rt >= -a.srDown && x <= a.voh && x >= a.vol
	case slewUp:
		return rt >= a.srUp && x <= a.voh
	case slewDown:
		return rt <= -a.srDown && x >= a.vol
	case railHigh:
		return rt >= 0
	case railLow:
		return rt <= 0
	}
	return false
}

// classify clamps the amp node into the swing and returns the regime that
// holds at (y, u). The rate is continuous in y and u, so after an event the
// new regime is always a neighbour of the old one; classify needs no
// history.
func (s *system) classify(y *vec, u inputs, a *ampParams) regime {
	if y[0] >= a.voh {
		y[0] = a.voh
		if s.rate(y, u, a) >= 0 {
			return railHigh
		}
	}
	if y[0] <= a.vol {
		y[0] = a.vol
		if s.rate(y, u, a) <= 0 {
			return railLow
		}
	}
	rt := s.rate(y, u, a)
	switch {
	case rt > a.srUp:
		return slewUp
	case rt < -a.srDown:
		return slewDown
	}
	return linear
}
