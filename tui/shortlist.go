package tui

import "github.com/opsift/opsift/filter"

// shortlist is the set of parts the user marked, by id, so marks survive
// re-ranking and catalog reloads.
type shortlist struct {
	ids map[string]bool
}

func newShortlist() shortlist { return shortlist{ids: map[string]bool{}} }

// has reports whether the part id is marked.
func (s *shortlist) has(id string) bool { return s.ids[id] }

// toggle marks or unmarks id and reports whether it is marked now.
func (s *shortlist) toggle(id string) bool {
	if s.ids[id] {
		delete(s.ids, id)
		return false
	}
	s.ids[id] = true
	return true
}

// len is the number of marked parts.
func (s *shortlist) len() int { return len(s.ids) }

// results returns the marked parts' results in rank order (a copy, so an
// export is not touched by the next ranking).
func (s *shortlist) results(all []filter.Result) []filter.Result {
	var out []filter.Result
	for i := range all {
		if s.ids[all[i].Part.ID] {
			out = append(out, all[i])
		}
	}
	return out
}

// prune drops marks of parts a reloaded catalog no longer has and returns
// how many were dropped.
func (s *shortlist) prune(exists func(id string) bool) int {
	n := 0
	for id := range s.ids {
		if !exists(id) {
			delete(s.ids, id)
			n++
		}
	}
	return n
}
