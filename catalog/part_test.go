package catalog

import (
	"math"
	"testing"
)

// TestOpt checks the compact optional number: the zero Opt is unset, and
// Some keeps every float64 bit for bit (IEEE 754 special values included:
// −0, ±Inf, NaN), including the one pattern the unset form uses.
func TestOpt(t *testing.T) {
	if (Opt{}).Known() || (Opt{}).V() != 0 {
		t.Fatalf("zero Opt: Known %v, V %v; want unset, 0", (Opt{}).Known(), (Opt{}).V())
	}
	for _, v := range []float64{0, math.Copysign(0, -1), 1, -40, 1e-15, 3.3e6,
		math.MaxFloat64, math.SmallestNonzeroFloat64, math.Inf(1), math.Inf(-1)} {
		o := Some(v)
		if !o.Known() || math.Float64bits(o.V()) != math.Float64bits(v) {
			t.Errorf("Some(%g): Known %v, V %g (bits %x); want %x", v, o.Known(), o.V(), math.Float64bits(o.V()), math.Float64bits(v))
		}
	}
	for _, v := range []float64{math.NaN(), math.Float64frombits(unsetBits)} {
		if o := Some(v); !o.Known() || !math.IsNaN(o.V()) {
			t.Errorf("Some(NaN %x): Known %v, V %g; want a known NaN", math.Float64bits(v), o.Known(), o.V())
		}
	}
	if got := Some(2.5).String() + " " + (Opt{}).String(); got != "2.5 unset" {
		t.Errorf("String: %q", got)
	}
}
