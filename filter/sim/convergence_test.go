package sim

import (
	"math"
	"math/cmplx"
	"testing"
)

// TestStepConvergence runs each stage at 100 … 1600 points per period and
// checks the metrics converge: the error against the finest run shrinks as
// the step shrinks and is below 1e-3 (relative to the figure's scale) at
// the default 400. The update is exact for straight-line inputs, so the
// only step error left is the chord of a sine (second order); oscillators,
// with no input, must agree to rounding at every step.
func TestStepConvergence(t *testing.T) {
	slow := Amp{Aol: 1e5, GBW: 1e6, SlewRise: 0.5e6, VOL: -5, VOH: 5}
	for _, tc := range []struct {
		name  string
		c     Circuit
		amp   Amp
		in    Input
		exact bool
	}{
		{"follower slewing sine", Follower{}, slow, Input{Shape: Sine, Peak: 1, Freq: 120e3}, false},
		{"noninverting clipping sine", NonInverting{Rf: 9e3, Rg: 1e3}, slow, Input{Shape: Sine, Peak: 0.7, Freq: 5e3}, false},
		{"inverting square", Inverting{Rf: 10e3, Rin: 1e3}, slow, Input{Shape: Square, Peak: 0.2, Freq: 10e3, Rise: 100e-9}, false},
		{"comparator sine", Comparator{Threshold: 0.2}, slow, Input{Shape: Sine, Peak: 1, Freq: 2e3}, false},
		{"sallen-key sine", SallenKeyLowPass{R1: 10e3, R2: 10e3, C1: 2.25e-9, C2: 1.125e-9}, slow, Input{Shape: Sine, Peak: 2, Freq: 12e3}, false},
		{"transimpedance step", Transimpedance{Rf: 1e6, Cf: 1e-12, Cin: 10e-12}, slow, Input{Shape: Step, Peak: 2e-6, At: 2e-6}, false},
		{"relaxation", Relaxation{R: 10e3, C: 1.517e-9, R1: 10e3, R2: 10e3}, slow, Input{}, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			ns := []int{100, 200, 400, 800, 1600}
			var ms []Metrics
			for _, n := range ns {
				w, err := Run(tc.c, tc.amp, tc.in, Options{PointsPerPeriod: n})
				if err != nil {
					t.Fatal(err)
				}
				ms = append(ms, w.Metrics)
			}
			ref := ms[len(ms)-1]
			figures := []struct {
				name  string
				get   func(m Metrics) float64
				scale float64
			}{
				{"output_pp", func(m Metrics) float64 { return m.OutputPP }, ref.OutputPP},
				{"slewing_fraction", func(m Metrics) float64 { return m.SlewingFraction }, 1},
			}
			opt := func(name string, p func(m Metrics) *float64, scale func(v float64) float64) {
				if v := p(ref); v != nil {
					figures = append(figures, struct {
						name  string
						get   func(m Metrics) float64
						scale float64
					}{name, func(m Metrics) float64 { return *p(m) }, scale(*v)})
				}
			}
			opt("thd", func(m Metrics) *float64 { return m.THD }, func(float64) float64 { return 1 })
			opt("peak_error", func(m Metrics) *float64 { return m.PeakError }, func(float64) float64 { return ref.IdealPP })
			opt("transition_time", func(m Metrics) *float64 { return m.TransitionTime }, math.Abs)
			opt("frequency", func(m Metrics) *float64 { return m.Frequency }, math.Abs)
			opt("duty", func(m Metrics) *float64 { return m.Duty }, func(float64) float64 { return 1 })
			for _, f := range figures {
				errs := make([]float64, len(ns)-1)
				for i := range errs {
					errs[i] = math.Abs(f.get(ms[i])-f.get(ref)) / f.scale
				}
				t.Logf("%-16s relative error at N=%v: %.2g", f.name, ns[:len(ns)-1], errs)
				switch {
				case tc.exact && errs[0] > 1e-9:
					t.Errorf("%s: N=%d differs from N=%d by %.3g; an oscillator has no step error", f.name, ns[0], ns[len(ns)-1], errs[0])
				case errs[2] > 1e-3:
					t.Errorf("%s: N=400 differs from N=1600 by %.3g, want ≤ 1e-3", f.name, errs[2])
				case errs[3] > errs[1]+1e-9:
					t.Errorf("%s: error grows as the step shrinks: %.3g", f.name, errs)
				}
			}
		})
	}
}

// TestAdaptiveGrid: the default grid refines until the metrics change less
// than 1e-5 between two grids. Against the closed-loop amplitude of the
// linear model (textbook single-pole loop, from memory): a follower with
// A(s) = Aol/(1 + s/ωp), ωp = 2π·GBW/Aol, passes |A/(1 + A)| at jω; at
// 200 kHz on 1 MHz that is 0.98058 (by hand: 1/√(1 + 0.2²) ≈ 0.98058 for
// Aol → ∞). The fixed 400-point grid reads the peak low by more than the
// adaptive one.
func TestAdaptiveGrid(t *testing.T) {
	amp := Amp{Aol: 1e5, GBW: 1e6, SlewRise: 1e9, VOL: -5, VOH: 5}
	in := Input{Shape: Sine, Peak: 1, Freq: 200e3}
	w := 2 * math.Pi * in.Freq
	wp := 2 * math.Pi * amp.GBW / amp.Aol
	a := complex(amp.Aol, 0) / (1 + complex(0, w/wp))
	want := 2 * in.Peak * cmplx.Abs(a/(1+a))
	if math.Abs(want/2-0.98058) > 1e-4 {
		t.Fatalf("closed-loop gain %g, want ≈ 0.98058 by hand", want/2)
	}
	adaptive, err := Run(Follower{}, amp, in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	fixed, err := Run(Follower{}, amp, in, Options{PointsPerPeriod: 400})
	if err != nil {
		t.Fatal(err)
	}
	errA := math.Abs(adaptive.Metrics.OutputPP/want - 1)
	errF := math.Abs(fixed.Metrics.OutputPP/want - 1)
	t.Logf("400 points: %.3g, adaptive (%d points): %.3g", errF, adaptive.Metrics.PointsPerPeriod, errA)
	if errA > 2e-5 {
		t.Errorf("adaptive output_pp off by %.3g, want ≤ 2e-5", errA)
	}
	if adaptive.Metrics.PointsPerPeriod <= 400 || errA >= errF {
		t.Errorf("adaptive grid %d points, error %.3g against %.3g at 400: want a finer, better grid",
			adaptive.Metrics.PointsPerPeriod, errA, errF)
	}
}
