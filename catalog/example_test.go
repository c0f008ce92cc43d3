package catalog_test

import (
	"errors"
	"fmt"

	"github.com/opsift/opsift/catalog"
)

// Decode reads one catalog file into parts with every figure in SI units,
// and reports what is wrong with file, line, part and field.
func ExampleDecode() {
	const file = `
[[part]]
id = "ex2-cmos"
name = "Example dual, rail-to-rail output"
tech = "cmos"
channels = 2
packages = ["soic8"]
supply = { min = "2.7 V", max = "5.5 V" }
gbw = { typ = "3 MHz", min = "2 MHz" }
slew = { typ = "1.5 V/us" }

[[part]]
id = "ex1-bad"
name = "A part with a figure in the wrong unit"
tech = "bipolar"
channels = 1
packages = ["sot5"]
supply = { min = "3 V", max = "30 V" }
gbw = { typ = "1 MHz" }
slew = { typ = "1 MHz" }
`
	parts, err := catalog.Decode("parts.toml", []byte(file))
	for _, p := range parts {
		// 1.5 V/µs is 1.5e6 V/s; the guaranteed GBW is 2e6 Hz.
		fmt.Printf("%s: slew %g V/s typical, gbw %g Hz guaranteed\n", p.ID, p.Slew.Typ.V(), p.GBW.Min.V())
	}
	var probs catalog.Problems
	if errors.As(err, &probs) {
		for _, pr := range probs {
			fmt.Println(pr)
		}
	}
	// Output:
	// ex2-cmos: slew 1.5e+06 V/s typical, gbw 2e+06 Hz guaranteed
	// parts.toml:20: part "ex1-bad": field "slew": typ = "1 MHz" is a frequency, want a slew rate such as "0.5 V/us"
}
