package catalog

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// TestExactDecimal holds the fast path of number reading to
// strconv.ParseFloat, which returns the float64 nearest the decimal value
// (IEEE 754 round to nearest even, as the strconv documentation states):
// wherever exactDecimal answers, its bits must be ParseFloat's for the
// same number with the shift folded into its exponent.
func TestExactDecimal(t *testing.T) {
	cases := []string{"0", "-0", "1", "-1", "0.5", ".5", "5.", "250", "0.0001", "1e3", "1E-3", "-2.5e+2",
		"123456789012345", "1234567890123456", "0.000000000000000000001", "9007199254740993", "1e22", "1e23",
		"4.7e-3", "100000000000000000000000", "3.3", "0.1", "0.30000000000000004", "1e999", "1e-999", "+7"}
	r := rand.New(rand.NewPCG(1, 2))
	for range 20000 {
		digits := ""
		for range 1 + r.IntN(17) {
			digits += strconv.Itoa(r.IntN(10))
		}
		dot := r.IntN(len(digits) + 1)
		s := digits[:dot] + "." + digits[dot:]
		if r.IntN(3) == 0 {
			s += fmt.Sprintf("e%d", r.IntN(50)-25)
		}
		if r.IntN(2) == 0 {
			s = "-" + s
		}
		cases = append(cases, s)
	}
	answered := 0
	for _, num := range cases {
		for _, shift := range []int{0, -15, -12, -9, -6, -3, -2, 3, 6, 9} {
			got, ok := exactDecimal(num, shift)
			if !ok {
				continue
			}
			answered++
			m, e := mantissa(num), 0
			if len(m) < len(num) {
				e, _ = strconv.Atoi(num[len(m)+1:])
			}
			want, err := strconv.ParseFloat(m+"e"+strconv.Itoa(e+shift), 64)
			if err != nil {
				t.Fatalf("%q·10^%d: fast path answered %g where ParseFloat fails: %v", num, shift, got, err)
			}
			if math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("%q·10^%d = %v (bits %x), ParseFloat %v (bits %x)", num, shift, got, math.Float64bits(got), want, math.Float64bits(want))
			}
		}
	}
	if answered < len(cases) {
		t.Fatalf("the fast path answered only %d of %d×10 cases", answered, len(cases))
	}
}

// TestParseMemoMatchesPlain: reading quantities through a file's memo of
// unit spellings gives the same values and errors as reading them one by
// one with the slow path (ParseFloat, parseUnit and scaled, as Parse read
// them before the memo), for every unit spelling the tests know, twice
// over so the second reading comes from the memo.
func TestParseMemoMatchesPlain(t *testing.T) {
	units := []string{"V", "mV", "uV", "µV", "kOhm", "MHz", "kHz", "Hz", "V/us", "V/µs", "mV/us", "nA", "pA", "fA",
		"mA", "uA", "A", "nV/rtHz", "pA/rtHz", "fA/√Hz", "nV/sqrt(Hz)", "uV/K", "uV/C", "dB", "V/mV", "V/V", "%", "ppm",
		"C", "pF", "nF", "us", "ns", "", "furlong", "V/mHz", "kV/s", "GHz"}
	dims := []Dim{Volt, Ampere, Hertz, VoltPerSecond, Ohm, Second, Farad, Celsius, Decibel, Ratio, VoltNoise,
		CurrentNoise, VoltPerKelvin, Dimensionless}
	nums := []string{"0", "1.5", "-2.05", "250", "0.0108", "3.04e-16", "1e400", "1e-400", "12345678901234567", "−3"}
	var memo unitMemo
	m := &memo
	for pass := range 2 {
		for _, u := range units {
			for _, d := range dims {
				for _, n := range nums {
					text := n + " " + u
					got, gotErr := m.parse(text, d)
					want, wantErr := slowParse(text, d)
					if (gotErr == nil) != (wantErr == nil) || (gotErr != nil && gotErr.Error() != wantErr.Error()) {
						t.Fatalf("pass %d, %q as %s: error %v, want %v", pass, text, d, gotErr, wantErr)
					}
					if math.Float64bits(got) != math.Float64bits(want) {
						t.Fatalf("pass %d, %q as %s = %v, want %v", pass, text, d, got, want)
					}
				}
			}
		}
	}
	if len(memo) == 0 || len(memo) > maxUnitMemo {
		t.Fatalf("memo holds %d spellings", len(memo))
	}
}

// slowParse is Parse as it was before the memo and the exact fast path,
// kept verbatim as the reference: ParseFloat, parseUnit and scaled.
func slowParse(text string, want Dim) (float64, error) {
	s := strings.TrimSpace(text)
	// Accept the typographic minus sign (U+2212) that datasheets print.
	if rest, ok := strings.CutPrefix(s, "−"); ok {
		s = "-" + rest
	}
	num, unit := splitNumber(s)
	if num == "" {
		return 0, &UnitError{Text: text, Want: want, Msg: "is not a number with a unit"}
	}
	v, err := strconv.ParseFloat(num, 64)
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
	scale, got, ok := parseUnit(unit, want)
	if !ok {
		if unit == "" {
			return 0, &UnitError{Text: text, Want: want, Msg: "has no unit"}
		}
		return 0, &UnitError{Text: text, Want: want, Msg: fmt.Sprintf("has an unknown unit %q", unit)}
	}
	r := scaled(num, v, scale)
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
