package present

import (
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	_ "github.com/opsift/opsift/internal/golden" // takes -update, so go test ./... -update runs here too
)

// The margin is available/required − 1 (DESIGN.md "Worst case and
// margins"); the expected texts are that fraction as a percentage worked
// by hand, with the rounding and ratio rules of the package doc.
func TestMargin(t *testing.T) {
	tests := []struct {
		m    float64
		want string
	}{
		{0.032, "+3.2 %"},    // 1.032× the need
		{0.0314, "+3.1 %"},   // rounds to one decimal below 10 %
		{0.31, "+31 %"},      // whole percent from 10 %
		{-0.07, "-7.0 %"},    // ASCII minus, the same in every front end
		{-0.44, "-44 %"},     //
		{-0.00001, "-0.0 %"}, // a near miss keeps its sign
		{0, "+0.0 %"},        // pass at the limit
		{8.04, "+804 %"},     // below the ratio threshold
		{9, "×10"},           // ten times the need
		{16, "×17"},          // 17 times the need
		{49999, "×50000"},    // 100 dB against 0 dB-ish needs: 1e5/2
		{math.NaN(), "—"},    // no margin
		{math.Inf(1), "×∞"},  // unbounded
	}
	for _, tc := range tests {
		if got := Margin(tc.m); got != tc.want {
			t.Errorf("Margin(%g) = %q, want %q", tc.m, got, tc.want)
		}
	}
}

func TestCheckNameAndTemp(t *testing.T) {
	if got := CheckName("gain", filter.KeyOutputRange); got != "gain/output_range" {
		t.Errorf("CheckName = %q", got)
	}
	if got := CheckName("", filter.KeySupply); got != "supply" {
		t.Errorf("CheckName design-level = %q", got)
	}
	if got := Temp(-20); got != "-20 °C" {
		t.Errorf("Temp(-20) = %q, want \"-20 °C\"", got)
	}
}

// A part failing only on a hard filter has no margin to show and names
// the filter; one failing on a numeric check shows that check's miss, not
// the positive worst margin of its passing checks.
func TestFailingRows(t *testing.T) {
	pkg := &filter.Requirement{Key: filter.KeyPackage, Bound: filter.BoundHard, Allowed: []string{"soic8"}}
	slew := &filter.Requirement{Stage: "gain", Key: filter.KeySlew, Bound: filter.BoundMin}
	gbw := &filter.Requirement{Stage: "gain", Key: filter.KeyGBW, Bound: filter.BoundMin}
	onlyPkg := &filter.Result{Part: &catalog.Part{ID: "a"}, WorstMargin: 0.031, Binding: filter.Binding{Stage: "gain", Key: filter.KeyGBW}, Failed: 1,
		Checks: []filter.Check{
			{Req: gbw, Margin: 0.031, Pass: true, Status: filter.StatusPass},
			{Req: pkg, Margin: math.NaN(), Status: filter.StatusFail},
		}}
	if got := RowMargin(onlyPkg); got != None {
		t.Errorf("package-only failure: margin %q, want %q", got, None)
	}
	if got := RowBinding(onlyPkg, false); got != "fails: package not offered" {
		t.Errorf("package-only failure: binding %q", got)
	}
	both := &filter.Result{Part: &catalog.Part{ID: "b"}, WorstMargin: -0.44, Failed: 2,
		Checks: []filter.Check{
			{Req: gbw, Margin: 0.5, Pass: true, Status: filter.StatusPass},
			{Req: pkg, Margin: math.NaN(), Status: filter.StatusFail},
			{Req: slew, Margin: -0.44, Status: filter.StatusFail},
		}}
	if got := RowMargin(both); got != "-44 %" {
		t.Errorf("numeric failure: margin %q", got)
	}
	if got := RowBinding(both, false); got != "fails: gain/slew +1" {
		t.Errorf("numeric failure: binding %q", got)
	}
	order := FailingFirst(both)
	if order[0].Req != slew || order[1].Req != pkg || order[2].Req != gbw {
		t.Errorf("failing first: got %s, %s, %s", order[0].Req.Key, order[1].Req.Key, order[2].Req.Key)
	}
}

func TestWrap(t *testing.T) {
	got := Wrap("gain/slew needs ≥ 0.628 V/µs, has 0.35 V/µs", 20, "  ")
	want := []string{"gain/slew needs ≥", "  0.628 V/µs, has", "  0.35 V/µs"}
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("Wrap = %q, want %q", got, want)
	}
	for _, l := range Wrap(strings.Repeat("word ", 40), 17, "") {
		if Width(l) > 17 {
			t.Errorf("line %q wider than 17", l)
		}
	}
	if Wrap("   ", 10, "") != nil {
		t.Error("blank text gives lines")
	}
}

func TestFit(t *testing.T) {
	cols := []Column{{Width: 3}, {Width: 10, Drop: 1}, {Width: 20, Min: 8, Drop: 5}, {Width: 6, Drop: 2}}
	tests := []struct {
		width int
		want  []int
	}{
		{45, []int{3, 10, 20, 6}}, // 39 + 3 gaps = 42 fits
		{36, []int{3, 10, 14, 6}}, // the shortenable column gives 6
		{30, []int{3, 10, 8, 6}},  // down to its least
		{28, []int{3, 10, 0, 6}},  // then dropped (highest Drop), the rest fits
		{20, []int{3, 10, 0, 0}},  // next drop
		{2, []int{3, 0, 0, 0}},    // a column that never drops stays
	}
	for _, tc := range tests {
		if got := Fit(cols, tc.width, 1); !slices.Equal(got, tc.want) {
			t.Errorf("Fit(%d) = %v, want %v", tc.width, got, tc.want)
		}
	}
	flex := Fit([]Column{{Width: 4}, {Width: 5, Flex: true}}, 20, 1)
	if flex[1] != 15 {
		t.Errorf("flex column %d, want 15", flex[1])
	}
	// A growing column widens from what is left before the flex column.
	for _, tc := range []struct {
		width int
		want  []int
	}{
		{30, []int{8, 5, 15}}, // grows to 8, the flex takes the other 15
		{16, []int{8, 5, 1}},  // 4 left over: all to the growing column, the flex at its least
		{11, []int{5, 5, 0}},  // the flex dropped: the cell it leaves goes to the growing column
	} {
		got := Fit([]Column{{Width: 4, Grow: 8}, {Width: 5}, {Width: 1, Flex: true, Drop: 1}}, tc.width, 1)
		if !slices.Equal(got, tc.want) {
			t.Errorf("Fit with Grow at %d = %v, want %v", tc.width, got, tc.want)
		}
	}
}
