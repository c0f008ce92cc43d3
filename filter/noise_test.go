package filter_test

import (
	"math"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// kT at 25 °C by hand: 1.380649e-23 J/K × 298.15 K.
const kT25 = 1.380649e-23 * 298.15

// Output noise with the feedback network (Motchenbacher & Connelly; Franco;
// from memory): referred to the + input, e² = en² + in²·(Rs² + Rp²) +
// 4kT·(Rs + Rp) with Rp = Rf∥Rg, times NG over the noise bandwidth. Rf
// 900 kΩ / Rg 100 kΩ (NG 10, Rp 90 kΩ), en 10 nV/√Hz, in 1 pA/√Hz, no Rs,
// GBW 10 MHz (closed loop 1 MHz, ENBW π/2 MHz). By hand: e² = 1e-16 +
// 8.1e-15 + 4kT·90k = 9.68226e-15 → 98.40 nV/√Hz, × 10 × √(1.5708e6)
// = 1.2333 mV. The old rule counted en alone, 0.1253 mV (9.8× less), and
// passed a part against a 1 mV allowance.
func TestNoiseFeedbackNetwork(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "noninverting"`+"\nrf = \"900 kOhm\"\nrg = \"100 kOhm\"\n"+`ref = "0 V"`+"\n"+
			`signal = { peak = "10 mV", freq = "10 Hz" }`+"\n"+`noise = "1 mV"`))
	part := basePart("x")
	part.En = catalog.Spec{Max: opt(10e-9)}
	part.In = catalog.Spec{Max: opt(1e-12)}
	part.GBW = catalog.Spec{Min: opt(10e6), Typ: opt(10e6)}
	c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyNoise)
	want := 10 * math.Sqrt(1e-16+8.1e-15+4*kT25*90e3) * math.Sqrt(math.Pi/2*1e6)
	near(t, "noise", c.Available, want, 1e-9)
	near(t, "noise by hand", c.Available, 1.2333e-3, 1e-4)
	if c.Pass {
		t.Errorf("noise %g V against 1 mV: pass, want a failure", c.Available)
	}
}

// An audio preamp, gain 20 on a 100 MHz part, with a 20 kHz measurement
// band: en 5 nV/√Hz, Rs 1 kΩ. Over the closed loop alone (π/2·5 MHz) the
// noise is 20·√(25e-18 + 4kT·1k)·√7.854e6 = 0.4166 mV and fails a 50 µV
// budget; over the band it is the loop cascaded with a 20 kHz brick wall,
// B = 5 MHz·atan(20 kHz/5 MHz) = 19.9999 kHz, 20·6.4394 nV·√B = 18.21 µV
// (by hand), which passes.
func TestNoiseBand(t *testing.T) {
	stage := `kind = "noninverting"` + "\ngain = 20\n" + `ref = "0 V"` + "\n" +
		`signal = { peak = "10 mV", freq = "1 kHz" }` + "\n" + `source_r = "1 kOhm"` + "\n" + `noise = "50 uV"`
	part := basePart("x")
	part.En = catalog.Spec{Max: opt(5e-9)}
	part.In = catalog.Spec{Max: opt(1e-15)}
	part.GBW = catalog.Spec{Min: opt(100e6), Typ: opt(100e6)}
	dens := math.Sqrt(25e-18 + 1e-30*1e6 + 4*kT25*1e3)
	for _, tc := range []struct {
		name  string
		extra string
		want  float64
		pass  bool
	}{
		{"closed-loop bandwidth", "", 20 * dens * math.Sqrt(math.Pi/2*5e6), false},
		{"20 kHz brick wall", "\nnoise_band = \"20 kHz\"", 20 * dens * math.Sqrt(5e6*math.Atan(20e3/5e6)), true},
		{"20 kHz second-order filter", "\nnoise_band = \"20 kHz\"\nnoise_order = 2",
			20 * dens * math.Sqrt(5e6*math.Atan(20e3*1.110720735/5e6)), true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`, stage+tc.extra))
			c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyNoise)
			near(t, "noise", c.Available, tc.want, 1e-9)
			if c.Pass != tc.pass {
				t.Errorf("pass %v, want %v (noise %g V)", c.Pass, tc.pass, c.Available)
			}
		})
	}
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`, stage+"\nnoise_band = \"20 kHz\""))
	near(t, "brick wall by hand", check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyNoise).Available, 18.213e-6, 1e-4)
}

// 1/f corners from the catalog (en_corner, in_corner): en 10 nV/√Hz with a
// 1 kHz corner over a 100 Hz band on a follower: power en²·(B + 1000·ln(B/0.1 Hz))
// with B ≈ 100 Hz, by hand 10 nV·√(100 + 6907.8) = 837.1 nV.
func TestNoiseFlickerCorner(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "follower"`+"\n"+`ref = "0 V"`+"\n"+`signal = { peak = "10 mV", freq = "10 Hz" }`+"\n"+
			`noise = "0.5 uV"`+"\nnoise_band = \"100 Hz\""))
	part := basePart("x")
	part.En = catalog.Spec{Max: opt(10e-9)}
	part.GBW = catalog.Spec{Min: opt(1e6)}
	white := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyNoise)
	part.EnCorner = opt(1e3)
	pink := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyNoise)
	near(t, "white", white.Available, 10e-9*math.Sqrt(1e6*math.Atan(100/1e6)), 1e-9)
	near(t, "with corner by hand", pink.Available, 837.1e-9, 1e-3)
	if !white.Pass || pink.Pass {
		t.Errorf("white pass %v, with 1/f pass %v: want the corner to break the 0.5 µV budget", white.Pass, pink.Pass)
	}
}

// Transimpedance noise (Graeme, from memory): with Cin = 0 the stage's en
// sees a follower; with the Rf thermal noise alone it is √(4kT·Rf·1.1107·f0)
// for the flat (Butterworth) response. Here Rf 1 MΩ, 10 pF, 100 kHz on a
// 10 MHz part with en = in = 0: only Rf's thermal noise and the check
// must equal √(4kT·Rf·ENBW), ENBW = 1.1107·f0, f0 the part's flat bandwidth.
func TestTransimpedanceNoise(t *testing.T) {
	p := tmplPlan(t, rails12, `kind = "transimpedance"
rf = "1 MOhm"
cin = "10 pF"
bandwidth = "100 kHz"
i_max = "1 uA"
ref = "1 V"
noise = "100 uV"`)
	part := tmplPart("t")
	part.Cin = catalog.Opt{}
	part.GBW = catalog.Spec{Min: catalog.Some(10e6), Typ: catalog.Some(10e6)}
	part.En = catalog.Spec{Max: catalog.Some(1e-30)}
	part.In = catalog.Spec{Max: catalog.Some(1e-30)}
	f := filter.Figures(part, p)
	_, bw, _ := filter.TIAFeedbackCap(&p.Stages[0], part, &f)
	c := tmplCheck(t, p, part, filter.KeyNoise)
	want := math.Sqrt(4 * 1.380649e-23 * 298.15 * 1e6 * 1.110720735 * bw)
	tmplNear(t, "Rf thermal", c.Available, want, 2e-3)
	// en·Cin gain peaking: 20 nV/√Hz on this stage far exceeds the
	// en·√(π/2·GBW) = 79 µV a follower would give, and breaks 100 µV.
	part.En = catalog.Spec{Max: catalog.Some(20e-9)}
	c = tmplCheck(t, p, part, filter.KeyNoise)
	if c.Pass || c.Available < 20e-9*math.Sqrt(math.Pi/2*10e6) {
		t.Errorf("en 20 nV/√Hz: noise %g V, pass %v; want above the follower value and a failure", c.Available, c.Pass)
	}
}
