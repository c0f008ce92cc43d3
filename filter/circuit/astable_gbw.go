package circuit

import (
	"fmt"
	"math"
)

// AstablePeriodLimited returns the period of the astable on a single-pole
// op-amp of gain-bandwidth gbw and slew rate sr (either may be +Inf), whose
// output swings between vol and voh. It is the behavioural macromodel of
// filter/sim reduced to the astable: the output is an integrator,
//
//	dVout/dt = clamp(ωT·(V+ − V−), −SR, +SR),  ωT = 2π·GBW,  held within vol … voh
//	RC·dVc/dt = Vout − Vc,                    V+ = ref + β·(Vout − ref)
//
// While the output sits at a level the capacitor follows its exact RC
// exponential to the threshold; each transition is integrated with RK4 in
// steps of 1/16 of the fastest time constant (1/(β·ωT), the ramp time
// (VOH − VOL)/SR, RC; while the drive stays clamped at ±SR, of the ramp and
// RC only), halving the step onto the level the transition ends at; that
// keeps the period within 2e-6 of a 16 times finer grid. A transition starts in the linear region with
// V+ = V−: the positive feedback through the divider makes the output
// leave the level as e^(β·ωT·t) (Sedra & Smith, bistable circuits, from
// memory), so it takes several times 1/(2π·GBW·β) before the output moves
// far, and then it ramps at SR if that is the tighter limit.
//
// It returns ErrNoFullSwing when a transition does not reach the opposite
// level (the capacitor turns it back first) and a *DomainError for
// arguments outside 0 < β < 1, vol < ref < voh, R, C, SR, GBW > 0.
func AstablePeriodLimited(r, c, ref, beta, vol, voh, sr, gbw float64) (float64, error) {
	const fn = "limited astable period"
	if err := checkRC(fn, r, c); err != nil {
		return 0, err
	}
	if !(sr > 0) {
		return 0, domainErr(fn, "sr", sr, "a slew rate above 0")
	}
	if !(gbw > 0) {
		return 0, domainErr(fn, "gbw", gbw, "a gain-bandwidth above 0")
	}
	vth, vtl, err := astableThresholds(fn, ref, beta, vol, voh)
	if err != nil {
		return 0, err
	}
	if math.IsInf(gbw, 1) {
		if math.IsInf(sr, 1) {
			return AstablePeriod(r, c, ref, beta, vol, voh)
		}
		return AstablePeriodSlewLimited(r, c, ref, beta, vol, voh, sr)
	}
	rc := r * c
	wt := 2 * math.Pi * gbw
	// Linear steps resolve the regeneration; while the drive is clamped at
	// ±SR the output is a ramp and the step need only resolve the ramp and
	// RC (it is taken only when all four RK4 stages stay clamped).
	lin := math.Min(1/(beta*wt), rc)
	h := lin / astableStepsPerTau
	hRamp := h
	if !math.IsInf(sr, 1) {
		ramp := (voh - vol) / sr
		// A ramp much shorter than the regeneration is resolved to 1/1024
		// of the linear time constant; the output is then never clamped
		// for long.
		h = math.Min(h, math.Max(ramp/astableStepsPerTau, lin/1024))
		hRamp = math.Max(h, math.Min(ramp, rc)/astableStepsPerTau)
	}
	clamped := 0
	deriv := func(vout, vc float64) (dout, dc float64) {
		d := wt * (ref + beta*(vout-ref) - vc)
		if math.Abs(d) > sr {
			clamped++
		}
		return math.Max(-sr, math.Min(sr, d)), (vout - vc) / rc
	}
	rk4 := func(vout, vc, h float64) (do, dc float64, allClamped bool) {
		clamped = 0
		k1o, k1c := deriv(vout, vc)
		k2o, k2c := deriv(vout+h/2*k1o, vc+h/2*k1c)
		k3o, k3c := deriv(vout+h/2*k2o, vc+h/2*k2c)
		k4o, k4c := deriv(vout+h*k3o, vc+h*k3c)
		return h / 6 * (k1o + 2*k2o + 2*k3o + k4o), h / 6 * (k1c + 2*k2c + 2*k3c + k4c), clamped == 4
	}
	// transition integrates from vout at one level until it reaches target;
	// it returns the time taken and the capacitor voltage at the end.
	transition := func(vout, vc, target float64) (float64, float64, error) {
		up := target > vout
		t := 0.0
		shrink := 1.0 // step scale while closing in on the target
		for steps := 0; ; steps++ {
			if steps > 1<<22 {
				return 0, 0, fmt.Errorf("%s: gbw %g Hz: %w", fn, gbw, ErrNoFullSwing)
			}
			step := h * shrink
			do, dc, clampedNow := rk4(vout, vc, step)
			if hRamp > h && clampedNow && shrink == 1 {
				if bo, bc, all := rk4(vout, vc, hRamp); all {
					step, do, dc = hRamp, bo, bc
				}
			}
			if (up && vout+do >= target) || (!up && vout+do <= target) {
				if step > h/1024 {
					// Close in: retry the crossing with half the step.
					shrink = step / h / 2
					continue
				}
				// The remainder is under 1/1024 of a step: in proportion.
				frac := (target - vout) / do
				return t + frac*step, vc + frac*dc, nil
			}
			if (up && do < 0) || (!up && do > 0) {
				return 0, 0, fmt.Errorf("%s: gbw %g Hz: %w", fn, gbw, ErrNoFullSwing)
			}
			vout, vc, t = vout+do, vc+dc, t+step
		}
	}
	// dwell is the exact time the capacitor takes from vc toward level to
	// the threshold th while the output sits at level.
	dwell := func(vc, level, th float64) float64 {
		if (level-vc)/(level-th) <= 1 {
			return 0 // already past the threshold
		}
		return rc * math.Log((level-vc)/(level-th))
	}
	// One cycle from the instant the capacitor reaches VTL with the output
	// low: every cycle starts there, so the first is the steady state.
	tUp, vc1, err := transition(vol, vtl, voh)
	if err != nil {
		return 0, err
	}
	tDown, vc2, err := transition(voh, vth, vol)
	if err != nil {
		return 0, err
	}
	return tUp + dwell(vc1, voh, vth) + tDown + dwell(vc2, vol, vtl), nil
}

// astableStepsPerTau is the number of RK4 steps per fastest time constant
// in AstablePeriodLimited.
const astableStepsPerTau = 16

// GBWForAstable returns the gain-bandwidth at which the astable's frequency
// on a single-pole op-amp with unlimited slew rate (AstablePeriodLimited)
// falls short of the ideal by the frequency error eps (0 < ε < 1): f =
// (1 − ε)·f0, a period of T0/(1 − ε) (5 %: 1.0526·T0). The regeneration
// after each switch must fit the allowed frequency error. The period falls
// monotonically as GBW rises, so the inverse is found by bisection on the
// same function.
func GBWForAstable(r, c, ref, beta, vol, voh, eps float64) (float64, error) {
	const fn = "astable gbw"
	if !(eps > 0 && eps < 1) {
		return 0, domainErr(fn, "eps", eps, "0 < eps < 1")
	}
	ideal, err := AstablePeriod(r, c, ref, beta, vol, voh)
	if err != nil {
		return 0, err
	}
	inf := math.Inf(1)
	slow := func(g float64) bool {
		t, err := AstablePeriodLimited(r, c, ref, beta, vol, voh, inf, g)
		return err != nil || t > ideal/(1-eps)
	}
	// Start one decade either side of 1/(β·RC·ε) per 2π, the scale where
	// a few regeneration time constants fill ε of the period.
	lo := 1 / (2 * math.Pi * beta * r * c * eps)
	hi := lo
	for !slow(lo) {
		lo /= 4
	}
	for slow(hi) {
		hi *= 4
	}
	for hi-lo > 1e-7*hi {
		mid := math.Sqrt(lo * hi)
		if slow(mid) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return hi, nil
}
