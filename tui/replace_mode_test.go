package tui

import (
	"fmt"
	"strings"
	"testing"

	"github.com/charmbracelet/x/ansi"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/replace"
)

// obsoleteQuad is the demo's obsolete slow bipolar quad: the part the
// replacement finder exists for.
const obsoleteQuad = "gp4-bip-old"

// openReplaceOn shows failing parts, selects id and opens replacement
// mode with R.
func openReplaceOn(t *testing.T, m *Model, id string) {
	t.Helper()
	press(t, m, "f")
	selectID(t, m, id)
	press(t, m, "R")
	if m.mode != modeReplace {
		t.Fatalf("R did not open replacement mode (mode %d, message %q)", m.mode, m.message)
	}
}

// lineWith returns the first line of screen holding every one of subs.
func lineWith(t *testing.T, screen string, subs ...string) string {
	t.Helper()
	for _, l := range lines(screen) {
		ok := true
		for _, s := range subs {
			ok = ok && strings.Contains(l, s)
		}
		if ok {
			return l
		}
	}
	t.Fatalf("no line holds %q:\n%s", subs, screen)
	return ""
}

// TestReplaceModeFlow opens replacement mode on the obsolete bipolar quad,
// moves to the second candidate, marks it into the shortlist and goes back.
// The trade fact (common practice, no source): the CMOS quad in the same
// footprint is a drop-in, faster (≥ 5× slew), but its maximum supply is
// lower — the first regression — and on the demo's 12 V rail it still
// passes the design.
func TestReplaceModeFlow(t *testing.T) {
	m := newDemo(t, 120, 40)
	openReplaceOn(t, m, obsoleteQuad)

	res := m.repl.res
	if res.Original.ID != obsoleteQuad || !res.Designed {
		t.Fatalf("original %s, designed %v; want %s evaluated against the demo design", res.Original.ID, res.Designed, obsoleteQuad)
	}
	seenFootprint := false
	for _, c := range res.Candidates {
		if c.Part.ID == obsoleteQuad {
			t.Fatal("the original is listed as its own replacement")
		}
		if c.Part.Lifecycle == catalog.LifecycleObsolete {
			t.Errorf("obsolete %s listed without being asked for", c.Part.ID)
		}
		// Passing drop-ins first, then passing footprint changes (Find's order).
		if c.Design.Pass && !c.DropIn {
			seenFootprint = true
		} else if c.Design.Pass && c.DropIn && seenFootprint {
			t.Errorf("passing drop-in %s listed after a passing footprint change", c.Part.ID)
		}
	}
	first := res.Candidates[0]
	if !first.DropIn || first.Part.Tech != catalog.TechCMOS || !first.Design.Pass {
		t.Fatalf("first candidate %s (%s, drop-in %v, pass %v), want a passing CMOS drop-in", first.Part.ID, first.Part.Tech, first.DropIn, first.Design.Pass)
	}
	if len(first.Regressions) == 0 || first.Regressions[0].Key != "supply_max" {
		t.Errorf("first regression of %s is not the maximum supply: %v", first.Part.ID, first.Regressions)
	}
	if s := first.Part.Slew.Typ.V() / res.Original.Slew.Typ.V(); s < 5 {
		t.Errorf("CMOS drop-in slews only %.1f× the bipolar quad, the trade fact says ≥ 5×", s)
	}

	screen := m.View()
	row := lineWith(t, screen, "▸", first.Part.ID)
	for _, want := range []string{"drop-in", "✓", "lower maximum supply", fmt.Sprintf("▼%d", len(first.Regressions))} {
		if !strings.Contains(row, want) {
			t.Errorf("candidate row lacks %q: %q", want, row)
		}
	}
	// The comparison flags the worse supply maximum by word and symbol.
	sup := lineWith(t, screen, "supply_max")
	for _, want := range []string{"▼ worse", "18 V", "26 V"} {
		if !strings.Contains(sup, want) {
			t.Errorf("supply_max row lacks %q: %q", want, sup)
		}
	}

	press(t, m, "down")
	second := m.repl.selected()
	if m.repl.cursor != 1 || second == nil || second.Part.ID != res.Candidates[1].Part.ID {
		t.Fatalf("down: cursor %d, want the second candidate", m.repl.cursor)
	}
	if !strings.Contains(m.View(), "candidate "+second.Part.ID) {
		t.Errorf("comparison does not follow the cursor to %s", second.Part.ID)
	}
	press(t, m, "space")
	if !m.marks.has(second.Part.ID) || m.marks.len() != 1 {
		t.Fatalf("space did not mark %s into the shortlist (%d marked)", second.Part.ID, m.marks.len())
	}
	if !strings.Contains(lineWith(t, m.View(), "▸", second.Part.ID), "●") {
		t.Error("marked candidate shows no ● mark")
	}
	press(t, m, "esc")
	if m.mode != modeBrowse {
		t.Fatalf("esc left mode %d, want browse", m.mode)
	}
	if r := m.list.selected(m.rank.results); r == nil || r.Part.ID != obsoleteQuad {
		t.Errorf("selection after esc is not %s", obsoleteQuad)
	}
	if !m.marks.has(second.Part.ID) {
		t.Error("the mark did not survive leaving the mode")
	}
}

// TestReplaceEnterSelects: enter leaves the mode with the candidate
// selected in the main list; tab makes the movement keys scroll the
// comparison instead of moving the cursor.
func TestReplaceEnterSelects(t *testing.T) {
	m := newDemo(t, 80, 24)
	openReplaceOn(t, m, obsoleteQuad)
	press(t, m, "tab", "down", "down")
	if m.repl.cursor != 0 || m.repl.scroll != 2 {
		t.Fatalf("after tab, down, down: cursor %d scroll %d, want 0 and 2", m.repl.cursor, m.repl.scroll)
	}
	press(t, m, "tab", "down", "enter")
	want := m.repl.res.Candidates[1].Part.ID
	if m.mode != modeBrowse {
		t.Fatalf("enter left mode %d, want browse", m.mode)
	}
	if r := m.list.selected(m.rank.results); r == nil || r.Part.ID != want {
		t.Errorf("selected %v after enter, want %s", r, want)
	}
}

// TestReplaceNoSelection: R with nothing selected says so and stays.
func TestReplaceNoSelection(t *testing.T) {
	m := newDemo(t, 120, 40)
	press(t, m, "/")
	typeText(t, m, "no-such-part")
	press(t, m, "enter", "R")
	if m.mode != modeBrowse || !strings.Contains(m.message, "select a part") {
		t.Errorf("mode %d, message %q; want browse and a hint", m.mode, m.message)
	}
}

// TestVerdictText: every verdict reads without colour.
func TestVerdictText(t *testing.T) {
	for _, tc := range []struct {
		v    replace.Verdict
		want string
	}{
		{replace.Better, "▲ better"},
		{replace.Worse, "▼ worse"},
		{replace.Same, "= same"},
		{replace.Unknown, "? unknown"},
	} {
		t.Run(string(tc.v), func(t *testing.T) {
			if got := verdictText(tc.v); got != tc.want {
				t.Errorf("verdictText(%s) = %q, want %q", tc.v, got, tc.want)
			}
		})
	}
}

// TestDesignCell: pass with margin and binding check, fail with the first
// failing check and the count of the others, no design.
func TestDesignCell(t *testing.T) {
	for _, tc := range []struct {
		name string
		fit  *replace.Fit
		want string
	}{
		{"none", nil, "—"},
		{"pass", &replace.Fit{Pass: true, WorstMargin: catalog.Some(0.31), Binding: replace.Binding{Stage: "gain", Key: "gbw"}}, "✓ +31 % gain/gbw"},
		{"pass no margin", &replace.Fit{Pass: true}, "✓ pass"},
		{"fail one", &replace.Fit{Failed: []string{"gain/slew"}, WorstMargin: catalog.Some(-0.319)}, "✗ -32 % gain/slew"},
		{"fail filter", &replace.Fit{Failed: []string{"package not offered"}}, "✗ package not offered"},
		{"fail three", &replace.Fit{Failed: []string{"supply", "gain/slew", "gain/gbw"}}, "✗ supply +2"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if got := designCell(tc.fit); got != tc.want {
				t.Errorf("designCell = %q, want %q", got, tc.want)
			}
		})
	}
}

// TestRegressionSummary: the count, the first two reasons without their
// consequence, and the figures the candidate lacks.
func TestRegressionSummary(t *testing.T) {
	orig := &catalog.Part{ID: "o", Supply: catalog.Span{Max: catalog.Some(32)},
		Slew: catalog.Spec{Typ: catalog.Some(1e6)}, GBW: catalog.Spec{Typ: catalog.Some(1e6)}, Vos: catalog.Spec{Max: catalog.Some(1e-3)}}
	cand := &catalog.Part{ID: "c", Supply: catalog.Span{Max: catalog.Some(16)},
		Slew: catalog.Spec{Typ: catalog.Some(0.5e6)}, GBW: catalog.Spec{Typ: catalog.Some(0.5e6)}}
	same := &catalog.Part{ID: "s", Supply: orig.Supply, Slew: orig.Slew, GBW: orig.GBW, Vos: orig.Vos}
	res := replace.Find(orig, []*catalog.Part{cand, same}, replace.Options{})
	byID := map[string]*replace.Candidate{}
	for i := range res.Candidates {
		byID[res.Candidates[i].Part.ID] = &res.Candidates[i]
	}
	got := regressionSummary(byID["c"])
	for _, want := range []string{"▼3 ", "lower maximum supply: 16 V against 32 V", "slew rate worse", "; …", "1 not given: vos"} {
		if !strings.Contains(got, want) {
			t.Errorf("summary %q lacks %q", got, want)
		}
	}
	if strings.Contains(got, " — ") {
		t.Errorf("summary %q keeps a reason's consequence", got)
	}
	if got := regressionSummary(byID["s"]); got != "none" {
		t.Errorf("identical part: summary %q, want none", got)
	}
}

// TestReplaceScreens: the mode fills the screen exactly at every size and
// matches the golden screens at 120×40 and 80×24.
func TestReplaceScreens(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}, {100, 30}, {60, 16}, {200, 60}} {
		t.Run(fmt.Sprintf("%dx%d", sz[0], sz[1]), func(t *testing.T) {
			m := newDemo(t, sz[0], sz[1])
			openReplaceOn(t, m, obsoleteQuad)
			press(t, m, "down", "space")
			screen := m.View()
			ls := lines(screen)
			if len(ls) != sz[1] {
				t.Errorf("%d lines, want %d", len(ls), sz[1])
			}
			for i, l := range ls {
				if w := ansi.StringWidth(l); w != sz[0] {
					t.Errorf("line %d is %d cells, want %d: %q", i, w, sz[0], l)
				}
			}
			if sz == [2]int{120, 40} || sz == [2]int{80, 24} {
				checkGolden(t, "testdata", fmt.Sprintf("TestReplaceMode_%dx%d", sz[0], sz[1]), screen)
			}
		})
	}
}
