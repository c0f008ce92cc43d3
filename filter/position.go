package filter

import "sort"

// RankPosition is the 0-based place result r would take among results,
// which are in Rank order for key, were it ranked with them: ahead of
// every result it beats and after those it ties with. A result whose part
// has the id skip is left out of the count (the part r is an edit of).
// It runs in O(log n) comparisons plus one pass when skip is given, so a
// front end can ask it on every keystroke.
func RankPosition(results []Result, r *Result, key SortKey, skip string) int {
	order := rankOrder(key)
	rk := newRankKey(r, len(results), key)
	n := sort.Search(len(results), func(i int) bool {
		return order(newRankKey(&results[i], i, key), rk) > 0
	})
	if skip != "" {
		for i := 0; i < n; i++ {
			if results[i].Part != nil && results[i].Part.ID == skip {
				n--
				break
			}
		}
	}
	return n
}
