package circuit

import (
	"errors"
	"math"
	"testing"
)

func TestSlewAndBandwidth(t *testing.T) {
	tests := []struct {
		name string
		got  float64
		want float64
	}{
		// Trade fact (common practice, no source): a 10 Vpp, 20 kHz sine needs
		// 2π·20 kHz·5 V = 0.6283 V/µs, more than a 0.5 V/µs part has.
		{"sine 10 Vpp 20 kHz", SlewForSine(20e3, 5), 628318.5307},
		// Full-power bandwidth SR/(2π·Vp): 0.5 V/µs at 5 V peak = 15.915 kHz
		// (computed by hand).
		{"full-power bandwidth 0.5 V/us 5 V", FullPowerBandwidth(0.5e6, 5), 15915.49431},
		// 10–90 % of a 4 V step in 2 µs: 0.8·4/2e-6 = 1.6 V/µs.
		{"step 4 V in 2 us", SlewForStep(4, 2e-6), 1.6e6},
		// Comparator 0.1 V → 4.9 V in 1 µs (10–90 %): 0.8·4.8/1e-6 = 3.84 V/µs.
		{"comparator 0.1..4.9 V in 1 us", SlewForTransition(0.1, 4.9, 1e-6), 3.84e6},
		{"comparator falling same", SlewForTransition(4.9, 0.1, 1e-6), 3.84e6},
		{"closed-loop bandwidth 1 MHz / 10", ClosedLoopBandwidth(1e6, 10), 100e3},
		// NG·0.35/rise: 5·0.35/1 µs = 1.75 MHz.
		{"gbw for 1 us rise at NG 5", GBWForRise(5, 1e-6), 1.75e6},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			assertRel(t, tt.name, tt.got, tt.want, 1e-9)
		})
	}

	t.Run("0.5 V/us cannot make 10 Vpp at 20 kHz", func(t *testing.T) {
		// Trade fact (common practice, no source).
		if need := SlewForSine(20e3, 5); need <= 0.5e6 {
			t.Errorf("slew for 10 Vpp 20 kHz = %g V/s, want above 0.5 V/µs", need)
		}
		if fpbw := FullPowerBandwidth(0.5e6, 5); fpbw >= 20e3 {
			t.Errorf("full-power bandwidth = %g Hz, want below 20 kHz", fpbw)
		}
	})

	t.Run("rise factor against exact single pole", func(t *testing.T) {
		// A single pole at f3 rises 10→90 % in ln 9/(2π·f3) (from
		// e^(−t/τ): t90 − t10 = τ·ln 9). 0.35 is the trade rounding.
		f3 := 123e3
		rise := math.Log(9) / (2 * math.Pi * f3)
		assertRel(t, "GBWForRise at NG 1", GBWForRise(1, rise), f3, 1e-3)
	})
}

func TestGBWForGainError(t *testing.T) {
	// DESIGN.md: ≈ 7.02·NG·f at 1 %; 1/√(1/0.99² − 1) = 7.017924 (computed by
	// hand from the single-pole closed-loop magnitude 1/√(1 + (NG·f/GBW)²)).
	tests := []struct {
		name       string
		ng, f, eps float64
		want       float64
	}{
		{"1 % at NG 1, 1 Hz", 1, 1, 0.01, 7.017923930},
		{"1 % at NG 11, 2 kHz", 11, 2e3, 0.01, 154394.3265},
		// 0.1 %: 1/√(1/0.999² − 1) = 22.343906 (python, independent).
		{"0.1 % at NG 1", 1, 1, 0.001, 22.343906},
		// 10 %: 1/√(1/0.81 − 1) = 1/√0.234568 = 2.064742.
		{"10 % at NG 2, 10 kHz", 2, 10e3, 0.1, 41294.84},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			gbw, err := GBWForGainError(tt.ng, tt.f, tt.eps, math.Inf(1))
			mustOK(t, err)
			assertRel(t, "gbw", gbw, tt.want, 1e-5)
			// The inverse must give the error back.
			assertRel(t, "round trip", gainErrorAt(gbw, tt.ng, tt.f), tt.eps, 1e-9)
		})
	}
	for _, eps := range []float64{0, 1, -0.01, 1.5, math.NaN()} {
		_, err := GBWForGainError(1, 1, eps, math.Inf(1))
		var de *DomainError
		if !errors.As(err, &de) || de.Param != "eps" {
			t.Errorf("GBWForGainError(eps=%g) error = %v, want a DomainError on eps", eps, err)
		}
	}
}

func TestGainErrorAtMatchesComplexGain(t *testing.T) {
	// Independent check: the closed loop A/(1 + A/NG) with A = GBW/(j·f) for a
	// single-pole op-amp, evaluated in complex arithmetic.
	gbw, ng, f := 1e6, 10.0, 30e3
	a := complex(0, -gbw/f) // GBW/(j·f)
	acl := a / (1 + a/complex(ng, 0))
	want := 1 - cmplxAbs(acl)/ng
	assertRel(t, "gain error", gainErrorAt(gbw, ng, f), want, 1e-9)
}

func TestAolForGainError(t *testing.T) {
	// Aol = NG(1−ε)/ε: NG 10 at 0.1 % → 9990 V/V = 79.9913 dB (by hand).
	vv, db, err := AolForGainError(10, 0.001)
	mustOK(t, err)
	assertRel(t, "aol V/V", vv, 9990, 1e-12)
	assertAbs(t, "aol dB", db, 79.99131, 1e-5)
	// Check against the loop equation itself: NG/(1 + NG/Aol) is 0.1 % low.
	assertRel(t, "closed-loop gain", 10/(1+10/vv), 10*(1-0.001), 1e-12)
	if _, _, err := AolForGainError(10, 0); err == nil {
		t.Error("AolForGainError(eps=0) gave no error")
	}
}

// gainErrorSinglePole against the complex closed loop A/(1 + A/NG) with
// A = Aol/(1 + j·f·Aol/GBW) (single pole at GBW/Aol), and GBWForGainError
// as its inverse. The 4 % case is the demo gain stage (NG 6.2, 24 kHz):
// 510.2 kHz and 148.8 V/V, the floors when each rule took the whole ε,
// err by 7.55 % (by hand: (1 + 6.2/148.8)² + (6.2·24 kHz/510.2 kHz)² =
// 1.0851 + 0.0851).
func TestGainErrorSinglePole(t *testing.T) {
	for _, tc := range []struct{ gbw, aol, ng, f float64 }{
		{1e6, 1e5, 10, 30e3},
		{510.2e3, 148.8, 6.2, 24e3},
		{4e6, 50, 2, 100e3},
	} {
		a := complex(tc.aol, 0) / complex(1, tc.f*tc.aol/tc.gbw)
		acl := a / (1 + a/complex(tc.ng, 0))
		want := 1 - cmplxAbs(acl)/tc.ng
		assertRel(t, "gain error", gainErrorSinglePole(tc.gbw, tc.aol, tc.ng, tc.f), want, 1e-12)
	}
	assertAbs(t, "both whole-ε floors", gainErrorSinglePole(510.2e3, 148.8, 6.2, 24e3), 0.0755, 5e-4)
	assertRel(t, "ideal Aol is gainErrorAt", gainErrorSinglePole(1e6, math.Inf(1), 10, 30e3), gainErrorAt(1e6, 10, 30e3), 1e-15)
	g, err := GBWForGainError(6.2, 24e3, 0.04, 613.8)
	mustOK(t, err)
	assertRel(t, "inverse", gainErrorSinglePole(g, 613.8, 6.2, 24e3), 0.04, 1e-12)
	// Aol alone spends the whole budget: no GBW is enough.
	var de *DomainError
	if _, err := GBWForGainError(6.2, 24e3, 0.04, 148.8); !errors.As(err, &de) || de.Param != "aol" {
		t.Errorf("aol at the whole-ε floor: err = %v, want a DomainError on aol", err)
	}
}

// GainErrorBudget: Aol takes ε/4 at DC, GBW the rest at f. By hand for the
// demo gain stage, NG 6.2, 24 kHz, ε 4 %: Aol = 6.2·0.99/0.01 = 613.8 V/V
// = 55.7605 dB; 1 + NG/Aol = 1/0.99, so GBW = 6.2·24 kHz/√(1/0.96² −
// 1/0.99²) = 148.8 kHz/0.254490 = 584.698 kHz. NG 100 at 1 %: 39 900 V/V
// = 92.0195 dB and 8.08842·NG·f. The single-pole error at both floors is
// exactly ε, and 0.1 % below either floor it exceeds ε (ngspice checks the
// same circuit in TestGainErrorBudgetAgainstNgspice).
func TestGainErrorBudget(t *testing.T) {
	for _, tc := range []struct {
		name           string
		ng, f, eps     float64
		gbw, aol, aoDB float64
	}{
		{"demo gain stage", 6.2, 24e3, 0.04, 584697.75, 613.8, 55.760538},
		{"NG 100 at 1 %", 100, 1e3, 0.01, 808842.38, 39900, 92.019458},
		{"follower at 4 %", 1, 24e3, 0.04, 94306.089, 99, 39.912704},
	} {
		t.Run(tc.name, func(t *testing.T) {
			gbw, aol, db, err := GainErrorBudget(tc.ng, tc.f, tc.eps)
			mustOK(t, err)
			assertRel(t, "gbw", gbw, tc.gbw, 1e-7)
			assertRel(t, "aol", aol, tc.aol, 1e-12)
			assertAbs(t, "aol dB", db, tc.aoDB, 1e-6)
			assertRel(t, "error at both floors", gainErrorSinglePole(gbw, aol, tc.ng, tc.f), tc.eps, 1e-12)
			if e := gainErrorSinglePole(0.999*gbw, aol, tc.ng, tc.f); !(e > tc.eps) {
				t.Errorf("GBW 0.1 %% below its floor: error %g, want > %g", e, tc.eps)
			}
			if e := gainErrorSinglePole(gbw, 0.999*aol, tc.ng, tc.f); !(e > tc.eps) {
				t.Errorf("Aol 0.1 %% below its floor: error %g, want > %g", e, tc.eps)
			}
		})
	}
	if _, _, _, err := GainErrorBudget(1, 1, 1); err == nil {
		t.Error("eps 1: no error")
	}
}

func cmplxAbs(z complex128) float64 { return math.Hypot(real(z), imag(z)) }

func TestRegenerationTimeConstant(t *testing.T) {
	// 1/(2π·1 MHz·0.5) = 318.31 ns (by hand).
	assertRel(t, "tau", RegenerationTimeConstant(1e6, 0.5), 318.3099e-9, 1e-6)
}

func TestMaxFreqForGainError(t *testing.T) {
	// Inverse in f of GBWForGainError. By hand from the single-pole error
	// (Sedra & Smith loop-gain relation, from memory):
	//   - 1 MHz, Aol 10⁵ (100 dB) in NG 10 at 1 % reaches
	//     1e6·√(1/0.99² − 1.0001²)/10 = 14.178872 kHz;
	//   - at the ε/4 split's Aol 10·0.9975/0.0025 = 3990 it reaches
	//     1e6/(10·8.08842) = 12.36335 kHz (8.088415 = 1/√(1/0.99² − 1/0.9975²)).
	for _, tc := range []struct {
		aol, want float64
	}{{1e5, 14178.872}, {3990, 12363.348}} {
		f, err := MaxFreqForGainError(1e6, 10, 0.01, tc.aol)
		if err != nil {
			t.Fatal(err)
		}
		assertRel(t, "fmax", f, tc.want, 1e-6)
		g, err := GBWForGainError(10, f, 0.01, tc.aol)
		if err != nil {
			t.Fatal(err)
		}
		assertRel(t, "round trip", g, 1e6, 1e-12)
	}
	if _, err := MaxFreqForGainError(1e6, 10, 0, 1e5); err == nil {
		t.Error("eps 0: no error")
	}
	if _, err := MaxFreqForGainError(1e6, 10, 0.01, 990); err == nil {
		t.Error("Aol at the whole-ε floor NG·(1−ε)/ε = 990: no error")
	}
}

func TestMaxNoiseGainForGainError(t *testing.T) {
	// By hand: GBW 1 MHz, Aol 10⁴, f 10 kHz, ε 1 %: the root of
	// (10⁻⁸ + 10⁻⁴)·NG² + 2·10⁻⁴·NG − (1/0.99² − 1) = 0 is NG = 13.28366.
	ng, err := MaxNoiseGainForGainError(1e6, 1e4, 1e4, 0.01)
	if err != nil {
		t.Fatal(err)
	}
	assertRel(t, "NG", ng, 13.283657, 1e-6)
	// Round trips through GBWForGainError, and at f = 0 the DC floor
	// NG = Aol·ε/(1 − ε) (AolForGainError inverted).
	for _, tc := range []struct{ gbw, aol, f, eps float64 }{
		{1e6, 1e5, 14178.87, 0.01}, {584.698e3, 613.8, 24e3, 0.04}, {3e6, 1e7, 1e3, 0.001},
	} {
		ng, err := MaxNoiseGainForGainError(tc.gbw, tc.aol, tc.f, tc.eps)
		if err != nil {
			t.Fatal(err)
		}
		g, err := GBWForGainError(ng, tc.f, tc.eps, tc.aol)
		if err != nil {
			t.Fatal(err)
		}
		assertRel(t, "round trip", g, tc.gbw, 1e-9)
	}
	ng, _ = MaxNoiseGainForGainError(1e6, 1e4, 0, 0.01)
	assertRel(t, "DC", ng, 1e4*0.01/0.99, 1e-12)
	if _, err := MaxNoiseGainForGainError(1e6, 1e4, 1e3, 1); err == nil {
		t.Error("eps 1: no error")
	}
	if _, err := MaxNoiseGainForGainError(0, 1e4, 1e3, 0.01); err == nil {
		t.Error("gbw 0: no error")
	}
}
