package tui

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/headroom"
	"github.com/opsift/opsift/filter/report"
)

// TestHeadroomLazy: the checks pane's headroom is searched in a tea.Cmd
// for the selected part only, shown as "searching…" until it arrives,
// equal to what filter/headroom finds, not searched again while the part
// and plan stay, searched anew for another part, a result for a part no
// longer selected is dropped, and a request overtaken within
// headroomDelay searches nothing.
func TestHeadroomLazy(t *testing.T) {
	m := newDemo(t, 120, 40)
	r := m.list.selected(m.rank.results)
	if r == nil || !r.Pass {
		t.Fatal("no passing part selected")
	}
	if !m.hr.ready || m.hr.partID != r.Part.ID {
		t.Fatalf("headroom of %s not in after the first ranking: %+v", r.Part.ID, m.hr)
	}
	want := headroom.Find(m.rank.resPlan.Design, m.rank.resPlan, r.Part, filter.Options{})
	if len(want) == 0 || len(m.hr.limits) != len(want) {
		t.Fatalf("%d limits, want %d", len(m.hr.limits), len(want))
	}
	text := strings.Join(m.checks.lines(r, 120), "\n")
	for _, l := range want {
		if !strings.Contains(text, l.Text()) {
			t.Errorf("checks pane lacks %q", l.Text())
		}
	}
	if m.requestHeadroom() != nil {
		t.Error("a second search for the same part and plan")
	}

	m.focus = paneList
	_, cmd := m.Update(keyMsg("down"))
	next := m.list.selected(m.rank.results)
	if next.Part.ID == r.Part.ID || m.hr.partID != next.Part.ID || m.hr.ready || cmd == nil {
		t.Fatalf("moving to %s: state %+v, cmd %v", next.Part.ID, m.hr, cmd != nil)
	}
	if text := strings.Join(m.checks.lines(next, 120), "\n"); !strings.Contains(text, "searching…") {
		t.Error("no searching line while the search runs")
	}
	// the old part's result arrives late: dropped
	m.Update(findHeadroom(m.rank.resPlan, r.Part, false))
	if m.hr.ready {
		t.Error("a stale headroom result was taken")
	}
	run(t, m, cmd)
	if !m.hr.ready || m.hr.partID != next.Part.ID {
		t.Errorf("headroom of %s not adopted: %+v", next.Part.ID, m.hr)
	}

	// Two moves in a burst: the first request, overtaken, searches nothing.
	_, first := m.Update(keyMsg("up"))
	_, second := m.Update(keyMsg("down"))
	if first == nil || second == nil {
		t.Fatal("a move started no headroom request")
	}
	if msg := first(); msg != nil {
		t.Errorf("an overtaken request searched: %T", msg)
	}
	run(t, m, second)
	if !m.hr.ready || m.hr.partID != next.Part.ID {
		t.Errorf("the newest request was not adopted: %+v", m.hr)
	}
}

// TestCompareView: "=" with 2–6 marked parts shows them side by side, the
// same cells as opsift compare (report.CompareCells of compare.Build on
// the same plan and parts); with one part it says what to do; the md
// export of the shortlist carries the same section.
func TestCompareView(t *testing.T) {
	m := newDemo(t, 200, 60)
	m.focus = paneList
	press(t, m, "space", "=")
	if m.detail == detailCompare || !strings.Contains(m.message, "mark 2 to 6 parts") {
		t.Fatalf("one mark: detail %d, message %q", m.detail, m.message)
	}
	press(t, m, "down", "space", "down", "space", "=")
	if m.detail != detailCompare || m.cmp.table == nil {
		t.Fatalf("three marks: detail %d, message %q", m.detail, m.message)
	}
	res := m.marks.results(m.rank.results)
	var parts []*catalog.Part
	for i := range res {
		parts = append(parts, res[i].Part)
	}
	tab, err := compare.Build(m.rank.resPlan, parts, filter.Options{})
	if err != nil {
		t.Fatal(err)
	}
	wantHead, wantLines := report.CompareCells(tab)
	gotHead, gotLines := report.CompareCells(m.cmp.table)
	if !slices.Equal(wantHead, gotHead) || len(wantLines) != len(gotLines) {
		t.Fatalf("view %v/%d lines, opsift compare %v/%d", gotHead, len(gotLines), wantHead, len(wantLines))
	}
	screen := m.View()
	for i, l := range wantLines {
		if !slices.Equal(l, gotLines[i]) {
			t.Errorf("line %d: view %v, compare %v", i, gotLines[i], l)
		}
		if i < 10 && !strings.Contains(screen, l[1]) {
			t.Errorf("screen lacks %q of %q", l[1], l[0])
		}
	}
	if !strings.Contains(screen, report.BestMark) {
		t.Error("no best mark on screen")
	}
	press(t, m, "=")
	if m.detail != detailChecks {
		t.Error("= did not go back to the checks")
	}

	press(t, m, "x")
	path := filepath.Join(t.TempDir(), "short.md")
	press(t, m, "ctrl+u")
	typeText(t, m, path)
	press(t, m, "enter")
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), "## Compared:") || !strings.Contains(string(b), "| check "+wantLines[3][0][len("check "):]) {
		t.Errorf("md export lacks the compare section:\n%s", b)
	}
}

// TestNarrowCell: a cell too wide for its column loses value text, never
// its best mark.
func TestNarrowCell(t *testing.T) {
	cases := []struct {
		cell string
		w    int
		want string
	}{
		{"4.09 MHz ◆", 12, "4.09 MHz ◆"},
		{"1.6 fA/√Hz ~ ◆", 10, "1.6 fA/… ◆"},
		{"1.6 fA/√Hz ~", 10, "1.6 fA/√Hz ~"}, // no mark: left to the column's own clipping
	}
	for _, c := range cases {
		got := strings.TrimRight(narrowCell(c.cell, c.w), " ")
		if got != c.want {
			t.Errorf("narrowCell(%q, %d) = %q, want %q", c.cell, c.w, got, c.want)
		}
	}
}
