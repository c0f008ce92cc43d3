package sim

import "math"

// Sizes of the linear algebra. A stage has at most three states (the amp
// node and two capacitors) and two inputs: u = (signal, 1).
const (
	maxStates = 3
	numInputs = 2
	maxAug    = maxStates + 2*numInputs
)

// vec is a state vector; only the first n entries of a system are used.
type vec [maxStates]float64

// inputs is u = (signal, 1), or its rate of change (slope, 0).
type inputs [numInputs]float64

// dyn is a linear time-invariant system dy/dt = M·y + B·u.
type dyn struct {
	n int
	m [maxStates][maxStates]float64
	b [maxStates][numInputs]float64
}

// level is the exact update of dyn over one step of length s when the input
// is a straight line u(τ) = u0 + τ·u1:
//
//	y(s) = E·y(0) + G1·u0 + G2·u1
//	E = e^{Ms}, G1 = ∫₀ˢ e^{M(s−τ)} B dτ, G2 = ∫₀ˢ e^{M(s−τ)} B τ dτ.
type level struct {
	e  [maxStates][maxStates]float64
	g1 [maxStates][numInputs]float64
	g2 [maxStates][numInputs]float64
}

// table holds the updates of one dyn for steps h/2^j, j = 0…levels, so any
// span that is a whole number of ticks (h/2^levels) is a product of at most
// levels+1 of them, and a bisection for an event time costs one
// matrix–vector product per halving.
type table struct {
	n  int
	lv [levels + 1]level
}

// apply advances y in place by the step of level lv.
func (lv *level) apply(n int, y *vec, u0, u1 inputs) {
	var out vec
	for i := 0; i < n; i++ {
		s := lv.g1[i][0]*u0[0] + lv.g1[i][1]*u0[1] + lv.g2[i][0]*u1[0] + lv.g2[i][1]*u1[1]
		for j := 0; j < n; j++ {
			s += lv.e[i][j] * y[j]
		}
		out[i] = s
	}
	*y = out
}

// advance moves y by n ticks (n ≤ 1<<levels) with u(τ) = u0 + τ·u1, using
// the binary digits of n.
func (tb *table) advance(y *vec, u0, u1 inputs, n int64, tick float64) {
	done := int64(0)
	for j := 0; j <= levels && done < n; j++ {
		s := int64(1) << (levels - j)
		if n-done < s {
			continue
		}
		dt := float64(done) * tick
		tb.lv[j].apply(tb.n, y, inputs{u0[0] + dt*u1[0], u0[1]}, u1)
		done += s
	}
}

// aug is the augmented matrix Z = [[M, B, 0], [0, 0, I], [0, 0, 0]] whose
// exponential e^{Zs} = [[E, G1, G2], [0, I, sI], [0, 0, I]] carries the
// blocks of a level (Van Loan's construction, from memory).
type aug [maxAug][maxAug]float64

func (d *dyn) aug() (z aug, size int) {
	n := d.n
	size = n + 2*numInputs
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			z[i][j] = d.m[i][j]
		}
		for k := 0; k < numInputs; k++ {
			z[i][n+k] = d.b[i][k]
		}
	}
	for k := 0; k < numInputs; k++ {
		z[n+k][n+numInputs+k] = 1
	}
	return z, size
}

func mul(a, b *aug, size int) aug {
	var c aug
	for i := 0; i < size; i++ {
		for k := 0; k < size; k++ {
			aik := a[i][k]
			if aik == 0 {
				continue
			}
			for j := 0; j < size; j++ {
				c[i][j] += aik * b[k][j]
			}
		}
	}
	return c
}

func norm(a *aug, size int) float64 {
	m := 0.0
	for i := 0; i < size; i++ {
		s := 0.0
		for j := 0; j < size; j++ {
			s += math.Abs(a[i][j])
		}
		m = math.Max(m, s)
	}
	return m
}

// expTaylor is e^{Z·s} by its Taylor series; callers keep ‖Z·s‖ ≤ 1/2,
// where the series converges to rounding in at most 20 terms.
func expTaylor(z *aug, size int, s float64) aug {
	var zs, term, sum aug
	for i := 0; i < size; i++ {
		for j := 0; j < size; j++ {
			zs[i][j] = z[i][j] * s
		}
		term[i][i] = 1
		sum[i][i] = 1
	}
	for k := 1; k <= 30; k++ {
		term = mul(&term, &zs, size)
		f := 1 / float64(k)
		for i := 0; i < size; i++ {
			for j := 0; j < size; j++ {
				term[i][j] *= f
				sum[i][j] += term[i][j]
			}
		}
		if norm(&term, size) <= 1e-18*norm(&sum, size) {
			break
		}
	}
	return sum
}

// newTable builds the updates of d for steps h/2^j. Levels whose ‖Z‖·step is
// at most 1/2 are summed directly; longer ones are squared up from the next
// shorter level (scaling and squaring, never over-scaled). A level that
// overflows — the growing mode of a positive-feedback loop over a long step —
// holds Inf or NaN, which the integrator reads as "leaves the regime".
func newTable(d *dyn, h float64) *table {
	tb := &table{n: d.n}
	z, size := d.aug()
	zn := norm(&z, size) * h
	jmin := 0
	for jmin < levels && zn/math.Ldexp(1, jmin) > 0.5 {
		jmin++
	}
	var cur aug
	for j := levels; j >= 0; j-- {
		if j >= jmin {
			cur = expTaylor(&z, size, math.Ldexp(h, -j))
		} else {
			cur = mul(&cur, &cur, size)
		}
		tb.lv[j] = extract(&cur, d.n)
	}
	return tb
}

func extract(a *aug, n int) level {
	var lv level
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			lv.e[i][j] = a[i][j]
		}
		for k := 0; k < numInputs; k++ {
			lv.g1[i][k] = a[i][n+k]
			lv.g2[i][k] = a[i][n+numInputs+k]
		}
	}
	return lv
}
