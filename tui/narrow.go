package tui

import (
	"slices"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// narrowing is what the user has asked the candidate list to show. None of
// it changes the evaluation: it picks and orders rows of the results.
type narrowing struct {
	failing   bool   // show failing parts after the passing ones
	shortlist bool   // show only the marked parts (failing or not)
	sortIdx   int    // index into filter.SortKeys()
	find      string // text filter on id, name and notes, as typed
	tech      string // quick filter; "" any
	pkg       string // quick filter; "" any
}

// sortKey is the sort key in force.
func (n *narrowing) sortKey() filter.SortKey { return filter.SortKeys()[n.sortIdx] }

// cycleSort moves to the next sort key.
func (n *narrowing) cycleSort() { n.sortIdx = (n.sortIdx + 1) % len(filter.SortKeys()) }

// cycle returns the value after cur in values, going "" → first → … → last → "".
func cycle(cur string, values []string) string {
	i := slices.Index(values, cur)
	if i+1 >= len(values) {
		return ""
	}
	return values[i+1]
}

// keepValid drops a quick filter whose value a reloaded catalog no longer has.
func (n *narrowing) keepValid(techs, pkgs []string) {
	if n.tech != "" && !slices.Contains(techs, n.tech) {
		n.tech = ""
	}
	if n.pkg != "" && !slices.Contains(pkgs, n.pkg) {
		n.pkg = ""
	}
}

// active reports whether anything beyond the default view is asked for.
func (n *narrowing) active() bool {
	return n.shortlist || n.find != "" || n.tech != "" || n.pkg != ""
}

// clear drops the text and quick filters and the shortlist view.
func (n *narrowing) clear() { n.shortlist, n.find, n.tech, n.pkg = false, "", "", "" }

// catalogValues lists the technologies and packages present in parts, sorted.
func catalogValues(parts []*catalog.Part) (techs, pkgs []string) {
	ts, ps := map[string]bool{}, map[string]bool{}
	for _, p := range parts {
		if p.Tech != "" {
			ts[string(p.Tech)] = true
		}
		for _, k := range p.Packages {
			ps[k] = true
		}
	}
	for t := range ts {
		techs = append(techs, t)
	}
	for k := range ps {
		pkgs = append(pkgs, k)
	}
	slices.Sort(techs)
	slices.Sort(pkgs)
	return techs, pkgs
}

// searchText is what the text filter matches a part against, lower-cased.
func searchText(p *catalog.Part) string {
	return strings.ToLower(p.ID + "\x00" + p.Name + "\x00" + p.Notes)
}

// rows returns the indices of the results the narrowing lets through, in
// rank order, reusing buf. search holds each part's searchText.
func (n *narrowing) rows(results []filter.Result, marks *shortlist, search map[*catalog.Part]string, buf []int) []int {
	find := strings.ToLower(strings.TrimSpace(n.find))
	rows := buf[:0]
	for i := range results {
		r := &results[i]
		p := r.Part
		switch {
		case n.shortlist && !marks.has(p.ID):
			continue
		case !n.shortlist && !n.failing && !r.Pass:
			continue
		case n.tech != "" && string(p.Tech) != n.tech:
			continue
		case n.pkg != "" && !p.HasPackage(n.pkg):
			continue
		case find != "" && !strings.Contains(search[p], find):
			continue
		}
		rows = append(rows, i)
	}
	return rows
}

// applyNarrowing rebuilds the list's rows from the results and keeps the
// selection on the same part (by id) when it is still shown.
func (m *Model) applyNarrowing() {
	rows := m.narrow.rows(m.rank.results, &m.marks, m.cat.search, m.list.view)
	if id := m.list.setRows(rows, m.rank.results, m.listRows()); id != "" {
		m.setMessage("%s", m.droppedNote(id))
	}
}

// droppedNote says why the selected part is no longer listed and how to
// see it again; the cursor goes back to it when it is.
func (m *Model) droppedNote(id string) string {
	for i := range m.rank.results {
		r := &m.rank.results[i]
		if r.Part.ID != id {
			continue
		}
		if m.narrow.shortlist {
			return id + " is not on the shortlist (l shows every part)"
		}
		if !r.Pass && !m.narrow.failing {
			return id + " no longer passes and left the list (f shows it with what it misses)"
		}
		return id + " is hidden by the filters (c clears them)"
	}
	return id + " is no longer in the catalog"
}
