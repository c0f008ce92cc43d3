package filter

import (
	"cmp"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strings"
	"sync"
)

// SortKey orders ranked results. Passing candidates always come first.
type SortKey string

// The sort keys.
const (
	SortMargin        SortKey = "margin"         // worst margin, largest first; ties by cost (default)
	SortCost          SortKey = "cost"           // cost of the packages used, cheapest first
	SortSupplyCurrent SortKey = "supply_current" // supply current, lowest first
	SortFMax          SortKey = "fmax"           // smallest stage fmax, highest first
	SortID            SortKey = "id"             // part id
)

// SortKeys lists the sort keys in help order.
func SortKeys() []SortKey {
	return []SortKey{SortMargin, SortCost, SortSupplyCurrent, SortFMax, SortID}
}

// ParseSortKey reads a sort key; "" is SortMargin.
func ParseSortKey(s string) (SortKey, error) {
	if s == "" {
		return SortMargin, nil
	}
	var names []string
	for _, k := range SortKeys() {
		if string(k) == s {
			return k, nil
		}
		names = append(names, string(k))
	}
	return "", fmt.Errorf("unknown sort key %q, want one of %s", s, strings.Join(names, ", "))
}

// Rank sorts results in place: passing candidates first, ordered by key;
// then failing ones by fewest failing checks, then by worst margin (the
// nearest miss first). Ties fall back to worst margin, cost, then part id
// and input order, so the order is total and stable across runs. An
// unknown figure (NaN) sorts last within its group. The sort runs on small
// precomputed keys and moves each Result once.
func Rank(results []Result, key SortKey) {
	keys := make([]rankKey, len(results))
	for i := range results {
		keys[i] = newRankKey(&results[i], i, key)
	}
	sortParallel(keys, rankOrder(key))
	// Apply the permutation in place, cycle by cycle: each Result moves
	// once and no second array is allocated.
	for i := range keys {
		if keys[i].idx == i || keys[i].idx < 0 {
			continue
		}
		tmp := results[i]
		j := i
		for {
			src := keys[j].idx
			keys[j].idx = -1
			if src == i {
				results[j] = tmp
				break
			}
			results[j] = results[src]
			j = src
		}
	}
}

// rankKey is what Rank compares, computed once per result. The figures
// are held as ascending uint64 codes (see ascCode), so most comparisons
// are of integers.
type rankKey struct {
	group   uint64 // 0 passing, else 1<<32 + failing checks
	primary uint64 // the sort key's figure (negated for largest-first)
	worst   uint64 // −worst margin
	cost    uint64
	id      string
	idx     int
}

// newRankKey is the key of result r at index i for sort key key.
func newRankKey(r *Result, i int, key SortKey) rankKey {
	k := rankKey{group: 1<<32 + uint64(r.Failed), worst: ascCode(-r.WorstMargin), cost: ascCode(r.Cost),
		primary: ascCode(0), id: r.Part.ID, idx: i}
	if r.Pass {
		k.group = 0
		switch key {
		case SortCost:
			k.primary = ascCode(r.Cost)
		case SortSupplyCurrent:
			k.primary = ascCode(r.SupplyCurrent)
		case SortFMax:
			k.primary = ascCode(-r.MinFMax())
		}
	}
	return k
}

// rankOrder is the comparison of rank keys for sort key key: a total
// order (the input index settles every tie).
func rankOrder(key SortKey) func(a, b rankKey) int {
	return func(a, b rankKey) int {
		if c := cmp.Compare(a.group, b.group); c != 0 {
			return c
		}
		if key == SortID && a.group == 0 {
			if c := strings.Compare(a.id, b.id); c != 0 {
				return c
			}
		}
		if c := cmp.Compare(a.primary, b.primary); c != 0 {
			return c
		}
		if c := cmp.Compare(a.worst, b.worst); c != 0 {
			return c
		}
		if c := cmp.Compare(a.cost, b.cost); c != 0 {
			return c
		}
		if c := strings.Compare(a.id, b.id); c != 0 {
			return c
		}
		return cmp.Compare(a.idx, b.idx)
	}
}

// ascCode maps a float64 to a uint64 whose order is the numbers' order
// with NaN after every number: −0 and +0 map alike, and every NaN after +Inf.
func ascCode(f float64) uint64 {
	switch {
	case math.IsNaN(f):
		return math.MaxUint64
	case f == 0:
		f = 0 // −0 counts as +0
	}
	b := math.Float64bits(f)
	if b>>63 == 1 {
		return ^b
	}
	return b | 1<<63
}

// sortMinParallel is the length from which sortParallel splits the work.
const sortMinParallel = 8192

// sortParallel sorts s by cmp, which must be a total order (no two
// elements compare equal), so the result is the one slices.SortFunc gives.
// A long slice is cut into one run per CPU, the runs sorted at once and
// merged pairwise.
func sortParallel[T any](s []T, cmp func(a, b T) int) { sortParallelIn(s, nil, cmp) }

// sortParallelIn is sortParallel merging through buf when it is long
// enough (else through a slice of its own).
func sortParallelIn[T any](s, buf []T, cmp func(a, b T) int) {
	procs := runtime.GOMAXPROCS(0)
	if len(s) < sortMinParallel || procs < 2 {
		slices.SortFunc(s, cmp)
		return
	}
	runs := min(procs, len(s)/(sortMinParallel/2))
	bounds := make([]int, runs+1)
	for i := range bounds {
		bounds[i] = i * len(s) / runs
	}
	var wg sync.WaitGroup
	for i := range runs {
		wg.Go(func() { slices.SortFunc(s[bounds[i]:bounds[i+1]], cmp) })
	}
	wg.Wait()
	if len(buf) < len(s) {
		buf = make([]T, len(s))
	}
	for width := 1; width < runs; width *= 2 {
		for i := 0; i+width < runs; i += 2 * width {
			lo, mid, hi := bounds[i], bounds[i+width], bounds[min(i+2*width, runs)]
			wg.Go(func() { merge(buf[lo:hi], s[lo:mid], s[mid:hi], cmp); copy(s[lo:hi], buf[lo:hi]) })
		}
		wg.Wait()
	}
}

// merge merges the sorted a and b into out (len(a)+len(b) long).
func merge[T any](out, a, b []T, cmp func(a, b T) int) {
	i, j, k := 0, 0, 0
	for i < len(a) && j < len(b) {
		if cmp(b[j], a[i]) < 0 {
			out[k] = b[j]
			j++
		} else {
			out[k] = a[i]
			i++
		}
		k++
	}
	k += copy(out[k:], a[i:])
	copy(out[k:], b[j:])
}
