package filter_test

import (
	"math"
	"slices"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

func TestRankOrders(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "follower"`+"\n"+`ref = "0 V"`+"\n"+`signal = { peak = "5 V", freq = "20 kHz" }`))
	// Slew need 0.628 V/µs and binds below the output range's +33 %:
	// a +11 %, b and c +27 % (c dearer), d fails by 20 %, e fails twice.
	mk := func(id string, sr, cost, iq float64) *catalog.Part {
		x := basePart(id)
		x.Slew = catalog.Spec{Min: opt(sr)}
		x.UnitCost = opt(cost)
		x.Iq = catalog.Spec{Max: opt(iq)}
		return x
	}
	e := mk("e", 0.3e6, 0.1, 1e-3)
	e.Supply.Max = opt(20)
	parts := []*catalog.Part{
		mk("d", 0.5e6, 0.2, 1e-3), mk("c", 0.8e6, 3, 1e-3), e, mk("a", 0.7e6, 2, 2e-3), mk("b", 0.8e6, 1, 3e-3),
	}
	tests := []struct {
		key  filter.SortKey
		want []string
	}{
		{filter.SortMargin, []string{"b", "c", "a", "d", "e"}},
		{filter.SortCost, []string{"b", "a", "c", "d", "e"}},
		{filter.SortSupplyCurrent, []string{"c", "a", "b", "d", "e"}},
		{filter.SortFMax, []string{"b", "c", "a", "d", "e"}},
		{filter.SortID, []string{"a", "b", "c", "d", "e"}},
	}
	for _, tc := range tests {
		t.Run(string(tc.key), func(t *testing.T) {
			rs := filter.Evaluate(p, parts, filter.Options{})
			filter.Rank(rs, tc.key)
			var got []string
			for _, r := range rs {
				got = append(got, r.Part.ID)
			}
			if !slices.Equal(got, tc.want) {
				t.Errorf("order = %v, want %v", got, tc.want)
			}
		})
	}
}

func TestParseSortKey(t *testing.T) {
	for _, k := range filter.SortKeys() {
		if got, err := filter.ParseSortKey(string(k)); err != nil || got != k {
			t.Errorf("ParseSortKey(%q) = %q, %v", k, got, err)
		}
	}
	if _, err := filter.ParseSortKey("speed"); err == nil {
		t.Error("ParseSortKey(speed): no error")
	}
}

// The worst margin is the smallest margin over all checks and names its check.
func TestWorstMarginAndBinding(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "noninverting"`+"\ngain = 10\n"+`ref = "0 V"`+"\n"+`signal = { peak = "0.5 V", freq = "20 kHz" }`))
	part := basePart("x")
	part.GBW = catalog.Spec{Min: opt(1.6e6)}
	r := evalOne(t, p, part, filter.Options{})
	m := math.Inf(1)
	var bind filter.Binding
	for _, c := range r.Checks {
		if c.HasMargin() && c.Margin < m {
			m, bind = c.Margin, filter.Binding{Stage: c.Req.Stage, Key: c.Req.Key}
		}
	}
	if r.WorstMargin != m || r.Binding != bind {
		t.Errorf("worst = %g %v, want %g %v", r.WorstMargin, r.Binding, m, bind)
	}
	if bind.Key != filter.KeyGBW {
		t.Errorf("binding %v, want gbw (1.6 MHz against 1.40 MHz is the tightest)", bind)
	}
}
