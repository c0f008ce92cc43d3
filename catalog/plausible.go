package catalog

import (
	"fmt"
	"strings"

	"github.com/opsift/opsift/catalog/safe"
)

// plausible is the range of magnitudes each figure, scalar and span may
// take, in SI units, as lo ≤ |v| ≤ hi. A value outside is almost always a
// wrong prefix ("5 mHz" for 5 MHz) or a hostile file, so it is a problem
// naming the range. The ranges are wide on purpose: every general-purpose,
// precision, micropower, high-speed and power op-amp class fits with room
// (common practice, no source). The README lists them.
var plausible = map[string]plausibleRange{
	"gbw":       {1, 100e9, "1 Hz … 100 GHz"},
	"slew":      {1, 100e9, "1 V/s … 100 kV/µs"},
	"aol":       {0, 250, "0 … 250 dB"},
	"vos":       {0, 1, "0 … 1 V"},
	"vos_drift": {0, 1e-3, "0 … 1 mV/°C"},
	"ib":        {0, 1e-3, "0 … 1 mA"},
	"ios":       {0, 1e-3, "0 … 1 mA"},
	"en":        {1e-12, 1e-3, "1 pV/√Hz … 1 mV/√Hz"},
	"in":        {1e-18, 1e-6, "1 aA/√Hz … 1 µA/√Hz"},
	"iq":        {1e-12, 10, "1 pA … 10 A"},
	"iout":      {1e-9, 100, "1 nA … 100 A"},
	"vdiff_max": {1e-3, 10e3, "1 mV … 10 kV"},
	"cload":     {1e-15, 1, "1 fF … 1 F"},
	"cin":       {1e-18, 1e-6, "1 aF … 1 µF"},
	"supply":    {1e-3, 10e3, "1 mV … 10 kV"},
	"input_cm":  {0, 10e3, "0 … 10 kV from a rail"},
	"output":    {0, 10e3, "0 … 10 kV from a rail"},
	"load":      {1e-3, 1e12, "1 mΩ … 1 TΩ"},
	"temp":      {0, 1000, "−1000 … 1000 °C"},
	"unit_cost": {0, 1e6, "0 … 1000000"},
}

// plausibleRange is the accepted range of a key's magnitude: lo ≤ |v| ≤ hi,
// with the text messages and the README show.
type plausibleRange struct {
	lo, hi float64
	text   string
}

// MaxChannels is the most op-amps one package may hold.
const MaxChannels = 64

// outside reports whether |v| lies outside key's plausible range.
func outside(key string, v float64) bool {
	r, ok := plausible[key]
	if !ok {
		return false
	}
	if v < 0 {
		v = -v
	}
	return v < r.lo || v > r.hi
}

// plausibility checks every quantity of the part against plausible.
func (c *checker) plausibility() {
	p := c.p
	check := func(key, name string, o Opt, dim Dim, rangeKey string) {
		if o.Known() && outside(rangeKey, o.V()) {
			what := name + " "
			if name == "" {
				what = ""
			}
			c.add(key, "%s%s is outside the plausible range %s for %s; check the unit prefix",
				what, formatAny(o.V(), dim), plausible[rangeKey].text, key)
		}
	}
	for _, f := range figures {
		s := f.spec(p)
		for _, v := range []struct {
			name string
			o    Opt
		}{{"typ", s.Typ}, {"min", s.Min}, {"max", s.Max}, {"min_ot", s.MinOT}, {"max_ot", s.MaxOT}} {
			check(f.key, v.name, v.o, f.dim, f.key)
		}
	}
	for _, s := range scalars {
		check(s.key, "", *s.opt(p), s.dim, s.key)
	}
	check("supply", "min", p.Supply.Min, Volt, "supply")
	check("supply", "max", p.Supply.Max, Volt, "supply")
	check("input_cm", "low", p.InputCM.Low, Volt, "input_cm")
	check("input_cm", "high", p.InputCM.High, Volt, "input_cm")
	check("output", "low", p.Output.Low, Volt, "output")
	check("output", "high", p.Output.High, Volt, "output")
	check("output", "load", p.Output.Load, Ohm, "load")
	check("temp", "low", p.Temp[0], Celsius, "temp")
	check("temp", "high", p.Temp[1], Celsius, "temp")
	check("unit_cost", "", p.UnitCost, Dimensionless, "unit_cost")
	if p.Channels > MaxChannels {
		c.add("channels", "%d is more than %d, the most op-amps a package may hold here", p.Channels, MaxChannels)
	}
}

// formatAny formats v in dim, plain for dimensionless numbers.
func formatAny(v float64, dim Dim) string {
	if dim == Dimensionless {
		return fmt.Sprintf("%g", v)
	}
	return Format(v, dim)
}

// text checks that the part's free-text fields hold nothing a terminal
// would act on (see package safe): such a part is a problem, not shown.
// Notes may hold line breaks and tabs (a """…""" string); they are shown
// escaped on one line.
func (c *checker) text() {
	p := c.p
	notes := strings.NewReplacer("\n", " ", "\t", " ").Replace(p.Notes)
	for _, f := range []struct{ key, v string }{
		{"id", p.ID}, {"name", p.Name}, {"tech", string(p.Tech)}, {"lifecycle", string(p.Lifecycle)},
		{"pinout", p.Pinout}, {"datasheet", p.Datasheet}, {"notes", notes},
	} {
		if err := safe.Problem(f.v); err != nil {
			c.add(f.key, "%w", err)
		}
	}
	for i, pkg := range p.Packages {
		if err := safe.Problem(pkg); err != nil {
			c.add("packages", "entry %d %w", i+1, err)
		}
	}
}
