package tui

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"
	"github.com/charmbracelet/x/exp/teatest"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/listing"
	"github.com/opsift/opsift/filter/report"
)

var (
	keyRight = tea.KeyMsg{Type: tea.KeyRight}
	keyLeft  = tea.KeyMsg{Type: tea.KeyLeft}
)

func send(t *testing.T, m *Model, msgs ...tea.KeyMsg) {
	t.Helper()
	for _, k := range msgs {
		_, cmd := m.Update(k)
		run(t, m, cmd)
	}
}

// Explorer mode lists every part, passing or not; s sorts on the column
// under the column cursor, ascending then descending, with parts lacking
// the figure last; space marks into the shortlist; esc goes back.
func TestExplorerSortAndMark(t *testing.T) {
	m := newDemo(t, 120, 40)
	press(t, m, "E")
	if m.mode != modeExplore || len(m.expl.rows) != len(m.cat.Parts) {
		t.Fatalf("mode %v, %d rows for %d parts", m.mode, len(m.expl.rows), len(m.cat.Parts))
	}
	send(t, m, keyRight, keyRight, keyRight) // gbw, slew, vos
	col := m.expl.cols[m.expl.colCur]
	if col.Key != "vos" {
		t.Fatalf("column cursor on %s, want vos", col.Key)
	}
	for _, desc := range []bool{false, true} {
		press(t, m, "s")
		if m.expl.sort != (listing.SortKey{Key: "vos", Desc: desc}) {
			t.Fatalf("sort %v, want vos desc=%v", m.expl.sort, desc)
		}
		var vs []float64
		for _, i := range m.expl.view {
			if c := m.expl.rows[i].Cells[m.expl.colCur]; c.Known() {
				vs = append(vs, c.V)
			}
		}
		sorted := slices.IsSorted(vs)
		if desc {
			slices.Reverse(vs)
			sorted = slices.IsSorted(vs)
		}
		if !sorted || len(vs) == 0 {
			t.Errorf("desc=%v: offsets not in order: %v", desc, vs)
		}
	}
	send(t, m, keyLeft, keyLeft, keyLeft, keyLeft, keyLeft)
	if m.expl.colCur != -1 {
		t.Errorf("column cursor %d, want -1 (the id)", m.expl.colCur)
	}
	id := m.expl.selectedID()
	press(t, m, "space")
	if !m.marks.has(id) {
		t.Errorf("space did not mark %s", id)
	}
	press(t, m, "/")
	typeText(t, m, "jf")
	press(t, m, "enter")
	for _, i := range m.expl.view {
		if p := m.expl.rows[i].Part; !strings.Contains(p.ID+p.Name, "jf") && !strings.Contains(strings.ToLower(p.Name), "jf") {
			t.Errorf("find jf shows %s", p.ID)
		}
	}
	if len(m.expl.view) == 0 {
		t.Error("find jf shows nothing")
	}
	press(t, m, "esc")
	if m.mode != modeBrowse {
		t.Errorf("esc left mode %v", m.mode)
	}
}

// The column picker shows or hides any column and the choice is written to
// the settings file (atomically, through report.WriteFile) and read back.
func TestExplorerColumnsRemembered(t *testing.T) {
	path := filepath.Join(t.TempDir(), "opsift", "settings.toml")
	m := New(Config{Design: demoDesign(t), Catalog: demoCatalog(t), Renderer: asciiRenderer(), SettingsFile: path,
		Settings: Settings{ExplorerColumns: []string{"gbw", "no-such-column"}}})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	run(t, m, m.Init())
	press(t, m, "E")
	if got := strings.Join(m.expl.keys(), ","); got != "gbw" {
		t.Fatalf("columns %s, want gbw (the unknown key dropped)", got)
	}
	press(t, m, "c")
	all := listing.Columns()
	for i := range all {
		if all[i].Key == "cload" {
			break
		}
		press(t, m, "down")
	}
	press(t, m, "space", "enter")
	if got := strings.Join(m.expl.keys(), ","); got != "gbw,cload" {
		t.Fatalf("columns %s, want gbw,cload", got)
	}
	s, err := LoadSettings(path)
	if err != nil || strings.Join(s.ExplorerColumns, ",") != "gbw,cload" {
		t.Errorf("settings file read back %v, %v", s.ExplorerColumns, err)
	}
	os.WriteFile(path, []byte("[explorer]\ncolumns = [\"vos\", \"bogus\"]\n"), 0o644)
	if s, err := LoadSettings(path); err != nil || strings.Join(s.ExplorerColumns, ",") != "vos" {
		t.Errorf("unknown key kept: %v, %v", s.ExplorerColumns, err)
	}
	os.WriteFile(path, []byte("[explorer\n"), 0o644)
	if _, err := LoadSettings(path); err == nil || !strings.Contains(err.Error(), path) {
		t.Errorf("bad settings file: %v", err)
	}
	if s, err := LoadSettings(filepath.Join(t.TempDir(), "none.toml")); err != nil || s.ExplorerColumns != nil {
		t.Errorf("missing file: %v, %v", s, err)
	}
}

// The explorer shows the numbers opsift list prints: every cell of the
// screen's first rows is report.ListCell of the same listing.Build at the
// demo design's plan (teatest drives the real program loop).
func TestExplorerShowsListNumbers(t *testing.T) {
	design := demoDesign(t)
	cat := demoCatalog(t)
	plan, err := filter.Derive(design.Clone())
	if err != nil {
		t.Fatal(err)
	}
	results := filter.Evaluate(plan, cat.Parts, filter.Options{})
	cols, _ := listing.ParseColumns("")
	rows := listing.Build(plan, results, nil, cols, false)
	listing.Sort(rows, listing.SortKey{Key: "id"}, false)
	var want []string
	for _, r := range rows[:3] {
		line := []string{r.Part.ID}
		for j, c := range cols[:4] {
			line = append(line, report.ListCell(c, r.Cells[j]))
		}
		want = append(want, strings.Join(line, " "))
	}
	m := New(Config{Design: design, Catalog: cat, Renderer: asciiRenderer()})
	tm := teatest.NewTestModel(t, m, teatest.WithInitialTermSize(120, 40))
	out := &screenLog{r: tm.Output()}
	out.waitFor(t, "sort margin · 1/")
	tm.Type("E")
	teatest.WaitFor(t, tm.Output(), func(b []byte) bool {
		lines := strings.Split(ansi.Strip(string(b)), "\n")
		for _, w := range want {
			if !slices.ContainsFunc(lines, func(l string) bool { return strings.HasPrefix(squash(l), w+" ") }) {
				return false
			}
		}
		return true
	}, teatest.WithDuration(5*time.Second), teatest.WithCheckInterval(10*time.Millisecond))
	tm.Send(tea.KeyMsg{Type: tea.KeyCtrlC})
	tm.WaitFinished(t, teatest.WithFinalTimeout(5*time.Second))
}

// squash keeps the id and the figures of an explorer row, single-spaced:
// the cursor, mark and verdict cells go.
func squash(l string) string {
	f := strings.Fields(l)
	var keep []string
	for i := 0; i < len(f); i++ {
		switch {
		case f[i] == "▸" || f[i] == "●" || f[i] == "pass":
		case f[i] == "✗" || f[i] == "✓":
			if f[i] == "✗" {
				i++ // the failing count
			}
		default:
			keep = append(keep, f[i])
		}
	}
	return strings.Join(keep, " ")
}

// A figure bound is edited in the design pane like any input: typing
// "max 5 mV" on the vos limit row puts limit.vos in force and re-ranks;
// the explorer, open afterwards, shows the same verdicts the ranking has.
func TestLimitEditedInDesignPane(t *testing.T) {
	m := newDemo(t, 120, 40)
	m.form.cursor = fieldIndex(t, m, "choose.limit.vos")
	press(t, m, "enter", "ctrl+u")
	typeText(t, m, "max 5 mV")
	press(t, m, "enter")
	var found bool
	for _, q := range m.rank.plan.Global {
		if q.Key == filter.LimitKey("vos") && q.Bound == filter.BoundMax && q.Value == 5e-3 {
			found = true
		}
	}
	if !found {
		t.Fatalf("no limit.vos ≤ 5 mV in force after the edit (error %q)", m.form.editErr)
	}
	press(t, m, "E")
	pass := map[string]bool{}
	for i := range m.rank.results {
		pass[m.rank.results[i].Part.ID] = m.rank.results[i].Pass
	}
	for i := range m.expl.rows {
		r := &m.expl.rows[i]
		if got, _ := r.Pass(); got != pass[r.Part.ID] {
			t.Errorf("%s: explorer verdict %v, ranking %v", r.Part.ID, got, pass[r.Part.ID])
		}
		// A part that passes keeps its worst-case offset within the bound.
		for j, c := range m.expl.cols {
			if c.Key == "vos" && pass[r.Part.ID] && r.Cells[j].V > 5e-3 {
				t.Errorf("%s passes with vos %g above the 5 mV limit", r.Part.ID, r.Cells[j].V)
			}
		}
	}
}

// The margin column of a failing part is its worst miss, the same number
// opsift list gives from a full evaluation, although the selector ranks
// in summary (the explorer explains the failing parts first).
func TestExplorerMarginOfFailingParts(t *testing.T) {
	design, cat := demoDesign(t), demoCatalog(t)
	m := New(Config{Design: design, Catalog: cat, Renderer: asciiRenderer(), Settings: Settings{ExplorerColumns: []string{"margin"}}})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	run(t, m, m.Init())
	press(t, m, "E")
	plan, err := filter.Derive(design.Clone())
	if err != nil {
		t.Fatal(err)
	}
	cols, _ := listing.ParseColumns("margin")
	want := map[string]string{}
	for _, r := range listing.Build(plan, filter.Evaluate(plan, cat.Parts, filter.Options{}), nil, cols, false) {
		want[r.Part.ID] = report.ListCell(cols[0], r.Cells[0])
	}
	failing := 0
	for i := range m.expl.rows {
		r := &m.expl.rows[i]
		if pass, _ := r.Pass(); !pass {
			failing++
		}
		if got := report.ListCell(cols[0], r.Cells[0]); got != want[r.Part.ID] {
			t.Errorf("%s: explorer margin %s, list %s", r.Part.ID, got, want[r.Part.ID])
		}
	}
	if failing == 0 {
		t.Error("no failing part in the demo: the test covers nothing")
	}
}

// TestExplorerTypicalLegend: the legend under the rows says what the
// figures are: worst case with ~ marks, or the catalog's typicals after T.
func TestExplorerTypicalLegend(t *testing.T) {
	m := newDemo(t, 120, 40)
	press(t, m, "E")
	if s := m.View(); !strings.Contains(s, "~ typical (derated or inflated)") {
		t.Fatalf("worst-case legend missing:\n%s", s)
	}
	press(t, m, "T")
	s := m.View()
	if strings.Contains(s, "derated or inflated") || !strings.Contains(s, "typical figures as the catalog gives them") {
		t.Errorf("after T the legend still reads as worst case:\n%s", s)
	}
}

// TestExplorerHelp: ? in explorer mode opens the help overlay with the
// explorer's own keys (every key of its footer, each doing what it says:
// ? and esc below, s, T and space in the tests above), and closing it goes
// back to the explorer, not to the list; at 80×24 too. A key pressed
// while finding is text, not help.
func TestExplorerHelp(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		m := newDemo(t, sz[0], sz[1])
		press(t, m, "E", "?")
		if m.mode != modeHelp {
			t.Fatalf("%v: ? in the explorer: mode %v, want the help overlay", sz, m.mode)
		}
		var all []string
		for p := 0; p < len(m.helpPages(m.ui.width, m.bodyH())); p++ {
			m.helpPage = p
			all = append(all, m.View())
		}
		m.helpPage = 0
		screen := strings.Join(all, "\n")
		for _, b := range m.ui.keys.explorerKeys() {
			h := b.Help()
			if !strings.Contains(screen, h.Key) || !strings.Contains(screen, h.Desc) {
				t.Errorf("%v: explorer help lacks %q %q:\n%s", sz, h.Key, h.Desc, screen)
			}
		}
		if !strings.Contains(screen, "Explorer keys") || strings.Contains(screen, "replace") {
			t.Errorf("%v: the overlay shows the browsing keys, not the explorer's:\n%s", sz, screen)
		}
		press(t, m, "esc")
		if m.mode != modeExplore {
			t.Fatalf("%v: closing help: mode %v, want back in the explorer", sz, m.mode)
		}
		press(t, m, "esc", "?")
		if m.mode != modeHelp || m.helpFrom != modeBrowse || !strings.Contains(m.View(), "replace") {
			t.Errorf("%v: ? while browsing: mode %v from %v, want the browsing help", sz, m.mode, m.helpFrom)
		}
		press(t, m, "esc", "E", "/", "?")
		if m.mode != modeExplore || m.expl.find != "?" {
			t.Errorf("%v: ? while finding: mode %v, find %q, want the text", sz, m.mode, m.expl.find)
		}
	}
}
