package sim

import (
	"math"
	"testing"
)

// near fails unless got is within rel of want (relative), or within abs.
func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if d := math.Abs(got - want); !(d <= rel*math.Abs(want)) {
		t.Errorf("%s = %.10g, want %.10g (relative error %.3g, allowed %.3g)", what, got, want, d/math.Abs(want), rel)
	}
}

// TestTableScalar checks the step update against the closed-form solution
// of dy/dt = −a·y + b·u with a ramp input u = u0 + u1·t (first-order linear
// ODE, integrating factor; textbook, from memory), for a stiff, a mild and
// a growing mode, at several table levels.
func TestTableScalar(t *testing.T) {
	const h = 1e-3
	for _, tc := range []struct {
		name string
		a    float64
	}{
		{"stiff a·h=1500", 1.5e6},
		{"mild a·h=0.1", 100},
		{"growing a·h=-3", -3000},
	} {
		t.Run(tc.name, func(t *testing.T) {
			b, y0, u0, u1 := 2.0, 0.3, 0.7, -150.0
			d := &dyn{n: 1}
			d.m[0][0] = -tc.a
			d.b[0] = inputs{b, 0.5} // the constant input adds 0.5 to the forcing
			tb := newTable(d, h)
			for _, j := range []int{0, 1, 7, 20, levels} {
				s := math.Ldexp(h, -j)
				e := math.Exp(-tc.a * s)
				f := (1 - e) / tc.a
				want := e*y0 + b*(u0*f+u1*(s/tc.a-f/tc.a)) + 0.5*f
				y := vec{y0}
				tb.lv[j].apply(1, &y, inputs{u0, 1}, inputs{u1, 0})
				near(t, "y(h/2^j)", y[0], want, 1e-12)
			}
		})
	}
}

// TestTableRotation checks e^{Ms} for an undamped oscillator, whose exact
// solution is a rotation by ω·s (textbook, from memory), over a step of
// 50 radians: many squarings, no decay to hide errors.
func TestTableRotation(t *testing.T) {
	const w, h = 5e4, 1e-3
	d := &dyn{n: 2}
	d.m[0][1], d.m[1][0] = w, -w
	tb := newTable(d, h)
	y := vec{1, 0.5}
	tb.lv[0].apply(2, &y, inputs{}, inputs{})
	c, s := math.Cos(w*h), math.Sin(w*h)
	want := vec{c*1 + s*0.5, -s*1 + c*0.5}
	for i := 0; i < 2; i++ {
		if math.Abs(y[i]-want[i]) > 1e-11 {
			t.Errorf("y[%d] = %.14g, want %.14g", i, y[i], want[i])
		}
	}
}

// TestTableAdvanceComposes checks that advancing by a tick count made of
// many binary pieces equals one step, for the three-state Sallen–Key in
// its linear regime with a ramp input.
func TestTableAdvanceComposes(t *testing.T) {
	ap, err := Amp{Aol: 1e5, GBW: 10e6, SlewRise: 1e6, VOL: -10, VOH: 10}.params()
	if err != nil {
		t.Fatal(err)
	}
	st, err := SallenKeyLowPass{R1: 10e3, R2: 10e3, C1: 2.2e-9, C2: 1.1e-9}.stage(&ap)
	if err != nil {
		t.Fatal(err)
	}
	d := st.sys.dynamics(linear, &ap)
	h := 1e-6
	tb := newTable(&d, h)
	tick := math.Ldexp(h, -levels)
	y0 := vec{0.1, -0.2, 0.3}
	u0, u1 := inputs{0.5, 1}, inputs{2e4, 0}
	one := y0
	tb.lv[0].apply(3, &one, u0, u1)
	pieces := y0
	first := full/3 + 12345
	tb.advance(&pieces, u0, u1, first, tick)
	tb.advance(&pieces, inputs{u0[0] + float64(first)*tick*u1[0], 1}, u1, full-first, tick)
	for i := 0; i < 3; i++ {
		if math.Abs(one[i]-pieces[i]) > 1e-12 {
			t.Errorf("y[%d]: one step %.15g, pieces %.15g", i, one[i], pieces[i])
		}
	}
}
