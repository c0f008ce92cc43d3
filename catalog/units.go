package catalog

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// Dim is the physical dimension a quantity is measured in. Every catalog
// and design field declares the Dim it wants; Parse refuses any other.
type Dim int

// The dimensions opsift knows. Values are held in SI base units of the
// dimension (V, A, Hz, V/s, Ω, s, F); temperatures in °C, gains in dB,
// ratios (percent, ppm) as plain fractions.
const (
	Dimensionless Dim = iota // a bare number or V/V
	Volt                     // V
	Ampere                   // A
	Hertz                    // Hz
	VoltPerSecond            // V/s (slew rate)
	Ohm                      // Ω
	Second                   // s
	Farad                    // F
	Celsius                  // °C
	Decibel                  // dB (also accepts V/V, V/mV, V/µV for open-loop gain)
	Ratio                    // %, ppm, or a bare fraction
	VoltNoise                // V/√Hz
	CurrentNoise             // A/√Hz
	VoltPerKelvin            // V/K (offset drift)
)

// dimInfo says how a dimension is named in messages and shown by Format.
type dimInfo struct {
	name    string // "a slew rate"
	example string // "0.5 V/us"
	unit    string // display unit after the prefix, e.g. "V/µs" handled specially
}

var dims = map[Dim]dimInfo{
	Dimensionless: {"a plain number", "11", ""},
	Volt:          {"a voltage", "1.5 V", "V"},
	Ampere:        {"a current", "250 nA", "A"},
	Hertz:         {"a frequency", "1 MHz", "Hz"},
	VoltPerSecond: {"a slew rate", "0.5 V/us", "V/s"},
	Ohm:           {"a resistance", "10 kOhm", "Ω"},
	Second:        {"a time", "2 us", "s"},
	Farad:         {"a capacitance", "100 pF", "F"},
	Celsius:       {"a temperature", "-40 C", "°C"},
	Decibel:       {"a gain in decibels", "100 dB", "dB"},
	Ratio:         {"a ratio", "5 %", "%"},
	VoltNoise:     {"a voltage noise density", "10 nV/rtHz", "V/√Hz"},
	CurrentNoise:  {"a current noise density", "0.1 pA/rtHz", "A/√Hz"},
	VoltPerKelvin: {"an offset drift", "2 uV/K", "V/K"},
}

// String names the dimension the way error messages use it ("a slew rate").
func (d Dim) String() string { return dims[d].name }

// Example returns a well-formed value of the dimension, for error messages.
func (d Dim) Example() string { return dims[d].example }

// Unit returns the SI unit symbol values of this dimension are held in.
func (d Dim) Unit() string { return dims[d].unit }

// prefixes are the SI prefixes accepted in front of a unit (SI Brochure,
// 9th edition, table 7). Case matters: m is milli, M is mega. f is accepted
// because current noise is quoted in fA/√Hz.
var prefixes = map[string]float64{
	"f": 1e-15, "p": 1e-12, "n": 1e-9, "u": 1e-6, "µ": 1e-6, "μ": 1e-6,
	"m": 1e-3, "k": 1e3, "M": 1e6, "G": 1e9,
}

// celsiusUnits are the spellings of °C (no prefix is taken), also as the
// denominator of an offset drift (uV/C).
var celsiusUnits = []string{"C", "°C", "degC", "℃"}

// noiseRoots are the spellings of the square root in a noise density's
// unit: rtHz, √Hz, sqrtHz, sqrt(Hz).
var noiseRoots = []string{"rt", "√", "sqrt"}

// baseUnits maps every accepted spelling of a prefix-free unit to its dimension.
var baseUnits = map[string]Dim{
	"V": Volt, "A": Ampere, "Hz": Hertz, "s": Second, "F": Farad,
	"Ohm": Ohm, "ohm": Ohm, "Ω": Ohm, "\u2126": Ohm, "Ohms": Ohm, "ohms": Ohm, // U+2126 is the OHM SIGN
}

// UnitError is returned by Parse: it keeps the offending text and the
// dimension that was wanted so callers can add file, line and field.
type UnitError struct {
	Text string // the value as written
	Want Dim    // the dimension the field wants
	Msg  string // what is wrong, e.g. "is a frequency"
	// Bare is set when the value was a bare number in the file rather than
	// a quoted string, so the message shows it unquoted as the user wrote it.
	Bare bool
}

// Error renders the problem with an example of a good value.
func (e *UnitError) Error() string {
	if e.Bare {
		return fmt.Sprintf("%s %s, want %s such as %q", e.Text, e.Msg, e.Want, e.Want.Example())
	}
	return fmt.Sprintf("%q %s, want %s such as %q", e.Text, e.Msg, e.Want, e.Want.Example())
}

// gainRatio is the internal dimension of V/V, V/mV and V/µV: a plain ratio
// that Parse converts to dB for open-loop gain and keeps as a number
// elsewhere. It is never returned to callers.
const gainRatio Dim = -1

// ErrUnit is matched by errors.Is for every *UnitError.
var ErrUnit = errors.New("bad quantity")

// Is lets errors.Is(err, ErrUnit) find unit errors.
func (e *UnitError) Is(target error) bool { return target == ErrUnit }

// Parse reads a quantity such as "0.5 V/us", "1.2MHz" or "-40 C" and returns
// its value in the SI unit of want. A missing or wrong unit, NaN, infinity or
// an exponent out of float64 range is a *UnitError.
func Parse(text string, want Dim) (float64, error) { return (*unitMemo)(nil).parse(text, want) }

// parse is Parse, remembering in m (when not nil) what each unit spelling
// means, so a file that writes "MHz" ten thousand times reads it once.
func (m *unitMemo) parse(text string, want Dim) (float64, error) {
	s := strings.TrimSpace(text)
	// Accept the typographic minus sign (U+2212) that datasheets print.
	if rest, ok := strings.CutPrefix(s, "−"); ok {
		s = "-" + rest
	}
	num, unit := splitNumber(s)
	if num == "" {
		return 0, &UnitError{Text: text, Want: want, Msg: "is not a number with a unit"}
	}
	v, exact := exactDecimal(num, 0)
	var err error
	if !exact {
		v, err = strconv.ParseFloat(num, 64)
	}
	if err != nil {
		if errors.Is(err, strconv.ErrRange) {
			return 0, &UnitError{Text: text, Want: want, Msg: "is out of range"}
		}
		return 0, &UnitError{Text: text, Want: want, Msg: "is not a number"}
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, &UnitError{Text: text, Want: want, Msg: "is not a finite number"}
	}
	if v == 0 && strings.ContainsAny(mantissa(num), "123456789") {
		// ParseFloat rounds "1e-400" to 0 without an error: an exponent
		// below float64's range must not silently become zero.
		return 0, &UnitError{Text: text, Want: want, Msg: "is out of range"}
	}
	unit = strings.TrimSpace(unit)
	u := m.unit(unit, want)
	scale, got, ok := u.scale, u.dim, u.ok
	if !ok {
		if unit == "" {
			return 0, &UnitError{Text: text, Want: want, Msg: "has no unit"}
		}
		return 0, &UnitError{Text: text, Want: want, Msg: fmt.Sprintf("has an unknown unit %q", unit)}
	}
	r, exact := v, scale == 1
	if !exact && u.pow10 {
		r, exact = exactDecimal(num, u.exp10)
	}
	if !exact {
		r = scaled(num, v, scale)
	}
	if r == 0 && v != 0 {
		return 0, &UnitError{Text: text, Want: want, Msg: "is out of range"}
	}
	switch {
	case got == gainRatio && want == Decibel:
		// Open-loop gain written as a ratio (V/V, V/mV): convert to dB.
		if r <= 0 {
			return 0, &UnitError{Text: text, Want: want, Msg: "is not a positive gain"}
		}
		r = 20 * math.Log10(r)
		got = Decibel
	case got == gainRatio:
		got = Dimensionless
	}
	if got != want {
		if unit == "" {
			return 0, &UnitError{Text: text, Want: want, Msg: "has no unit"}
		}
		return 0, &UnitError{Text: text, Want: want, Msg: "is " + got.String()}
	}
	if math.IsInf(r, 0) || math.IsNaN(r) {
		return 0, &UnitError{Text: text, Want: want, Msg: "is out of range"}
	}
	return r, nil
}

// splitNumber splits "1.2MHz" into "1.2" and "MHz". It returns num == ""
// when the text does not start with a decimal number.
func splitNumber(s string) (num, unit string) {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i++
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i++
			digits++
		}
	}
	if digits == 0 {
		return "", s
	}
	// Exponent only when followed by a digit, so "1e" is not a number and
	// "2 E" is left to the unit parser.
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		if j < len(s) && s[j] >= '0' && s[j] <= '9' {
			for j < len(s) && s[j] >= '0' && s[j] <= '9' {
				j++
			}
			i = j
		}
	}
	return s[:i], s[i:]
}

// scaled returns v·scale, the value of the number text num times the
// unit's factor. When the factor is a power of ten, as every SI prefix is,
// the product is read as one decimal number ("250e-9" for "250 nA"), so
// the result is the float64 nearest the exact value, the same as the
// literal 250e-9; a plain multiplication by 1e-9 can land one step off.
func scaled(num string, v, scale float64) float64 {
	k := math.Round(math.Log10(scale))
	if scale == 1 || math.Abs(k) > 30 || math.Abs(scale/math.Pow(10, k)-1) > 1e-9 {
		return v * scale
	}
	exp := 0
	m := mantissa(num)
	if len(m) < len(num) {
		e, err := strconv.Atoi(num[len(m)+1:])
		if err != nil {
			return v * scale // exponent beyond int: ParseFloat already refused it
		}
		exp = e
	}
	r, err := strconv.ParseFloat(m+"e"+strconv.Itoa(exp+int(k)), 64)
	if err != nil && !errors.Is(err, strconv.ErrRange) {
		return v * scale
	}
	return r
}

// mantissa returns the part of a number before its exponent.
func mantissa(num string) string {
	if i := strings.IndexAny(num, "eE"); i >= 0 {
		return num[:i]
	}
	return num
}

// parseUnit returns the factor to SI and the dimension of a unit string.
// want disambiguates spellings that mean different things in different
// fields (a bare number is a plain number, a ratio or nothing at all).
func parseUnit(u string, want Dim) (scale float64, d Dim, ok bool) {
	switch u {
	case "":
		if want == Ratio {
			return 1, Ratio, true
		}
		return 1, Dimensionless, true
	case "%":
		return 0.01, Ratio, true
	case "ppm":
		return 1e-6, Ratio, true
	case "dB":
		return 1, Decibel, true
	}
	if slices.Contains(celsiusUnits, u) {
		return 1, Celsius, true
	}
	num, den, slash := strings.Cut(u, "/")
	if !slash {
		s, d, ok := prefixed(u)
		return s, d, ok
	}
	ns, nd, ok := prefixed(strings.TrimSpace(num))
	if !ok {
		return 0, 0, false
	}
	den = strings.TrimSpace(den)
	if nd == Volt {
		switch {
		case den == "K" || slices.Contains(celsiusUnits, den):
			return ns, VoltPerKelvin, true
		case den == "V":
			return ns, gainRatio, true
		}
	}
	if root, isRoot := noiseRoot(den); isRoot {
		if rs, rd, ok := prefixed(root); ok && rd == Hertz {
			s := ns / math.Sqrt(rs)
			switch nd {
			case Volt:
				return s, VoltNoise, true
			case Ampere:
				return s, CurrentNoise, true
			}
		}
		return 0, 0, false
	}
	ds, dd, ok := prefixed(den)
	if !ok {
		return 0, 0, false
	}
	switch {
	case nd == Volt && dd == Second:
		return ns / ds, VoltPerSecond, true
	case nd == Volt && dd == Volt:
		// V/mV and the like: a gain ratio, converted to dB for open-loop gain.
		return ns / ds, gainRatio, true
	}
	return 0, 0, false
}

// noiseRoot recognises "rtHz", "√Hz", "sqrtHz", "sqrt(Hz)" and returns the
// unit under the root.
func noiseRoot(den string) (string, bool) {
	for _, p := range noiseRoots {
		if rest, ok := strings.CutPrefix(den, p); ok {
			rest = strings.TrimSuffix(strings.TrimPrefix(rest, "("), ")")
			return rest, true
		}
	}
	return "", false
}

// prefixed parses an optional SI prefix followed by a base unit.
func prefixed(u string) (float64, Dim, bool) {
	if d, ok := baseUnits[u]; ok {
		return 1, d, true
	}
	for p, f := range prefixes {
		if rest, ok := strings.CutPrefix(u, p); ok {
			if d, ok := baseUnits[rest]; ok {
				return f, d, true
			}
		}
	}
	return 0, 0, false
}

// engPrefixes are the prefixes Format may choose, smallest first.
var engPrefixes = []struct {
	sym string
	f   float64
}{
	{"f", 1e-15}, {"p", 1e-12}, {"n", 1e-9}, {"µ", 1e-6}, {"m", 1e-3},
	{"", 1}, {"k", 1e3}, {"M", 1e6}, {"G", 1e9},
}

// Format renders an SI value of dimension d in engineering notation with at
// most three significant figures: 1.2e6 Hz → "1.2 MHz". Slew rates are shown
// in V/µs, the unit the trade quotes them in; gains in dB; ratios in %.
func Format(v float64, d Dim) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	switch d {
	case Dimensionless:
		return trimNum(v, 3)
	case Decibel:
		return trimNum(v, 3) + " dB"
	case Celsius:
		return trimNum(v, 3) + " °C"
	case Ratio:
		return trimNum(v*100, 3) + " %"
	case VoltPerSecond:
		return trimNum(v/1e6, 3) + " V/µs"
	}
	return eng(v, dims[d].unit)
}

// FormatASCII is Format with only ASCII characters (µ → u, √ → rt, ° dropped),
// for files that will be parsed again, such as exported catalogs.
func FormatASCII(v float64, d Dim) string {
	r := strings.NewReplacer("µ", "u", "√", "rt", "°C", "C", "Ω", "Ohm", "—", "-")
	return r.Replace(Format(v, d))
}

// eng picks the prefix that leaves a mantissa in [1, 1000).
func eng(v float64, unit string) string {
	if v == 0 {
		return "0 " + unit
	}
	a := math.Abs(v)
	best := engPrefixes[0]
	for _, p := range engPrefixes {
		if a >= p.f*0.9995 {
			best = p
		}
	}
	return trimNum(v/best.f, 3) + " " + best.sym + unit
}

// trimNum formats with sig significant figures and no trailing zeros.
func trimNum(v float64, sig int) string {
	if v == 0 {
		return "0"
	}
	s := strconv.FormatFloat(v, 'g', sig, 64)
	if strings.ContainsAny(s, "e") {
		// Large or small plain numbers: a decimal rendering of the rounded
		// value ("123000", not "1.23e+05" nor "123456.789") when short.
		r, _ := strconv.ParseFloat(s, 64)
		f := strconv.FormatFloat(r, 'f', -1, 64)
		if len(f) <= 12 {
			return f
		}
	}
	return s
}
