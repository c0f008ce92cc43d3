package filter_test

import (
	"testing"

	"github.com/opsift/opsift/filter"
)

// TestRankPositionMatchesRank takes each part out of a ranked demo
// catalog in turn and asks where it would go among the rest: the answer
// must be where Rank puts it among all of them, for every sort key.
func TestRankPositionMatchesRank(t *testing.T) {
	_, all := demoRanked(t, "vibration-monitor-5v.toml")
	for _, key := range filter.SortKeys() {
		rs := append([]filter.Result(nil), all...)
		filter.Rank(rs, key)
		for i := range rs {
			rest := append(append([]filter.Result(nil), rs[:i]...), rs[i+1:]...)
			if got := filter.RankPosition(rest, &rs[i], key, ""); got != i {
				t.Errorf("%s: %s would go to %d, Rank puts it at %d", key, rs[i].Part.ID, got, i)
			}
			// Asked among all results with itself skipped (an edit of the
			// part): the same place.
			r := rs[i]
			if got := filter.RankPosition(rs, &r, key, r.Part.ID); got != i {
				t.Errorf("%s: %s skipping itself would go to %d, want %d", key, r.Part.ID, got, i)
			}
		}
	}
}
