package filter_test

import (
	"math"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

const splitterStage = `kind = "rail_splitter"
i_source = "8 mA"
i_sink = "5 mA"
cload = "10 uF"
supply_current = "10 mA"`

// A rail splitter holds the mid-rail (6 V on 0…12 V by default), drives the
// larger return current and, without an isolation resistor, must be stable
// with the decoupling capacitance itself. The sourced current comes from the
// supply through the part, so Iq + i_source is what the supply sees
// (arithmetic, worked by hand).
func TestRailSplitterRequirements(t *testing.T) {
	p := tmplPlan(t, rails12, splitterStage)
	for _, key := range []filter.Key{filter.KeyInputRange, filter.KeyOutputRange} {
		r := tmplMust(t, p, key)
		if r.Low != 6 || r.High != 6 {
			t.Errorf("%s %g … %g V, want the point 6 V (mid of 0 … 12 V)", key, r.Low, r.High)
		}
	}
	tmplNear(t, "output current", tmplMust(t, p, filter.KeyOutputCurrent).Value, 8e-3, 1e-12)
	part := tmplPart("r") // Iq 1 mA max, cload 1 nF
	sc := tmplCheck(t, p, part, filter.KeySupplyCurrent)
	tmplNear(t, "supply current", sc.Available, 1e-3+8e-3, 1e-12)
	tmplNear(t, "supply current margin", sc.Margin, 10e-3/9e-3-1, 1e-9)

	tests := []struct {
		name   string
		stage  string
		cload  catalog.Opt
		status filter.Status
	}{
		{"no isolation, 1 nF part fails", splitterStage, catalog.Some(1e-9), filter.StatusFail},
		{"no isolation, unrated part unknown", splitterStage, catalog.Opt{}, filter.StatusUnknown},
		{"no isolation, 22 uF part passes", splitterStage, catalog.Some(22e-6), filter.StatusPass},
		{"isolation resistor relaxes the check", splitterStage + "\niso_r = \"47 Ohm\"", catalog.Some(1e-9), filter.StatusPass},
		{"isolation resistor, unrated part passes", splitterStage + "\niso_r = \"47 Ohm\"", catalog.Opt{}, filter.StatusPass},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := tmplPlan(t, rails12, tt.stage)
			part := tmplPart("r")
			part.CLoad = tt.cload
			c := tmplCheck(t, p, part, filter.KeyCLoad)
			if c.Status != tt.status {
				t.Errorf("cload check %v, want %v (note %q)", c.Status, tt.status, c.Note)
			}
		})
	}
	t.Run("isolation resistor says so and moves the output", func(t *testing.T) {
		p := tmplPlan(t, rails12, splitterStage+"\niso_r = \"47 Ohm\"")
		tmplContains(t, "cload why", tmplMust(t, p, filter.KeyCLoad).Why, "relaxed", "iso_r")
		c := tmplCheck(t, p, tmplPart("r"), filter.KeyCLoad)
		tmplContains(t, "cload note", c.Note, "isolation resistor")
		if !math.IsInf(c.Margin, 1) {
			t.Errorf("relaxed cload margin %g, want unbounded", c.Margin)
		}
		out := tmplMust(t, p, filter.KeyOutputRange)
		tmplNear(t, "output low", out.Low, 6-5e-3*47, 1e-12)
		tmplNear(t, "output high", out.High, 6+8e-3*47, 1e-12)
	})
	t.Run("errors", func(t *testing.T) {
		tests := []struct{ name, stage, want string }{
			{"no current", "kind = \"rail_splitter\"\ncload = \"1 uF\"", `"i_source": missing`},
			{"ref outside the rails", "kind = \"rail_splitter\"\ni_sink = \"1 mA\"\nref = \"13 V\"", `"ref": 13 V is not between the rails`},
			{"zero iso_r", splitterStage + "\niso_r = \"0 Ohm\"", `"iso_r"`},
		}
		for _, tt := range tests {
			t.Run(tt.name, func(t *testing.T) {
				tmplContains(t, "error", tmplDeriveErr(t, rails12, tt.stage), tt.want)
			})
		}
	})
}
