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
			assertRel(t, "density", ThermalNoiseDensity(tt.r, tt.tK), tt.want, 1e-6)
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

func TestOutputNoiseRMS(t *testing.T) {
	// Worked example (python, independent): en 10 nV/√Hz, in 1 pA/√Hz,
	// Rs 10 kΩ at 300 K, NG 10, GBW 1 MHz. Density √(100 + 100 + 165.68)
	// nV/√Hz = 19.1227 nV/√Hz; ENBW = π/2·100 kHz; output = 19.1227 nV ·
	// 10 · √157080 = 75.790 µV rms.
	got := OutputNoiseRMS(10e-9, 1e-12, 10e3, 300, 10, 1e6)
	assertRel(t, "output noise", got, 7.578954220e-5, 1e-6)

	t.Run("voltage noise only", func(t *testing.T) {
		// Rs = 0: en·NG·√(π/2·GBW/NG) = 5 nV · 1 · √(π/2 · 10 MHz) = 19.8166 µV.
		got := OutputNoiseRMS(5e-9, 1e-12, 0, 300, 1, 10e6)
		assertRel(t, "output noise", got, 5e-9*math.Sqrt(math.Pi/2*10e6), 1e-12)
		assertRel(t, "output noise worked", got, 19.81663e-6, 1e-5)
	})
}
