package circuit

import "math"

// The op-amp relaxation oscillator (astable multivibrator), as drawn in
// Sedra & Smith, Microelectronic Circuits, bistable and astable
// multivibrators (from memory):
//
//	output ──R──┬── inverting input        (timing: R to C, C to the reference)
//	            C
//	           ref
//	output ──R2──┬── non-inverting input   (hysteresis: R2 to the output, R1 to ref)
//	             R1
//	            ref
//
// The output sits at VOH or VOL; the capacitor charges toward it through R
// until it reaches the threshold on the non-inverting input, the output
// flips, and the capacitor turns back. β = R1/(R1 + R2).

// HysteresisBeta returns the feedback fraction of the hysteresis divider,
// β = R1/(R1 + R2), with R1 from the non-inverting input to the reference
// and R2 from it to the output.
func HysteresisBeta(r1, r2 float64) float64 {
	return r1 / (r1 + r2)
}

// Thresholds returns the switching thresholds of the astable for output
// levels vol and voh: VTH = ref + β·(VOH − ref) while the output is high and
// VTL = ref + β·(VOL − ref) while it is low (divider superposition).
func Thresholds(ref, beta, vol, voh float64) (vth, vtl float64) {
	return ref + beta*(voh-ref), ref + beta*(vol-ref)
}

// HighTime returns how long the output stays at voh: the capacitor charges
// from vtl toward voh through R until it reaches vth,
// t_high = RC·ln((VOH − VTL)/(VOH − VTH)) (first-order RC step response;
// Sedra & Smith, from memory). It wants vtl < vth < voh.
func HighTime(r, c, voh, vth, vtl float64) (float64, error) {
	const fn = "astable high time"
	if err := checkRC(fn, r, c); err != nil {
		return 0, err
	}
	if !(vtl < vth) {
		return 0, domainErr(fn, "vtl", vtl, "vtl < vth")
	}
	if !(vth < voh) {
		return 0, domainErr(fn, "vth", vth, "vth < voh")
	}
	return r * c * math.Log((voh-vtl)/(voh-vth)), nil
}

// LowTime returns how long the output stays at vol: the capacitor
// discharges from vth toward vol until it reaches vtl,
// t_low = RC·ln((VTH − VOL)/(VTL − VOL)) (Sedra & Smith, from memory). It
// wants vol < vtl < vth.
func LowTime(r, c, vol, vth, vtl float64) (float64, error) {
	const fn = "astable low time"
	if err := checkRC(fn, r, c); err != nil {
		return 0, err
	}
	if !(vtl < vth) {
		return 0, domainErr(fn, "vtl", vtl, "vtl < vth")
	}
	if !(vol < vtl) {
		return 0, domainErr(fn, "vtl", vtl, "vol < vtl")
	}
	return r * c * math.Log((vth-vol)/(vtl-vol)), nil
}

// AstablePeriod returns the ideal period t_high + t_low of the astable with
// timing R and C, reference ref, divider fraction beta and output levels
// vol and voh (instant output transitions). It wants 0 < β < 1 and
// vol < ref < voh.
func AstablePeriod(r, c, ref, beta, vol, voh float64) (float64, error) {
	th, tl, err := astableTimes(r, c, ref, beta, vol, voh)
	return th + tl, err
}

// AstableVdiff returns the largest differential input voltage of the
// astable in ideal operation, VTH − VTL = β·(VOH − VOL): at each switching
// instant the capacitor sits at one threshold while the non-inverting input
// jumps to the other.
func AstableVdiff(beta, vol, voh float64) float64 {
	return beta * (voh - vol)
}

// AstableOutputCurrent returns the largest current the astable's output
// drives (source or sink, as a magnitude): just after each switch the timing
// resistor carries (VOH − VTL)/R or (VTH − VOL)/R, and the divider carries
// (VOH − ref)/(R1 + R2) or (ref − VOL)/(R1 + R2).
func AstableOutputCurrent(r, r1, r2, ref, vol, voh float64) float64 {
	vth, vtl := Thresholds(ref, HysteresisBeta(r1, r2), vol, voh)
	src := (voh-vtl)/r + (voh-ref)/(r1+r2)
	sink := (vth-vol)/r + (ref-vol)/(r1+r2)
	return math.Max(src, sink)
}

// SlewForAstable returns the slew rate at which the two full-swing output
// transitions of one cycle, each (VOH − VOL)/SR long, take no more than
// share (> 0) of the period: SR = 2·(VOH − VOL)/(share·period). For a
// frequency error ε the share is PeriodStretch(ε) = ε/(1 − ε).
//
// The frequency actually lost is smaller than share: the capacitor moves
// toward the new level while the output ramps, so in the symmetric case the
// period grows by about 2τ/(1 + β) rather than 2τ (τ the transition time;
// see AstablePeriodSlewLimited). The bound is conservative.
func SlewForAstable(vol, voh, period, share float64) float64 {
	return 2 * (voh - vol) / (share * period)
}

// PeriodStretch returns the share of the ideal period an oscillator may add
// while its frequency stays within the error ferr (0 < ε < 1) below the
// ideal: f ≥ (1 − ε)·f0 ⇔ T ≤ T0/(1 − ε) = T0·(1 + ε/(1 − ε)), so the share
// is ε/(1 − ε) (5 %: 5.263 %, not 5 %, which would allow only −4.76 %).
func PeriodStretch(ferr float64) float64 {
	return ferr / (1 - ferr)
}

func astableTimes(r, c, ref, beta, vol, voh float64) (th, tl float64, err error) {
	vth, vtl, err := astableThresholds("astable period", ref, beta, vol, voh)
	if err != nil {
		return 0, 0, err
	}
	if th, err = HighTime(r, c, voh, vth, vtl); err != nil {
		return 0, 0, err
	}
	if tl, err = LowTime(r, c, vol, vth, vtl); err != nil {
		return 0, 0, err
	}
	return th, tl, nil
}

// astableThresholds checks the operating conditions 0 < β < 1 and
// vol < ref < voh (which give vol < vtl < vth < voh) and returns the
// thresholds.
func astableThresholds(fn string, ref, beta, vol, voh float64) (vth, vtl float64, err error) {
	if !(beta > 0 && beta < 1) {
		return 0, 0, domainErr(fn, "beta", beta, "0 < beta < 1")
	}
	if !(vol < ref) {
		return 0, 0, domainErr(fn, "vol", vol, "vol below ref")
	}
	if !(ref < voh) {
		return 0, 0, domainErr(fn, "voh", voh, "voh above ref")
	}
	vth, vtl = Thresholds(ref, beta, vol, voh)
	return vth, vtl, nil
}

func checkRC(fn string, r, c float64) error {
	if !positive(r) {
		return domainErr(fn, "r", r, "a resistance above 0")
	}
	if !positive(c) {
		return domainErr(fn, "c", c, "a capacitance above 0")
	}
	return nil
}
