package filter_test

import (
	"fmt"
	"log"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// exampleDesign is the design brief's example: a ×11 non-inverting stage
// on 3.3 V with a 0.1 V, 2 kHz sine at its input.
const exampleDesign = `
title = "Soil-probe logger, analog front end"
[supply]
pos = "3.3 V"
[[stage]]
name = "gain"
kind = "noninverting"
gain = 11
signal = { shape = "sine", peak = "0.1 V", freq = "2 kHz" }
load_r = "10 kOhm"
`

// Derive turns a design's circuit-level inputs into requirements, each
// with the formula and numbers behind it. The slew rate a 1.1 V peak sine
// at 2 kHz needs is 2π·2 kHz·1.1 V ≈ 13.8 kV/s (0.0138 V/µs); the GBW for 1 % gain error
// at a noise gain of 11 is at least 11·2 kHz·7.02 ≈ 154 kHz (the design
// brief's single-pole loop with an ideal DC gain); each part is held to the
// GBW its own Aol leaves room for, and a part without Aol to
// 11·2 kHz·8.09 ≈ 178 kHz (1/√(1/(1−ε)² − 1/(1−ε/4)²) = 8.088 by hand,
// with ε/4 left to the Aol).
func ExampleDerive() {
	d, err := filter.DecodeDesign("probe.toml", []byte(exampleDesign))
	if err != nil {
		log.Fatal(err)
	}
	plan, err := filter.Derive(d)
	if err != nil {
		log.Fatal(err)
	}
	for _, r := range plan.Stages[0].Requirements {
		if r.Key == filter.KeySlew || r.Key == filter.KeyGBW {
			fmt.Printf("%s ≥ %s: %s\n", r.Key, catalog.Format(r.Value, r.Dim), r.Why)
		}
	}
	// Output:
	// slew ≥ 0.0138 V/µs: 2π·f·Vo = 2π·2 kHz·1.1 V
	// gbw ≥ 154 kHz: NG·f/√(1/(1−ε)² − (1 + NG/Aol)²) with each part's own Aol; as Aol → ∞ 11·2 kHz·7.018 (ε = 1 %); 178 kHz for a part with no Aol (ε/4 left to it)
}

// Evaluate checks every part against the plan at worst case and Rank puts
// the passing parts first, by their smallest margin. The fast part passes
// with its least spare in the output swing (2.2 V of 3.3 V used); the slow
// one misses the 154 kHz GBW (100 kHz guaranteed).
func ExampleRank() {
	d, err := filter.DecodeDesign("probe.toml", []byte(exampleDesign))
	if err != nil {
		log.Fatal(err)
	}
	plan, err := filter.Derive(d)
	if err != nil {
		log.Fatal(err)
	}
	parts, err := catalog.Decode("parts.toml", []byte(exampleParts))
	if err != nil {
		log.Fatal(err)
	}
	results := filter.Evaluate(plan, parts, filter.Options{})
	filter.Rank(results, filter.SortMargin)
	for _, r := range results {
		verdict := "passes"
		if !r.Pass {
			verdict = "fails"
		}
		fmt.Printf("%s %s, binding %s.%s\n", r.Part.ID, verdict, r.Binding.Stage, r.Binding.Key)
	}
	// Output:
	// ex2-fast passes, binding gain.output_range
	// ex2-slow fails, binding gain.gbw
}

// exampleParts are two invented rail-to-rail duals that differ only in
// speed: 1 MHz and 100 kHz guaranteed GBW against the 154 kHz needed.
const exampleParts = `
[[part]]
id = "ex2-fast"
name = "Example dual, 1 MHz"
tech = "cmos"
channels = 2
packages = ["soic8"]
supply = { min = "1.8 V", max = "5.5 V" }
input_cm = { low = "-0.1 V", high = "0.1 V" }
output = { low = "0.01 V", high = "-0.01 V", load = "10 kOhm" }
gbw = { typ = "1.3 MHz", min = "1 MHz" }
slew = { typ = "1 V/us", min = "0.8 V/us" }
iout = { typ = "20 mA", min = "10 mA" }

[[part]]
id = "ex2-slow"
name = "Example dual, 100 kHz"
tech = "cmos"
channels = 2
packages = ["soic8"]
supply = { min = "1.8 V", max = "5.5 V" }
input_cm = { low = "-0.1 V", high = "0.1 V" }
output = { low = "0.01 V", high = "-0.01 V", load = "10 kOhm" }
gbw = { typ = "0.13 MHz", min = "0.1 MHz" }
slew = { typ = "0.1 V/us", min = "0.08 V/us" }
iout = { typ = "20 mA", min = "10 mA" }
`
