package sim

import (
	"fmt"
	"math"
	"math/cmplx"
)

// steadyState is the state of the linear system d at t = 0 in which the
// input source leaves it settled: the periodic steady state for a sine
// (DC point plus the phasor solution at phase 0), the DC point of u(0)
// otherwise. Starting there removes the start-up transient whenever the
// stage stays linear, so a stage with a slow pole needs no settling.
func steadyState(d *dyn, src *source) (vec, error) {
	u := inputs{src.at(0), 1}
	if src.in.Shape == Sine {
		u[0] = src.in.Offset
	}
	y, err := dcPoint(d, u)
	if err != nil {
		return y, err
	}
	if src.in.Shape != Sine || src.in.Peak == 0 {
		return y, nil
	}
	// (jωI − M)·Y = B·e_signal·Peak; y(t) = y_dc + Im(Y·e^{jωt}).
	w := 2 * math.Pi * src.in.Freq
	var a [maxStates][maxStates]complex128
	var rhs [maxStates]complex128
	for i := 0; i < d.n; i++ {
		for j := 0; j < d.n; j++ {
			a[i][j] = complex(-d.m[i][j], 0)
		}
		a[i][i] += complex(0, w)
		rhs[i] = complex(d.b[i][0]*src.in.Peak, 0)
	}
	ph, ok := solveComplex(a, rhs, d.n)
	if !ok {
		return y, fmt.Errorf("sim: the stage has no steady state at %g Hz", src.in.Freq)
	}
	for i := 0; i < d.n; i++ {
		y[i] += imag(ph[i])
	}
	return y, nil
}

// dcPoint solves M·y + B·u = 0.
func dcPoint(d *dyn, u inputs) (vec, error) {
	var a [maxStates][maxStates]complex128
	var rhs [maxStates]complex128
	for i := 0; i < d.n; i++ {
		for j := 0; j < d.n; j++ {
			a[i][j] = complex(d.m[i][j], 0)
		}
		rhs[i] = complex(-(d.b[i][0]*u[0] + d.b[i][1]*u[1]), 0)
	}
	x, ok := solveComplex(a, rhs, d.n)
	var y vec
	if !ok {
		return y, fmt.Errorf("sim: the stage has no DC operating point")
	}
	for i := 0; i < d.n; i++ {
		y[i] = real(x[i])
	}
	return y, nil
}

// holdAtRail re-solves the capacitor states for a DC point with the amp
// node clamped to x (rows 1… of the rail dynamics d).
func holdAtRail(d *dyn, y vec, u inputs) vec {
	n := d.n - 1
	if n == 0 {
		return y
	}
	var a [maxStates][maxStates]complex128
	var rhs [maxStates]complex128
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			a[i][j] = complex(d.m[i+1][j+1], 0)
		}
		rhs[i] = complex(-(d.m[i+1][0]*y[0] + d.b[i+1][0]*u[0] + d.b[i+1][1]*u[1]), 0)
	}
	if x, ok := solveComplex(a, rhs, n); ok {
		for i := 0; i < n; i++ {
			y[i+1] = real(x[i])
		}
	}
	return y
}

// solveComplex solves a·x = rhs (n ≤ 3) by Gaussian elimination with
// partial pivoting; ok is false for a singular matrix.
func solveComplex(a [maxStates][maxStates]complex128, rhs [maxStates]complex128, n int) ([maxStates]complex128, bool) {
	var x [maxStates]complex128
	scale := 0.0
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			scale = math.Max(scale, cmplx.Abs(a[i][j]))
		}
	}
	if scale == 0 {
		return x, false
	}
	for col := 0; col < n; col++ {
		p := col
		for i := col + 1; i < n; i++ {
			if cmplx.Abs(a[i][col]) > cmplx.Abs(a[p][col]) {
				p = i
			}
		}
		if cmplx.Abs(a[p][col]) <= 1e-14*scale {
			return x, false
		}
		a[col], a[p] = a[p], a[col]
		rhs[col], rhs[p] = rhs[p], rhs[col]
		for i := col + 1; i < n; i++ {
			f := a[i][col] / a[col][col]
			for j := col; j < n; j++ {
				a[i][j] -= f * a[col][j]
			}
			rhs[i] -= f * rhs[col]
		}
	}
	for i := n - 1; i >= 0; i-- {
		s := rhs[i]
		for j := i + 1; j < n; j++ {
			s -= a[i][j] * x[j]
		}
		x[i] = s / a[i][i]
	}
	return x, true
}
