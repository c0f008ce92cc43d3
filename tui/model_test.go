package tui

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

const gainFreq = "stage.gain.signal.freq"

// TestRankingIsTheEngines checks that the list shows exactly the passing
// parts in the engine's order (filter.Evaluate + filter.Rank on the same
// design), and that the design pane shows the slew the demo needs.
func TestRankingIsTheEngines(t *testing.T) {
	m := newDemo(t, 120, 40)
	plan, err := filter.Derive(demoDesign(t))
	if err != nil {
		t.Fatal(err)
	}
	res := filter.Evaluate(plan, demoCatalog(t).Parts, filter.Options{})
	filter.Rank(res, filter.SortMargin)
	var want []string
	for _, r := range res {
		if r.Pass {
			want = append(want, r.Part.ID)
		}
	}
	if len(want) == 0 {
		t.Fatal("the demo design passes no part; the test needs some")
	}
	if got := topIDs(m, 1000); !slices.Equal(got, want) {
		t.Errorf("list = %v, want the engine's passing order %v", got, want)
	}
	// Gain stage: 5.58 Vpp (Vo = 2.79 V) at 24 kHz needs SR ≥ 2π·f·Vo =
	// 0.421 V/µs (full-power bandwidth, Sedra & Smith, Microelectronic
	// Circuits — from memory).
	if v := designText(m); !strings.Contains(v, "slew ≥ 0.421 V/µs") {
		t.Errorf("design pane does not show the gain stage's slew need 0.421 V/µs:\n%s", v)
	}
}

// TestEditFrequencyReranks raises the gain stage's frequency above the top
// part's fmax: that part must drop out, failing on slew or gbw, and the
// requirements must follow the new frequency at once.
func TestEditFrequencyReranks(t *testing.T) {
	m := newDemo(t, 120, 40)
	top := m.list.selected(m.rank.results)
	if top == nil {
		t.Fatal("no candidate at start")
	}
	fmax := top.MinFMax()
	if math.IsNaN(fmax) || fmax > 250e3 {
		t.Fatalf("precondition: top part %s has fmax %g, want below 250 kHz", top.Part.ID, fmax)
	}
	oldTop := top.Part.ID
	editField(t, m, gainFreq, "250 kHz")
	if got := m.design.Stage("gain").Value("signal.freq").V; got != 250e3 {
		t.Fatalf("gain signal.freq in force = %g, want 250e3", got)
	}
	if ids := topIDs(m, 1000); slices.Contains(ids, oldTop) {
		t.Fatalf("%s (fmax %g Hz) still passes at 250 kHz: %v", oldTop, fmax, ids)
	}
	if r := m.list.selected(m.rank.results); r == nil || r.Part.ID == oldTop {
		t.Fatalf("selection did not move off the part that dropped out")
	}
	// SR ≥ 2π·250 kHz·2.79 V = 4.383 V/µs (same formula as above, worked by hand).
	if v := designText(m); !strings.Contains(v, "slew ≥ 4.38 V/µs") || !strings.Contains(v, "2π·250 kHz·2.79 V") {
		t.Errorf("design pane does not show the new slew need:\n%s", v)
	}
	press(t, m, "f")
	var old *filter.Result
	for _, i := range m.list.view {
		if m.rank.results[i].Part.ID == oldTop {
			old = &m.rank.results[i]
		}
	}
	if old == nil || old.Pass {
		t.Fatalf("with failing parts shown, %s is missing or passes", oldTop)
	}
	explain(m.rank.resPlan, old, false)
	_, binding := marginCells(old)
	if !strings.Contains(binding, "gain/slew") && !strings.Contains(binding, "gain/gbw") {
		t.Errorf("%s fails on %q, want gain/slew or gain/gbw", oldTop, binding)
	}
}

// TestSelectionPersists keeps the cursor on the same part across
// re-rankings that move it, and at the same place when it goes.
func TestSelectionPersists(t *testing.T) {
	m := newDemo(t, 120, 40)
	press(t, m, "f") // all parts, so the list is long
	ids := topIDs(m, 1000)
	if len(ids) < 10 {
		t.Fatalf("too few parts: %v", ids)
	}
	want := ids[7]
	selectID(t, m, want)
	for _, k := range []string{"s", "s", "s", "s"} { // cost, supply current, fmax, id
		press(t, m, k)
		if r := m.list.selected(m.rank.results); r == nil || r.Part.ID != want {
			t.Fatalf("after sort %s the selection is on %v, want %s", m.narrow.sortKey(), r.Part.ID, want)
		}
	}
	editField(t, m, gainFreq, "25 kHz")
	if r := m.list.selected(m.rank.results); r == nil || r.Part.ID != want {
		t.Fatalf("after an edit the selection is on %v, want %s", r.Part.ID, want)
	}
	// The find filter hides it: the cursor stays in place on another part.
	pos := m.list.cursor
	press(t, m, "/")
	typeText(t, m, "no-part-has-this")
	press(t, m, "esc")
	if r := m.list.selected(m.rank.results); r == nil || r.Part.ID != want {
		t.Errorf("after a find that matched nothing and was dropped, selection = %v, want %s", r, want)
	}
	if m.list.cursor != pos {
		t.Errorf("cursor moved from %d to %d", pos, m.list.cursor)
	}
}

// TestStaleRankingDropped delivers an old job's result after a newer
// edit: it must be ignored.
func TestStaleRankingDropped(t *testing.T) {
	m := newDemo(t, 120, 40)
	m.focus = paneDesign
	m.form.cursor = fieldIndex(t, m, gainFreq)
	press(t, m, "enter", "home")
	_, cmd1 := m.Update(keyMsg("1")) // 124 kHz
	_, cmd2 := m.Update(keyMsg("1")) // 1124 kHz: nothing passes
	if cmd1 == nil || cmd2 == nil {
		t.Fatalf("edits did not start rankings (error %q)", m.form.editErr)
	}
	newer := cmd2()
	older := cmd1()
	m.Update(newer)
	want := topIDs(m, 1000)
	m.Update(older)
	if got := topIDs(m, 1000); !slices.Equal(got, want) {
		t.Errorf("a stale ranking replaced the newer one: %v, want %v", got, want)
	}
	if f := m.rank.plan.Stages[0].Freq; math.Abs(f-1124e3) > 1e-6 {
		t.Errorf("plan freq = %g, want 1124e3", f)
	}
}

// TestInlineError types a frequency with a bad unit: the error shows
// under the field, the last valid value stays in force, and leaving the
// field says what was kept.
func TestInlineError(t *testing.T) {
	tests := []struct {
		name, text, want string
	}{
		{"unknown unit", "24 kHzz", "unknown unit"},
		{"wrong dimension", "20 V", "want a frequency"},
		{"not a number", "fast", "want a frequency"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := newDemo(t, 120, 40)
			before := topIDs(m, 1000)
			m.form.cursor = fieldIndex(t, m, gainFreq)
			press(t, m, "enter", "ctrl+u")
			typeText(t, m, tc.text)
			if !strings.Contains(m.form.editErr, tc.want) {
				t.Errorf("inline error = %q, want it to contain %q", m.form.editErr, tc.want)
			}
			if strings.HasPrefix(m.form.editErr, "stage ") || strings.HasPrefix(m.form.editErr, "field ") {
				t.Errorf("inline error %q repeats the stage or field the form already shows", m.form.editErr)
			}
			screen := m.View()
			if !strings.Contains(screen, "✗") || !strings.Contains(strings.Join(strings.Fields(screen), " "), firstWords(m.form.editErr, 3)) {
				t.Errorf("screen does not show the inline error %q:\n%s", m.form.editErr, screen)
			}
			if got := m.design.Stage("gain").Value("signal.freq").V; got != 24e3 {
				t.Errorf("freq in force = %g, want the last valid 24e3", got)
			}
			if got := topIDs(m, 1000); !slices.Equal(got, before) {
				t.Errorf("ranking changed on an invalid value: %v, want %v", got, before)
			}
			reason := m.form.editErr
			press(t, m, "enter")
			if !strings.Contains(m.message, "kept 24 kHz") {
				t.Errorf("message = %q, want it to say the value kept", m.message)
			}
			if !strings.Contains(m.message, reason) {
				t.Errorf("message = %q, want it to keep the reason %q", m.message, reason)
			}
			if m.mode != modeBrowse || m.form.editErr != "" {
				t.Errorf("after enter: mode %v, error %q", m.mode, m.form.editErr)
			}
		})
	}
}

// TestDeriveErrorInline types a value that parses but cannot derive (V+
// below V−): shown inline, design unchanged.
func TestDeriveErrorInline(t *testing.T) {
	m := newDemo(t, 120, 40)
	m.form.cursor = fieldIndex(t, m, "supply.pos")
	press(t, m, "enter", "ctrl+u")
	typeText(t, m, "-6 V")
	if !strings.Contains(m.form.editErr, "not above supply.neg") {
		t.Errorf("inline error = %q, want the derive error", m.form.editErr)
	}
	if m.design.Supply.Pos.V != 5 {
		t.Errorf("V+ in force = %g, want 5", m.design.Supply.Pos.V)
	}
	press(t, m, "esc")
	if m.design.Supply.Pos.Raw != "5 V" || m.mode != modeBrowse {
		t.Errorf("after esc: V+ %q, mode %v", m.design.Supply.Pos.Raw, m.mode)
	}
}

// TestShortlist marks and unmarks parts, shows the shortlist view and
// keeps the marks across a re-rank.
func TestShortlist(t *testing.T) {
	m := newDemo(t, 120, 40)
	m.focus = paneList
	press(t, m, "f")
	ids := topIDs(m, 3)
	press(t, m, "space", "down", "space", "down", "space", "up", "m") // mark 0,1,2 then unmark 1
	if m.marks.len() != 2 || !m.marks.has(ids[0]) || m.marks.has(ids[1]) || !m.marks.has(ids[2]) {
		t.Fatalf("marks = %v, want %s and %s", m.marks.ids, ids[0], ids[2])
	}
	press(t, m, "l")
	if got := topIDs(m, 100); !slices.Equal(got, []string{ids[0], ids[2]}) {
		t.Errorf("shortlist view = %v, want %v", got, []string{ids[0], ids[2]})
	}
	editField(t, m, gainFreq, "2 kHz")
	if m.marks.len() != 2 || len(m.list.view) != 2 {
		t.Errorf("after re-rank: %d marks, %d rows, want 2 and 2", m.marks.len(), len(m.list.view))
	}
	if !strings.Contains(m.View(), "SHORTLIST 2 marked") {
		t.Error("shortlist view heading missing")
	}
}

// TestExport writes the shortlist in every format through the prompt and
// checks each file carries the marked parts, the design and the caution;
// a second export to the same path asks before overwriting.
func TestExport(t *testing.T) {
	for _, format := range []string{"md", "csv", "json", "toml"} {
		t.Run(format, func(t *testing.T) {
			m := newDemo(t, 120, 40)
			m.focus = paneList
			ids := topIDs(m, 2)
			press(t, m, "space", "down", "space", "x")
			if m.mode != modePrompt {
				t.Fatal("x did not open the export prompt")
			}
			path := filepath.Join(t.TempDir(), "short."+format)
			press(t, m, "ctrl+u")
			typeText(t, m, path)
			press(t, m, "enter")
			if m.mode != modeBrowse {
				t.Fatalf("prompt still open: %s", m.message)
			}
			b, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			text := string(b)
			for _, id := range ids {
				if !strings.Contains(text, id) {
					t.Errorf("export lacks marked part %s:\n%s", id, text)
				}
			}
			if format != "csv" && !strings.Contains(text, "advisory") {
				t.Errorf("export lacks the caution:\n%s", text)
			}
			if format == "md" || format == "json" {
				if !strings.Contains(text, "2π") {
					t.Errorf("export lacks the requirements' formulas:\n%s", text)
				}
			}
			// Overwrite asks; n keeps the file, y replaces it.
			if err := os.WriteFile(path, []byte("keep me"), 0o644); err != nil {
				t.Fatal(err)
			}
			press(t, m, "x", "ctrl+u")
			typeText(t, m, path)
			press(t, m, "enter")
			if !m.prompt.confirm {
				t.Fatal("no overwrite question for an existing file")
			}
			press(t, m, "n", "esc")
			if b, _ := os.ReadFile(path); string(b) != "keep me" {
				t.Errorf("declined overwrite changed the file: %q", b)
			}
			press(t, m, "x", "ctrl+u")
			typeText(t, m, path)
			press(t, m, "enter", "y")
			if b, _ := os.ReadFile(path); !strings.Contains(string(b), ids[0]) {
				t.Errorf("confirmed overwrite did not write the export: %q", b)
			}
			if matches, _ := filepath.Glob(filepath.Join(filepath.Dir(path), ".*tmp*")); len(matches) > 0 {
				t.Errorf("temporary files left behind: %v", matches)
			}
		})
	}
}

// TestExportFormatKey cycles the format with tab, which also renames the path.
func TestExportFormatKey(t *testing.T) {
	m := newDemo(t, 120, 40)
	press(t, m, "tab", "space", "x")
	got := []string{m.prompt.input.Value()}
	for range 4 {
		press(t, m, "tab")
		got = append(got, m.prompt.input.Value()+"="+string(m.prompt.format))
	}
	want := []string{"shortlist.md", "shortlist.csv=csv", "shortlist.json=json", "shortlist.toml=toml", "shortlist.md=md"}
	if !slices.Equal(got, want) {
		t.Errorf("tab cycle = %v, want %v", got, want)
	}
}

// TestSaveDesign saves the edited design and reads it back.
func TestSaveDesign(t *testing.T) {
	m := newDemo(t, 120, 40)
	editField(t, m, gainFreq, "33 kHz")
	path := filepath.Join(t.TempDir(), "edited.toml")
	press(t, m, "w", "ctrl+u")
	typeText(t, m, path)
	press(t, m, "enter")
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (message %q)", err, m.message)
	}
	d, err := filter.DecodeDesign(path, b)
	if err != nil {
		t.Fatalf("saved design does not decode: %v\n%s", err, b)
	}
	if v := d.Stage("gain").Value("signal.freq"); v.V != 33e3 {
		t.Errorf("saved freq = %+v, want 33 kHz", v)
	}
}

// TestNarrowing checks the quick filters, the text filter and clear.
func TestNarrowing(t *testing.T) {
	m := newDemo(t, 120, 40)
	press(t, m, "f")
	all := len(m.list.view)
	press(t, m, "t")
	tech := m.narrow.tech
	for _, i := range m.list.view {
		if string(m.rank.results[i].Part.Tech) != tech {
			t.Errorf("tech filter %q shows %s (%s)", tech, m.rank.results[i].Part.ID, m.rank.results[i].Part.Tech)
		}
	}
	press(t, m, "c", "p")
	pkg := m.narrow.pkg
	for _, i := range m.list.view {
		if !m.rank.results[i].Part.HasPackage(pkg) {
			t.Errorf("package filter %q shows %s", pkg, m.rank.results[i].Part.ID)
		}
	}
	press(t, m, "c", "/")
	typeText(t, m, "QUAD")
	press(t, m, "enter")
	if len(m.list.view) == 0 {
		t.Fatal("find QUAD matched nothing")
	}
	for _, i := range m.list.view {
		if !strings.Contains(m.cat.search[m.rank.results[i].Part], "quad") {
			t.Errorf("find shows %s", m.rank.results[i].Part.ID)
		}
	}
	press(t, m, "c")
	if len(m.list.view) != all {
		t.Errorf("after clear %d rows, want %d", len(m.list.view), all)
	}
	// Cycling a quick filter past its last value comes back to "any".
	for range len(m.cat.techs) + 1 {
		press(t, m, "t")
	}
	if m.narrow.tech != "" {
		t.Errorf("tech after a full cycle = %q, want any", m.narrow.tech)
	}
}

// TestReloadKeepsSelectionAndShortlist reloads a catalog that lost one
// marked part.
func TestReloadKeepsSelectionAndShortlist(t *testing.T) {
	cat := demoCatalog(t)
	var loads int
	var drop string
	cfg := Config{Design: demoDesign(t), Catalog: cat, Renderer: asciiRenderer(),
		Load: func() (*catalog.Catalog, error) {
			loads++
			c := *cat
			c.Parts = slices.DeleteFunc(slices.Clone(cat.Parts), func(p *catalog.Part) bool { return p.ID == drop })
			return &c, nil
		}}
	m := New(cfg)
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	run(t, m, m.Init())
	m.focus = paneList
	press(t, m, "f")
	ids := topIDs(m, 5)
	press(t, m, "space", "down", "space", "down", "down")
	drop = ids[1]
	sel := m.list.selected(m.rank.results).Part.ID
	press(t, m, "r")
	if loads != 1 {
		t.Fatalf("r loaded %d times, want 1", loads)
	}
	if r := m.list.selected(m.rank.results); r == nil || r.Part.ID != sel {
		t.Errorf("selection after reload = %v, want %s", r, sel)
	}
	if !m.marks.has(ids[0]) || m.marks.has(ids[1]) || m.marks.len() != 1 {
		t.Errorf("marks after reload = %v, want only %s", m.marks.ids, ids[0])
	}
	if !strings.Contains(m.message, "left the shortlist") {
		t.Errorf("message %q does not say a marked part left", m.message)
	}
}

// TestReloadWithProblemsKeepsCatalog: a broken reload keeps the parts in force.
func TestReloadWithProblemsKeepsCatalog(t *testing.T) {
	cat := demoCatalog(t)
	m := New(Config{Design: demoDesign(t), Catalog: cat, Renderer: asciiRenderer(),
		Load: func() (*catalog.Catalog, error) {
			return catalog.Load(catalog.PathLayer(filepath.Join("testdata", "broken.toml")))
		}})
	run(t, m, m.Init())
	n := len(m.rank.results)
	press(t, m, "r")
	if len(m.rank.results) != n || !m.msgErr || !strings.Contains(m.message, "broken.toml") {
		t.Errorf("after a broken reload: %d results (want %d), message %q", len(m.rank.results), n, m.message)
	}
}

// TestEmbeddedPartIsReadOnly: o on a demo part explains instead of opening.
func TestEmbeddedPartIsReadOnly(t *testing.T) {
	m := newDemo(t, 120, 40)
	_, cmd := m.Update(keyMsg("o"))
	if cmd != nil {
		t.Error("o on an embedded part returned a command")
	}
	if !strings.Contains(m.message, "read-only") || !strings.Contains(m.message, "opsift init") {
		t.Errorf("message = %q", m.message)
	}
}

// TestEditorCommand: vi-like editors get +LINE, then "--", then the file
// as an absolute path, so a hostile file name such as "+!touch X;.toml"
// (which vi would run as an ex command) is only ever a file name.
func TestEditorCommand(t *testing.T) {
	const hostile = "+!touch X;.toml"
	abs, err := filepath.Abs(hostile)
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, visual, editor string
		want                 []string
	}{
		{"vi at line", "", "vi", []string{"vi", "+12", "--", abs}},
		{"visual wins", "vi", "nano", []string{"vi", "+12", "--", abs}},
		{"flags kept", "", "vi -n", []string{"vi", "-n", "+12", "--", abs}},
		{"other editor gets the file only", "", "cat", []string{"cat", abs}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			env := map[string]string{"VISUAL": tc.visual, "EDITOR": tc.editor}
			cmd, err := editorCommand(func(k string) string { return env[k] }, hostile, 12)
			if err != nil {
				t.Skipf("editor not installed: %v", err)
			}
			got := append([]string{filepath.Base(cmd.Args[0])}, cmd.Args[1:]...)
			if !slices.Equal(got, tc.want) {
				t.Errorf("args = %v, want %v", got, tc.want)
			}
		})
	}
}

// TestScreenFits draws every mode at several sizes: always exactly height
// lines of exactly width cells, so nothing wraps.
func TestScreenFits(t *testing.T) {
	sizes := [][2]int{{120, 40}, {80, 24}, {100, 30}, {99, 30}, {60, 16}, {200, 60}, {40, 10}}
	setups := map[string][]string{
		"browse":  nil,
		"failing": {"f", "tab", "down", "down"},
		"edit":    {"down", "enter", "x"},
		"find":    {"/", "q"},
		"help":    {"?"},
		"export":  {"tab", "space", "x"},
		"detail":  {"tab", "tab", "pgdown"},
	}
	for _, sz := range sizes {
		for name, keys := range setups {
			t.Run(fmt.Sprintf("%s/%dx%d", name, sz[0], sz[1]), func(t *testing.T) {
				m := newDemo(t, sz[0], sz[1])
				press(t, m, keys...)
				ls := lines(m.View())
				if len(ls) != sz[1] {
					t.Errorf("%d lines, want %d", len(ls), sz[1])
				}
				for i, l := range ls {
					if w := ansi.StringWidth(l); w != sz[0] {
						t.Errorf("line %d is %d cells, want %d: %q", i, w, sz[0], l)
					}
				}
			})
		}
	}
}

// TestColours: with colour on, only the 16 ANSI colours are used; with
// the no-colour renderer, no escape code at all.
func TestColours(t *testing.T) {
	m := newDemo(t, 120, 40)
	press(t, m, "f")
	if v := m.View(); strings.Contains(v, "\x1b[") {
		t.Errorf("no-colour screen has escape codes")
	}
	r := asciiRenderer()
	r.SetColorProfile(2) // termenv.ANSI: 16 colours
	mc := New(Config{Design: demoDesign(t), Catalog: demoCatalog(t), Renderer: r})
	run(t, mc, mc.Init())
	press(t, mc, "f")
	v := mc.View()
	if !strings.Contains(v, "\x1b[") {
		t.Fatal("colour screen has no escape codes")
	}
	if strings.Contains(v, "38;5;") || strings.Contains(v, "38;2;") || strings.Contains(v, "48;5;") {
		t.Error("colour screen uses colours beyond the 16 ANSI ones")
	}
}

// TestMouseWheel scrolls the list under the pointer.
func TestMouseWheel(t *testing.T) {
	m := newDemo(t, 120, 40)
	press(t, m, "f")
	l := m.ui.layout()
	m.Update(tea.MouseMsg{X: 5, Y: l.list.y + 3, Button: tea.MouseButtonWheelDown, Action: tea.MouseActionPress})
	if m.list.cursor != wheelRows {
		t.Errorf("cursor after one wheel notch = %d, want %d", m.list.cursor, wheelRows)
	}
}

// designText is the whole design pane, unscrolled, as plain text.
func designText(m *Model) string {
	var b strings.Builder
	for _, l := range m.form.lines(m.rank.plan, nil, 200) {
		b.WriteString(strings.TrimRight(l.text, " ") + "\n")
	}
	return b.String()
}

// firstWords is the first n words of s.
func firstWords(s string, n int) string {
	f := strings.Fields(s)
	return strings.Join(f[:min(n, len(f))], " ")
}
