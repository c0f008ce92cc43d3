package catalog

import (
	"regexp"
	"strings"
	"testing"
)

// TestPatternMatchesParse checks Dim.Pattern against Parse on a grid of
// numbers and unit spellings, right and wrong: for every dimension the
// pattern matches exactly the texts Parse accepts. The grid is the
// project's own; the expected answers come from Parse itself, so a
// spelling added to Parse without the pattern (or the reverse) fails.
func TestPatternMatchesParse(t *testing.T) {
	numbers := []string{"1", "2.5", "-3", "1e3", ".5", "4.", "−2", "+7"}
	bases := []string{"V", "A", "Hz", "s", "F", "Ohm", "ohm", "Ω", "\u2126", "Ohms", "ohms", "C", "°C", "degC",
		"℃", "dB", "%", "ppm", "K", "Kelvin", "v", "hz", ""}
	prefixList := []string{"", "f", "p", "n", "u", "µ", "μ", "m", "k", "M", "G", "x", "da"}
	var units []string
	for _, p := range prefixList {
		for _, b := range bases {
			units = append(units, p+b)
		}
	}
	for _, n := range []string{"V", "mV", "kV", "A", "nA", "Hz", "s"} {
		for _, d := range []string{"s", "us", "ms", "V", "mV", "uV", "K", "C", "°C", "degC", "rtHz", "√Hz", "sqrtHz",
			"sqrt(Hz)", "rtkHz", "Hz", "(Hz)", "rt(Hz", ""} {
			units = append(units, n+"/"+d, n+" / "+d)
		}
	}
	dimsAll := []Dim{Dimensionless, Volt, Ampere, Hertz, VoltPerSecond, Ohm, Second, Farad, Celsius, Decibel, Ratio,
		VoltNoise, CurrentNoise, VoltPerKelvin}
	checked := 0
	for _, d := range dimsAll {
		re := regexp.MustCompile(d.Pattern())
		for _, num := range numbers {
			for _, u := range units {
				for _, sep := range []string{"", " "} {
					text := num + sep + u
					negative := strings.HasPrefix(num, "-") || strings.HasPrefix(num, "−")
					if d == Decibel && negative && strings.Contains(u, "/") {
						continue // a negative gain ratio has no dB value: Parse refuses it by value, not form
					}
					_, err := Parse(text, d)
					if got, want := re.MatchString(text), err == nil; got != want {
						t.Errorf("%s: pattern matches %q = %v, Parse accepts = %v (%v)", d, text, got, want, err)
					}
					checked++
				}
			}
		}
	}
	if checked < 10000 {
		t.Errorf("only %d texts checked", checked)
	}
}
