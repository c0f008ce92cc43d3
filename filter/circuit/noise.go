package circuit

import "math"

// KelvinFromCelsius converts a temperature in °C to kelvin, T = t + 273.15.
func KelvinFromCelsius(c float64) float64 {
	return c + ZeroCelsius
}

// ThermalNoiseDensity returns the Johnson–Nyquist voltage noise density of a
// resistance r at temperature tempK, e = √(4kTR) in V/√Hz (Johnson 1928,
// Nyquist 1928; k is Boltzmann, exact).
func ThermalNoiseDensity(r, tempK float64) float64 {
	return math.Sqrt(4 * Boltzmann * tempK * r)
}

// NoiseBandwidthSinglePole returns the equivalent noise bandwidth of a
// single-pole low-pass with −3 dB frequency f3db, ENBW = (π/2)·f3db (the
// integral of 1/(1 + (f/f3)²) from 0 to ∞).
func NoiseBandwidthSinglePole(f3db float64) float64 {
	return math.Pi / 2 * f3db
}

// OutputNoiseRMS returns the RMS output noise of a stage of noise gain ng
// built on a single-pole op-amp of gain-bandwidth gbw, from the op-amp's
// voltage noise density en (V/√Hz), its current noise density in (A/√Hz)
// flowing in the source resistance rs, and the thermal noise of rs at tempK:
//
//	Vn,out = √(en² + (in·Rs)² + 4kT·Rs) · NG · √((π/2)·GBW/NG)
//
// All densities are taken as white (no 1/f corner) and referred to the
// non-inverting input; the feedback network's own noise is left out, which
// is small when its resistances are well below Rs.
func OutputNoiseRMS(en, in, rs, tempK, ng, gbw float64) float64 {
	irs := in * rs
	density := math.Sqrt(en*en + irs*irs + 4*Boltzmann*tempK*rs)
	return density * ng * math.Sqrt(NoiseBandwidthSinglePole(ClosedLoopBandwidth(gbw, ng)))
}
