package circuit

import (
	"math"
	"testing"

	_ "github.com/opsift/opsift/internal/golden" // takes -update, so go test ./... -update runs here too
)

// assertRel fails unless got is within rel (a fraction) of want.
func assertRel(t *testing.T, name string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.10g, want %.10g (±%g relative)", name, got, want, rel)
	}
}

// assertAbs fails unless got is within abs of want.
func assertAbs(t *testing.T, name string, got, want, abs float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > abs {
		t.Errorf("%s = %.10g, want %.10g (±%g)", name, got, want, abs)
	}
}

// mustOK fails the test at once on a non-nil error.
func mustOK(t *testing.T, err error) {
	t.Helper()
	if err != nil {
		t.Fatalf("unexpected error: %v", err)
	}
}

// Closed forms the tests check the package against: standard results kept
// here as independent references, not used by the engine.

// gainErrorAt returns the magnitude error of the closed-loop gain at
// frequency f for a single-pole op-amp of gain-bandwidth gbw in a loop of
// noise gain ng: ε = 1 − 1/√(1 + (NG·f/GBW)²), from A_cl = A_ideal/(1 + j·NG·f/GBW)
// (single-pole loop; Sedra & Smith, from memory).
func gainErrorAt(gbw, ng, f float64) float64 {
	x := ng * f / gbw
	return 1 - 1/math.Sqrt(1+x*x)
}

// thermalNoiseDensity returns the Johnson–Nyquist voltage noise density of a
// resistance r at temperature tempK, e = √(4kTR) in V/√Hz (Johnson 1928,
// Nyquist 1928; k is Boltzmann, exact).
func thermalNoiseDensity(r, tempK float64) float64 {
	return math.Sqrt(4 * Boltzmann * tempK * r)
}

// lowPass2Gain returns the gain magnitude at frequency f of a second-order
// low-pass of natural frequency f0, quality factor q and unity DC gain:
// |H| = 1/√((1 − x²)² + (x/Q)²) with x = f/f0; at f0 it equals Q.
func lowPass2Gain(f, f0, q float64) float64 {
	x := f / f0
	a := 1 - x*x
	b := x / q
	return 1 / math.Sqrt(a*a+b*b)
}

// feedbackCapForTIA45 returns Graeme's feedback capacitor for 45° phase
// margin, Cf = √(Cin/(2π·Rf·GBW)): it puts the feedback pole 1/(2π·Rf·Cf) at
// the frequency where the noise gain 1 + Cin/Cf meets the op-amp's gain
// (Cf ≪ Cin). The 45° comes from the straight-line Bode construction; the
// exact single-pole loop has about 52° and Q ≈ 1 — about 1.2 dB of peaking
// and a −3 dB bandwidth about 1.26·BandwidthTIA. For a maximally flat
// response use FeedbackCapForTIAFlat, √2 times larger.
func feedbackCapForTIA45(rf, cin, gbw float64) float64 {
	return math.Sqrt(cin / (2 * math.Pi * rf * gbw))
}

// astablePeriodSymmetric returns the ideal period when the output levels sit
// symmetric about the reference, T = 2RC·ln((1 + β)/(1 − β)) (Sedra & Smith,
// from memory); it does not depend on the swing. It wants 0 < β < 1.
func astablePeriodSymmetric(r, c, beta float64) (float64, error) {
	const fn = "astable symmetric period"
	if err := checkRC(fn, r, c); err != nil {
		return 0, err
	}
	if !(beta > 0 && beta < 1) {
		return 0, domainErr(fn, "beta", beta, "0 < beta < 1")
	}
	return 2 * r * c * math.Log((1+beta)/(1-beta)), nil
}

// gainErrorSinglePole returns the magnitude error of the closed-loop gain
// at frequency f for a single-pole op-amp A(jf) = Aol/(1 + j·f·Aol/GBW) in a
// loop of noise gain ng: |A_cl| = NG/|1 + NG/A|, with
// |1 + NG/A|² = (1 + NG/Aol)² + (NG·f/GBW)² (loop-gain relation A_cl =
// A/(1 + A/NG), Sedra & Smith, from memory), so
// ε = 1 − 1/√((1 + NG/Aol)² + (NG·f/GBW)²). aol = +Inf gives gainErrorAt.
func gainErrorSinglePole(gbw, aol, ng, f float64) float64 {
	d, x := 1+ng/aol, ng*f/gbw
	return 1 - 1/math.Sqrt(d*d+x*x)
}
