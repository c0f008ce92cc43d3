package circuit

import (
	"errors"
	"math"
	"testing"
)

func TestThresholds(t *testing.T) {
	// VTH/VTL = ref + β(VOH/VOL − ref), by hand: ref 2.5 V, β = 1/3,
	// levels 0.05 V and 3.5 V → VTH = 2.8333 V, VTL = 1.6833 V.
	vth, vtl := Thresholds(2.5, HysteresisBeta(10e3, 20e3), 0.05, 3.5)
	assertRel(t, "vth", vth, 2.5+1.0/3, 1e-12)
	assertRel(t, "vtl", vtl, 2.5-2.45/3, 1e-12)
}

func TestAstableIdeal(t *testing.T) {
	// Sedra & Smith, Microelectronic Circuits, astable multivibrator (from
	// memory): T = 2RC·ln((1+β)/(1−β)) for levels symmetric about the
	// reference. Worked numbers computed independently (python).
	const rc = 100e-6 // 10 kΩ · 10 nF
	tests := []struct {
		name                string
		ref, beta, vol, voh float64
		wantT, wantDuty     float64 // T in units of RC
	}{
		// β = 0.5: 2·ln 3 = 2.197225.
		{"beta 0.5, +-5 V", 0, 0.5, -5, 5, 2.1972245773, 0.5},
		{"beta 0.5, +-13 V", 0, 0.5, -13, 13, 2.1972245773, 0.5},
		// β = 1/11 (R1 10k, R2 100k): 2·ln 1.2 = 0.364643.
		{"beta 1/11, +-12 V", 0, 1.0 / 11, -12, 12, 0.3646431136, 0.5},
		// Single supply, rail-to-rail 0.1…4.9 V around 2.5 V, β = 1/3:
		// still symmetric, T = 2·ln 2 = 1.386294.
		{"single supply symmetric", 2.5, 1.0 / 3, 0.1, 4.9, 1.3862943611, 0.5},
		// Asymmetric swing 0.05…3.5 V around 2.5 V, β = 1/3:
		// t_high = ln(1.81667/0.66667) = 1.002468, t_low = ln(2.78333/1.63333)
		// = 0.533026 (in RC), T = 1.535495, duty 0.652863.
		{"asymmetric swing", 2.5, 1.0 / 3, 0.05, 3.5, 1.5354947619, 0.6528634633},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			T, err := AstablePeriod(10e3, 10e-9, tt.ref, tt.beta, tt.vol, tt.voh)
			mustOK(t, err)
			assertRel(t, "period", T, tt.wantT*rc, 1e-9)
			th, tl, err := astableTimes(10e3, 10e-9, tt.ref, tt.beta, tt.vol, tt.voh)
			mustOK(t, err)
			assertRel(t, "duty", th/(th+tl), tt.wantDuty, 1e-9)
			if tt.wantDuty == 0.5 && tt.ref == 0 {
				ts, err := astablePeriodSymmetric(10e3, 10e-9, tt.beta)
				mustOK(t, err)
				assertRel(t, "symmetric formula", ts, T, 1e-12)
			}
		})
	}
}

func TestAstableDomain(t *testing.T) {
	var de *DomainError
	cases := []struct {
		name string
		err  error
		want string
	}{
		{"beta 1", second(AstablePeriod(1e3, 1e-9, 0, 1, -5, 5)), "beta"},
		{"beta 0", second(astablePeriodSymmetric(1e3, 1e-9, 0)), "beta"},
		{"ref above voh", second(AstablePeriod(1e3, 1e-9, 6, 0.5, -5, 5)), "voh"},
		{"ref below vol", second(AstablePeriod(1e3, 1e-9, -6, 0.5, -5, 5)), "vol"},
		{"no capacitor", second(AstablePeriod(1e3, 0, 0, 0.5, -5, 5)), "c"},
		{"NaN resistor", second(HighTime(math.NaN(), 1e-9, 5, 2.5, -2.5)), "r"},
		{"vth above voh", second(HighTime(1e3, 1e-9, 5, 6, -2.5)), "vth"},
		{"vtl below vol", second(LowTime(1e3, 1e-9, -5, 2.5, -6)), "vtl"},
		{"zero slew", second(AstablePeriodSlewLimited(1e3, 1e-9, 0, 0.5, -5, 5, 0)), "sr"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if !errors.As(c.err, &de) || de.Param != c.want {
				t.Fatalf("error = %v, want a DomainError on %q", c.err, c.want)
			}
		})
	}
}

func second(_ float64, err error) error { return err }

func TestAstableSlewLimited(t *testing.T) {
	// Reference: brute-force time stepping of the same ramp model (plain
	// implementation in simulateAstable below, with the moving threshold on
	// the non-inverting input), compared with the closed form.
	tests := []struct {
		name                          string
		r, c, ref, beta, vol, voh, sr float64
	}{
		{"+-5 V beta 0.5, 0.5 V/us, 20 kHz RC", 22.756e3, 1e-9, 0, 0.5, -5, 5, 0.5e6},
		{"+-5 V beta 0.5, 5 V/us", 22.756e3, 1e-9, 0, 0.5, -5, 5, 5e6},
		{"single supply asymmetric, 1 V/us", 10e3, 1e-9, 2.5, 1.0 / 3, 0.05, 3.5, 1e6},
		{"small beta 1/11, 2 V/us", 47e3, 1e-9, 0, 1.0 / 11, -12, 12, 2e6},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := AstablePeriodSlewLimited(tt.r, tt.c, tt.ref, tt.beta, tt.vol, tt.voh, tt.sr)
			mustOK(t, err)
			want := simulateAstable(tt.r*tt.c, tt.ref, tt.beta, tt.vol, tt.voh, tt.sr)
			assertRel(t, "period vs brute force", got, want, 1e-3)
			ideal, err := AstablePeriod(tt.r, tt.c, tt.ref, tt.beta, tt.vol, tt.voh)
			mustOK(t, err)
			if !(got > ideal) {
				t.Errorf("slew-limited period %g not above ideal %g", got, ideal)
			}
		})
	}

	t.Run("tends to ideal for fast slew", func(t *testing.T) {
		ideal, _ := AstablePeriod(10e3, 10e-9, 2.5, 1.0/3, 0.05, 3.5)
		got, err := AstablePeriodSlewLimited(10e3, 10e-9, 2.5, 1.0/3, 0.05, 3.5, 1e15)
		mustOK(t, err)
		assertRel(t, "period", got, ideal, 1e-9)
		inf, err := AstablePeriodSlewLimited(10e3, 10e-9, 2.5, 1.0/3, 0.05, 3.5, math.Inf(1))
		mustOK(t, err)
		assertRel(t, "period at infinite slew", inf, ideal, 1e-12)
	})

	t.Run("first-order growth 2 tau/(1+beta)", func(t *testing.T) {
		// Expanding the closed form in τ/RC by hand for levels ±V around ref:
		// each half-period grows by τ·(1 − β/(1+β)) = τ/(1+β).
		for _, beta := range []float64{0.2, 0.5, 0.8} {
			const sr = 1e9 // τ = 10 V/SR = 10 ns ≪ RC = 1 ms
			ideal, _ := astablePeriodSymmetric(1e3, 1e-6, beta)
			got, err := AstablePeriodSlewLimited(1e3, 1e-6, 0, beta, -5, 5, sr)
			mustOK(t, err)
			tau := 10 / sr
			assertRel(t, "growth", got-ideal, 2*tau/(1+beta), 1e-4)
		}
	})

	t.Run("trade fact: slow part runs slow", func(t *testing.T) {
		// Trade fact (common practice, no source; issue 5): same RC, ~10 V
		// swing, a few tens of kHz — 0.5 V/µs loses well over 10 %, 5 V/µs far
		// less. Worked by an independent python brute-force run of the ramp
		// model: 76.827 µs (13.016 kHz, −34.9 %) and 52.651 µs (18.993 kHz,
		// −5.0 %) for an ideal 20 kHz.
		r := 1 / (20e3 * 2 * math.Log(3)) / 1e-9 // RC for 20 kHz at β = 0.5
		slow, err := AstablePeriodSlewLimited(r, 1e-9, 0, 0.5, -5, 5, 0.5e6)
		mustOK(t, err)
		fast, err := AstablePeriodSlewLimited(r, 1e-9, 0, 0.5, -5, 5, 5e6)
		mustOK(t, err)
		assertRel(t, "slow period", slow, 76.827e-6, 1e-3)
		assertRel(t, "fast period", fast, 52.651e-6, 1e-3)
		slowLoss, fastLoss := 1-1/(slow*20e3), 1-1/(fast*20e3)
		if slowLoss < 0.10 || fastLoss > slowLoss/4 {
			t.Errorf("frequency loss 0.5 V/µs %.1f %%, 5 V/µs %.1f %%: want >10 %% and far less", 100*slowLoss, 100*fastLoss)
		}
	})

	t.Run("no full swing", func(t *testing.T) {
		// RC = 1 µs with a 10 µs transition: the capacitor crosses the next
		// threshold long before the output arrives.
		_, err := AstablePeriodSlewLimited(1e3, 1e-9, 0, 0.5, -5, 5, 1e6)
		if !errors.Is(err, ErrNoFullSwing) {
			t.Fatalf("error = %v, want ErrNoFullSwing", err)
		}
	})
}

func TestSlewForAstable(t *testing.T) {
	// By hand: ±5 V, 50 µs period, transitions ≤ 10 % → 2·10 V/5 µs = 4 V/µs.
	assertRel(t, "slew", SlewForAstable(-5, 5, 50e-6, 0.1), 4e6, 1e-12)

	// With exactly that slew the two transitions take 10 % of the ideal
	// period, and the frequency loss stays below it (the bound is
	// conservative).
	r := 1 / (20e3 * 2 * math.Log(3)) / 1e-9
	sr := SlewForAstable(-5, 5, 50e-6, 0.1)
	T, err := AstablePeriodSlewLimited(r, 1e-9, 0, 0.5, -5, 5, sr)
	mustOK(t, err)
	if loss := 1 - 50e-6/T; loss <= 0 || loss >= 0.1 {
		t.Errorf("frequency loss at the required slew = %.3f, want between 0 and 0.1", loss)
	}
}

func TestAstableVdiffAndCurrent(t *testing.T) {
	// By hand: β = 0.5, ±5 V → VTH − VTL = 5 V.
	assertRel(t, "vdiff", AstableVdiff(0.5, -5, 5), 5, 1e-12)
	// R 10k, R1 = R2 = 10k, ±5 V: just after switching high the capacitor
	// is at −2.5 V: 7.5 V/10k + 5 V/20k = 1 mA.
	assertRel(t, "output current", AstableOutputCurrent(10e3, 10e3, 10e3, 0, -5, 5), 1e-3, 1e-12)
	// Asymmetric: R 10k, R1 10k, R2 20k, ref 2.5, 0.05…3.5 V: sink side
	// (2.8333 − 0.05)/10k + 2.45/30k = 0.27833 + 0.08167 = 0.36 mA; source
	// side (3.5 − 1.6833)/10k + 1/30k = 0.18167 + 0.03333 = 0.215 mA.
	assertRel(t, "asymmetric current", AstableOutputCurrent(10e3, 10e3, 20e3, 2.5, 0.05, 3.5), 0.36e-3, 1e-9)
}

// simulateAstable integrates the slew-limited astable step by step: the
// output slews at sr toward the level chosen by the sign of v+ − v−, with
// v+ = ref + β(vout − ref) and RC·dv−/dt = vout − v−. It returns the mean
// period over the last two cycles.
func simulateAstable(rc, ref, beta, vol, voh, sr float64) float64 {
	tau := (voh - vol) / sr
	dt := math.Min(rc, tau) / 4000
	vout := voh
	_, v := Thresholds(ref, beta, vol, voh) // capacitor at VTL, output high
	high := true
	var flips []float64
	for t := 0.0; len(flips) < 9; t += dt {
		vp := ref + beta*(vout-ref)
		if now := vp > v; now != high {
			high = now
			flips = append(flips, t)
		}
		if high {
			vout = math.Min(voh, vout+sr*dt)
		} else {
			vout = math.Max(vol, vout-sr*dt)
		}
		k1 := (vout - v) / rc
		k2 := (vout - (v + k1*dt)) / rc
		v += (k1 + k2) / 2 * dt
	}
	n := len(flips)
	return (flips[n-1] - flips[n-5]) / 2
}
