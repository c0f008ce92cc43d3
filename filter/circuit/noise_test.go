package circuit

import (
	"math"
	"testing"
)

func TestThermalNoise(t *testing.T) {
	// √(4kTR) with k = 1.380649e-23 J/K (SI 2019, exact); values computed
	// independently in python.
	tests := []struct {
		name  string
		r, tK float64
		want  float64
	}{
		{"1 kOhm at 300 K", 1e3, 300, 4.070354776e-9}, // the familiar ≈ 4.07 nV/√Hz
		{"10 kOhm at 25 C", 10e3, KelvinFromCelsius(25), 1.283184319e-8},
		{"1 MOhm at 300 K", 1e6, 300, 1.287159198e-7}, // √1000 × the 1 kΩ figure
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			assertRel(t, "density", thermalNoiseDensity(tt.r, tt.tK), tt.want, 1e-6)
		})
	}
}

func TestKelvinFromCelsius(t *testing.T) {
	assertAbs(t, "0 C", KelvinFromCelsius(0), 273.15, 1e-12)
	assertAbs(t, "-40 C", KelvinFromCelsius(-40), 233.15, 1e-12)
}

func TestNoiseBandwidthSinglePole(t *testing.T) {
	// Independent check: integrate 1/(1 + (f/f3)²) numerically with the
	// substitution f = f3·tan θ, which maps 0…∞ onto 0…π/2 with integrand f3.
	f3 := 10e3
	n := 100000
	sum := 0.0
	for i := 0; i < n; i++ {
		th := (float64(i) + 0.5) * (math.Pi / 2) / float64(n)
		f := f3 * math.Tan(th)
		dfdth := f3 / (math.Cos(th) * math.Cos(th))
		sum += dfdth / (1 + (f/f3)*(f/f3)) * (math.Pi / 2) / float64(n)
	}
	assertRel(t, "ENBW", NoiseBandwidthSinglePole(f3), sum, 1e-9)
	assertRel(t, "ENBW 10 kHz", NoiseBandwidthSinglePole(f3), 15707.96327, 1e-9)
}

func TestAmpNoise(t *testing.T) {
	// Worked example (python, independent): en 10 nV/√Hz, in 1 pA/√Hz,
	// Rs 10 kΩ at 300 K, NG 10, GBW 1 MHz, no feedback resistance. Density
	// √(100 + 100 + 165.68) nV/√Hz = 19.1227 nV/√Hz; ENBW = π/2·100 kHz;
	// output = 19.1227 nV · 10 · √157080 = 75.790 µV rms.
	a := AmpNoise{En: 10e-9, In: 1e-12, Rs: 10e3, TempK: 300, NG: 10}
	assertRel(t, "output noise", a.OutputRMS(NoiseBandwidthSinglePole(1e6/10)), 7.578954220e-5, 1e-6)

	t.Run("feedback network counted", func(t *testing.T) {
		// Rf 900 kΩ, Rg 100 kΩ (NG 10, Rp = 90 kΩ), en 10 nV/√Hz, in 1 pA/√Hz,
		// Rs 0, 300 K, 10 kHz brick-wall band. By hand: 4kT·90k = 1.49098e-15,
		// (in·Rp)² = 8.1e-15, en² = 1e-16 → e = 98.44 nV/√Hz, × 10 × √10⁴
		// = 98.44 µV. Without the network it is en alone: 10 µV, 9.8× less.
		a := AmpNoise{En: 10e-9, In: 1e-12, Rp: 90e3, TempK: 300, NG: 10}
		want := 10 * math.Sqrt(1e-16+8.1e-15+4*1.380649e-23*300*90e3) * 100
		assertRel(t, "with Rf∥Rg", a.OutputRMS(10e3), want, 1e-12)
		assertRel(t, "with Rf∥Rg by hand", a.OutputRMS(10e3), 98.4434e-6, 1e-5)
	})

	t.Run("1/f corner", func(t *testing.T) {
		// en 10 nV/√Hz with a 100 Hz corner over a 1 kHz brick wall: the power
		// is en²·(1000 + 100·ln(1000/0.1)) = en²·1921.03 (by hand), so the RMS
		// is 10 nV·√1921.03 = 438.30 nV.
		a := AmpNoise{En: 10e-9, EnCorner: 100, NG: 1}
		assertRel(t, "1/f", a.OutputRMS(1e3), 10e-9*math.Sqrt(1000+100*math.Log(1e4)), 1e-12)
		assertRel(t, "1/f by hand", a.OutputRMS(1e3), 438.30e-9, 1e-4)
	})
}

func TestFilterNoiseBandwidth(t *testing.T) {
	// Butterworth ENBW/fc (Motchenbacher & Connelly, from memory): 1.5708,
	// 1.1107, 1.0472, 1.0262 for orders 1…4; checked by integrating
	// 1/(1 + x^2n) numerically with x = tan θ.
	for n, want := range map[int]float64{1: math.Pi / 2, 2: 1.110720735, 3: 1.047197551, 4: 1.026172153} {
		sum := 0.0
		const steps = 200000
		for i := 0; i < steps; i++ {
			th := (float64(i) + 0.5) * (math.Pi / 2) / steps
			x := math.Tan(th)
			sum += (1 + x*x) / (1 + math.Pow(x, 2*float64(n))) * (math.Pi / 2) / steps
		}
		assertRel(t, "ENBW", FilterNoiseBandwidth(1, n), want, 1e-8)
		assertRel(t, "ENBW integral", FilterNoiseBandwidth(1, n), sum, 1e-6)
	}
	assertRel(t, "brick wall", FilterNoiseBandwidth(20e3, 0), 20e3, 0)
	// Single pole (3 dB at 100 kHz) into a 20 kHz brick wall:
	// 100 kHz·atan(0.2) = 19.7396 kHz (by hand).
	assertRel(t, "loop and band", NoiseBandwidthLoopBand(100e3, 20e3), 19739.56, 1e-6)
}

func TestTIANoise(t *testing.T) {
	const rf, cin = 1e6, 100e-12
	gbw := 10e6
	cf := FeedbackCapForTIAFlat(rf, cin, gbw)
	f0, _ := TIAResponse(rf, cin, cf, gbw)
	t.Run("Rf thermal noise", func(t *testing.T) {
		// The current sees the signal's own flat second-order response, whose
		// noise bandwidth is the Butterworth n = 2 figure 1.1107·f0 (from
		// memory): Vn = √(4kT·Rf·1.1107·f0).
		n := TIANoise{Rf: rf, Cf: cf, Cin: cin, GBW: gbw, TempK: 300}
		want := math.Sqrt(4 * Boltzmann * 300 * rf * FilterNoiseBandwidth(f0, 2))
		assertRel(t, "Rf thermal", n.OutputRMS(), want, 1e-3)
	})
	t.Run("voltage noise without input capacitance", func(t *testing.T) {
		// Cin = 0: the noise gain is 1 and en sees a follower, a single pole
		// at GBW: en·√(π/2·GBW) (textbook ENBW).
		n := TIANoise{En: 10e-9, Rf: rf, Cf: cf, GBW: gbw, TempK: 0}
		assertRel(t, "en follower", n.OutputRMS(), 10e-9*math.Sqrt(math.Pi/2*gbw), 1e-3)
	})
	t.Run("en·Cin gain peaking", func(t *testing.T) {
		// With Cin the noise gain climbs to 1 + Cin/Cf (≈ 51 here) above the
		// feedback zero, so en's output exceeds its follower value many times.
		n := TIANoise{En: 10e-9, Rf: rf, Cf: cf, Cin: cin, GBW: gbw}
		if got, flat := n.OutputRMS(), 10e-9*math.Sqrt(math.Pi/2*gbw); got < 3*flat {
			t.Errorf("en with Cin = %g V, want ≫ %g V (gain peaking)", got, flat)
		}
	})
	t.Run("grid converged", func(t *testing.T) {
		n := TIANoise{En: 10e-9, In: 1e-15, EnCorner: 100, Rf: rf, Cf: cf / 2, Cin: cin, GBW: gbw, TempK: 300}
		got := n.OutputRMS()
		fine := n.outputRMS(400)
		assertRel(t, "24 vs 400 points per decade", got, fine, 1e-4)
	})
	t.Run("brick-wall band", func(t *testing.T) {
		// A 1 kHz band far below f0: only Rf's thermal noise in a flat
		// response, √(4kT·Rf·(1 kHz − 0.1 Hz)).
		n := TIANoise{Rf: rf, Cf: cf, Cin: cin, GBW: gbw, TempK: 300, Band: 1e3}
		assertRel(t, "banded", n.OutputRMS(), math.Sqrt(4*Boltzmann*300*rf*(1e3-FlickerLow)), 1e-4)
	})
}
