package sim

import (
	"math"
	"math/cmplx"
	"strconv"
	"testing"
)

func run(t *testing.T, c Circuit, a Amp, in Input) *Waveform {
	t.Helper()
	w, err := Run(c, a, in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	return w
}

// TestSmallSignalBandwidth: with a single-pole amp the closed-loop gain is
// H = G·(Aβ/(1+Aβ)) / (1 + jf/(f_pole·(1+Aβ))), β = 1/NG, f_pole = GBW/Aol,
// so a follower is 3 dB down at GBW and a stage of noise gain NG at GBW/NG
// (single-pole op-amp, textbook, from memory).
func TestSmallSignalBandwidth(t *testing.T) {
	const aol, gbw = 1e6, 10e6
	amp := Amp{Aol: aol, GBW: gbw, SlewRise: 1e9, VOL: -10, VOH: 10}
	for _, tc := range []struct {
		name string
		c    Circuit
		g    float64 // ideal gain magnitude
		ng   float64
		f    float64
	}{
		{"follower at GBW", Follower{}, 1, 1, gbw},
		{"follower at GBW/10", Follower{}, 1, 1, gbw / 10},
		{"noninverting G=10 at GBW/10", NonInverting{Rf: 9e3, Rg: 1e3}, 10, 10, gbw / 10},
		{"noninverting G=10 at GBW/100", NonInverting{Rf: 9e3, Rg: 1e3}, 10, 10, gbw / 100},
		{"inverting G=-9 (NG=10) at GBW/10", Inverting{Rf: 9e3, Rin: 1e3}, 9, 10, gbw / 10},
	} {
		t.Run(tc.name, func(t *testing.T) {
			const vp = 1e-3
			w := run(t, tc.c, amp, Input{Shape: Sine, Peak: vp, Freq: tc.f})
			if w.Metrics.SlewingFraction != 0 {
				t.Fatalf("small signal slews: fraction %g", w.Metrics.SlewingFraction)
			}
			ab := aol / tc.ng
			h := tc.g * ab / (1 + ab) / cmplx.Abs(complex(1, tc.f/(gbw/aol*(1+ab))))
			near(t, "|H|", w.Metrics.OutputPP/(2*vp), h, 1e-4)
			if tc.f == gbw/tc.ng {
				near(t, "|H|/G at GBW/NG", w.Metrics.OutputPP/(2*vp)/tc.g, 1/math.Sqrt2, 2e-3)
			}
		})
	}
}

// TestSlewLimitedTriangle: a sine far past full-power bandwidth makes the
// output ramp at the slew rate for the whole of each half period, so
// Vpp = SR/(2f); with unequal rates Vpp/SR_rise + Vpp/SR_fall = T (both
// from the definition of slew rate). A symmetric triangle's harmonics fall
// as 1/k² on odd k, THD over k ≤ 10 = √(Σ 1/k⁴, k = 3,5,7,9) ≈ 12.05 %
// (Fourier series of a triangle wave, textbook, from memory).
func TestSlewLimitedTriangle(t *testing.T) {
	const f = 100e3
	for _, tc := range []struct {
		name       string
		rise, fall float64
	}{
		{"symmetric 1 V/us", 1e6, 1e6},
		{"rise 2 V/us, fall 1 V/us", 2e6, 1e6},
	} {
		t.Run(tc.name, func(t *testing.T) {
			amp := Amp{Aol: 1e6, GBW: 1e9, SlewRise: tc.rise, SlewFall: tc.fall, VOL: -10, VOH: 10}
			w := run(t, Follower{}, amp, Input{Shape: Sine, Peak: 6, Freq: f})
			want := 1 / (f * (1/tc.rise + 1/tc.fall))
			near(t, "Vpp", w.Metrics.OutputPP, want, 2e-3)
			if w.Metrics.SlewingFraction < 0.99 {
				t.Errorf("slewing fraction %g, want nearly 1", w.Metrics.SlewingFraction)
			}
			if tc.rise == tc.fall {
				thd := math.Sqrt(math.Pow(3, -4) + math.Pow(5, -4) + math.Pow(7, -4) + math.Pow(9, -4))
				near(t, "THD", *w.Metrics.THD, thd, 1e-2)
			}
		})
	}
}

// TestFullPowerBandwidth: a sine of peak Vp starts to slew where its
// largest rate 2π·f·Vp reaches SR: f_p = SR/(2π·Vp) (definition of
// full-power bandwidth, from memory). The onset is found by bisection on
// the model and compared with f_p.
func TestFullPowerBandwidth(t *testing.T) {
	for _, tc := range []struct {
		name string
		vp   float64
		sr   float64
	}{
		{"1 V at 1 V/us", 1, 1e6},
		{"4 V at 13 V/us", 4, 13e6},
	} {
		t.Run(tc.name, func(t *testing.T) {
			amp := Amp{Aol: 1e6, GBW: 1e10, SlewRise: tc.sr, VOL: -10, VOH: 10}
			fp := tc.sr / (2 * math.Pi * tc.vp)
			slews := func(f float64) bool {
				return run(t, Follower{}, amp, Input{Shape: Sine, Peak: tc.vp, Freq: f}).Metrics.SlewingFraction > 0
			}
			lo, hi := 0.9*fp, 1.1*fp
			if slews(lo) || !slews(hi) {
				t.Fatalf("no onset of slewing between %g and %g Hz", lo, hi)
			}
			for i := 0; i < 14; i++ {
				if m := (lo + hi) / 2; slews(m) {
					hi = m
				} else {
					lo = m
				}
			}
			near(t, "onset of slewing", (lo+hi)/2, fp, 1e-3)
		})
	}
}

// TestAstablePeriod: with slew rate and GBW far beyond the circuit's needs
// the relaxation oscillator has the ideal period. Symmetric swing about
// ref: T = 2RC·ln((1+β)/(1−β)) (astable multivibrator, Sedra & Smith, from
// memory); asymmetric: t_high = RC·ln((VOH−VTL)/(VOH−VTH)), t_low =
// RC·ln((VTH−VOL)/(VTL−VOL)) with VTH/VTL = ref + β(VOH/VOL − ref) (the same
// capacitor charging law, from memory).
func TestAstablePeriod(t *testing.T) {
	const r, c = 10e3, 1e-9
	for _, tc := range []struct {
		name     string
		r1, r2   float64
		vol, voh float64
		ref      float64
	}{
		{"symmetric beta 0.5", 10e3, 10e3, -5, 5, 0},
		{"symmetric beta 0.2", 2e3, 8e3, -12, 12, 0},
		{"single supply beta 1/3", 10e3, 20e3, 0.05, 3.2, 1.65},
	} {
		t.Run(tc.name, func(t *testing.T) {
			amp := Amp{Aol: 1e7, GBW: 1e12, SlewRise: 1e13, VOL: tc.vol, VOH: tc.voh}
			w := run(t, Relaxation{R: r, C: c, R1: tc.r1, R2: tc.r2, Ref: tc.ref}, amp, Input{})
			b := tc.r1 / (tc.r1 + tc.r2)
			vth, vtl := tc.ref+b*(tc.voh-tc.ref), tc.ref+b*(tc.vol-tc.ref)
			th := r * c * math.Log((tc.voh-vtl)/(tc.voh-vth))
			tl := r * c * math.Log((vth-tc.vol)/(vtl-tc.vol))
			if tc.ref == 0 {
				near(t, "symmetric period formula", th+tl, 2*r*c*math.Log((1+b)/(1-b)), 1e-12)
			}
			near(t, "frequency", *w.Metrics.Frequency, 1/(th+tl), 1e-3)
			near(t, "ideal frequency", *w.Metrics.IdealFrequency, 1/(th+tl), 1e-12)
			near(t, "duty", *w.Metrics.Duty, th/(th+tl), 2e-3)
		})
	}
}

// TestComparatorSlewEdge: a heavily overdriven comparator's output edge is
// a slew ramp, 10–90 % in 0.8·(VOH − VOL)/SR (definition of slew rate).
func TestComparatorSlewEdge(t *testing.T) {
	for _, tc := range []struct {
		name       string
		rise, fall float64
	}{
		{"1 V/us", 1e6, 1e6},
		{"rise 3 V/us, fall 1 V/us", 3e6, 1e6},
	} {
		t.Run(tc.name, func(t *testing.T) {
			amp := Amp{Aol: 1e6, GBW: 1e9, SlewRise: tc.rise, SlewFall: tc.fall, VOL: -5, VOH: 5}
			w := run(t, Comparator{Threshold: 0}, amp, Input{Shape: Square, Peak: 1, Freq: 10e3, Rise: 1e-9})
			slowest := 0.8 * 10 / math.Min(tc.rise, tc.fall)
			near(t, "transition time", *w.Metrics.TransitionTime, slowest, 1e-3)
		})
	}
}

// TestSallenKeyResponse: the unity-gain Sallen–Key low-pass has
// H(jω) = 1/(1 − ω²R1R2C1C2 + jωC2(R1+R2)) (textbook, from memory). The
// ideal network must match it; with a fast amp the stage must too.
func TestSallenKeyResponse(t *testing.T) {
	sk := SallenKeyLowPass{R1: 10e3, R2: 10e3, C1: 2.25e-9, C2: 1.125e-9}
	fc := 1 / (2 * math.Pi * math.Sqrt(sk.R1*sk.R2*sk.C1*sk.C2))
	amp := Amp{Aol: 1e6, GBW: 1e9, SlewRise: 1e9, VOL: -10, VOH: 10}
	for _, ratio := range []float64{0.3, 1, 3} {
		t.Run("f/fc="+formatG(ratio), func(t *testing.T) {
			f := ratio * fc
			w := run(t, sk, amp, Input{Shape: Sine, Peak: 1, Freq: f})
			om := 2 * math.Pi * f
			h := cmplx.Abs(1 / complex(1-om*om*sk.R1*sk.R2*sk.C1*sk.C2, om*sk.C2*(sk.R1+sk.R2)))
			near(t, "ideal |H|", w.Metrics.IdealPP/2, h, 1e-4)
			near(t, "stage |H|", w.Metrics.OutputPP/2, h, 1e-3)
		})
	}
}

// TestTransimpedanceStep: with an amp far faster than the feedback pole
// the step response is a single pole τ = Rf·Cf: final value Ref + I·Rf,
// 10–90 % time τ·ln 9 (first-order step response, textbook, from memory).
func TestTransimpedanceStep(t *testing.T) {
	tia := Transimpedance{Rf: 100e3, Cf: 10e-12, Cin: 5e-12, Ref: 0.5}
	amp := Amp{Aol: 1e6, GBW: 1e10, SlewRise: 1e10, VOL: 0, VOH: 5}
	w := run(t, tia, amp, Input{Shape: Step, Peak: 10e-6, At: 1e-6})
	near(t, "final output", w.Out[len(w.Out)-1], 0.5+10e-6*100e3, 1e-4)
	near(t, "transition time", *w.Metrics.TransitionTime, math.Log(9)*tia.Rf*tia.Cf, 2e-3)
}

// TestInvertingFiniteGain: at low frequency the inverting gain is
// −(Rf/Rin)/(1 + NG/Aol) (feedback with finite loop gain, textbook, from
// memory); a low Aol makes the 1 % shortfall visible.
func TestInvertingFiniteGain(t *testing.T) {
	const aol = 1e3
	amp := Amp{Aol: aol, GBW: 1e6, SlewRise: 1e7, VOL: -10, VOH: 10}
	w := run(t, Inverting{Rf: 10e3, Rin: 1e3, Ref: 0.2}, amp, Input{Shape: Sine, Peak: 0.1, Freq: 10, Offset: 0.2})
	ab := aol / 11.0
	near(t, "gain", w.Metrics.OutputPP/0.2, 10*ab/(1+ab), 1e-4)
}

func formatG(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
