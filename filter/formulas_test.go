package filter_test

import (
	"math"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/circuit"
)

// Full-power bandwidth: a sine of peak Vp needs SR ≥ 2π·f·Vp, so a part
// slewing SR reaches f = SR/(2π·Vp) at full amplitude (Sedra & Smith,
// "Microelectronic Circuits", op-amp large-signal operation; from memory).
func TestFullPowerBandwidth(t *testing.T) {
	tests := []struct {
		name    string
		sr      string  // part slew (guaranteed)
		vp      string  // output peak
		fpbWant float64 // SR/(2π·Vp), worked by hand
	}{
		{"0.5 V/us at 10 V peak", "0.5 V/us", "10 V", 7957.7},
		{"1 V/us at 5 V peak", "1 V/us", "5 V", 31831},
		{"13 V/us at 10 V peak", "13 V/us", "10 V", 206901},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
				`kind = "follower"`+"\n"+`ref = "0 V"`+"\n"+`signal = { peak = "`+tc.vp+`", freq = "1 kHz" }`))
			part := basePart("x")
			part.Slew = catalog.Spec{Min: opt(q(tc.sr, catalog.VoltPerSecond))}
			r := evalOne(t, p, part, filter.Options{})
			// GBW is 100 MHz, so the slew limit sets fmax.
			near(t, "fmax", r.FMax[0], tc.fpbWant, 1e-4)
		})
	}
}

// Closed-loop bandwidth of a single-pole op-amp: f−3dB = GBW/NG (Franco,
// "Design with Operational Amplifiers and Analog Integrated Circuits",
// ch. 6; from memory). At f−3dB the gain is 1/√2 of ideal, so with an ideal
// DC gain a gain error of ε = 1 − 1/√2 at f = GBW/NG needs exactly GBW:
// that is the stage's gbw floor (Requirement.Value, Aol → ∞). A part with
// no Aol is checked with the ε/4 split (circuit.GainErrorBudget), which asks
// GBW·√(1/(1−ε)² − 1)/√(1/(1−ε)² − 1/(1−ε/4)²) = GBW·1/√(2 − 1/(1−ε/4)²)
// (by hand).
func TestClosedLoopBandwidth(t *testing.T) {
	tests := []struct {
		name string
		gain string
		gbw  float64
	}{
		{"gain 10 on 1 MHz: 100 kHz", "10", 1e6},
		{"gain 100 on 10 MHz: 100 kHz", "100", 10e6},
		{"gain 2 on 3 MHz: 1.5 MHz", "2", 3e6},
	}
	eps := 1 - 1/math.Sqrt2
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			g := q(tc.gain, catalog.Dimensionless)
			f3 := tc.gbw / g
			_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
				`kind = "noninverting"`+"\n"+`gain = `+tc.gain+"\n"+`ref = "0 V"`+"\n"+
					`gain_error = "`+catalog.FormatASCII(eps, catalog.Ratio)+`"`+"\n"+
					`signal = { peak = "10 mV", freq = "`+catalog.FormatASCII(f3, catalog.Hertz)+`" }`))
			ideal, err := circuit.GBWForGainError(g, f3, eps, math.Inf(1))
			if err != nil {
				t.Fatal(err)
			}
			near(t, "ideal-Aol gbw at f−3dB", ideal, tc.gbw, 1e-12)
			// FormatASCII rounds ε and f to 3 figures; allow that.
			near(t, "gbw floor", requirement(t, p, "s", filter.KeyGBW).Value, tc.gbw, 2e-3)
			d := 1 / (1 - eps/4)
			part := basePart("x")
			part.Aol = catalog.Spec{}
			c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyGBW)
			near(t, "gbw needed without Aol", c.Required, tc.gbw/math.Sqrt(2-d*d), 2e-3)
		})
	}
}

// The gain-error factor with an ideal DC gain, 1/√(1/(1−ε)² − 1), is ≈ 7.02
// at 1 % (DESIGN.md): the gbw floor. A part whose catalog entry gives no
// Aol is checked with ε/4 left to an Aol at its floor,
// 1/√(1/(1−ε)² − 1/(1−ε/4)²), worked by hand: 1/0.99² = 1.020304,
// 1/0.9975² = 1.005019, √0.015285 = 0.123633, 1/0.123633 = 8.0884. A part
// of Aol 80 dB (10⁴) needs 1/√(1/0.99² − 1.0001²) = 1/√0.0201037 = 7.0528.
func TestGBWFactorAtOnePercent(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "5 V"`, `kind = "follower"`+"\n"+`signal = { peak = "0.1 V", freq = "1 kHz" }`))
	near(t, "gbw floor for NG 1 at 1 kHz", requirement(t, p, "s", filter.KeyGBW).Value, 7017.9, 1e-4)
	for _, tc := range []struct {
		aol  catalog.Spec
		want float64
	}{{catalog.Spec{}, 8088.4}, {catalog.Spec{Min: opt(80)}, 7052.8}} {
		part := basePart("x")
		part.Aol = tc.aol
		c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyGBW)
		near(t, "gbw needed", c.Required, tc.want, 1e-4)
	}
}

// Thermal noise of a resistor: √(4kTR), k = 1.380649e-23 J/K (exact, SI
// 2019 definition); 1 kΩ at 300 K is 4.07 nV/√Hz. The noise check adds it
// for the source resistance; with en = in = 0, NG = 1 and a GBW of 2/π Hz
// the single-pole noise bandwidth π/2·GBW is exactly 1 Hz, so the output
// rms equals the density.
func TestThermalNoise(t *testing.T) {
	_, p := mustDesign(t, `title = "t"
[supply]
pos = "5 V"
[environment]
temp = ["26.85 C", "26.85 C"]
[[stage]]
name = "s"
kind = "follower"
signal = { peak = "0.1 V", freq = "0.01 Hz" }
source_r = "1 kOhm"
noise = "1 uV"
`)
	part := basePart("x")
	part.En = catalog.Spec{Max: opt(0)}
	part.In = catalog.Spec{Max: opt(0)}
	part.GBW = catalog.Spec{Typ: opt(2 / math.Pi)}
	c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyNoise)
	near(t, "4kTR noise of 1 kΩ at 300 K", c.Available, 4.07e-9, 2e-3)
	near(t, "exact √(4kTR)", c.Available, math.Sqrt(4*1.380649e-23*300*1e3), 1e-9)
}

// Noise bandwidth of a single-pole response is π/2 × f−3dB (from memory):
// compare the check's output noise with a direct numerical integral of
// en²·|H(f)|², H = NG/(1 + j·f·NG/GBW).
func TestNoiseBandwidthSinglePole(t *testing.T) {
	const en, gbw, ng = 10e-9, 1e6, 4.0
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "noninverting"`+"\ngain = 4\n"+`signal = { peak = "0.1 V", freq = "1 kHz" }`+"\n"+`noise = "1 mV"`))
	part := basePart("x")
	part.En = catalog.Spec{Max: opt(en)}
	part.GBW = catalog.Spec{Typ: opt(gbw)}
	c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyNoise)
	// ∫0^∞ df/(1+(f/fc)²) by substitution f = fc·tan θ, midpoint rule in θ.
	fc := gbw / ng
	const n = 200000
	sum := 0.0
	for i := 0; i < n; i++ {
		th := (float64(i) + 0.5) * (math.Pi / 2) / n
		f := fc * math.Tan(th)
		dfdth := fc / (math.Cos(th) * math.Cos(th))
		sum += dfdth / (1 + (f/fc)*(f/fc)) * (math.Pi / 2) / n
	}
	want := en * ng * math.Sqrt(sum)
	near(t, "output noise", c.Available, want, 1e-6)
}

// Trade fact (common practice, no source): a 10 Vpp 20 kHz sine needs
// 2π·20 kHz·5 V ≈ 0.63 V/µs, so a part slewing 0.5 V/µs cannot deliver it
// and one slewing 5 V/µs can.
func TestSlewTradeFact(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "follower"`+"\n"+`ref = "0 V"`+"\n"+`signal = { peak = "5 V", freq = "20 kHz" }`))
	near(t, "required slew", requirement(t, p, "s", filter.KeySlew).Value, 0.628e6, 1e-3)
	for _, tc := range []struct {
		sr   string
		pass bool
	}{{"0.5 V/us", false}, {"5 V/us", true}} {
		t.Run(tc.sr, func(t *testing.T) {
			part := basePart("x")
			part.Slew = catalog.Spec{Min: opt(q(tc.sr, catalog.VoltPerSecond))}
			c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeySlew)
			if c.Pass != tc.pass {
				t.Errorf("slew %s: pass = %v, want %v (margin %.3g)", tc.sr, c.Pass, tc.pass, c.Margin)
			}
		})
	}
}

// Square edges: slew ≥ 0.8·2Vo/rise (10–90 % of the step) and GBW ≥
// NG·0.35/rise (single-pole rise time t = ln 9/(2π f−3dB) ≈ 0.35/f−3dB;
// from memory).
func TestSquareRequirements(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "5 V"`+"\n"+`neg = "-5 V"`,
		`kind = "noninverting"`+"\ngain = 2\n"+`ref = "0 V"`+"\n"+`signal = { shape = "square", peak = "1 V", rise = "1 us" }`))
	near(t, "slew", requirement(t, p, "s", filter.KeySlew).Value, 0.8*2*2/1e-6, 1e-12)
	near(t, "gbw", requirement(t, p, "s", filter.KeyGBW).Value, 2*math.Log(9)/(2*math.Pi)/1e-6, 6e-3)
	// The settled level of a square is a DC gain and the rise rule does not
	// draw on ε, so the aol floor has all of it: A_cl = NG/(1 + NG/Aol)
	// (Sedra & Smith, from memory) gives Aol ≥ NG·(1 − ε)/ε = 2·0.99/0.01 =
	// 198 V/V = 45.9333 dB (by hand: 20·log10 198).
	near(t, "aol", requirement(t, p, "s", filter.KeyAol).Value, 45.93330, 1e-5)
	for _, tc := range []struct {
		db   float64
		pass bool
	}{{45.94, true}, {20 * math.Log10(198), true}, {45.93, false}} {
		part := basePart("x")
		part.Aol = catalog.Spec{Min: opt(tc.db)}
		if c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyAol); c.Pass != tc.pass {
			t.Errorf("square stage, Aol %.4f dB: pass %v (margin %g), want %v", tc.db, c.Pass, c.Margin, tc.pass)
		}
	}
}

// Open-loop gain from the loop-gain relation A_cl = NG/(1 + NG/Aol)
// (Sedra & Smith, from memory): a DC error ε needs Aol ≥ NG·(1 − ε)/ε, the
// floor below which no GBW can help (the gbw check counts what the part's
// Aol spends). NG 100 at 1 % needs 100·0.99/0.01 = 9900 = 79.9127 dB (by
// hand: 20·log10 9900). Parts just above, at and just below the floor.
func TestAolRequirement(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "noninverting"`+"\ngain = 100\n"+`ref = "0 V"`+"\n"+`signal = { peak = "10 mV", freq = "10 Hz" }`))
	near(t, "aol", requirement(t, p, "s", filter.KeyAol).Value, 20*math.Log10(9900), 1e-12)
	near(t, "aol by hand", requirement(t, p, "s", filter.KeyAol).Value, 79.9127, 1e-6)
	for _, tc := range []struct {
		db   float64
		pass bool
	}{{79.92, true}, {20 * math.Log10(9900), true}, {79.90, false}} {
		aol := math.Pow(10, tc.db/20)
		errDC := 1 - 1/(1+100/aol) // A_cl = NG/(1 + NG/Aol): relative shortfall
		part := basePart("x")
		part.Aol = catalog.Spec{Min: opt(tc.db)}
		c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyAol)
		if c.Pass != tc.pass || (errDC <= 0.01+1e-12) != tc.pass {
			t.Errorf("Aol %.4f dB: pass %v (margin %g), closed-loop error %.5f %%; want pass %v", tc.db, c.Pass, c.Margin, 100*errDC, tc.pass)
		}
	}
}

// Inverting stage: NG = 1 + G and the inputs sit at ref.
func TestInvertingNoiseGain(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "inverting"`+"\ngain = 4\n"+`ref = "0 V"`+"\n"+`signal = { peak = "1 V", freq = "1 kHz" }`+"\n"+`load_r = "2 kOhm"`))
	if ng := p.Stages[0].NoiseGain; ng != 5 {
		t.Errorf("NG = %g, want 5", ng)
	}
	in := requirement(t, p, "s", filter.KeyInputRange)
	if in.Low != 0 || in.High != 0 {
		t.Errorf("input range = %g … %g, want the point 0 V", in.Low, in.High)
	}
	out := requirement(t, p, "s", filter.KeyOutputRange)
	if out.Low != -4 || out.High != 4 {
		t.Errorf("output range = %g … %g, want −4 … 4 V", out.Low, out.High)
	}
	near(t, "iout", requirement(t, p, "s", filter.KeyOutputCurrent).Value, 2e-3, 1e-12)
}

// The gbw check of a sine stage asks each part for the GBW its own Aol
// leaves room for: with the single-pole error (1 + NG/Aol)² + (NG·f/GBW)² =
// 1/(1−ε)² (Sedra & Smith loop-gain relation, from memory), NG 5 at 1 kHz
// and 1 % with Aol 94 dB (50 118.7 V/V) needs 5 kHz/√(1/0.99² − 1.00009976²)
// = 35.2633 kHz (by hand; ngspice gives exactly 1 % there, see
// circuit.TestGBWForOwnAolAgainstNgspice). GBW at the need passes at
// margin 0, 0.5 % below fails; without an Aol the ε/4 split applies
// (5·1 kHz·8.0884 = 40.442 kHz). An Aol that alone spends ε leaves
// nothing for GBW: the need is infinite, also when the aol check passes
// at the limit (NG·(1−ε)/ε = 495 V/V = 53.8921 dB exactly: the DC error is
// then ε by itself, so any finite GBW errs by more).
func TestGBWNeedWithOwnAol(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "noninverting"`+"\ngain = 5\n"+`ref = "0 V"`+"\n"+`signal = { peak = "10 mV", freq = "1 kHz" }`))
	for _, tc := range []struct {
		name     string
		aol      catalog.Spec
		gbw      float64
		need     float64
		pass     bool
		noteHas  string
		aolFails bool
	}{
		{"own Aol, GBW at the need", catalog.Spec{Min: opt(94)}, 35263.321, 35263.32, true, "own Aol", false},
		{"own Aol, GBW 0.5 % low", catalog.Spec{Min: opt(94)}, 0.995 * 35263.321, 35263.32, false, "own Aol", false},
		{"no Aol: the ε/4 split", catalog.Spec{}, 40e3, 40442, false, "no Aol", false},
		{"Aol below the whole-ε floor", catalog.Spec{Min: opt(53)}, 1e9, math.Inf(1), false, "alone spends", true},
		{"Aol exactly at the whole-ε floor", catalog.Spec{Min: opt(20 * math.Log10(495))}, 1e9, math.Inf(1), false, "alone spends", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			part := basePart("x")
			part.Aol, part.GBW = tc.aol, catalog.Spec{Min: opt(tc.gbw)}
			r := evalOne(t, p, part, filter.Options{})
			c := check(t, r, "s", filter.KeyGBW)
			if math.IsInf(tc.need, 1) {
				if !math.IsInf(c.Required, 1) {
					t.Errorf("need = %g, want +Inf", c.Required)
				}
			} else {
				near(t, "need", c.Required, tc.need, 1e-5)
			}
			if c.Pass != tc.pass || !strings.Contains(c.Note, tc.noteHas) {
				t.Errorf("pass %v (margin %g) note %q, want pass %v and a note with %q", c.Pass, c.Margin, c.Note, tc.pass, tc.noteHas)
			}
			if a := check(t, r, "s", filter.KeyAol); a.Status != filter.StatusUnknown && a.Pass == tc.aolFails {
				t.Errorf("aol pass %v, want %v", a.Pass, !tc.aolFails)
			}
		})
	}
}
