package listing_test

import (
	"math"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/listing"
)

func opt(v float64) catalog.Opt { return catalog.Some(v) }

// Without a design the figures are at 25 °C with the default policy
// (DESIGN.md "Worst case and margins"): a limit as given, a typical-only
// figure × derate_typ 0.7 or × inflate_typ 2, no temperature moves; the
// typical view shows the typical as written. Worked by hand beside each.
func TestBuildWithoutDesign(t *testing.T) {
	p := &catalog.Part{ID: "a", Tech: catalog.TechCMOS, Channels: 2,
		GBW:  catalog.Spec{Typ: opt(2e6)},                      // worst 2 MHz × 0.7 = 1.4 MHz, typical
		Vos:  catalog.Spec{Typ: opt(1e-3), Max: opt(3e-3)},     // worst the max, 3 mV, guaranteed
		Ib:   catalog.Spec{Typ: opt(1e-12)},                    // worst 1 pA × 2 = 2 pA; FET, but 25 °C: no doubling
		Iq:   catalog.Spec{Typ: opt(100e-6), Max: opt(150e-6)}, // supply current, one package: 2 × 150 µA
		Slew: catalog.Spec{Min: opt(1e6)},                      // no typical: unknown in the typical view
	}
	cols, err := listing.ParseColumns("gbw,vos,ib,supply_current,slew,tech,gbw")
	if err != nil {
		t.Fatal(err)
	}
	if len(cols) != 6 {
		t.Fatalf("%d columns, want 6 (gbw given twice is kept once)", len(cols))
	}
	tests := []struct {
		typical bool
		want    []float64
		basis   []filter.Basis
	}{
		{false, []float64{1.4e6, 3e-3, 2e-12, 300e-6, 1e6},
			[]filter.Basis{filter.BasisTypical, filter.BasisGuaranteed, filter.BasisTypical, filter.BasisGuaranteed, filter.BasisGuaranteed}},
		{true, []float64{2e6, 1e-3, 1e-12, 200e-6, math.NaN()},
			[]filter.Basis{filter.BasisTypical, filter.BasisTypical, filter.BasisTypical, filter.BasisTypical, filter.BasisNone}},
	}
	for _, tc := range tests {
		rows := listing.Build(nil, nil, []*catalog.Part{p}, cols, tc.typical)
		if _, known := rows[0].Pass(); known {
			t.Error("a verdict without a design")
		}
		for j, w := range tc.want {
			c := rows[0].Cells[j]
			if math.IsNaN(w) {
				if c.Known() {
					t.Errorf("typical %v %s = %g, want unknown", tc.typical, cols[j].Key, c.V)
				}
				continue
			}
			if math.Abs(c.V-w) > 1e-12*w || c.Basis != tc.basis[j] {
				t.Errorf("typical %v %s = %g %v, want %g %v", tc.typical, cols[j].Key, c.V, c.Basis, w, tc.basis[j])
			}
		}
		if rows[0].Cells[5].Text != "cmos" {
			t.Errorf("tech = %q", rows[0].Cells[5].Text)
		}
	}
}

// Column and sort keys are checked, with did-you-mean.
func TestParseKeys(t *testing.T) {
	if _, err := listing.ParseColumns("gbw,noise"); err == nil || !strings.Contains(err.Error(), `unknown column "noise"`) {
		t.Errorf("unknown column: %v", err)
	}
	if _, err := listing.ParseColumns("supply.mni"); err == nil || !strings.Contains(err.Error(), `did you mean "supply.min"`) {
		t.Errorf("misspelt column: %v", err)
	}
	k, err := listing.ParseSort("-unit_cost")
	if err != nil || k.Key != "unit_cost" || !k.Desc || k.String() != "-unit_cost" {
		t.Errorf("ParseSort(-unit_cost) = %+v, %v", k, err)
	}
	cols, err := listing.ParseColumns("")
	if err != nil || len(cols) != len(listing.DefaultColumns()) {
		t.Errorf("default columns: %d, %v", len(cols), err)
	}
}
