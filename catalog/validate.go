package catalog

import (
	"fmt"
	"slices"
	"strings"
)

// absoluteZero is 0 K in °C (SI Brochure, 9th ed., 2.3.1: T/°C = T/K − 273.15).
const absoluteZero = -273.15

// Validate checks a decoded part against the rules of the catalog format:
// required keys, id spelling, known names, physical signs and the ordering
// of limits. It returns every problem found, or nil for a valid part.
// Decode and Load validate every part they read; Validate is for parts
// built in code.

// validate is Validate for the index-th part of its file, skipping the
// fields in skip (they already have a decode problem).
func validate(p *Part, index int, skip map[string]bool) Problems {
	c := checker{p: p, index: index, skip: skip}
	c.text()
	c.identity()
	c.ranges()
	for _, f := range figures {
		c.figure(f)
	}
	for _, s := range scalars {
		if o := *s.opt(p); o.Known() && o.V() <= 0 {
			c.add(s.key, "%s is not positive", Format(o.V(), s.dim))
		}
	}
	c.plausibility()
	return c.probs
}

// checker collects the problems of one part.
type checker struct {
	p     *Part
	index int
	skip  map[string]bool
	probs Problems
}

// add records a problem with field, unless the field already has one.
func (c *checker) add(field, format string, a ...any) {
	if c.skip[field] {
		return
	}
	c.skip = withKey(c.skip, field)
	c.probs = append(c.probs, Problem{
		Pos: Pos{c.p.Pos.File, c.p.Line(field)}, Part: c.p.ID, Index: c.index, Field: field,
		Err: fmt.Errorf(format, a...),
	})
}

// withKey returns m with key set, allocating m if needed.
func withKey(m map[string]bool, key string) map[string]bool {
	if m == nil {
		m = map[string]bool{}
	}
	m[key] = true
	return m
}

// given reports whether the part's file wrote key; parts built in code
// (no Lines) count as having written everything.
func (c *checker) given(key string) bool {
	if c.p.Lines == nil {
		return true
	}
	_, ok := c.p.Lines[key]
	return ok
}

// identity checks the naming keys: id, name, tech, channels, packages,
// lifecycle and cost.
func (c *checker) identity() {
	p := c.p
	switch {
	case p.ID == "":
		c.add("id", `missing, want a unique id such as "xq4-bip"`)
	case !validID(p.ID):
		c.add("id", "%q may only hold a-z, 0-9, '.', '_' and '-'", p.ID)
	}
	if strings.TrimSpace(p.Name) == "" {
		c.add("name", `missing, want a short description such as "Bipolar quad, single-supply"`)
	}
	switch {
	case p.Tech == "":
		c.add("tech", "missing, want one of %s", enumList(techs))
	case !slices.Contains(techs, string(p.Tech)):
		c.add("tech", "%q is not a known tech, want one of %s%s", p.Tech, enumList(techs), didYouMean(string(p.Tech), techs))
	}
	switch {
	case p.Channels == 0 && !c.given("channels"):
		c.add("channels", "missing, want the number of op-amps in one package such as 2")
	case p.Channels < 1:
		c.add("channels", "%d, want at least 1", p.Channels)
	}
	if len(p.Packages) == 0 {
		c.add("packages", `missing, want a list such as ["soic8", "dip8"]`)
	}
	for i, pkg := range p.Packages {
		if strings.TrimSpace(pkg) == "" {
			c.add("packages", "entry %d is empty", i+1)
		}
	}
	if p.Lifecycle != "" && !slices.Contains(lifecycles, string(p.Lifecycle)) {
		c.add("lifecycle", "%q is not a known lifecycle, want one of %s%s",
			p.Lifecycle, enumList(lifecycles), didYouMean(string(p.Lifecycle), lifecycles))
	}
	if p.UnitCost.Known() && p.UnitCost.V() < 0 {
		c.add("unit_cost", "%g is negative", p.UnitCost.V())
	}
}

// ranges checks the temperature range, supply span and the input and
// output windows.
func (c *checker) ranges() {
	p := c.p
	if lo, hi := p.Temp[0], p.Temp[1]; lo.Known() && hi.Known() {
		switch {
		case lo.V() < absoluteZero:
			c.add("temp", "low %s is below absolute zero (%s)", Format(lo.V(), Celsius), Format(absoluteZero, Celsius))
		case lo.V() >= hi.V():
			c.add("temp", "low %s is not below high %s", Format(lo.V(), Celsius), Format(hi.V(), Celsius))
		}
	}
	s := p.Supply
	switch {
	case !s.Min.Known() && !s.Max.Known():
		c.add("supply", `missing, want the rated span such as { min = "3 V", max = "32 V" }`)
	case !s.Min.Known():
		c.add("supply", "gives max but not min")
	case !s.Max.Known():
		c.add("supply", "gives min but not max")
	case s.Min.V() <= 0:
		c.add("supply", "min %s is not positive", Format(s.Min.V(), Volt))
	case s.Min.V() >= s.Max.V():
		c.add("supply", "min %s is not below max %s", Format(s.Min.V(), Volt), Format(s.Max.V(), Volt))
	}
	// A window V− + low … V+ + high must be open at the smallest rated span,
	// or no signal fits.
	window := func(key string, low, high Opt) {
		switch {
		case !low.Known() && !high.Known():
		case !low.Known():
			c.add(key, "gives high but not low")
		case !high.Known():
			c.add(key, "gives low but not high")
		case s.Min.Known() && s.Min.V()+high.V()-low.V() <= 0:
			c.add(key, "low %s and high %s leave no room at the minimum supply %s",
				Format(low.V(), Volt), Format(high.V(), Volt), Format(s.Min.V(), Volt))
		}
	}
	window("input_cm", p.InputCM.Low, p.InputCM.High)
	c.source("input_cm", p.InputCM.Source)
	o := p.Output
	switch {
	case o.Low.Known() && o.Low.V() < 0:
		c.add("output", "low %s is negative; it is how far above V− the output reaches", Format(o.Low.V(), Volt))
	case o.High.Known() && o.High.V() > 0:
		c.add("output", "high %s is positive; it is the offset from V+, zero or negative", Format(o.High.V(), Volt))
	case o.Load.Known() && o.Load.V() <= 0:
		c.add("output", "load %s is not positive", Format(o.Load.V(), Ohm))
	}
	window("output", o.Low, o.High)
	c.source("output", o.Source)
}

// figure checks one datasheet figure: presence, sign, order of limits, source.
func (c *checker) figure(f figure) {
	s := *f.spec(c.p)
	if !s.Known() {
		switch {
		case f.key == "gbw" || f.key == "slew":
			c.add(f.key, "missing, every part needs gbw and slew, such as %s = { typ = %q }", f.key, f.dim.Example())
		case s.Source != "":
			c.add(f.key, "gives a source but no figure, want at least typ = %q", f.dim.Example())
		}
		return
	}
	vals := []struct {
		name string
		o    Opt
	}{{"typ", s.Typ}, {"min", s.Min}, {"max", s.Max}, {"min_ot", s.MinOT}, {"max_ot", s.MaxOT}}
	for _, v := range vals {
		switch {
		case !v.o.Known():
		case f.sign == positive && v.o.V() <= 0:
			c.add(f.key, "%s %s is not positive", v.name, Format(v.o.V(), f.dim))
		case f.sign == nonNeg && v.o.V() < 0:
			c.add(f.key, "%s %s is negative; give the magnitude", v.name, Format(v.o.V(), f.dim))
		}
	}
	// Each pair must satisfy lo ≤ hi. Limits over the rated range include
	// 25 °C, so they can only be looser than the 25 °C limits.
	const looser = "; a limit over the rated range cannot be tighter than at 25 °C"
	order := []struct {
		lo, hi     Opt
		loN, hiN   string
		afterwards string
	}{
		{s.Min, s.Typ, "min", "typ", ""},
		{s.Typ, s.Max, "typ", "max", ""},
		{s.Min, s.Max, "min", "max", ""},
		{s.MinOT, s.Min, "min_ot", "min", looser},
		{s.Max, s.MaxOT, "max", "max_ot", looser},
		{s.MinOT, s.Typ, "min_ot", "typ", ""},
		{s.Typ, s.MaxOT, "typ", "max_ot", ""},
		{s.MinOT, s.MaxOT, "min_ot", "max_ot", ""},
	}
	for _, o := range order {
		if o.lo.Known() && o.hi.Known() && o.lo.V() > o.hi.V() {
			c.add(f.key, "%s %s is above %s %s%s", o.loN, Format(o.lo.V(), f.dim), o.hiN, Format(o.hi.V(), f.dim), o.afterwards)
			break
		}
	}
	c.source(f.key, s.Source)
}

// source checks the source of a figure.
func (c *checker) source(key string, s Source) {
	if s != "" && !slices.Contains(sources, string(s)) {
		c.add(key, "source %q is not known, want one of %s%s", s, enumList(sources), didYouMean(string(s), sources))
	}
}

// validID reports whether id uses only [a-z0-9._-].
func validID(id string) bool {
	for i := 0; i < len(id); i++ {
		c := id[i]
		if !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '.' || c == '_' || c == '-') {
			return false
		}
	}
	return true
}

// enumList renders allowed values as "a | b | c".
func enumList(vals []string) string { return strings.Join(vals, " | ") }
