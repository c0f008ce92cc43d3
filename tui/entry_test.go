package tui

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"
	"github.com/charmbracelet/x/exp/teatest"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/data"
)

// teamFile is a user's catalog file with comments, alignment and two
// invented parts; the entry form must keep every byte of it.
const teamFile = `# Team catalog — invented parts for the entry-form tests.
# Keep this header comment.

[[part]]   # the general-purpose dual
id = "tf-dual"
name = "Team test dual, bipolar"
tech     = "bipolar"
channels = 2
packages = ["soic8", "dip8"]
supply = { min = "4 V", max = "30 V" }
gbw  = { typ = "1.1 MHz", min = "0.8 MHz" }   # from the table
slew = { typ = "0.6 V/us" }

# ---- the fast one ----
[[part]]
id = "tf-fast"
name = "Team test single, fast CMOS"
tech = "cmos"
channels = 1
packages = ["sot23-5"]
supply = { min = "2.2 V", max = "5.5 V" }
input_cm = { low = "-0.1 V", high = "0.1 V" }
output = { low = "0.02 V", high = "-0.02 V", load = "10 kOhm" }
gbw = { typ = "40 MHz", min = "30 MHz" }
slew = { typ = "25 V/us", min = "18 V/us" }
iq = { typ = "1.2 mA", max = "1.6 mA" }
iout = { typ = "60 mA", min = "40 mA" }

# trailing comment
`

// teamSelector starts the selector on the demo catalog with the team file
// as a second source on disk, reloading both from disk, at w×h.
func teamSelector(t *testing.T, w, h int) (*Model, string) {
	t.Helper()
	cfg, file := teamConfig(t)
	m := New(cfg)
	m.Update(tea.WindowSizeMsg{Width: w, Height: h})
	run(t, m, m.Init())
	return m, file
}

// teamConfig is the selector's configuration over the demo catalog and the
// team file, written to a temporary directory as a second source on disk,
// both read again from disk on each reload; file is the team file.
func teamConfig(t *testing.T) (Config, string) {
	t.Helper()
	file := filepath.Join(t.TempDir(), "team.toml")
	if err := os.WriteFile(file, []byte(teamFile), 0o644); err != nil {
		t.Fatal(err)
	}
	load := func() (*catalog.Catalog, error) {
		return catalog.Load(catalog.FSLayer("demo", data.Catalog), catalog.PathLayer(file))
	}
	c, err := load()
	if err != nil {
		t.Fatal(err)
	}
	return Config{Design: demoDesign(t), Catalog: c, Load: load, OnDisk: []string{file}, Renderer: asciiRenderer()}, file
}

// typeInto moves the form's cursor to key's field sub with tab, as a
// user does, replaces its text and types text.
func typeInto(t *testing.T, m *Model, key, sub, text string) {
	t.Helper()
	for range 200 {
		r := m.entry.rows[m.entry.row]
		if r.key == key && r.cells[m.entry.cell].sub == sub {
			press(t, m, "ctrl+u")
			typeText(t, m, text)
			return
		}
		press(t, m, "tab")
	}
	t.Fatalf("no field %s.%s in the form", key, sub)
}

// partIndex is the place of part id in the ranking, -1 when it is not in it.
func partIndex(m *Model, id string) int {
	for i := range m.rank.results {
		if m.rank.results[i].Part.ID == id {
			return i
		}
	}
	return -1
}

// TestEntryAddsPartToRanking types a new part into the form, saves it
// into the team file and finds it in the ranking without a restart, at
// the place the form said it would take; the file keeps every byte it
// had, comments included, with the part's table after them.
func TestEntryAddsPartToRanking(t *testing.T) {
	m, file := teamSelector(t, 120, 40)
	press(t, m, "a")
	if m.mode != modeEntry {
		t.Fatalf("a did not open the entry form (mode %d)", m.mode)
	}
	for _, f := range [][3]string{
		{"id", "", "tf-new"}, {"name", "", "Team test dual, new entry"}, {"tech", "", "cmos"},
		{"channels", "", "2"}, {"packages", "", "soic8, msop8"}, {"unit_cost", "", "0.4"},
		{"temp", "low", "-40 C"}, {"temp", "high", "125 C"},
		{"supply", "min", "2.7 V"}, {"supply", "max", "12 V"},
		{"input_cm", "low", "-0.1 V"}, {"input_cm", "high", "0.1 V"},
		{"output", "low", "0.03 V"}, {"output", "high", "-0.03 V"}, {"output", "load", "10 kOhm"},
		{"gbw", "typ", "22 MHz"}, {"gbw", "min", "16 MHz"},
		{"slew", "typ", "14 V/us"}, {"slew", "min", "10 V/us"}, {"slew", "source", "table"},
		{"vos", "typ", "0.4 mV"}, {"vos", "max", "1.5 mV"}, {"ib", "typ", "5 pA"}, {"ib", "max", "60 pA"},
		{"en", "typ", "11 nV/rtHz"}, {"iq", "typ", "0.9 mA"}, {"iq", "max", "1.3 mA"},
		{"iout", "typ", "45 mA"}, {"iout", "min", "30 mA"}, {"aol", "typ", "110 dB"},
	} {
		typeInto(t, m, f[0], f[1], f[2])
	}
	f := &m.entry
	if f.part == nil || f.result == nil {
		t.Fatalf("the complete part does not evaluate: %v %v", f.probs, f.general)
	}
	predicted, pass := f.pos, f.result.Pass
	screen := m.View()
	if !strings.Contains(screen, "IN THE DESIGN") || !strings.Contains(screen, "would") {
		t.Errorf("the form does not show the part in the design:\n%s", screen)
	}
	press(t, m, "ctrl+s")
	if m.entry.ask != askPath || strings.TrimSpace(m.entry.path.Value()) != file {
		t.Fatalf("ctrl+s does not offer the team file (ask %d, path %q)", m.entry.ask, m.entry.path.Value())
	}
	press(t, m, "enter")
	if m.mode != modeBrowse {
		t.Fatalf("the form is still open after saving: %s", m.entry.err)
	}
	i := partIndex(m, "tf-new")
	if i < 0 {
		t.Fatalf("tf-new is not in the ranking after the save; message %q", m.message)
	}
	if i != predicted || m.rank.results[i].Pass != pass {
		t.Errorf("tf-new ranks %d (pass %v), the form predicted %d (pass %v)", i, m.rank.results[i].Pass, predicted, pass)
	}
	if pass {
		if r := m.list.selected(m.rank.results); r == nil || r.Part.ID != "tf-new" {
			t.Errorf("the saved part is not selected")
		}
	}
	got, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(got, []byte(teamFile)) {
		t.Errorf("the team file lost bytes of what it had:\n%s", got)
	}
	tail := string(got[len(teamFile):])
	if !strings.HasPrefix(tail, "\n[[part]]\nid = \"tf-new\"\n") {
		t.Errorf("the new table does not follow the file's text after a blank line:\n%q", tail)
	}
	ps, err := catalog.Decode(file, got)
	if err != nil || len(ps) != 3 {
		t.Errorf("the saved file reads %d parts: %v", len(ps), err)
	}
}

// TestEntryCopyPredictsRank copies the top demo part (the embedded
// catalog is read-only, so A opens a copy to save as a new part), gives it
// an id of its own and saves it into a new file: the part joins the
// session's sources through AddSource and ranks where the form said.
func TestEntryCopyPredictsRank(t *testing.T) {
	dir := t.TempDir()
	var extra []catalog.Layer
	load := func() (*catalog.Catalog, error) {
		return catalog.Load(append([]catalog.Layer{catalog.FSLayer("demo", data.Catalog)}, extra...)...)
	}
	c, _ := load()
	m := New(Config{Design: demoDesign(t), Catalog: c, Load: load, Renderer: asciiRenderer(),
		AddSource: func(p string) { extra = append(extra, catalog.PathLayer(p)) }})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	run(t, m, m.Init())
	top := m.list.selected(m.rank.results).Part
	press(t, m, "A")
	if m.mode != modeEntry || m.entry.editing != "" {
		t.Fatalf("A on a demo part does not open a copy (mode %d, editing %q)", m.mode, m.entry.editing)
	}
	if !strings.Contains(m.message, "read-only") {
		t.Errorf("the message does not say the demo catalog is read-only: %q", m.message)
	}
	press(t, m, "ctrl+s")
	if m.entry.part != nil || !strings.Contains(m.entry.err, "problem") {
		t.Errorf("a copy without an id saves: err %q", m.entry.err)
	}
	typeInto(t, m, "id", "", top.ID)
	if ps := m.entry.probs["id"]; len(ps) == 0 || !strings.Contains(ps[0], "already in the catalog") {
		t.Errorf("an id taken in the catalog is not refused: %v", ps)
	}
	typeInto(t, m, "id", "", "zz-copy")
	if m.entry.result == nil || !m.entry.result.Pass {
		t.Fatalf("the copy of the top part does not pass")
	}
	predicted := m.entry.pos
	press(t, m, "ctrl+s")
	if m.entry.ask != askPath || m.entry.path.Value() != "" {
		t.Fatalf("with only the demo catalog the form suggests %q", m.entry.path.Value())
	}
	press(t, m, "enter") // no file given
	if !strings.Contains(m.entry.err, "read-only") {
		t.Errorf("saving with no file does not say where to save: %q", m.entry.err)
	}
	press(t, m, "ctrl+s")
	typeText(t, m, filepath.Join(dir, "mine.toml"))
	press(t, m, "enter")
	if i := partIndex(m, "zz-copy"); i != predicted {
		t.Errorf("zz-copy ranks %d, the form predicted %d (message %q)", i, predicted, m.message)
	}
	if len(extra) != 1 || !strings.Contains(m.message, "catalog sources") {
		t.Errorf("the new file did not join the sources: %v, %q", extra, m.message)
	}
}

// TestEntryMessagesAreChecks: what the form says about a field is what
// the catalog decoder behind opsift check says about the same part
// written by hand in a file.
func TestEntryMessagesAreChecks(t *testing.T) {
	m, _ := teamSelector(t, 120, 40)
	press(t, m, "a")
	for _, f := range [][3]string{
		{"id", "", "Bad_ID"}, {"name", "", "Faulty entry"}, {"tech", "", "cmso"}, {"channels", "", "2x"},
		{"packages", "", "soic8"}, {"supply", "min", "5 V"}, {"gbw", "typ", "1 V/us"},
		{"slew", "typ", "0.5 V/us"}, {"slew", "min", "0.9 V/us"}, {"vos", "source", "graf"},
	} {
		typeInto(t, m, f[0], f[1], f[2])
	}
	file := `[[part]]
id = "Bad_ID"
name = "Faulty entry"
tech = "cmso"
channels = "2x"
packages = ["soic8"]
supply = { min = "5 V" }
gbw = { typ = "1 V/us" }
slew = { typ = "0.5 V/us", min = "0.9 V/us" }
vos = { source = "graf" }
`
	_, err := catalog.Decode("hand.toml", []byte(file))
	var ps catalog.Problems
	if !errors.As(err, &ps) {
		t.Fatalf("the hand-written part has no problems: %v", err)
	}
	want := map[string]string{}
	for _, p := range ps {
		want[p.Field] = p.Err.Error()
	}
	if len(want) != 7 {
		t.Fatalf("the hand-written part has problems in %d fields, want 7: %v", len(want), ps)
	}
	for field, msg := range want {
		got := m.entry.probs[field]
		if len(got) != 1 || got[0] != msg {
			t.Errorf("field %s: the form says %q, check says %q", field, got, msg)
		}
	}
	// The focused field's problem is on screen, the row marked.
	typeInto(t, m, "tech", "", "cmso")
	screen := m.View()
	if !regexp.MustCompile(`tech +!`).MatchString(screen) || !strings.Contains(screen, `"cmso" is not a known tech`) {
		t.Errorf("the tech problem is not shown:\n%s", screen)
	}
	press(t, m, "ctrl+s")
	if m.entry.ask != askNone || !strings.Contains(m.entry.err, "7 problems") {
		t.Errorf("a part with problems is offered for saving: ask %d, %q", m.entry.ask, m.entry.err)
	}
}

// TestEntryEditsInPlace edits a figure of the first team part: only that
// value's text changes in the file.
func TestEntryEditsInPlace(t *testing.T) {
	m, file := teamSelector(t, 120, 40)
	press(t, m, "f") // the dual fails the demo design; show it
	selectID(t, m, "tf-dual")
	press(t, m, "A")
	if m.entry.editing != "tf-dual" {
		t.Fatalf("A does not edit tf-dual (editing %q)", m.entry.editing)
	}
	if got := m.entry.rows[rowOf(&m.entry, "gbw")].cells[0].in.Value(); got != "1.1 MHz" {
		t.Errorf("the form holds gbw.typ %q, want the file's 1.1 MHz", got)
	}
	typeInto(t, m, "gbw", "typ", "1.3 MHz")
	press(t, m, "ctrl+s")
	if m.mode != modeBrowse {
		t.Fatalf("the edit was not saved: %s", m.entry.err)
	}
	got, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	// Only the changed value's text differs: the comment beside it, the
	// alignment and every other line stay as written.
	want := strings.Replace(teamFile, `gbw  = { typ = "1.1 MHz", min = "0.8 MHz" }   # from the table`,
		`gbw  = { typ = "1.3 MHz", min = "0.8 MHz" }   # from the table`, 1)
	if string(got) != want {
		t.Errorf("the file after the edit:\n%s\nwant:\n%s", got, want)
	}
	i := partIndex(m, "tf-dual")
	if i < 0 || m.rank.results[i].Part.GBW.Typ.V() != 1.3e6 {
		t.Errorf("the reloaded ranking does not hold the edited gbw")
	}
	if n := strings.Count(string(got), "[[part]]"); n != 2 {
		t.Errorf("the file has %d parts after the edit, want 2", n)
	}
}

// TestEntryLeaving: esc leaves an untouched form at once and asks before
// throwing typed fields away.
func TestEntryLeaving(t *testing.T) {
	m, file := teamSelector(t, 80, 24)
	press(t, m, "a", "esc")
	if m.mode != modeBrowse {
		t.Fatal("esc does not leave an untouched form")
	}
	press(t, m, "a")
	typeText(t, m, "half-done")
	press(t, m, "esc")
	if m.mode != modeEntry || m.entry.ask != askDiscard {
		t.Fatal("esc with typed fields does not ask")
	}
	press(t, m, "n")
	if m.entry.rows[0].cells[0].in.Value() != "half-done" {
		t.Error("n did not keep the fields")
	}
	press(t, m, "esc", "y")
	if m.mode != modeBrowse {
		t.Error("y does not leave")
	}
	if got, _ := os.ReadFile(file); string(got) != teamFile {
		t.Error("leaving the form wrote the file")
	}
}

// TestEntryScreens draws the form at both sizes the layout is made for:
// every line fits, the field list scrolls to the cursor's row and the
// hint under it names the unit.
func TestEntryScreens(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		m, _ := teamSelector(t, sz[0], sz[1])
		press(t, m, "a")
		for range len(m.entry.rows) - 1 {
			press(t, m, "down")
		}
		s := m.View()
		ls := lines(s)
		if len(ls) != sz[1] {
			t.Errorf("%dx%d: %d lines", sz[0], sz[1], len(ls))
		}
		for i, l := range ls {
			if w := ansi.StringWidth(l); w > sz[0] {
				t.Errorf("%dx%d: line %d is %d wide", sz[0], sz[1], i, w)
			}
		}
		if !strings.Contains(s, "▸ notes") || !strings.Contains(s, "notes: free text") {
			t.Errorf("%dx%d: the last row or its hint is not on screen:\n%s", sz[0], sz[1], s)
		}
		press(t, m, "pgup", "pgup", "pgup", "pgup", "pgup", "pgup")
		typeInto(t, m, "gbw", "min", "")
		if s := m.View(); !strings.Contains(s, `frequency such as "1 MHz"`) {
			t.Errorf("%dx%d: no unit hint for gbw.min:\n%s", sz[0], sz[1], s)
		}
	}
}

// TestEntryHostileText: a part whose name holds escape sequences (built
// in code past the catalog's checks) is copied into the form, and the
// same text is typed into a field: no frame lets a control byte through,
// the text shows escaped, and validation refuses it.
func TestEntryHostileText(t *testing.T) {
	cat := demoCatalog(t)
	bad := *cat.Parts[0]
	bad.Name = hostileText
	cat.Parts = append([]*catalog.Part{&bad}, cat.Parts[1:]...)
	m := New(Config{Design: demoDesign(t), Catalog: cat, Renderer: asciiRenderer()})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	run(t, m, m.Init())
	press(t, m, "f")
	selectID(t, m, bad.ID)
	press(t, m, "A")
	frames := []string{m.View()}
	typeInto(t, m, "name", "", "x")
	press(t, m, "backspace")
	for _, r := range hostileText {
		_, cmd := m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune{r}})
		run(t, m, cmd)
	}
	frames = append(frames, m.View())
	typeInto(t, m, "id", "", "evil\x1b[2Jid")
	frames = append(frames, m.View())
	for i, f := range frames {
		if err := safe.CheckOutput(f); err != nil {
			t.Errorf("frame %d: %v", i, err)
		}
		for j, l := range lines(f) {
			if w := ansi.StringWidth(l); w > 120 {
				t.Errorf("frame %d line %d is %d wide", i, j, w)
			}
		}
	}
	if len(m.entry.probs["name"]) == 0 || len(m.entry.probs["id"]) == 0 {
		t.Errorf("hostile name and id are not refused: %v", m.entry.probs)
	}
	if !strings.Contains(frames[0], `\u202e`) || !strings.Contains(frames[1], `\u202e`) {
		t.Errorf("the copied or typed name is not shown escaped:\n%s\n%s", frames[0], frames[1])
	}
}

// rowOf is the index of key's row in the form.
func rowOf(f *entryForm, key string) int {
	for i, r := range f.rows {
		if r.key == key {
			return i
		}
	}
	return -1
}

// TestEntryEndToEnd runs the real program (teatest) as opsift add does:
// the form is open from the start; a part is typed field by field with
// tab, saved with ctrl+s and enter, and shows in the list after the
// background write and reload, without a restart.
func TestEntryEndToEnd(t *testing.T) {
	cfg, file := teamConfig(t)
	cfg.StartEntry, cfg.SaveTo = true, file
	m := New(cfg)
	tm := teatest.NewTestModel(t, m, teatest.WithInitialTermSize(80, 24))
	out := &screenLog{r: tm.Output()}
	out.waitFor(t, "NEW PART")
	tab := func(n int) {
		for range n {
			tm.Send(tea.KeyMsg{Type: tea.KeyTab})
		}
	}
	tm.Type("tf-e2e")
	tab(1)
	tm.Type("Team test, typed end to end")
	tab(1)
	tm.Type("cmos")
	tab(1)
	tm.Type("2")
	tab(1)
	tm.Type("soic8")
	tab(6) // to supply.min
	tm.Type("2.7 V")
	tab(1)
	tm.Type("12 V")
	tab(8) // to gbw.typ
	tm.Type("5 MHz")
	tab(6) // to slew.typ
	tm.Type("3 V/us")
	out.waitFor(t, "would")
	tm.Send(tea.KeyMsg{Type: tea.KeyCtrlS})
	out.waitFor(t, "save into")
	tm.Send(tea.KeyMsg{Type: tea.KeyEnter})
	out.waitFor(t, "saved tf-e2e into team.toml")
	tm.Type("q")
	tm.WaitFinished(t, teatest.WithFinalTimeout(5*time.Second))
	fm := tm.FinalModel(t).(*Model)
	if partIndex(fm, "tf-e2e") < 0 {
		t.Errorf("tf-e2e is not in the final ranking")
	}
	got, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(got, []byte(teamFile)) || !bytes.Contains(got, []byte(`id = "tf-e2e"`)) {
		t.Errorf("the file does not hold its old text and the new part:\n%s", got)
	}
}

// TestWritePartRefuses: a new part is not appended to a file that is not
// valid TOML, nor to one already holding its id, and an edit of a part
// no longer in its file writes nothing; each file is left as it was.
func TestWritePartRefuses(t *testing.T) {
	dir := t.TempDir()
	ps, err := catalog.Decode("team.toml", []byte(teamFile))
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name, text, editing, want string
	}{
		{"syntax", "[[part]\nid = \"x\"\n", "", "not a catalog file that reads"},
		{"same id", teamFile, "", `already holds a part "tf-dual"`},
		{"gone", "# nothing here\n", "tf-dual", "no such part in the file"},
	} {
		file := filepath.Join(dir, tc.name+".toml")
		if err := os.WriteFile(file, []byte(tc.text), 0o644); err != nil {
			t.Fatal(err)
		}
		err := writePart(file, tc.editing, ps[0])
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want %q", tc.name, err, tc.want)
		}
		if got, _ := os.ReadFile(file); string(got) != tc.text {
			t.Errorf("%s: the file changed", tc.name)
		}
	}
}
