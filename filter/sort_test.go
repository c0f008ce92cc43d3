package filter

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestSortParallel checks the parallel sort against slices.SortFunc on
// lengths around its split points.
func TestSortParallel(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for _, n := range []int{0, 1, sortMinParallel - 1, sortMinParallel, 3*sortMinParallel + 7, 100_003} {
		s := make([][2]int, n)
		for i := range s {
			s[i] = [2]int{r.IntN(50), i} // many equal first fields, total by the second
		}
		cmp := func(a, b [2]int) int {
			if a[0] != b[0] {
				return a[0] - b[0]
			}
			return a[1] - b[1]
		}
		want := slices.Clone(s)
		slices.SortFunc(want, cmp)
		sortParallel(s, cmp)
		if !slices.Equal(s, want) {
			t.Fatalf("n=%d: order differs from slices.SortFunc", n)
		}
	}
}

// ascNaNLast compares ascending with NaN after every number: the order
// ascCode must keep.
func ascNaNLast(a, b float64) int {
	an, bn := math.IsNaN(a), math.IsNaN(b)
	switch {
	case an && bn:
		return 0
	case an:
		return 1
	case bn:
		return -1
	}
	return cmp.Compare(a, b)
}

// TestAscCode checks ascCode's order against the float comparison on
// random and special values (IEEE 754 ordering; from memory).
func TestAscCode(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	vals := []float64{0, math.Copysign(0, -1), 1, -1, math.Inf(1), math.Inf(-1), math.NaN(), math.SmallestNonzeroFloat64,
		-math.SmallestNonzeroFloat64, math.MaxFloat64, -math.MaxFloat64, 1e-9, -1e-9}
	for range 2000 {
		vals = append(vals, (r.Float64()-0.5)*math.Pow(10, float64(r.IntN(40)-20)))
	}
	for _, a := range vals {
		for _, b := range vals[:60] {
			if got, want := cmp.Compare(ascCode(a), ascCode(b)), ascNaNLast(a, b); got != want {
				t.Fatalf("ascCode order of %v, %v is %d, want %d", a, b, got, want)
			}
		}
	}
}
