package circuit

import "math"

// The unity-gain Sallen–Key low-pass (Sallen & Key, "A practical method of
// designing RC active filters", IRE Trans. Circuit Theory, 1955; every
// active-filter handbook, from memory):
//
//	in ──R1──┬──R2──┬── non-inverting input; output tied to inverting input
//	         C1     C2
//	        out    ground
//
// C1 is the feedback capacitor (from the R1–R2 junction to the output), C2
// the capacitor from the non-inverting input to ground. With an ideal
// follower, H(s) = 1/(1 + s·C2·(R1 + R2) + s²·R1R2C1C2).

// SallenKeyF0 returns the natural frequency of the unity-gain Sallen–Key
// low-pass, f0 = 1/(2π·√(R1R2C1C2)).
func SallenKeyF0(r1, r2, c1, c2 float64) float64 {
	return 1 / (2 * math.Pi * math.Sqrt(r1*r2*c1*c2))
}

// SallenKeyQ returns the quality factor of the unity-gain Sallen–Key
// low-pass, Q = √(R1R2C1C2)/(C2·(R1 + R2)), C1 the feedback capacitor. With
// equal resistors Q = ½·√(C1/C2), so equal components give Q = 0.5 and
// Q ≥ 0.5 needs C1 ≥ C2.
func SallenKeyQ(r1, r2, c1, c2 float64) float64 {
	return math.Sqrt(r1*r2*c1*c2) / (c2 * (r1 + r2))
}

// SallenKeyEqualR returns the capacitors of a unity-gain Sallen–Key low-pass
// with both resistors equal to r for natural frequency f0 and quality factor
// q: from √(C1C2) = 1/(2π·f0·R) and C1/C2 = 4Q²,
// C1 = Q/(π·f0·R) (feedback) and C2 = 1/(4π·Q·f0·R) (to ground).
func SallenKeyEqualR(r, f0, q float64) (c1, c2 float64) {
	return q / (math.Pi * f0 * r), 1 / (4 * math.Pi * q * f0 * r)
}

// SallenKeyGBW returns the rule-of-thumb gain-bandwidth for a Sallen–Key
// stage, GBW ≥ k·Q·f0 (common practice, no source): a generous k (the
// templates default to 100) keeps the op-amp's own phase shift from moving
// f0 and Q away from their ideal values.
func SallenKeyGBW(k, q, f0 float64) float64 {
	return k * q * f0
}

// LowPass2Peak returns the largest gain magnitude of a unity-DC-gain
// second-order low-pass: Q/√(1 − 1/(4Q²)) for Q > 1/√2 (at
// f = f0·√(1 − 1/(2Q²))), else 1 (no peaking, the maximum is at DC).
func LowPass2Peak(q float64) float64 {
	if q <= 1/math.Sqrt2 {
		return 1
	}
	return q / math.Sqrt(1-1/(4*q*q))
}

// LowPass2Bandwidth returns the −3 dB frequency of a unity-DC-gain
// second-order low-pass of natural frequency f0 and quality factor q:
// f3 = f0·√(a + √(a² + 1)) with a = 1 − 1/(2Q²) (solving |H|² = ½); it is
// f0 for the Butterworth Q = 1/√2.
func LowPass2Bandwidth(f0, q float64) float64 {
	a := 1 - 1/(2*q*q)
	return f0 * math.Sqrt(a+math.Sqrt(a*a+1))
}
