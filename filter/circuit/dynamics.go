package circuit

import "math"

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

// GBWForGainError returns the gain-bandwidth that keeps the closed-loop gain
// magnitude error at frequency f within eps (0 < ε < 1) in a loop of noise
// gain ng: GBW = NG·f/√(1/(1−ε)² − 1) (≈ 7.02·NG·f at 1 %; DESIGN.md), the
// inverse of the single-pole loop's error ε = 1 − 1/√(1 + (NG·f/GBW)²) from
// A_cl = A_ideal/(1 + j·NG·f/GBW) (Sedra & Smith, from memory).
func GBWForGainError(ng, f, eps float64) (float64, error) {
	if !(eps > 0 && eps < 1) {
		return 0, domainErr("gbw for gain error", "eps", eps, "0 < eps < 1")
	}
	d := 1 / ((1 - eps) * (1 - eps))
	return ng * f / math.Sqrt(d-1), nil
}

// MaxFreqForGainError returns the highest frequency at which a loop of
// noise gain ng around a single-pole op-amp of gain-bandwidth gbw keeps its
// gain magnitude error within eps: the inverse in f of GBWForGainError,
// which is linear in f, so f = GBW/GBWForGainError(NG, 1 Hz, ε).
func MaxFreqForGainError(gbw, ng, eps float64) (float64, error) {
	g1, err := GBWForGainError(ng, 1, eps)
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
