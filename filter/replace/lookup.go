package replace

import (
	"fmt"
	"sort"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// UnknownPartError is returned by Lookup for an id no part has. Suggestions
// holds the closest ids, nearest first (possibly none).
type UnknownPartError struct {
	ID          string
	Suggestions []string
}

// Error names the id, offers the suggestions and points at the command
// that lists every id: "no part with id "x" in the catalog; did you mean
// "y"? (opsift list shows every part id)".
func (e *UnknownPartError) Error() string {
	const hint = " (opsift list shows every part id)"
	msg := fmt.Sprintf("no part with id %q in the catalog", e.ID)
	switch len(e.Suggestions) {
	case 0:
		return msg + hint
	case 1:
		return msg + fmt.Sprintf("; did you mean %q?", e.Suggestions[0]) + hint
	}
	q := make([]string, len(e.Suggestions))
	for i, s := range e.Suggestions {
		q[i] = fmt.Sprintf("%q", s)
	}
	return msg + "; did you mean one of " + strings.Join(q, ", ") + "?" + hint
}

// maxSuggestions caps the ids an UnknownPartError offers.
const maxSuggestions = 3

// Lookup finds the part with the given id, or returns an
// *UnknownPartError with the nearest ids. Ids are compared exactly; the
// suggestions ignore case.
func Lookup(id string, parts []*catalog.Part) (*catalog.Part, error) {
	for _, p := range parts {
		if p != nil && p.ID == id {
			return p, nil
		}
	}
	return nil, &UnknownPartError{ID: id, Suggestions: suggest(id, parts)}
}

// suggest returns the ids within a small edit distance of id (a third of
// its length, at least 2), or that contain it or are contained in it,
// nearest first.
func suggest(id string, parts []*catalog.Part) []string {
	want := strings.ToLower(id)
	limit := max(2, len([]rune(want))/3)
	type hit struct {
		id   string
		dist int
	}
	var hits []hit
	for _, p := range parts {
		if p == nil {
			continue
		}
		got := strings.ToLower(p.ID)
		d := catalog.EditDistance(want, got)
		if d > limit && want != "" && (strings.Contains(got, want) || strings.Contains(want, got)) {
			d = limit // a substring match is as good as the furthest near miss
		}
		if d <= limit {
			hits = append(hits, hit{p.ID, d})
		}
	}
	sort.SliceStable(hits, func(i, j int) bool {
		if hits[i].dist != hits[j].dist {
			return hits[i].dist < hits[j].dist
		}
		return hits[i].id < hits[j].id
	})
	var out []string
	for _, h := range hits {
		if len(out) == maxSuggestions {
			break
		}
		out = append(out, h.id)
	}
	return out
}
