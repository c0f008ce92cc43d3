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

// AolShare is the part of a stage's allowed gain error ε that the finite DC
// open-loop gain may take; the loop gain at the signal frequency (GBW) takes
// the rest (GainErrorBudget). Each rule spending the whole ε on its own
// let a part at both limits miss by about 2× (7.6 % against 4 %). A quarter
// keeps the gbw figure within about 15 % of the ideal-Aol formula at 1 %
// (1.153 × 7.02·NG·f) while asking Aol for 12 dB more than the whole-ε
// rule; the split is a choice (common practice, no source), stated in
// derive's why lines and the README.
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
// noise gain ng around a single-pole op-amp of gain-bandwidth gbw keeps
// within the gbw requirement of GainErrorBudget for eps: that requirement is
// linear in f, so f = GBW/gbw(NG, 1 Hz, ε).
func MaxFreqForGainError(gbw, ng, eps float64) (float64, error) {
	g1, _, _, err := GainErrorBudget(ng, 1, eps)
	if err != nil {
		return 0, err
	}
	return gbw / g1, nil
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
