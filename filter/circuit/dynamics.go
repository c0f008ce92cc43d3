package circuit

import (
	"fmt"
	"math"
)

// SlewForSine returns the slew rate a sine of frequency f and peak vpeak
// needs at its zero crossing, SR = 2π·f·Vp (d/dt of Vp·sin 2πft at t = 0).
func SlewForSine(f, vpeak float64) float64 {
	return 2 * math.Pi * f * vpeak
}

// SlewForStep returns the slew rate that moves a step of vstep from its 10 %
// to its 90 % point within rise1090, SR = 0.8·Vstep/t(10–90).
func SlewForStep(vstep, rise1090 float64) float64 {
	return TenToNinety * math.Abs(vstep) / rise1090
}

// SlewForTransition returns the slew rate an op-amp used as a comparator
// needs to move its output between the levels vol and voh within t, where t
// is the 10–90 % transition time: SR = 0.8·|VOH − VOL|/t.
func SlewForTransition(vol, voh, t float64) float64 {
	return SlewForStep(voh-vol, t)
}

// FullPowerBandwidth returns the highest frequency at which an output of
// peak vpeak stays an undistorted sine for slew rate sr, f = SR/(2π·Vp) (the
// inverse of SlewForSine).
func FullPowerBandwidth(sr, vpeak float64) float64 {
	return sr / (2 * math.Pi * vpeak)
}

// RegenerationTimeConstant returns the time constant 1/(2π·GBW·β) with
// which the output of a single-pole op-amp with positive feedback β leaves
// its level after a switch (the growth e^(t/τ) of the astable's linear
// phase; see AstablePeriodLimited).
func RegenerationTimeConstant(gbw, beta float64) float64 {
	return 1 / (2 * math.Pi * gbw * beta)
}

// ClosedLoopBandwidth returns the −3 dB bandwidth of a loop around a
// single-pole op-amp, f3 = GBW/NG.
func ClosedLoopBandwidth(gbw, ng float64) float64 {
	return gbw / ng
}

// AolShare is the part of a stage's allowed gain error ε that an op-amp
// whose catalog entry gives no DC open-loop gain is assumed to spend at DC
// (its Aol taken at NG·(1 − ε/4)/(ε/4)); GBW then takes the rest
// (GainErrorBudget). A part whose Aol is known is checked with its own Aol
// instead (GBWForGainError), which is exact for a single-pole part and
// never stricter than the split when its Aol is above the split's floor.
// A quarter keeps the fallback gbw within about 15 % of the ideal-Aol
// formula at 1 % (1.153 × 7.02·NG·f); the share is a choice (common
// practice, no source), stated in derive's why lines and the README.
const AolShare = 0.25

// GBWForGainError returns the gain-bandwidth that keeps the closed-loop gain
// magnitude error at frequency f within eps (0 < ε < 1) in a loop of noise
// gain ng around a single-pole op-amp of DC open-loop gain aol (V/V; +Inf
// for an ideal DC gain): GBW = NG·f/√(1/(1−ε)² − (1 + NG/Aol)²), the inverse
// in GBW of the single-pole error ε = 1 − 1/√((1 + NG/Aol)² + (NG·f/GBW)²)
// (loop-gain relation A_cl = A/(1 + A/NG), Sedra & Smith, from memory).
// With aol = +Inf it is NG·f/√(1/(1−ε)² − 1) (≈ 7.02·NG·f at 1 %;
// DESIGN.md). An aol that alone spends ε is an error.
func GBWForGainError(ng, f, eps, aol float64) (float64, error) {
	if !(eps > 0 && eps < 1) {
		return 0, domainErr("gbw for gain error", "eps", eps, "0 < eps < 1")
	}
	dc := 1 + ng/aol
	rest := 1/((1-eps)*(1-eps)) - dc*dc
	if !(rest > 0) {
		return 0, domainErr("gbw for gain error", "aol", aol, fmt.Sprintf("aol > NG·(1 − ε)/ε = %g", ng*(1-eps)/eps))
	}
	return ng * f / math.Sqrt(rest), nil
}

// GainErrorBudget splits the allowed gain error eps of a loop of noise gain
// ng at frequency f between the DC open-loop gain and the gain-bandwidth:
// Aol takes AolShare·ε (AolForGainError), and GBW the rest
// (GBWForGainError with that Aol), so a single-pole op-amp exactly at both
// returned figures has a gain error of exactly ε at f.
func GainErrorBudget(ng, f, eps float64) (gbw, aolVV, aolDB float64, err error) {
	if !(eps > 0 && eps < 1) {
		return 0, 0, 0, domainErr("gain error budget", "eps", eps, "0 < eps < 1")
	}
	aolVV, aolDB, err = AolForGainError(ng, AolShare*eps)
	if err != nil {
		return 0, 0, 0, err
	}
	gbw, err = GBWForGainError(ng, f, eps, aolVV)
	return gbw, aolVV, aolDB, err
}

// MaxFreqForGainError returns the highest frequency at which a loop of
// noise gain ng around a single-pole op-amp of gain-bandwidth gbw and DC
// open-loop gain aol (V/V; +Inf ideal) keeps its gain error within eps:
// GBWForGainError is linear in f, so f = GBW/GBWForGainError(NG, 1 Hz, ε,
// Aol) = GBW·√(1/(1−ε)² − (1 + NG/Aol)²)/NG.
func MaxFreqForGainError(gbw, ng, eps, aol float64) (float64, error) {
	g1, err := GBWForGainError(ng, 1, eps, aol)
	if err != nil {
		return 0, err
	}
	return gbw / g1, nil
}

// MaxNoiseGainForGainError returns the largest noise gain a loop around a
// single-pole op-amp of gain-bandwidth gbw and DC open-loop gain aol (V/V)
// can have at frequency f and keep its gain error within eps: the positive
// root in NG of the single-pole error (1 + NG/Aol)² + (NG·f/GBW)² =
// 1/(1−ε)² (GBWForGainError), a quadratic a·NG² + 2·NG/Aol − (K − 1) = 0
// with a = 1/Aol² + (f/GBW)², K = 1/(1−ε)².
func MaxNoiseGainForGainError(gbw, aol, f, eps float64) (float64, error) {
	if !(eps > 0 && eps < 1) {
		return 0, domainErr("noise gain for gain error", "eps", eps, "0 < eps < 1")
	}
	if !(gbw > 0 && aol > 0 && f >= 0) {
		return 0, domainErr("noise gain for gain error", "gbw", gbw, "gbw > 0, aol > 0, f ≥ 0")
	}
	k := 1/((1-eps)*(1-eps)) - 1
	b := 1 / aol
	a := b*b + (f/gbw)*(f/gbw)
	// The root (−b + √(b² + a·k))/a, written as k/(b + √(b² + a·k)) so that
	// it stays accurate when b² ≫ a·k or a → 0.
	return k / (b + math.Sqrt(b*b+a*k)), nil
}

// GBWForRise returns the gain-bandwidth that gives a 10–90 % rise time of
// rise in a loop of noise gain ng: the closed-loop bandwidth must be
// 0.35/rise (single pole, see RiseBandwidth), so GBW = NG·0.35/rise.
func GBWForRise(ng, rise float64) float64 {
	return ng * RiseBandwidth / rise
}

// AolForGainError returns the open-loop gain, as V/V and in dB, that keeps
// the DC closed-loop gain error within eps (0 < ε < 1) in a loop of noise
// gain ng. From the loop-gain relation A_cl = NG/(1 + NG/Aol) (Sedra &
// Smith, from memory), ε = (NG/Aol)/(1 + NG/Aol), so Aol = NG·(1 − ε)/ε.
// The shortcut NG/ε (ε ≈ NG/Aol for a large loop gain) asks 20·log10(1/(1−ε))
// dB too much (0.087 dB at 1 %) and fails a part that meets ε exactly.
func AolForGainError(ng, eps float64) (vv, db float64, err error) {
	if !(eps > 0 && eps < 1) {
		return 0, 0, domainErr("aol for gain error", "eps", eps, "0 < eps < 1")
	}
	vv = ng * (1 - eps) / eps
	return vv, DB(vv), nil
}
