package filter_test

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"github.com/opsift/opsift/filter"
)

// sallenKeyNodal solves the unity-gain Sallen–Key low-pass by nodal
// analysis at frequency f, independent of the closed forms: an ideal
// follower makes the non-inverting node P equal to the output; node X joins
// R1, R2 and the feedback capacitor C1. KCL at P: (X − P)/R2 = jωC2·P, so
// X = P·(1 + jωC2R2); KCL at X: (Vin − X)/R1 = (X − P)/R2 + jωC1·(X − P).
// It returns the gain P/Vin and the current the output drives into C1 per
// volt of input.
func sallenKeyNodal(r1, r2, c1, c2, f float64) (h, ic1 complex128) {
	jw := complex(0, 2*math.Pi*f)
	// X = P·a with a = 1 + jωC2R2; Vin/R1 = X/R1 + (X − P)(1/R2 + jωC1).
	a := 1 + jw*complex(c2*r2, 0)
	den := a/complex(r1, 0) + (a-1)*(1/complex(r2, 0)+jw*complex(c1, 0))
	p := (1 / complex(r1, 0)) / den // P per volt of Vin
	x := p * a
	return p, jw * complex(c1, 0) * (p - x)
}

func skStage(r1, r2, c1, c2, extra string) string {
	return `kind = "sallen_key_lowpass"` + "\n" + `ref = "6 V"` + "\n" + `r1 = "` + r1 + `"` + "\n" + `r2 = "` + r2 + `"` + "\n" +
		`c1 = "` + c1 + `"` + "\n" + `c2 = "` + c2 + `"` + "\n" + `signal = { peak = "2 V" }` + "\n" + extra
}

// Sallen–Key f0 and Q (Sallen & Key, "A practical method of designing RC
// active filters", IRE Trans. Circuit Theory, 1955; any active-filter
// handbook; from memory): f0 = 1/(2π√(R1R2C1C2)), Q = √(R1R2C1C2)/(C2(R1+R2)).
// Worked by hand: equal components 10 kΩ, 10 nF give f0 = 1591.5 Hz and
// Q = 0.5; C1 = 2·C2 gives Q = 1/√2 (Butterworth) at f0 = 1125.4 Hz. Each is
// also checked by nodal analysis: |H(f0)| = Q.
func TestSallenKeyResponse(t *testing.T) {
	tests := []struct {
		name           string
		r1, r2, c1, c2 string
		v              [4]float64
		f0, q          float64 // hand-worked
	}{
		{"equal components", "10 kOhm", "10 kOhm", "10 nF", "10 nF", [4]float64{10e3, 10e3, 10e-9, 10e-9}, 1591.549, 0.5},
		{"Butterworth C1 = 2 C2", "10 kOhm", "10 kOhm", "20 nF", "10 nF", [4]float64{10e3, 10e3, 20e-9, 10e-9}, 1125.395, 1 / math.Sqrt2},
		// Unequal resistors: √(R1R2C1C2) = √(1e4·2e4·1e-8·1e-7) = √(2e-7) = 4.4721e-4 s,
		// f0 = 1/(2π·4.4721e-4 s) = 355.88 Hz; Q = 4.4721e-4/(1e-7·3e4) = 0.14907.
		{"unequal, C2 large", "10 kOhm", "20 kOhm", "10 nF", "100 nF", [4]float64{10e3, 20e3, 10e-9, 100e-9}, 355.881, 0.149071},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := tmplPlan(t, rails12, skStage(tt.r1, tt.r2, tt.c1, tt.c2, ""))
			sp := p.Stages[0]
			tmplNear(t, "f0", sp.Freq, tt.f0, 1e-5)
			gbw := tmplMust(t, p, filter.KeyGBW).Value
			tmplNear(t, "gbw = 100·Q·f0", gbw, 100*tt.q*tt.f0, 1e-4)
			h, _ := sallenKeyNodal(tt.v[0], tt.v[1], tt.v[2], tt.v[3], tt.f0)
			tmplNear(t, "|H(f0)| by nodal analysis", cmplx.Abs(h), tt.q, 1e-4)
			h0, _ := sallenKeyNodal(tt.v[0], tt.v[1], tt.v[2], tt.v[3], 1e-3)
			tmplNear(t, "DC gain", cmplx.Abs(h0), 1, 1e-6)
		})
	}
}

// The slew and drive needs are the largest over every input frequency of
// the signal amplitude; a brute-force frequency sweep of the nodal solution
// must stay under them and reach them (within the sweep's resolution).
func TestSallenKeySlewAndDriveSweep(t *testing.T) {
	tests := []struct {
		name           string
		r1, r2, c1, c2 string
		v              [4]float64
	}{
		{"Q 0.5", "10 kOhm", "10 kOhm", "10 nF", "10 nF", [4]float64{10e3, 10e3, 10e-9, 10e-9}},
		{"Q 0.707", "10 kOhm", "10 kOhm", "20 nF", "10 nF", [4]float64{10e3, 10e3, 20e-9, 10e-9}},
		{"Q 2", "10 kOhm", "10 kOhm", "160 nF", "10 nF", [4]float64{10e3, 10e3, 160e-9, 10e-9}},
	}
	const vp = 2.0 // signal.peak of skStage
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := tmplPlan(t, rails12, skStage(tt.r1, tt.r2, tt.c1, tt.c2, ""))
			slew := tmplMust(t, p, filter.KeySlew).Value
			iout := tmplMust(t, p, filter.KeyOutputCurrent).Value
			out := tmplMust(t, p, filter.KeyOutputRange)
			var maxSlew, maxI, maxV float64
			for f := 1.0; f < 1e8; f *= 1.001 {
				h, ic := sallenKeyNodal(tt.v[0], tt.v[1], tt.v[2], tt.v[3], f)
				maxSlew = math.Max(maxSlew, 2*math.Pi*f*cmplx.Abs(h)*vp)
				maxI = math.Max(maxI, cmplx.Abs(ic)*vp)
				maxV = math.Max(maxV, cmplx.Abs(h)*vp)
			}
			tmplNear(t, "slew vs sweep", maxSlew, slew, 1e-4)
			tmplNear(t, "C1 current vs sweep", maxI, iout, 1e-3)
			tmplNear(t, "output peak vs sweep", maxV, out.High-6, 1e-4)
		})
	}
}

func TestSallenKeyInputs(t *testing.T) {
	t.Run("f0 and q directly", func(t *testing.T) {
		p := tmplPlan(t, rails12, "kind = \"sallen_key_lowpass\"\nf0 = \"10 kHz\"\nq = 0.707\nsignal = { peak = \"1 V\" }\ngbw_factor = 50")
		tmplNear(t, "gbw = 50·0.707·10 kHz", tmplMust(t, p, filter.KeyGBW).Value, 50*0.707*10e3, 1e-12)
		tmplNear(t, "slew = 2π·10 kHz·0.707·1 V", tmplMust(t, p, filter.KeySlew).Value, 2*math.Pi*10e3*0.707, 1e-12)
		if _, ok := tmplReq(p, filter.KeyOutputCurrent); ok {
			t.Error("output current without components or load")
		}
	})
	t.Run("dc_error counts R1 + R2", func(t *testing.T) {
		p := tmplPlan(t, rails12, skStage("10 kOhm", "22 kOhm", "20 nF", "10 nF", "source_r = \"1 kOhm\"\ndc_error = \"10 mV\""))
		if got := p.Stages[0].SourceR; got != 33e3 {
			t.Errorf("source resistance %g Ω, want 1 k + 10 k + 22 k = 33 kΩ", got)
		}
		part := tmplPart("d")
		// Vos 1 mV + (Ib 10 nA + Ios 1 nA/2) · 33 kΩ = 1.3465 mV against
		// 10 mV (the + input's current is up to Ib + Ios/2).
		c := tmplCheck(t, p, part, filter.KeyDCError)
		tmplNear(t, "dc error", c.Available, 1e-3+(10e-9+0.5e-9)*33e3, 1e-9)
	})
	tests := []struct{ name, stage, want string }{
		{"both forms", skStage("10 kOhm", "10 kOhm", "10 nF", "10 nF", "f0 = \"1 kHz\""), "not both"},
		{"missing c2", strings.Replace(skStage("10 kOhm", "10 kOhm", "10 nF", "10 nF", ""), "c2 = \"10 nF\"\n", "", 1), `"c2": missing`},
		{"nothing", "kind = \"sallen_key_lowpass\"\nsignal = { peak = \"1 V\" }", `"f0": missing`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tmplContains(t, "error", tmplDeriveErr(t, rails12, tt.stage), tt.want)
		})
	}
}
