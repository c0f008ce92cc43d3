package circuit

import "math"

// The photodiode transimpedance amplifier (Graeme, Photodiode Amplifiers:
// Op Amp Solutions, 1996, from memory): the photocurrent flows into the
// inverting input, Rf ∥ Cf runs from there to the output, and Cin is all
// capacitance on the inverting input (detector, wiring, the op-amp's own
// input capacitance). With a single-pole op-amp A = ωT/s, ωT = 2π·GBW,
// nodal analysis gives
//
//	Vout/I = −Rf / (1 + s·(Rf·Cf + 1/ωT) + s²·Rf·(Cin + Cf)/ωT)
//
// a second-order low-pass with f0 = √(GBW/(2π·Rf·(Cin + Cf))).

// GBWForTIA returns the gain-bandwidth a transimpedance stage needs for a
// maximally flat (Butterworth, Q = 1/√2) response whose −3 dB bandwidth is
// f, with the matching feedback capacitor (FeedbackCapForTIAFlat):
// GBW = 2π·Rf·Cin·f². It assumes Cf ≪ Cin, so Cin + Cf ≈ Cin; the exact
// bandwidth is f·√(Cin/(Cin + Cf)), about 1 % short at Cf = Cin/45.
func GBWForTIA(rf, cin, f float64) float64 {
	return 2 * math.Pi * rf * cin * f * f
}

// BandwidthTIA returns the natural frequency of a transimpedance stage,
// f0 = √(GBW/(2π·Rf·Cin)) (Cf ≪ Cin): the −3 dB bandwidth with the flat
// feedback capacitor, the inverse of GBWForTIA. It is also Graeme's
// feedback-pole frequency 1/(2π·Rf·Cf) for the 45° choice of
// FeedbackCapForTIA.
func BandwidthTIA(rf, cin, gbw float64) float64 {
	return math.Sqrt(gbw / (2 * math.Pi * rf * cin))
}

// FeedbackCapForTIA returns Graeme's feedback capacitor for 45° phase
// margin, Cf = √(Cin/(2π·Rf·GBW)): it puts the feedback pole 1/(2π·Rf·Cf) at
// the frequency where the noise gain 1 + Cin/Cf meets the op-amp's gain
// (Cf ≪ Cin). The 45° comes from the straight-line Bode construction; the
// exact single-pole loop has about 52° and Q ≈ 1 — about 1.2 dB of peaking
// and a −3 dB bandwidth about 1.26·BandwidthTIA. For a maximally flat
// response use FeedbackCapForTIAFlat, √2 times larger.
func FeedbackCapForTIA(rf, cin, gbw float64) float64 {
	return math.Sqrt(cin / (2 * math.Pi * rf * gbw))
}

// FeedbackCapForTIAFlat returns the feedback capacitor that makes the
// transimpedance response maximally flat (Q = 1/√2 exactly, for the
// single-pole op-amp model above): setting Q² = ½ in the transfer function,
// the terms in Cf cancel and Cf = √(2·Cin/(Rf·ωT) − 1/(Rf·ωT)²), ωT = 2π·GBW;
// ≈ √(Cin/(π·Rf·GBW)) when Cin ≫ 1/(Rf·ωT). It returns 0 when the stage is
// already flat or overdamped without a feedback capacitor
// (2·Rf·Cin·ωT ≤ 1).
func FeedbackCapForTIAFlat(rf, cin, gbw float64) float64 {
	wt := 2 * math.Pi * gbw
	x := 2*cin/(rf*wt) - 1/(rf*wt*rf*wt)
	if x <= 0 {
		return 0
	}
	return math.Sqrt(x)
}

// TIAResponse returns the natural frequency and quality factor of a
// transimpedance stage with feedback Rf ∥ Cf, input capacitance cin and a
// single-pole op-amp of gain-bandwidth gbw, from the transfer function above:
// f0 = √(ωT/(Rf·(Cin + Cf)))/(2π), Q = √(Rf·(Cin + Cf)/ωT)/(Rf·Cf + 1/ωT).
// LowPass2Bandwidth(f0, q) gives its −3 dB bandwidth.
func TIAResponse(rf, cin, cf, gbw float64) (f0, q float64) {
	wt := 2 * math.Pi * gbw
	t2 := rf * (cin + cf) / wt
	return 1 / (2 * math.Pi * math.Sqrt(t2)), math.Sqrt(t2) / (rf*cf + 1/wt)
}
