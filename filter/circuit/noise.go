package circuit

import "math"

// KelvinFromCelsius converts a temperature in °C to kelvin, T = t + 273.15.
func KelvinFromCelsius(c float64) float64 {
	return c + ZeroCelsius
}

// NoiseBandwidthSinglePole returns the equivalent noise bandwidth of a
// single-pole low-pass with −3 dB frequency f3db, ENBW = (π/2)·f3db (the
// integral of 1/(1 + (f/f3)²) from 0 to ∞).
func NoiseBandwidthSinglePole(f3db float64) float64 {
	return math.Pi / 2 * f3db
}

// FlickerLow is the lowest frequency, Hz, the 1/f part of a noise density
// is integrated from: 1/f noise has no finite integral down to DC, and
// 0.1 Hz is the lower edge of the usual low-frequency noise band
// (0.1–10 Hz peak-to-peak; common practice, no source). Below it drift is
// counted as DC error.
const FlickerLow = 0.1

// FilterNoiseBandwidth returns the brick-wall equivalent noise bandwidth of
// an n-th order Butterworth low-pass with −3 dB frequency fc: the integral
// of 1/(1 + (f/fc)^2n) from 0 to ∞, fc·(π/2n)/sin(π/2n) (π/2·fc for n = 1,
// 1.111·fc for n = 2, 1.047·fc for n = 3; Motchenbacher & Connelly,
// Low-Noise Electronic System Design, from memory). Order 0 stands for an
// ideal brick wall at fc and returns fc.
func FilterNoiseBandwidth(fc float64, order int) float64 {
	if order <= 0 {
		return fc
	}
	x := math.Pi / (2 * float64(order))
	return fc * x / math.Sin(x)
}

// NoiseBandwidthLoopBand returns the equivalent noise bandwidth of a
// single-pole closed loop (−3 dB at f3) followed by an ideal brick wall at
// band: ∫₀^band df/(1 + (f/f3)²) = f3·atan(band/f3). band ≤ 0 or +Inf
// means no band limit and gives NoiseBandwidthSinglePole(f3).
func NoiseBandwidthLoopBand(f3, band float64) float64 {
	if !(band > 0) || math.IsInf(band, 1) {
		return NoiseBandwidthSinglePole(f3)
	}
	return f3 * math.Atan(band/f3)
}

// FlickerIntegral returns the extra noise power, in units of the white
// density squared, that a 1/f corner fc adds over a band of equivalent
// width b: ∫ fc/f df from FlickerLow to b = fc·ln(b/FlickerLow) (0 when the
// band ends below FlickerLow or there is no corner). The density model is
// e²(f) = e²·(1 + fc/f); the integral takes the band as a brick wall, which
// overstates the 1/f share slightly for a gradual roll-off.
func FlickerIntegral(fc, b float64) float64 {
	if !(fc > 0) || !(b > FlickerLow) {
		return 0
	}
	return fc * math.Log(b/FlickerLow)
}

// AmpNoise holds what sets the output noise of a non-inverting or
// inverting amplifier, all referred to the non-inverting input
// (Motchenbacher & Connelly; Franco, Design with Operational Amplifiers,
// noise chapter; from memory):
//
//	e²(f) = en²·(1 + fe/f) + in²·(1 + fi/f)·(Rs² + Rp²) + 4kT·(Rs + Rp)
//	Vn,out = NG · √(∫ e²(f) df over the band)
//
// Rs is the resistance at the non-inverting input, Rp = Rf∥Rg (inverting:
// Rf∥Rin) the resistance the inverting input sees; the current noise of
// each input flows in its own resistance, and the two resistances' thermal
// noise is referred to the input by the same noise gain.
type AmpNoise struct {
	En, In   float64 // white voltage (V/√Hz) and current (A/√Hz) noise densities
	EnCorner float64 // 1/f corner of en, Hz (0: white)
	InCorner float64 // 1/f corner of in, Hz (0: white)
	Rs, Rp   float64 // resistance at the + and − input, Ω (0: none)
	TempK    float64 // temperature of the resistors, K
	NG       float64 // noise gain 1/β
}

// OutputRMS returns the RMS output noise over an equivalent noise bandwidth
// enbw (Hz): NG·√(en²·(B + fe·ln(B/0.1 Hz)) + in²·(Rs² + Rp²)·(B + fi·ln(B/0.1 Hz)) + 4kT·(Rs + Rp)·B).
func (a AmpNoise) OutputRMS(enbw float64) float64 {
	r2 := a.Rs*a.Rs + a.Rp*a.Rp
	p := a.En*a.En*(enbw+FlickerIntegral(a.EnCorner, enbw)) +
		a.In*a.In*r2*(enbw+FlickerIntegral(a.InCorner, enbw)) +
		4*Boltzmann*a.TempK*(a.Rs+a.Rp)*enbw
	return a.NG * math.Sqrt(p)
}
