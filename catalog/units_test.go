package catalog

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

// near reports whether got is within rel (relative) of want.
func near(got, want, rel float64) bool {
	if want == 0 {
		return math.Abs(got) <= rel
	}
	return math.Abs(got-want) <= rel*math.Abs(want)
}

func assertNear(t *testing.T, got, want, rel float64) {
	t.Helper()
	if !near(got, want, rel) {
		t.Errorf("got %g, want %g (±%g relative)", got, want, rel)
	}
}

func TestParseSIPrefixes(t *testing.T) {
	// Prefix factors from the SI Brochure (BIPM, 9th edition, 2019), table 7.
	// µ is written three ways: "u" (ASCII), U+00B5 micro sign, U+03BC mu.
	tests := []struct {
		text string
		dim  Dim
		want float64
	}{
		{"3 fA/rtHz", CurrentNoise, 3e-15},
		{"100 pF", Farad, 100e-12},
		{"250 nA", Ampere, 250e-9},
		{"2 uV/K", VoltPerKelvin, 2e-6},
		{"2 µV/K", VoltPerKelvin, 2e-6},
		{"2 μV/K", VoltPerKelvin, 2e-6},
		{"7 mV", Volt, 7e-3},
		{"10 kOhm", Ohm, 10e3},
		{"1 MHz", Hertz, 1e6},
		{"1 mHz", Hertz, 1e-3}, // case matters: m is milli
		{"1.2 GHz", Hertz, 1.2e9},
		{"1.2MHz", Hertz, 1.2e6},
		{"5 V", Volt, 5},
		{"+5 V", Volt, 5},
		{"-1.5 V", Volt, -1.5},
		{"−1.5 V", Volt, -1.5}, // U+2212 minus sign
		{"  3.3 V  ", Volt, 3.3},
		{".5 V", Volt, 0.5},
		{"1e3 Ohm", Ohm, 1e3},
		{"2.5E-3 A", Ampere, 2.5e-3},
		{"10 kΩ", Ohm, 10e3},
		{"1 Mohm", Ohm, 1e6},
		{"2 us", Second, 2e-6},
		{"2 ms", Second, 2e-3},
	}
	for _, tc := range tests {
		t.Run(tc.text, func(t *testing.T) {
			got, err := Parse(tc.text, tc.dim)
			if err != nil {
				t.Fatalf("Parse(%q): %v", tc.text, err)
			}
			assertNear(t, got, tc.want, 1e-12)
		})
	}
}

// TestParseCorrectlyRounded checks that a prefixed value is the float64
// nearest its exact decimal value, the same as the Go literal (the Go
// specification rounds constants correctly): 250 × 1e-9 computed in floating
// point is 2.5000000000000004e-07, one step above 250e-9.
func TestParseCorrectlyRounded(t *testing.T) {
	tests := []struct {
		text string
		dim  Dim
		want float64
	}{
		{"250 nA", Ampere, 250e-9},
		{"9 mV", Volt, 9e-3},
		{"0.7 MHz", Hertz, 0.7e6},
		{"2.5E-3 mA", Ampere, 2.5e-6},
		{"0.1 pA/rtHz", CurrentNoise, 0.1e-12},
		{"0.5 V/us", VoltPerSecond, 0.5e6},
		{"3.3 kOhm", Ohm, 3.3e3},
	}
	for _, tc := range tests {
		t.Run(tc.text, func(t *testing.T) {
			got, err := Parse(tc.text, tc.dim)
			if err != nil {
				t.Fatal(err)
			}
			if got != tc.want {
				t.Errorf("Parse(%q) = %v, want exactly %v", tc.text, got, tc.want)
			}
		})
	}
}

func TestParseDerivedUnits(t *testing.T) {
	tests := []struct {
		name string
		text string
		dim  Dim
		want float64
	}{
		// 1 V/µs = 1 V / 1e-6 s = 1e6 V/s (definition of the prefix, SI Brochure table 7).
		{"slew V/us", "1 V/us", VoltPerSecond, 1e6},
		{"slew V/µs", "0.5 V/µs", VoltPerSecond, 0.5e6},
		{"slew V/ms", "3 V/ms", VoltPerSecond, 3e3},
		{"slew V/s", "13823 V/s", VoltPerSecond, 13823},
		{"slew kV/us", "1 kV/us", VoltPerSecond, 1e9},
		{"dB", "100 dB", Decibel, 100},
		// Voltage gain in dB is 20·log10(Av) (IEC 60027-3, from memory):
		// 1e5 V/V = 100 dB, 1 V/mV = 1e3 V/V = 60 dB, 1 V/µV = 1e6 V/V = 120 dB.
		{"aol V/V", "100000 V/V", Decibel, 100},
		{"aol V/mV", "1 V/mV", Decibel, 60},
		{"aol 100 V/mV", "100 V/mV", Decibel, 100},
		{"aol V/uV", "1 V/uV", Decibel, 120},
		{"gain V/V plain", "11 V/V", Dimensionless, 11},
		{"gain bare", "11", Dimensionless, 11},
		{"celsius C", "-40 C", Celsius, -40},
		{"celsius °C", "85 °C", Celsius, 85},
		{"celsius degC", "125 degC", Celsius, 125},
		{"celsius ℃", "25 ℃", Celsius, 25},
		{"percent", "5 %", Ratio, 0.05},
		{"percent no space", "1%", Ratio, 0.01},
		{"ppm", "50 ppm", Ratio, 50e-6},
		{"ratio bare", "0.7", Ratio, 0.7},
		{"noise rtHz", "35 nV/rtHz", VoltNoise, 35e-9},
		{"noise √Hz", "35 nV/√Hz", VoltNoise, 35e-9},
		{"noise sqrt(Hz)", "35 nV/sqrt(Hz)", VoltNoise, 35e-9},
		{"current noise", "0.1 pA/rtHz", CurrentNoise, 0.1e-12},
		// 1 µV/√kHz = 1e-6 V / √1000 √Hz = 31.62 nV/√Hz (arithmetic).
		{"noise per root kHz", "1 uV/rtkHz", VoltNoise, 1e-6 / math.Sqrt(1000)},
		{"drift per C", "7 uV/C", VoltPerKelvin, 7e-6},
		{"drift per °C", "7 uV/°C", VoltPerKelvin, 7e-6},
		{"spaces around slash", "0.5 V / us", VoltPerSecond, 0.5e6},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, err := Parse(tc.text, tc.dim)
			if err != nil {
				t.Fatalf("Parse(%q): %v", tc.text, err)
			}
			assertNear(t, got, tc.want, 1e-12)
		})
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		name string
		text string
		dim  Dim
		want string // the full message
	}{
		{"wrong dimension", "1 MHz", VoltPerSecond, `"1 MHz" is a frequency, want a slew rate such as "0.5 V/us"`},
		{"volt for amp", "2 mV", Ampere, `"2 mV" is a voltage, want a current such as "250 nA"`},
		{"missing unit", "0.5", VoltPerSecond, `"0.5" has no unit, want a slew rate such as "0.5 V/us"`},
		{"missing unit volt", "5", Volt, `"5" has no unit, want a voltage such as "1.5 V"`},
		{"unknown unit", "5 Vx", Volt, `"5 Vx" has an unknown unit "Vx", want a voltage such as "1.5 V"`},
		{"lower-case v", "5 v", Volt, `"5 v" has an unknown unit "v", want a voltage such as "1.5 V"`},
		{"NaN", "NaN V", Volt, `"NaN V" is not a number with a unit, want a voltage such as "1.5 V"`},
		{"Inf", "Inf Hz", Hertz, `"Inf Hz" is not a number with a unit, want a frequency such as "1 MHz"`},
		{"empty", "", Volt, `"" is not a number with a unit, want a voltage such as "1.5 V"`},
		{"exponent too large", "1e400 V", Volt, `"1e400 V" is out of range, want a voltage such as "1.5 V"`},
		{"exponent too small", "1e-400 V", Volt, `"1e-400 V" is out of range, want a voltage such as "1.5 V"`},
		{"underflow after prefix", "1e-320 pF", Farad, `"1e-320 pF" is out of range, want a capacitance such as "100 pF"`},
		{"overflow after prefix", "1e305 GHz", Hertz, `"1e305 GHz" is out of range, want a frequency such as "1 MHz"`},
		{"negative gain ratio", "-5 V/mV", Decibel, `"-5 V/mV" is not a positive gain, want a gain in decibels such as "100 dB"`},
		{"bare number for dB", "100", Decibel, `"100" has no unit, want a gain in decibels such as "100 dB"`},
		{"unit for plain number", "5 V", Dimensionless, `"5 V" is a voltage, want a plain number such as "11"`},
		{"percent for volt", "5 %", Volt, `"5 %" is a ratio, want a voltage such as "1.5 V"`},
		{"noise over Hz without root", "5 nV/Hz", VoltNoise, `"5 nV/Hz" has an unknown unit "nV/Hz", want a voltage noise density such as "10 nV/rtHz"`},
		{"plain voltage for noise", "5 nV", VoltNoise, `"5 nV" is a voltage, want a voltage noise density such as "10 nV/rtHz"`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse(tc.text, tc.dim)
			if err == nil {
				t.Fatalf("Parse(%q) succeeded, want an error", tc.text)
			}
			var ue *UnitError
			if !errors.As(err, &ue) {
				t.Fatalf("error %T is not a *UnitError", err)
			}
			if !errors.Is(err, ErrUnit) {
				t.Errorf("errors.Is(err, ErrUnit) = false")
			}
			if got := err.Error(); got != tc.want {
				t.Errorf("message\n got %s\nwant %s", got, tc.want)
			}
		})
	}
}

func TestUnitErrorBare(t *testing.T) {
	e := &UnitError{Text: "0.5", Want: VoltPerSecond, Msg: "has no unit", Bare: true}
	want := `0.5 has no unit, want a slew rate such as "0.5 V/us"`
	if got := e.Error(); got != want {
		t.Errorf("got %s, want %s", got, want)
	}
}

func TestFormat(t *testing.T) {
	tests := []struct {
		v    float64
		dim  Dim
		want string
	}{
		{1.2e6, Hertz, "1.2 MHz"},
		{1e6, Hertz, "1 MHz"},
		{999.6, Hertz, "1 kHz"}, // rounds up into the next prefix
		{999.4, Hertz, "999 Hz"},
		{0.5e6, VoltPerSecond, "0.5 V/µs"},
		{13823, VoltPerSecond, "0.0138 V/µs"},
		{250e-9, Ampere, "250 nA"},
		{-1.5, Volt, "-1.5 V"},
		{0, Volt, "0 V"},
		{10e3, Ohm, "10 kΩ"},
		{100e-12, Farad, "100 pF"},
		{35e-9, VoltNoise, "35 nV/√Hz"},
		{2e-6, VoltPerKelvin, "2 µV/K"},
		{100, Decibel, "100 dB"},
		{-40, Celsius, "-40 °C"},
		{0.05, Ratio, "5 %"},
		{11, Dimensionless, "11"},
		{123456.789, Dimensionless, "123000"},
		{1.23456e-5, Dimensionless, "0.0000123"},
		{math.NaN(), Volt, "—"},
		{math.Inf(1), Volt, "—"},
	}
	for _, tc := range tests {
		t.Run(tc.want, func(t *testing.T) {
			if got := Format(tc.v, tc.dim); got != tc.want {
				t.Errorf("Format(%g) = %q, want %q", tc.v, got, tc.want)
			}
		})
	}
}

func TestFormatASCII(t *testing.T) {
	tests := []struct {
		v    float64
		dim  Dim
		want string
	}{
		{0.5e6, VoltPerSecond, "0.5 V/us"},
		{10e3, Ohm, "10 kOhm"},
		{35e-9, VoltNoise, "35 nV/rtHz"},
		{-40, Celsius, "-40 C"},
		{2e-6, VoltPerKelvin, "2 uV/K"},
		{math.NaN(), Volt, "-"},
	}
	for _, tc := range tests {
		t.Run(tc.want, func(t *testing.T) {
			got := FormatASCII(tc.v, tc.dim)
			if got != tc.want {
				t.Errorf("FormatASCII(%g) = %q, want %q", tc.v, got, tc.want)
			}
			for _, r := range got {
				if r > 127 {
					t.Errorf("%q holds non-ASCII %q", got, r)
				}
			}
		})
	}
}

// TestFormatParseRoundTrip checks that what Format shows reads back within
// three significant figures: rounding to 3 figures moves a value by at most
// half a unit in the third figure, 0.5/100 = 5e-3 relative.
func TestFormatParseRoundTrip(t *testing.T) {
	dims := []Dim{Volt, Ampere, Hertz, VoltPerSecond, Ohm, Second, Farad, Celsius,
		Decibel, Ratio, VoltNoise, CurrentNoise, VoltPerKelvin, Dimensionless}
	values := []float64{1, -1, 0.5, 1.23456, 9.99949, 999.96, 1234567, 3.3e-3, 7e-9,
		2.5e-13, 4.7e-16, 6.02e11, -0.0271, 1e-20, 1e30}
	for _, d := range dims {
		for _, v := range values {
			for _, f := range []func(float64, Dim) string{Format, FormatASCII} {
				s := f(v, d)
				t.Run(d.String()+"/"+s, func(t *testing.T) {
					got, err := Parse(s, d)
					if err != nil {
						t.Fatalf("Parse(%q) after formatting %g: %v", s, v, err)
					}
					if !near(got, v, 5e-3) {
						t.Errorf("Format(%g) = %q reads back as %g", v, s, got)
					}
				})
			}
		}
	}
}

func FuzzParse(f *testing.F) {
	for _, s := range []string{"0.5 V/us", "1 MHz", "1e400 V", "NaN", "-40 C", "35 nV/rtHz",
		"1 V/mV", "5 %", "1e-400 V", "−3 V", "10 kΩ", "2 uV/K", "1 uV/sqrt(kHz)", "1e"} {
		for d := Dimensionless; d <= VoltPerKelvin; d++ {
			f.Add(s, int(d))
		}
	}
	f.Fuzz(func(t *testing.T, text string, d int) {
		dim := Dim(((d % 14) + 14) % 14)
		v, err := Parse(text, dim)
		// The memo and the exact fast path give the bits and the message of
		// the previous Parse, kept as slowParse (unitmemo_test.go).
		var memo unitMemo
		for range 2 {
			got, gotErr := (&memo).parse(text, dim)
			want, wantErr := slowParse(text, dim)
			if math.Float64bits(got) != math.Float64bits(want) || fmt.Sprint(gotErr) != fmt.Sprint(wantErr) {
				t.Fatalf("Parse(%q, %s) = %v, %v; before the fast path %v, %v", text, dim, got, gotErr, want, wantErr)
			}
		}
		if err != nil {
			var ue *UnitError
			if !errors.As(err, &ue) {
				t.Fatalf("Parse(%q) error %T is not *UnitError", text, err)
			}
			if ue.Text != text || ue.Want != dim {
				t.Fatalf("UnitError %+v does not carry the input", ue)
			}
			if !strings.Contains(err.Error(), dim.Example()) {
				t.Fatalf("message %q lacks the example", err.Error())
			}
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("Parse(%q) = %g, not finite", text, v)
		}
	})
}
