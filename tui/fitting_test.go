package tui

import (
	"fmt"
	"regexp"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/report"
)

// gluedMark is a basis mark (~ typical, g graph, report.BasisMark) right
// after a unit, which reads as part of it: "27.5 kHzg", "104 kHz~", "-35 %g".
var gluedMark = regexp.MustCompile(`(Hz|%|dB|V|A|/K|µs)[~g]( |$)`)

// TestBasisMarkSeparated: wherever the selector shows figures with a basis
// mark — the candidate list (margin and fmax), the explorer, replacement
// mode — the mark stands apart from the unit, at 120×40 and 80×24, and
// the marks are still there.
func TestBasisMarkSeparated(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		t.Run(fmt.Sprintf("%dx%d", sz[0], sz[1]), func(t *testing.T) {
			m := newDemo(t, sz[0], sz[1])
			press(t, m, "f", "tab") // failing parts in the list
			var screens []string
			for i := 0; i < len(m.rank.results); i += max(1, m.listRows()) {
				screens = append(screens, m.View())
				press(t, m, "pgdown")
			}
			press(t, m, "E")
			screens = append(screens, m.View())
			press(t, m, "esc")
			selectID(t, m, obsoleteQuad)
			press(t, m, "R")
			screens = append(screens, m.View())
			all := strings.Join(screens, "\n")
			for _, l := range lines(all) {
				if gluedMark.MatchString(l) {
					t.Errorf("a basis mark glued to its unit: %q", l)
				}
			}
			for _, want := range []string{" kHz g", " % ~", " kHz ~"} {
				if !strings.Contains(all, want) {
					t.Errorf("no %q on any screen: the marks went missing", want)
				}
			}
		})
	}
}

// TestFitID: an id too long for its cells is cut in the middle, keeping
// its head and its longer tail, to exactly the width asked.
func TestFitID(t *testing.T) {
	for _, tc := range []struct {
		id   string
		w    int
		want string
	}{
		{"gp4-bip", 11, "gp4-bip    "},
		{"lownoise-dual-rev-a", 19, "lownoise-dual-rev-a"},
		{"lownoise-dual-rev-a", 16, "lownois…al-rev-a"},
		{"lownoise-dual-rev-b", 16, "lownois…al-rev-b"},
		{"lownoise-dual-rev-a", 11, "lowno…rev-a"},
		{"abcdefgh", 4, "abc…"}, // too narrow to keep both ends
	} {
		if got := fitID(tc.id, tc.w); got != tc.want {
			t.Errorf("fitID(%q, %d) = %q, want %q", tc.id, tc.w, got, tc.want)
		}
	}
}

// TestLongIDsStayDistinct: two parts whose ids differ only in their last
// letter, longer than the id column's least width, read apart in the
// candidate list, the explorer and replacement mode at 80×24, and whole
// in the list at 120×40, where the id column grows into the name's room.
func TestLongIDsStayDistinct(t *testing.T) {
	ids := []string{"lownoise-dual-rev-a", "lownoise-dual-rev-b"}
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		t.Run(fmt.Sprintf("%dx%d", sz[0], sz[1]), func(t *testing.T) {
			c := demoCatalog(t)
			for i, id := range ids {
				p := *c.Parts[i]
				p.ID = id
				c.Parts[i] = &p
			}
			m := New(Config{Design: demoDesign(t), Catalog: c, Renderer: asciiRenderer()})
			m.Update(tea.WindowSizeMsg{Width: sz[0], Height: sz[1]})
			run(t, m, m.Init())
			press(t, m, "f", "tab", "/")
			press(t, m, strings.Split("lownoise", "")...)
			press(t, m, "enter")
			screens := map[string]string{"list": m.View()}
			press(t, m, "E", "/")
			press(t, m, strings.Split("lownoise", "")...)
			press(t, m, "enter")
			screens["explorer"] = m.View()
			press(t, m, "esc", "esc", "esc")
			selectID(t, m, obsoleteQuad)
			press(t, m, "R")
			screens["replace"] = m.View()
			for name, screen := range screens {
				if name == "replace" && !strings.Contains(screen, "lownois") {
					continue // neither is a replacement for the quad
				}
				shown := map[string]bool{}
				for _, w := range strings.Fields(screen) {
					if strings.HasPrefix(w, "lownois") && w != "lownoise" { // not the find text
						shown[w] = true
					}
				}
				if len(shown) != 2 {
					t.Errorf("%s: the two ids show as %v, want two different cells:\n%s", name, shown, screen)
				}
				if sz[0] == 120 && name == "list" && (!shown[ids[0]] || !shown[ids[1]]) {
					t.Errorf("list at 120 columns: ids cut (%v), want them whole", shown)
				}
			}
		})
	}
}

// TestTooSmallWraps: below the least size the screen asks for a bigger
// terminal in words wrapped to its width — whole, with both sizes — and
// still fills exactly the screen.
func TestTooSmallWraps(t *testing.T) {
	for _, sz := range [][2]int{{40, 12}, {59, 30}, {20, 6}, {120, 10}} {
		m := newDemo(t, sz[0], sz[1])
		screen := m.View()
		ls := lines(screen)
		if len(ls) != sz[1] {
			t.Errorf("%v: %d lines", sz, len(ls))
		}
		for _, l := range ls {
			if w := ansi.StringWidth(l); w != sz[0] {
				t.Errorf("%v: a line of %d cells: %q", sz, w, l)
			}
		}
		want := fmt.Sprintf("terminal %d×%d is too small: opsift needs at least %d×%d (q quits)", sz[0], sz[1], minWidth, minHeight)
		if got := strings.Join(strings.Fields(screen), " "); got != want {
			t.Errorf("%v: says %q, want %q", sz, got, want)
		}
	}
}

// TestRangesReadable: the figures that decide a range check are shown
// whole in the checks pane at 120×40 and 80×24 — on the demo's gain stage
// the output must cover ref ± G·Vp = 0 ± 6.2·450 mV = ±2.79 V (by hand),
// and the part's window is the check's own — and the design pane's
// longest label ("supply current budget") is not cut at 120×40, where
// the pane is 36 cells wide.
func TestRangesReadable(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		t.Run(fmt.Sprintf("%dx%d", sz[0], sz[1]), func(t *testing.T) {
			m := newDemo(t, sz[0], sz[1])
			r := m.list.selected(m.rank.results)
			var c *filter.Check
			for i := range r.Checks {
				if r.Checks[i].Req.Stage == "gain" && r.Checks[i].Req.Key == filter.KeyOutputRange {
					c = &r.Checks[i]
				}
			}
			if c == nil {
				t.Fatal("no gain/output_range check")
			}
			avail := catalog.Format(c.AvailLow, catalog.Volt) + "…" + catalog.Format(c.AvailHigh, catalog.Volt)
			avail = strings.Replace(avail, " V…", "…", 1) // the shared unit written once
			press(t, m, "tab", "tab")
			var screen string
			for i := 0; i < 6 && !strings.Contains(screen, "output_range"); i++ {
				screen = m.View()
				press(t, m, "pgdown")
			}
			lineWith(t, screen, "output_range", "-2.79…2.79 V", avail)
			if sz[0] == 120 {
				m = newDemo(t, sz[0], sz[1])
				var left []string
				for _, l := range lines(m.View()) {
					if d, _, ok := strings.Cut(l, "│"); ok {
						left = append(left, strings.TrimSpace(d))
					}
				}
				design := strings.Join(left, "\n")
				if !strings.Contains(design, "supply current    —\nbudget") {
					t.Errorf("design pane does not show the whole supply current budget label:\n%s", design)
				}
			}
		})
	}
}

// TestStatusMessageWhole: at 80×24 a status message too long for the room
// beside the counts and the caution wraps onto a second line, so its end
// (the useful half: what to do) shows; the screen still fills exactly
// 80×24 and the caution stays; a short message keeps one line.
func TestStatusMessageWhole(t *testing.T) {
	m := newDemo(t, 80, 24)
	press(t, m, "x") // nothing marked
	want := "mark parts with space first; x exports the marked ones"
	if m.message != want {
		t.Fatalf("message %q, want %q", m.message, want)
	}
	ls := lines(m.View())
	if len(ls) != 24 {
		t.Fatalf("%d lines", len(ls))
	}
	for _, l := range ls {
		if w := ansi.StringWidth(l); w != 80 {
			t.Errorf("a line of %d cells: %q", w, l)
		}
	}
	foot := len(m.footLines())
	status := ls[len(ls)-foot-2 : len(ls)-foot]
	got := strings.Join(strings.Fields(strings.Join(status, " ")), " ")
	if !strings.Contains(got, cautionStatusShort) {
		t.Errorf("status lines %q lack the caution", status)
	}
	got = strings.Replace(got, cautionStatusShort+" ", "", 1) // it sits at the first line's end
	if !strings.Contains(got, want) || !strings.Contains(got, "4 of 52 parts pass") {
		t.Errorf("status lines %q lack the whole message, the counts or the caution", status)
	}
	press(t, m, "s")
	if n := len(m.statusLines(80)); n != 1 {
		t.Errorf("short message %q takes %d status lines, want 1", m.message, n)
	}
}

// TestSpaceInDesignPane: with the design pane focused, j/k move the design
// field, so space and m mark nothing (pressing "space j space j" used to
// toggle one list part on and off) and the status line says where marking
// works; from the list, space marks the selected candidate.
func TestSpaceInDesignPane(t *testing.T) {
	m := newDemo(t, 120, 40)
	if m.focus != paneDesign {
		t.Fatalf("precondition: focus %v, want the design pane", m.focus)
	}
	field := m.form.cursor
	press(t, m, "space", "j", "m", "j")
	if m.marks.len() != 0 {
		t.Errorf("space in the design pane marked %d parts", m.marks.len())
	}
	if m.form.cursor != field+2 || !strings.Contains(m.message, "space marks the selected candidate from the list") {
		t.Errorf("design cursor %d (want %d), message %q", m.form.cursor, field+2, m.message)
	}
	press(t, m, "tab", "space")
	if id := m.list.selected(m.rank.results).Part.ID; m.marks.len() != 1 || !m.marks.has(id) {
		t.Errorf("space in the list: %d marked, want %s", m.marks.len(), id)
	}
}

// TestSortSaysPassingOnly: with failing parts shown, a sort orders the
// passing parts and the failing ones follow by fewest failing checks
// (filter.Rank); the list heading and the status line say so, at 80×24
// too, so a sort that seems to leave the failing parts alone is explained.
func TestSortSaysPassingOnly(t *testing.T) {
	m := newDemo(t, 80, 24)
	press(t, m, "f", "s")
	if m.narrow.sortKey() != filter.SortCost {
		t.Fatalf("sort %s, want cost", m.narrow.sortKey())
	}
	screen := m.View()
	lineWith(t, screen, "sort cost", "+failing by fewest misses")
	if !strings.Contains(m.message, "the passing parts; failing ones follow, fewest failing checks first") {
		t.Errorf("message %q does not say the sort orders the passing parts", m.message)
	}
	prevCost, prevFails, failing := -1.0, 0, false
	for _, i := range m.list.view {
		r := &m.rank.results[i]
		switch {
		case r.Pass && failing:
			t.Fatalf("passing %s after a failing part", r.Part.ID)
		case r.Pass:
			if r.Cost < prevCost {
				t.Errorf("passing %s costs %g, below the one before it (%g)", r.Part.ID, r.Cost, prevCost)
			}
			prevCost = r.Cost
		default:
			failing = true
			if r.Failed < prevFails {
				t.Errorf("failing %s misses %d checks, fewer than the one before it (%d)", r.Part.ID, r.Failed, prevFails)
			}
			prevFails = r.Failed
		}
	}
}

// TestCompareSixAt80: six marked parts side by side at 80×24 show as many
// part columns as fit whole — no cell cut — and ←/→ bring the others in,
// so every part's every cell (report.CompareCells, what opsift compare
// prints) can be read; the pane heading says which parts show.
func TestCompareSixAt80(t *testing.T) {
	m := newDemo(t, 80, 24)
	press(t, m, "f", "tab")
	for i := 0; i < 6; i++ {
		press(t, m, "space", "down")
	}
	press(t, m, "=")
	if m.detail != detailCompare || m.cmp.table == nil || len(m.cmp.table.Results) != 6 {
		t.Fatalf("= with six marks: detail %v, message %q", m.detail, m.message)
	}
	head, rows := report.CompareCells(m.cmp.table)
	seen := map[int]bool{}
	for step := 0; step < 8; step++ {
		screen := m.View()
		for _, l := range lines(screen) {
			if w := ansi.StringWidth(l); w != 80 {
				t.Fatalf("a line of %d cells: %q", w, l)
			}
		}
		ls := lines(screen)
		ids := ""
		for i, l := range ls {
			if strings.Contains(l, "COMPARE") && i+1 < len(ls) {
				ids = ls[i+1] // the part ids over their columns
			}
		}
		for j, id := range head[1:] {
			if !strings.Contains(ids+" ", " "+id+" ") {
				continue
			}
			seen[j] = true
			// Each shown part's cells of the rows on screen appear whole.
			for _, r := range rows[:4] {
				if !strings.Contains(screen, r[1+j]) {
					t.Errorf("part %s: cell %q of %q not shown whole:\n%s", id, r[1+j], r[0], screen)
				}
			}
		}
		if strings.Contains(screen, "…") && !strings.Contains(lineWith(t, screen, "COMPARE"), "of 6 (←/→)") {
			t.Errorf("cut cells without a scroll:\n%s", screen)
		}
		press(t, m, "right")
	}
	if len(seen) != 6 {
		t.Errorf("←/→ reached %d of the 6 parts", len(seen))
	}
	lineWith(t, m.View(), "COMPARE", "of 6 (←/→)")
	for i := 0; i < 8; i++ {
		press(t, m, "left")
	}
	if m.cmp.colOff != 0 {
		t.Errorf("← back to the start: column offset %d", m.cmp.colOff)
	}
}
