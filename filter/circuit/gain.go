package circuit

import "math"

// NonInvertingGain returns the signal gain of a non-inverting amplifier,
// G = 1 + Rf/Rg, with Rf from output to the inverting input and Rg from the
// inverting input to the reference (ideal op-amp; any textbook, e.g. Sedra &
// Smith, Microelectronic Circuits, from memory). Rg = +Inf gives the
// follower, G = 1.
func NonInvertingGain(rf, rg float64) float64 {
	return 1 + rf/rg
}

// InvertingGain returns the magnitude of the signal gain of an inverting
// amplifier, |G| = Rf/Rin (the gain itself is −Rf/Rin; ideal op-amp; Sedra &
// Smith, from memory).
func InvertingGain(rf, rin float64) float64 {
	return rf / rin
}

// NoiseGainNonInverting returns the noise gain NG = 1/β of a non-inverting
// stage of signal gain g: NG = G = 1 + Rf/Rg.
func NoiseGainNonInverting(g float64) float64 {
	return g
}

// NoiseGainInverting returns the noise gain NG = 1/β = 1 + Rf/Rin of an
// inverting stage whose signal gain has magnitude g: NG = 1 + |G|.
func NoiseGainInverting(g float64) float64 {
	return 1 + math.Abs(g)
}

// Parallel returns the resistance of resistors in parallel,
// 1/(1/a + 1/b + …). A zero resistance gives 0 and +Inf (an open) drops out.
func Parallel(a float64, b ...float64) float64 {
	sum := 1 / a
	for _, r := range b {
		sum += 1 / r
	}
	return 1 / sum
}

// DB returns a voltage ratio in decibels, 20·log10(v).
func DB(v float64) float64 {
	return 20 * math.Log10(v)
}

// FromDB returns the voltage ratio of a level in decibels, 10^(dB/20).
func FromDB(db float64) float64 {
	return math.Pow(10, db/20)
}
