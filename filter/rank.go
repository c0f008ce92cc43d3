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
		r := &results[i]
		k := rankKey{pass: r.Pass, failed: r.Failed, worst: -r.WorstMargin, cost: r.Cost, id: r.Part.ID, idx: i}
		if r.Pass {
			switch key {
			case SortCost:
				k.primary = r.Cost
			case SortSupplyCurrent:
				k.primary = r.SupplyCurrent
			case SortFMax:
				k.primary = -r.MinFMax()
			}
		}
		keys[i] = k
	}
	sortParallel(keys, func(a, b rankKey) int {
		if a.pass != b.pass {
			if a.pass {
				return -1
			}
			return 1
		}
		if c := cmp.Compare(a.failed, b.failed); c != 0 {
			return c
		}
		if key == SortID && a.pass {
			if c := strings.Compare(a.id, b.id); c != 0 {
				return c
			}
		}
		if c := ascNaNLast(a.primary, b.primary); c != 0 {
			return c
		}
		if c := ascNaNLast(a.worst, b.worst); c != 0 {
			return c
		}
		if c := ascNaNLast(a.cost, b.cost); c != 0 {
			return c
		}
		if c := strings.Compare(a.id, b.id); c != 0 {
			return c
		}
		return cmp.Compare(a.idx, b.idx)
	})
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

// rankKey is what Rank compares, computed once per result.
type rankKey struct {
	pass    bool
	failed  int     // failing checks (0 for passing results)
	primary float64 // the sort key's figure, ascending (negated for largest-first)
	worst   float64 // −worst margin
	cost    float64
	id      string
	idx     int
}

// ascNaNLast compares ascending with NaN after every number.
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

// sortMinParallel is the length from which sortParallel splits the work.
const sortMinParallel = 8192

// sortParallel sorts s by cmp, which must be a total order (no two
// elements compare equal), so the result is the one slices.SortFunc gives.
// A long slice is cut into one run per CPU, the runs sorted at once and
// merged pairwise.
func sortParallel[T any](s []T, cmp func(a, b T) int) {
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
	buf := make([]T, len(s))
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
