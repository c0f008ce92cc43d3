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
// a second-order low-pass with f0 = √(GBW/(2π·Rf·(Cin + Cf))). opsift
// aligns it maximally flat (Q = 1/√2, Butterworth): the gbw requirement and
// each part's Cf both come from that alignment.

// GBWForTIA returns the gain-bandwidth a transimpedance stage needs for a
// maximally flat (Butterworth, Q = 1/√2) response whose −3 dB bandwidth is
// f, with the matching feedback capacitor FeedbackCapForTIAFlat in the
// loop: the GBW at which BandwidthTIA equals f. It is GBWForTIAFitted with
// no spread. The shortcut 2π·Rf·Cin·f², which neglects Cf beside Cin, is
// its lower bound and falls short when Cf is not ≪ Cin.
func GBWForTIA(rf, cin, f float64) float64 { return GBWForTIAFitted(rf, cin, f, 1) }

// GBWForTIAFitted returns the smallest worst-case gain-bandwidth g for
// which a transimpedance stage with the feedback capacitor fitted to the
// GBW span [g, spread·g] (FeedbackCapForTIASpan) reaches the −3 dB
// bandwidth f on every op-amp whose GBW lies in that span
// (BandwidthTIAFitted), found by Newton's method on ln(bandwidth) against
// ln(g) inside a bisection bracket (the bandwidth rises monotonically with
// g). spread below 1 counts as 1.
func GBWForTIAFitted(rf, cin, f, spread float64) float64 {
	bw := func(g float64) float64 { return BandwidthTIAFitted(rf, cin, g, spread) }
	// The bandwidth grows as g^0.5…0.75, so a few steps reach full
	// precision.
	lo := GBWForTIANoCf(rf, cin, f) // bw(lo) ≤ f: Cf only lowers it
	hi := 2 * lo
	for bw(hi) < f {
		lo, hi = hi, 2*hi
	}
	miss := func(g float64) float64 { return math.Log(bw(g) / f) }
	x := math.Log(hi)
	for range 60 {
		m := miss(math.Exp(x))
		if math.Abs(m) < 1e-12 {
			break
		}
		if m < 0 {
			lo = math.Exp(x)
		} else {
			hi = math.Exp(x)
		}
		const d = 1e-7
		slope := (miss(math.Exp(x+d)) - m) / d
		next := x - m/slope
		if !(slope > 0) || next <= math.Log(lo) || next >= math.Log(hi) {
			next = (math.Log(lo) + math.Log(hi)) / 2
		}
		if math.Abs(next-x) < 1e-13 {
			x = next
			break
		}
		x = next
	}
	return math.Exp(x)
}

// BandwidthTIAFitted returns the least −3 dB bandwidth of a
// transimpedance stage whose Cf is fitted to the GBW span [gbw,
// spread·gbw] (FeedbackCapForTIASpan; spread below 1 counts as 1) when the
// op-amp's actual gain-bandwidth lies anywhere in that span. With Cf fixed
// the bandwidth holds only near the GBW it was fitted at: on a faster
// op-amp it rises a little, then falls toward the feedback pole
// 1/(2π·Rf·Cf), up to about 29 % lower (1 MΩ, 10 pF, Cf flat at 1 MHz:
// −3.4 % at 2×, −15 % at 5×). The bandwidth has a single maximum over the
// GBW, so the least value over the span is at one of its ends.
func BandwidthTIAFitted(rf, cin, gbw, spread float64) float64 {
	hi := gbw * max(spread, 1)
	cf := FeedbackCapForTIASpan(rf, cin, gbw, hi)
	b := LowPass2Bandwidth(TIAResponse(rf, cin, cf, gbw))
	if hi > gbw {
		b = math.Min(b, LowPass2Bandwidth(TIAResponse(rf, cin, cf, hi)))
	}
	return b
}

// FeedbackCapForTIASpan returns the smallest feedback capacitor that keeps
// the transimpedance response free of peaking (Q ≤ 1/√2) on every op-amp
// whose gain-bandwidth lies in [lo, hi]. Q falls as Cf grows (where a Cf
// is needed at all, 2π·Rf·Cin·GBW > 1/2), so that is the largest flat Cf
// over the span. FeedbackCapForTIAFlat, √(2·Cin·y − y²) with
// y = 1/(Rf·ωT), is largest at y = Cin — at the GBW 1/(2π·Rf·Cin), where
// it equals Cin — so the answer is the flat Cf at the GBW of the span
// nearest that one. In the usual photodiode stage (2π·Rf·Cin·lo ≥ 1) it
// is the flat Cf at lo, the worst case: a faster op-amp is then damped
// further, never peaking.
func FeedbackCapForTIASpan(rf, cin, lo, hi float64) float64 {
	g := 1 / (2 * math.Pi * rf * cin)
	return FeedbackCapForTIAFlat(rf, cin, min(max(g, lo), max(lo, hi)))
}

// GBWForTIANoCf returns the shortcut 2π·Rf·Cin·f², the GBW that would
// give the bandwidth f if the feedback capacitor added nothing to Cin: a
// lower bound on GBWForTIA, shown beside it so the user sees what Cf costs.
func GBWForTIANoCf(rf, cin, f float64) float64 {
	return 2 * math.Pi * rf * cin * f * f
}

// BandwidthTIA returns the −3 dB bandwidth of a transimpedance stage on an
// op-amp of gain-bandwidth gbw with the maximally flat feedback capacitor
// Cf = FeedbackCapForTIAFlat: Q = 1/√2, so the bandwidth is the natural
// frequency f0 = √(GBW/(2π·Rf·(Cin + Cf))) with Cf counted (TIAResponse).
// Where no Cf is needed (the stage is flat or overdamped without one) it
// is the −3 dB bandwidth of that response.
func BandwidthTIA(rf, cin, gbw float64) float64 {
	cf := FeedbackCapForTIAFlat(rf, cin, gbw)
	return LowPass2Bandwidth(TIAResponse(rf, cin, cf, gbw))
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

// TIANoise holds what sets the output noise of a transimpedance stage.
type TIANoise struct {
	En, In             float64 // white op-amp noise densities, V/√Hz and A/√Hz
	EnCorner, InCorner float64 // their 1/f corners, Hz (0: white)
	Rf, Cf             float64 // feedback network, Ω and F
	Cin                float64 // total capacitance at the inverting input, F
	Rsh                float64 // detector shunt resistance, Ω (0: none, an open)
	GBW                float64 // op-amp gain-bandwidth, Hz (single pole)
	TempK              float64 // temperature of the resistors, K
	Band               float64 // post-filter or measurement band, Hz (0: none)
	Order              int     // Butterworth order of that filter (0: brick wall)
}

// tiaNoisePerDecade is the number of integration points per decade of
// frequency in TIANoise.OutputRMS; 24 keep Simpson's rule within 1e-4 of
// the converged value on responses up to Q ≈ 2 (checked against 400 per
// decade in the tests).
const tiaNoisePerDecade = 24

// OutputRMS returns the RMS output noise of the transimpedance stage with
// a single-pole op-amp A = ωT/s (Graeme, Photodiode Amplifiers, noise
// chapter, from memory). With Zf = Rf ∥ Cf, Zi = Rsh ∥ Cin, β = Zi/(Zi + Zf):
//
//	Vout = en·A/(1 + Aβ) + i·Zf·Aβ/(1 + Aβ)
//
// The voltage noise en sees the noise gain 1/β = 1 + Zf/Zi, which rises to
// 1 + Cin/Cf above the feedback zero — the en·Cin gain peaking that makes
// op-amp voltage noise dominate a wideband photodiode amplifier. The
// current i at the inverting input is the op-amp's in plus the thermal
// current noise of Rf and Rsh, 4kT/R each, shaped like the signal. Both are
// integrated in power from FlickerLow up to 100·GBW (or the band), with
// 1/f corners and the post filter 1/(1 + (f/band)^2n) (brick wall for
// order 0), by Simpson's rule on a logarithmic grid; above 100·GBW the
// 1/f² tail is added in closed form.
func (n TIANoise) OutputRMS() float64 { return n.outputRMS(tiaNoisePerDecade) }

func (n TIANoise) outputRMS(perDecade int) float64 {
	wt := 2 * math.Pi * n.GBW
	thermal := 4 * Boltzmann * n.TempK / n.Rf
	if n.Rsh > 0 {
		thermal += 4 * Boltzmann * n.TempK / n.Rsh
	}
	hi, tail := 100*n.GBW, true
	if n.Band > 0 && n.Order <= 0 && n.Band < hi {
		hi, tail = n.Band, false
	}
	lo := FlickerLow
	if !(hi > lo) {
		return 0
	}
	density := func(f float64) float64 {
		s := complex(0, 2*math.Pi*f)
		a := complex(wt, 0) / s
		zf := complex(n.Rf, 0) / (1 + s*complex(n.Rf*n.Cf, 0))
		yi := s * complex(n.Cin, 0)
		if n.Rsh > 0 {
			yi += complex(1/n.Rsh, 0)
		}
		beta := 1 / (1 + zf*yi) // Zi/(Zi + Zf) = 1/(1 + Zf·Yi)
		ab := a * beta
		ge := a / (1 + ab)
		gi := zf * ab / (1 + ab)
		e2 := n.En * n.En * (1 + n.EnCorner/f)
		i2 := n.In*n.In*(1+n.InCorner/f) + thermal
		p := e2*sqAbs(ge) + i2*sqAbs(gi)
		if n.Band > 0 && n.Order > 0 {
			p /= 1 + math.Pow(f/n.Band, 2*float64(n.Order))
		}
		return p * f // d f = f · d ln f
	}
	decades := math.Log10(hi / lo)
	steps := 2 * int(math.Ceil(decades*float64(perDecade)/2))
	h := math.Log(hi/lo) / float64(steps)
	sum := density(lo) + density(hi)
	for k := 1; k < steps; k++ {
		w := 2.0
		if k%2 == 1 {
			w = 4
		}
		sum += w * density(lo*math.Exp(float64(k)*h))
	}
	power := sum * h / 3
	if tail {
		// Far above GBW every term falls as 1/f², so ∫ from hi to ∞ of the
		// power density p is p(hi)·hi, which is density(hi).
		power += density(hi)
	}
	return math.Sqrt(power)
}

func sqAbs(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }
