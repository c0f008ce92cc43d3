package sim

import (
	"fmt"
	"math"
)

// Amp is one op-amp channel as the time-domain model sees it. All values are
// SI: V/V, Hz, V/s, V. The caller resolves the swing limits from the rails
// and the load before it builds an Amp, and picks worst-case or typical
// figures; the model takes the numbers as given.
type Amp struct {
	// Aol is the open-loop DC gain in V/V (100 dB is 1e5). It must exceed 1.
	Aol float64
	// GBW is the gain-bandwidth product in Hz: the open-loop pole sits at
	// GBW/Aol.
	GBW float64
	// SlewRise is the largest positive-going rate of the output in V/s.
	SlewRise float64
	// SlewFall is the largest negative-going rate in V/s (a positive
	// number); zero means the same as SlewRise.
	SlewFall float64
	// VOL and VOH are the lowest and highest output voltages, already
	// resolved from the rails and the load.
	VOL, VOH float64
	// CMLow and CMHigh bound the input common-mode range in volts. Input
	// pins outside it are flagged in Metrics; leave both zero to skip the
	// check.
	CMLow, CMHigh float64
}

// ampParams are the figures the integrator uses, derived once from an Amp.
type ampParams struct {
	aol    float64 // DC gain, V/V
	wp     float64 // open-loop pole, rad/s: 2π·GBW/Aol
	gbw    float64 // Hz
	srUp   float64 // V/s
	srDown float64 // V/s, positive
	vol    float64 // V
	voh    float64 // V
	cmLow  float64 // V
	cmHigh float64 // V
	cmSet  bool
}

// Validate reports the first figure of a that the model cannot use.
func (a Amp) Validate() error {
	_, err := a.params()
	return err
}

func (a Amp) params() (ampParams, error) {
	bad := func(field string, v float64, want string) error {
		return fmt.Errorf("sim: amp: %s = %g, want %s", field, v, want)
	}
	fin := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case !fin(a.Aol) || a.Aol <= 1:
		return ampParams{}, bad("aol", a.Aol, "a gain above 1 V/V")
	case !fin(a.GBW) || a.GBW <= 0:
		return ampParams{}, bad("gbw", a.GBW, "a frequency above 0 Hz")
	case !fin(a.SlewRise) || a.SlewRise <= 0:
		return ampParams{}, bad("slew_rise", a.SlewRise, "a rate above 0 V/s")
	case !fin(a.SlewFall) || a.SlewFall < 0:
		return ampParams{}, bad("slew_fall", a.SlewFall, "a rate of 0 V/s (same as slew_rise) or more")
	case !fin(a.VOL) || !fin(a.VOH) || a.VOH <= a.VOL:
		return ampParams{}, fmt.Errorf("sim: amp: swing %.4g V … %.4g V, want vol below voh", a.VOL, a.VOH)
	case !fin(a.CMLow) || !fin(a.CMHigh) || a.CMHigh < a.CMLow:
		return ampParams{}, fmt.Errorf("sim: amp: common-mode range %.4g V … %.4g V, want low ≤ high", a.CMLow, a.CMHigh)
	}
	fall := a.SlewFall
	if fall == 0 {
		fall = a.SlewRise
	}
	return ampParams{
		aol:    a.Aol,
		wp:     2 * math.Pi * a.GBW / a.Aol,
		gbw:    a.GBW,
		srUp:   a.SlewRise,
		srDown: fall,
		vol:    a.VOL,
		voh:    a.VOH,
		cmLow:  a.CMLow,
		cmHigh: a.CMHigh,
		cmSet:  a.CMHigh > a.CMLow,
	}, nil
}

// slowSlew is the smaller of the two slew rates, V/s.
func (p *ampParams) slowSlew() float64 { return math.Min(p.srUp, p.srDown) }
