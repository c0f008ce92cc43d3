package filter

import (
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
