package catalog

import (
	"regexp"
	"slices"
	"strings"
)

// numberPattern is the number Parse reads before the unit: an optional
// sign (also U+2212), digits with an optional decimal point, an optional
// exponent.
const numberPattern = `[+\-−]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+\-]?[0-9]+)?`

// Pattern returns a regular expression (in the common subset of RE2 and
// ECMA-262, for JSON Schema) matching the quantities Parse accepts for
// the dimension as to their form: a number and one of the dimension's
// unit spellings with an optional SI prefix. It says nothing of range
// (an exponent past float64, a non-positive gain ratio), which Parse and
// validation check. Built from the same tables Parse reads.
func (d Dim) Pattern() string {
	return `^\s*` + numberPattern + `\s*` + d.unitPattern() + `\s*$`
}

// unitPattern is the unit part of Pattern.
func (d Dim) unitPattern() string {
	volt, sec, hz := prefixedPattern(Volt), prefixedPattern(Second), prefixedPattern(Hertz)
	ratio := volt + `\s*/\s*` + volt // V/V, V/mV: a gain ratio
	switch d {
	case Dimensionless:
		return `(?:` + ratio + `)?`
	case Ratio:
		return `(?:%|ppm)?`
	case Decibel:
		return `(?:dB|` + ratio + `)`
	case Celsius:
		return alternatives(celsiusUnits)
	case VoltPerSecond:
		return volt + `\s*/\s*` + sec
	case VoltPerKelvin:
		return volt + `\s*/\s*` + alternatives(append([]string{"K"}, celsiusUnits...))
	case VoltNoise, CurrentNoise:
		num := volt
		if d == CurrentNoise {
			num = prefixedPattern(Ampere)
		}
		return num + `\s*/\s*` + alternatives(noiseRoots) + `\(?` + hz + `\)?`
	}
	return prefixedPattern(d)
}

// prefixedPattern matches a base unit of d with an optional SI prefix.
func prefixedPattern(d Dim) string {
	var ps []string
	for p := range prefixes {
		ps = append(ps, p)
	}
	slices.Sort(ps)
	var units []string
	for u, ud := range baseUnits {
		if ud == d {
			units = append(units, u)
		}
	}
	return `(?:` + alternatives(ps) + `)?` + alternatives(units)
}

// alternatives is a group matching any of words, longest first so that
// an engine trying them in order takes the whole word.
func alternatives(words []string) string {
	ws := slices.Clone(words)
	slices.SortFunc(ws, func(a, b string) int {
		if len(a) != len(b) {
			return len(b) - len(a)
		}
		return strings.Compare(a, b)
	})
	q := make([]string, len(ws))
	for i, w := range ws {
		q[i] = regexp.QuoteMeta(w)
	}
	return `(?:` + strings.Join(q, "|") + `)`
}
