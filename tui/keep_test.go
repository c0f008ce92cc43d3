package tui

import (
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
)

// newOnFile copies the demo design (31 comment lines) to a file in a
// temporary directory and opens the selector on it, as opsift --design
// FILE does. It returns the model and the file.
func newOnFile(t *testing.T, w, h int) (*Model, string) {
	t.Helper()
	_, text := embeddedDesign(t, data.DefaultDesign)
	path := filepath.Join(t.TempDir(), "monitor.toml")
	if err := os.WriteFile(path, text, 0o644); err != nil {
		t.Fatal(err)
	}
	d, err := filter.DecodeDesign(path, text)
	if err != nil {
		t.Fatal(err)
	}
	m := New(Config{Design: d, DesignFile: path, DesignText: text, Catalog: demoCatalog(t), Renderer: asciiRenderer()})
	m.Update(tea.WindowSizeMsg{Width: w, Height: h})
	run(t, m, m.Init())
	return m, path
}

// commentLines are the lines of text that hold a comment.
func commentLines(text string) []string {
	var out []string
	for _, l := range strings.Split(text, "\n") {
		if i := strings.Index(l, "#"); i >= 0 {
			out = append(out, strings.TrimSpace(l[i:]))
		}
	}
	return out
}

// TestModifiedAndQuit: an edit shows "modified" in the header and the
// design pane; q then asks (esc goes back, d quits without writing); with
// no edit, or with the edit undone, q quits at once.
func TestModifiedAndQuit(t *testing.T) {
	m, path := newOnFile(t, 120, 40)
	before, _ := os.ReadFile(path)
	if strings.Contains(m.View(), "modified") {
		t.Fatal("a fresh design shows modified")
	}
	editField(t, m, "supply.pos", "15 V")
	screen := m.View()
	for _, want := range []string{"● modified (1 input, w saves)", "DESIGN · modified", "▸*V+ rail"} {
		if !strings.Contains(screen, want) {
			t.Errorf("after an edit the screen lacks %q:\n%s", want, screen)
		}
	}
	press(t, m, "q")
	if m.quitting || m.mode != modeAsk {
		t.Fatalf("q with unsaved edits: quitting %v, mode %v; want a question", m.quitting, m.mode)
	}
	if s := m.View(); !strings.Contains(s, "monitor.toml has 1 edited input not saved") || !strings.Contains(s, "d discard and quit") {
		t.Errorf("the question is not on screen:\n%s", s)
	}
	press(t, m, "esc")
	if m.quitting || m.mode != modeBrowse {
		t.Fatalf("esc: quitting %v, mode %v; want back to browsing", m.quitting, m.mode)
	}
	press(t, m, "q", "d")
	if !m.quitting {
		t.Fatal("d did not quit")
	}
	if after, _ := os.ReadFile(path); string(after) != string(before) {
		t.Error("discarding wrote the file")
	}

	m, _ = newOnFile(t, 120, 40)
	editField(t, m, "supply.pos", "15 V")
	press(t, m, "u")
	if m.modified() {
		t.Errorf("after undoing the only edit the design is still modified: %v", m.edits)
	}
	press(t, m, "q")
	if !m.quitting {
		t.Error("q without unsaved edits did not quit at once")
	}

	// ctrl+c asks the same from a prompt and from a field being edited; a
	// second ctrl+c at the question discards and quits.
	for _, keys := range [][]string{{"w", "ctrl+c"}, {"enter", "x", "ctrl+c"}} {
		m, _ = newOnFile(t, 120, 40)
		editField(t, m, "supply.pos", "15 V")
		press(t, m, keys...)
		if m.quitting || m.mode != modeAsk {
			t.Fatalf("%v: quitting %v, mode %v; want the question", keys, m.quitting, m.mode)
		}
		press(t, m, "ctrl+c")
		if !m.quitting {
			t.Errorf("%v: a second ctrl+c did not quit", keys)
		}
	}
}

// TestSaveInPlaceKeepsComments: w on the design file writes the edited
// value into the user's text: every comment stays, the new value is in
// place, the file reads back as the design in force, and the header is
// no longer modified. q with the save asked for at quit saves, then quits.
func TestSaveInPlaceKeepsComments(t *testing.T) {
	m, path := newOnFile(t, 120, 40)
	orig, _ := os.ReadFile(path)
	editField(t, m, "supply.pos", "15 V")
	editField(t, m, "stage.gain.rf", "190 kOhm")
	editField(t, m, "choose.limit.vos", "max 6 mV")
	press(t, m, "w")
	if m.mode != modePrompt || m.prompt.input.Value() != path {
		t.Fatalf("w: mode %v, path %q; want the save prompt on %s", m.mode, m.prompt.input.Value(), path)
	}
	press(t, m, "enter")
	if m.mode != modeBrowse {
		t.Fatalf("saving the design file asked something: %s", m.View())
	}
	got, _ := os.ReadFile(path)
	if c0, c1 := commentLines(string(orig)), commentLines(string(got)); strings.Join(c0, "\n") != strings.Join(c1, "\n") {
		t.Errorf("comments changed:\nbefore %q\nafter  %q", c0, c1)
	}
	for _, want := range []string{`pos = "15 V"         # charge-pump rails`, `rf = "190 kOhm"`, "[choose.limit]\nvos = { max = \"6 mV\" }"} {
		if !strings.Contains(string(got), want) {
			t.Errorf("saved file lacks %q:\n%s", want, got)
		}
	}
	d, err := filter.DecodeDesign(path, got)
	if err != nil {
		t.Fatal(err)
	}
	if ch := changedInputs(d, m.design); len(ch) > 0 {
		t.Errorf("the saved file differs from the design in force in %v", ch)
	}
	if m.modified() || strings.Contains(m.View(), "modified") {
		t.Error("still modified after saving")
	}

	editField(t, m, "supply.neg", "-15 V")
	press(t, m, "q", "s", "enter")
	if !m.quitting {
		t.Fatal("s, enter at the quit question did not quit after saving")
	}
	if got, _ := os.ReadFile(path); !strings.Contains(string(got), `neg = "-15 V"`) {
		t.Errorf("the save at quit was not written:\n%s", got)
	}
}

// TestSaveErrorStaysInPrompt: a save into a missing directory shows the
// error in the prompt, which stays open with the path to correct; a good
// path then writes, and the next prompt starts in that directory.
func TestSaveErrorStaysInPrompt(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		m := newDemo(t, sz[0], sz[1])
		dir := t.TempDir()
		editField(t, m, "supply.pos", "6 V")
		press(t, m, "w", "ctrl+u")
		typeText(t, m, filepath.Join(dir, "no-such-dir", "d.toml"))
		press(t, m, "enter")
		if m.mode != modePrompt {
			t.Fatalf("%v: the prompt closed on a failed save", sz)
		}
		screen := m.View()
		// The message wraps where the temp file's random name puts it, so
		// it is matched with the line breaks and padding folded to spaces.
		flat := strings.Join(strings.Fields(screen), " ")
		if !strings.Contains(flat, "! save design: write d.toml") || !strings.Contains(flat, "such file or directory") {
			t.Errorf("%v: the error is not in the prompt:\n%s", sz, screen)
		}
		if strings.Contains(screen, "…") && strings.Contains(lines(screen)[len(lines(screen))-1], "…") {
			t.Errorf("%v: the error is cut:\n%s", sz, screen)
		}
		press(t, m, "ctrl+u")
		good := filepath.Join(dir, "d.toml")
		typeText(t, m, good)
		press(t, m, "enter")
		if m.mode != modeBrowse {
			t.Fatalf("%v: the good path did not save: %s", sz, m.View())
		}
		if _, err := os.Stat(good); err != nil {
			t.Fatal(err)
		}
		press(t, m, "tab", "m", "x") // marks from the list (the design pane only hints)
		if got := m.prompt.input.Value(); got != filepath.Join(dir, "shortlist.md") {
			t.Errorf("%v: the export prompt suggests %q, want the last directory's shortlist.md", sz, got)
		}
		press(t, m, "esc")
	}
}

// TestDiskChange: the design file changed on disk is taken at once when
// there are no edits; under unsaved edits the user is asked, r reloads
// the disk version and k keeps the edits, which w then writes over it
// (keeping the disk version's own comments). A save without the watcher
// still notices the change and asks first.
func TestDiskChange(t *testing.T) {
	diskEdit := func(t *testing.T, path, old, new string) []byte {
		t.Helper()
		b, _ := os.ReadFile(path)
		nb := []byte(strings.Replace(string(b), old, new, 1))
		if string(nb) == string(b) {
			t.Fatalf("%q not in the file", old)
		}
		if err := os.WriteFile(path, nb, 0o644); err != nil {
			t.Fatal(err)
		}
		return nb
	}
	posText := func(m *Model) string {
		for _, f := range m.design.Fields() {
			if f.Path == "supply.pos" {
				return f.Raw
			}
		}
		return ""
	}

	t.Run("no edits: reloaded", func(t *testing.T) {
		m, path := newOnFile(t, 120, 40)
		text := diskEdit(t, path, `pos = "5 V"`, `pos = "6 V"`)
		m.Update(designReadMsg{path: path, text: text})
		if posText(m) != "6 V" || m.mode != modeBrowse || !strings.Contains(m.message, "changed on disk; reloaded") {
			t.Errorf("V+ %q, mode %v, message %q", posText(m), m.mode, m.message)
		}
	})
	t.Run("own save: nothing", func(t *testing.T) {
		m, path := newOnFile(t, 120, 40)
		editField(t, m, "supply.pos", "7 V")
		press(t, m, "w", "enter")
		text, _ := os.ReadFile(path)
		m.message = ""
		m.Update(designReadMsg{path: path, text: text})
		if m.mode != modeBrowse || m.message != "" {
			t.Errorf("its own save came back as a change: mode %v, %q", m.mode, m.message)
		}
	})
	t.Run("edits: reload", func(t *testing.T) {
		m, path := newOnFile(t, 120, 40)
		editField(t, m, "supply.neg", "-6 V")
		text := diskEdit(t, path, `pos = "5 V"`, `pos = "6 V"`)
		m.Update(designReadMsg{path: path, text: text})
		if m.mode != modeAsk || !strings.Contains(m.View(), "changed on disk while you have unsaved edits") {
			t.Fatalf("no question under unsaved edits:\n%s", m.View())
		}
		press(t, m, "r")
		if posText(m) != "6 V" || m.modified() {
			t.Errorf("r: V+ %q, modified %v; want the disk version, unmodified", posText(m), m.modified())
		}
	})
	t.Run("edits: keep mine", func(t *testing.T) {
		m, path := newOnFile(t, 120, 40)
		editField(t, m, "supply.neg", "-6 V")
		diskEdit(t, path, `tolerance = "5 %"`, `tolerance = "5 %" # checked with the pump loaded`)
		text := diskEdit(t, path, `pos = "5 V"`, `pos = "6 V"`)
		m.Update(designReadMsg{path: path, text: text})
		press(t, m, "k")
		if !m.modified() {
			t.Fatal("k dropped the edits")
		}
		if posText(m) != "6 V" {
			t.Errorf("k: V+ %q; want the disk's 6 V under the edit of V−", posText(m))
		}
		press(t, m, "w", "enter")
		got, _ := os.ReadFile(path)
		for _, want := range []string{`neg = "-6 V"`, `pos = "6 V"`, "# checked with the pump loaded"} {
			if !strings.Contains(string(got), want) {
				t.Errorf("saved file lacks %q:\n%s", want, got)
			}
		}
	})
	t.Run("save notices without the watcher", func(t *testing.T) {
		m, path := newOnFile(t, 120, 40)
		editField(t, m, "supply.neg", "-6 V")
		diskEdit(t, path, `pos = "5 V"`, `pos = "6 V"`)
		press(t, m, "w", "enter")
		if !m.prompt.confirm || !strings.Contains(m.View(), "changed on disk since it was read") {
			t.Fatalf("the save did not ask about the disk change:\n%s", m.View())
		}
		press(t, m, "n", "esc")
		if got, _ := os.ReadFile(path); strings.Contains(string(got), `neg = "-6 V"`) {
			t.Error("n still wrote the file")
		}
	})
}

// TestUndoPerField: u takes back edits newest first, each field getting
// its earlier text back, down to the file's own.
func TestUndoPerField(t *testing.T) {
	m, _ := newOnFile(t, 120, 40)
	editField(t, m, "supply.pos", "6 V")
	editField(t, m, "supply.pos", "7 V")
	editField(t, m, "stage.gain.rf", "70 kOhm")
	raw := func(path string) string {
		for _, f := range m.design.Fields() {
			if f.Path == path {
				return f.Raw
			}
		}
		return "?"
	}
	steps := []struct{ path, want string }{
		{"stage.gain.rf", "52 kOhm"},
		{"supply.pos", "6 V"},
		{"supply.pos", "5 V"},
	}
	for _, s := range steps {
		press(t, m, "u")
		if got := raw(s.path); got != s.want {
			t.Errorf("after u: %s = %q, want %q", s.path, got, s.want)
		}
		if m.form.path() != s.path {
			t.Errorf("after u the cursor is on %s, want %s", m.form.path(), s.path)
		}
	}
	if m.modified() {
		t.Errorf("every edit undone, still modified: %v", m.edits)
	}
	press(t, m, "u")
	if m.message != "nothing to undo" {
		t.Errorf("u with nothing left: %q", m.message)
	}
}

// TestEveryKeyDiscoverable: at 80×24 and 120×40 the footer holds every
// key of the short help whole (wrapped, never cut with "…"), and the ?
// overlay, page by page, shows every key of the full help with its
// description, each page inside the screen.
func TestEveryKeyDiscoverable(t *testing.T) {
	for _, sz := range [][2]int{{80, 24}, {120, 40}} {
		m := newDemo(t, sz[0], sz[1])
		foot := strings.Join(m.footLines(), "\n")
		if strings.Contains(foot, "…") {
			t.Errorf("%v: the footer is cut:\n%s", sz, foot)
		}
		for _, b := range m.ui.keys.ShortHelp() {
			if h := b.Help(); !strings.Contains(foot, h.Key+" "+h.Desc) {
				t.Errorf("%v: the footer lacks %q:\n%s", sz, h.Key+" "+h.Desc, foot)
			}
		}
		press(t, m, "?")
		var seen strings.Builder
		for page := 0; m.mode == modeHelp; page++ {
			if page > 10 {
				t.Fatal("the overlay never ends")
			}
			screen := m.View()
			if n := len(lines(screen)); n != sz[1] {
				t.Errorf("%v: page %d is %d lines", sz, page, n)
			}
			for _, l := range lines(screen)[1 : sz[1]-2] {
				if strings.Contains(l, "…") {
					t.Errorf("%v: page %d cuts a line: %q", sz, page, l)
				}
			}
			seen.WriteString(screen)
			press(t, m, "pgdown")
		}
		for _, col := range m.ui.keys.FullHelp() {
			for _, b := range col {
				h := b.Help()
				if !strings.Contains(seen.String(), h.Key) || !strings.Contains(seen.String(), h.Desc) {
					t.Errorf("%v: the overlay never shows %q %q", sz, h.Key, h.Desc)
				}
			}
		}
		if !strings.Contains(seen.String(), "Caution") {
			t.Errorf("%v: the overlay lacks the caution", sz)
		}
	}
}

// TestWarningsShown: an edit that makes the design impossible (gain
// 1 + 190 kΩ/10 kΩ = 20 on
// the 0.45 V peak: Vo = G·Vp = 9 V, beyond the ±5 V rails) and a package
// the catalog does not hold each show as a warning atop the design pane
// (wrapped, not cut) and are counted on the status line; a package typed
// with other case and separators (soic-8) matches and does not warn; the
// empty list points at the warnings.
func TestWarningsShown(t *testing.T) {
	m := newDemo(t, 120, 40)
	if strings.Contains(m.View(), "⚠") {
		t.Fatalf("the demo design warns:\n%s", m.View())
	}
	editField(t, m, "stage.gain.rf", "190 kOhm") // G = 20: Vo = 20 × 0.45 V = 9 V > 4.75 V
	editField(t, m, "choose.packages", "soic-8, sop99")
	m.focus = paneDesign
	m.form.cursor, m.form.offset = 0, 0
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	screen := m.View()
	for _, want := range []string{
		`⚠ stage "gain": the output must`, "reach -9 V … 9 V, beyond the rails",
		`⚠ package "sop99" is not in the`,
		"⚠ 2 warnings",
	} {
		if !strings.Contains(screen, want) {
			t.Errorf("the screen lacks %q:\n%s", want, screen)
		}
	}
	if strings.Contains(screen, `"soic-8"`) {
		t.Errorf("soic-8 warns, though the catalog holds soic8:\n%s", screen)
	}
	if !strings.Contains(screen, "see the warnings atop the design pane") {
		t.Errorf("the empty list does not point at the warnings:\n%s", screen)
	}
}

// TestSelectionPinnedFromStart: the part selected on the first frame stays
// selected across a re-sort without the user having moved; when an edit
// makes it fail it leaves the list with a note saying why, and the cursor
// goes back to it when f shows the failing parts.
func TestSelectionPinnedFromStart(t *testing.T) {
	m := newDemo(t, 120, 40)
	first := m.list.selected(m.rank.results).Part.ID
	press(t, m, "tab", "s", "s")
	if got := m.list.selected(m.rank.results).Part.ID; got != first {
		t.Errorf("after re-sorting to %s the selection is %s, want %s", m.narrow.sortKey(), got, first)
	}
	editField(t, m, gainFreq, "250 kHz")
	if r := m.list.selected(m.rank.results); r != nil && r.Part.ID == first {
		t.Fatalf("%s still listed after the frequency edit", first)
	}
	if want := first + " no longer passes and left the list"; !strings.Contains(m.message, want) {
		t.Errorf("message %q, want it to say %q", m.message, want)
	}
	press(t, m, "f")
	if got := m.list.selected(m.rank.results).Part.ID; got != first {
		t.Errorf("with failing parts shown the selection is %s, want %s back", got, first)
	}
}

// TestCheckNotesReadable: at 120×40 and 80×24 every check's note (its
// formula or worst-case rule, with the aside such as a predicted
// frequency or a TIA's Cf) can be read in full in the checks pane: wrapped
// onto detail lines, never cut.
func TestCheckNotesReadable(t *testing.T) {
	squash := func(s string) string { return strings.Join(strings.Fields(s), " ") }
	for _, name := range []string{data.DefaultDesign, "turbidity-5v.toml"} {
		d, _ := embeddedDesign(t, name)
		for _, sz := range [][2]int{{120, 40}, {80, 24}} {
			m := New(Config{Design: d, Catalog: demoCatalog(t), Renderer: asciiRenderer()})
			m.Update(tea.WindowSizeMsg{Width: sz[0], Height: sz[1]})
			run(t, m, m.Init())
			press(t, m, "f")
			r := m.list.selected(m.rank.results)
			if r == nil {
				t.Fatalf("%s: nothing selected", name)
			}
			l := m.ui.layout()
			text := squash(strings.Join(m.checks.lines(r, l.detail.w), " "))
			for i := range r.Checks {
				c := &r.Checks[i]
				note := c.Note
				if note == "" {
					note = c.Req.Why
				}
				if a := c.Aside.Text(); a != "" {
					note = a + " · " + note
				}
				if !strings.Contains(text, squash(note)) {
					t.Errorf("%s %v: the note of %s/%s is not readable in full: %q", name, sz, c.Req.Stage, c.Req.Key, note)
				}
			}
		}
	}
}

// TestJSONExportRecordsInputs: a JSON export from the selector carries the
// block every JSON output of the command line opens with: the version,
// the date, the design file and that it was modified, the edited input's
// text in force, and every catalog source with its SHA-256.
func TestJSONExportRecordsInputs(t *testing.T) {
	m, path := newOnFile(t, 120, 40)
	m.cfg.Version = "9.9.9-test"
	editField(t, m, "supply.pos", "6 V")
	out := filepath.Join(filepath.Dir(path), "short.json")
	press(t, m, "tab", "space", "x", "ctrl+u")
	typeText(t, m, out)
	press(t, m, "enter")
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatalf("%v; screen:\n%s", err, m.View())
	}
	var doc struct {
		Version   string `json:"version"`
		Generated string `json:"generated"`
		Title     string `json:"title"`
		Design    struct {
			File     string `json:"file"`
			Modified bool   `json:"modified"`
			Inputs   []struct {
				Path, Text string
				Given      bool
			} `json:"inputs"`
		} `json:"design"`
		Catalog struct {
			Sources []struct {
				Path, SHA256 string
				Parts        int
			} `json:"sources"`
		} `json:"catalog"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Version != "9.9.9-test" || doc.Generated == "" || doc.Design.File != path || !doc.Design.Modified {
		t.Errorf("version %q, generated %q, file %q, modified %v", doc.Version, doc.Generated, doc.Design.File, doc.Design.Modified)
	}
	if !strings.Contains(doc.Title, "edited: supply.pos = 6 V") {
		t.Errorf("title %q does not name the edit", doc.Title)
	}
	found := false
	for _, in := range doc.Design.Inputs {
		if in.Path == "supply.pos" {
			found = in.Text == "6 V" && in.Given
		}
	}
	if !found {
		t.Errorf("the inputs lack supply.pos = 6 V: %+v", doc.Design.Inputs)
	}
	if len(doc.Catalog.Sources) == 0 || len(doc.Catalog.Sources[0].SHA256) != 64 || doc.Catalog.Sources[0].Parts == 0 {
		t.Errorf("catalog sources: %+v", doc.Catalog.Sources)
	}
}

// TestSmokeListsEveryHelpKey: .ci/tmux-smoke asserts at 80×24 that every
// key of the help overlay is visible; its list of descriptions must be the
// overlay's, so a key added to the KeyMap is checked there too.
func TestSmokeListsEveryHelpKey(t *testing.T) {
	b, err := os.ReadFile("../.ci/tmux-smoke")
	if err != nil {
		t.Fatal(err)
	}
	s := string(b)
	start := strings.Index(s, "help_keys=(")
	if start < 0 {
		t.Fatal("tmux-smoke has no help_keys list")
	}
	end := strings.Index(s[start:], ")\n")
	list := s[start : start+end]
	var want []string
	for _, col := range DefaultKeyMap().FullHelp() {
		for _, k := range col {
			want = append(want, `"`+k.Help().Desc+`"`)
		}
	}
	for _, w := range want {
		if !strings.Contains(list, w) {
			t.Errorf("tmux-smoke's help_keys lacks %s", w)
		}
	}
	if n := strings.Count(list, `"`) / 2; n != len(want) {
		t.Errorf("tmux-smoke's help_keys has %d entries, the overlay %d keys", n, len(want))
	}
}

// TestFailingPartSummary: the checks pane of a failing part names what it
// fails, worst miss first, a hard filter by its reason, and the list
// shows no positive margin for it.
func TestFailingPartSummary(t *testing.T) {
	m := newDemo(t, 120, 40)
	editField(t, m, "choose.packages", "msop8")
	press(t, m, "f")
	found := false
	for _, i := range m.list.view {
		r := &m.rank.results[i]
		explain(m.rank.resPlan, r, false)
		if r.Pass {
			continue
		}
		margin, _ := marginCells(r)
		if strings.HasPrefix(margin, "+") {
			t.Errorf("failing %s shows margin %s", r.Part.ID, margin)
		}
		if r.Failed == 1 && !slices.Contains(r.Part.Packages, "msop8") {
			found = true
			if got := m.checks.summary(r); !strings.Contains(got, "✗ fails: package not offered") {
				t.Errorf("%s: summary %q", r.Part.ID, got)
			}
		}
	}
	if !found {
		t.Fatal("no part fails on the package alone; the test covers nothing")
	}
}
