// Package fourier holds the Fourier-series THD of two waveforms with known
// series, worked outside the simulator, for the tests that check the
// simulated thd requirement against them.
package fourier

import "math"

// TriangleTHD is the THD over harmonics 2…10 of a symmetric triangle wave:
// its Fourier series has only odd harmonics, of amplitude ∝ 1/n² (standard
// Fourier series tables, from memory: x(t) = 8/π²·Σ (−1)^((n−1)/2)·sin(nωt)/n²),
// so THD = √(Σ_{n=3,5,7,9} 1/n⁴) = 12.0477 %.
func TriangleTHD() float64 {
	s := 0.0
	for n := 3.0; n <= 9; n += 2 {
		s += math.Pow(n, -4)
	}
	return math.Sqrt(s)
}

// ClippedSineTHD is the THD over harmonics 2…10 of a sine A·sin θ clipped
// symmetrically at ±c, clip = c/A = sin θc (0 < clip ≤ 1). The wave is odd
// and half-wave symmetric, so only odd sine terms remain,
// b_n = (4/π)·∫₀^{π/2} x(θ)·sin(nθ) dθ. Integrated by hand (the Fourier
// series by its definition; the integrals are elementary):
//
//	b_1 = (2A/π)·(θc + sin θc·cos θc)
//	b_n = (4A/π)·[½·(sin((n−1)θc)/(n−1) − sin((n+1)θc)/(n+1)) + sin θc·cos(nθc)/n],  n = 3, 5, …
//
// (the last term is c·∫_{θc}^{π/2} sin nθ dθ = c·cos(nθc)/n, as cos(nπ/2) = 0
// for odd n).
func ClippedSineTHD(clip float64) float64 {
	tc := math.Asin(clip)
	b1 := 2 / math.Pi * (tc + math.Sin(tc)*math.Cos(tc))
	s := 0.0
	for n := 3.0; n <= 9; n += 2 {
		bn := 4 / math.Pi * (0.5*(math.Sin((n-1)*tc)/(n-1)-math.Sin((n+1)*tc)/(n+1)) + math.Sin(tc)*math.Cos(n*tc)/n)
		s += bn * bn
	}
	return math.Sqrt(s) / b1
}

// ClipForTHD is the clip level c/A at which ClippedSineTHD equals thd
// (0 < thd < 0.4291, the hard-clip limit), by bisection: the THD falls
// monotonically as the clip level rises to 1.
func ClipForTHD(thd float64) float64 {
	lo, hi := 1e-9, 1.0 // THD(lo) > thd > THD(hi) = 0
	for range 200 {
		mid := (lo + hi) / 2
		if ClippedSineTHD(mid) > thd {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}
