package circuit

import (
	"errors"
	"fmt"
	"math"
)

// ErrNoFullSwing reports that a slew-limited astable's capacitor reaches the
// opposite threshold before the output has finished its transition: the
// oscillator then runs with a reduced swing (a triangle-like output) and the
// full-swing model of AstablePeriodSlewLimited does not apply.
var ErrNoFullSwing = errors.New("output does not reach its level before the capacitor crosses the next threshold")

// AstablePeriodSlewLimited returns the period of the astable when the output
// moves between vol and voh as a linear ramp of slope sr instead of
// switching instantly.
//
// Model: each transition lasts τ = (VOH − VOL)/SR. It starts the moment the
// capacitor reaches a threshold, and during it the capacitor keeps following
// the ramping output through R (it first overshoots the threshold, then
// turns). The non-inverting input follows the output through the divider,
// which keeps the comparator decided during the ramp as long as the
// capacitor ends the ramp short of the other threshold. Solving
// RC·dv/dt = vout(t) − v for the ramp vout = VOH − SR·t from v(0) = VTH:
//
//	v(τ) − VOL = SR·RC·(1 − e^(−τ/RC)) − (VOH − VTH)·e^(−τ/RC)
//	t_low'     = RC·ln((v(τ) − VOL)/(VTL − VOL))
//
// and the mirror image for the rising ramp from VTL:
//
//	VOH − v(τ) = SR·RC·(1 − e^(−τ/RC)) − (VTL − VOL)·e^(−τ/RC)
//	t_high'    = RC·ln((VOH − v(τ))/(VOH − VTH))
//
// so T = 2τ + t_high' + t_low'. This is exact for the ramp model and tends to
// AstablePeriod as SR → ∞; for small τ it is T ≈ T_ideal + 2τ/(1 + β) in the
// symmetric case. Left out: the rounding of the output near the rails,
// saturation-recovery delay and input overdrive effects, which all lengthen
// the period further — so treat the result as an optimistic prediction
// (first-order approximation of the real part). The time-domain model
// (filter/sim) refines it.
//
// It returns ErrNoFullSwing (wrapped in the message) when the capacitor
// would cross the opposite threshold during a ramp, and a *DomainError for
// arguments outside 0 < β < 1, vol < ref < voh, R, C, SR > 0.
func AstablePeriodSlewLimited(r, c, ref, beta, vol, voh, sr float64) (float64, error) {
	const fn = "slew-limited astable period"
	if err := checkRC(fn, r, c); err != nil {
		return 0, err
	}
	if !(sr > 0) {
		return 0, domainErr(fn, "sr", sr, "a slew rate above 0")
	}
	vth, vtl, err := astableThresholds(fn, ref, beta, vol, voh)
	if err != nil {
		return 0, err
	}
	if math.IsInf(sr, 1) {
		return AstablePeriod(r, c, ref, beta, vol, voh)
	}
	rc := r * c
	tau := (voh - vol) / sr
	decay := math.Exp(-tau / rc)
	gain := sr * rc * -math.Expm1(-tau/rc) // SR·RC·(1 − e^(−τ/RC)), exact for small τ/RC

	fromHigh := gain - (voh-vth)*decay // v(τ) − VOL after the falling ramp
	fromLow := gain - (vtl-vol)*decay  // VOH − v(τ) after the rising ramp
	if fromHigh < vtl-vol || fromLow < voh-vth {
		return 0, fmt.Errorf("%s: slew rate %g V/s: %w", fn, sr, ErrNoFullSwing)
	}
	tLow := rc * math.Log(fromHigh/(vtl-vol))
	tHigh := rc * math.Log(fromLow/(voh-vth))
	return 2*tau + tHigh + tLow, nil
}
