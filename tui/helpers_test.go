package tui

import (
	"fmt"
	"io"
	"io/fs"
	"math"
	"math/rand/v2"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/internal/golden"
)

// asciiRenderer draws without colour or attributes: golden screens and
// NO_COLOR.
func asciiRenderer() *lipgloss.Renderer {
	r := lipgloss.NewRenderer(io.Discard)
	r.SetColorProfile(termenv.Ascii)
	return r
}

// demoDesign decodes the embedded default design.
func demoDesign(t testing.TB) *filter.Design {
	t.Helper()
	d, _ := embeddedDesign(t, data.DefaultDesign)
	return d
}

// embeddedDesign decodes the embedded demo design name and returns it with
// its text.
func embeddedDesign(t testing.TB, name string) (*filter.Design, []byte) {
	t.Helper()
	b, err := fs.ReadFile(data.Designs, name)
	if err != nil {
		t.Fatal(err)
	}
	d, err := filter.DecodeDesign(name, b)
	if err != nil {
		t.Fatal(err)
	}
	return d, b
}

// demoCatalog loads the embedded demo catalog.
func demoCatalog(t testing.TB) *catalog.Catalog {
	t.Helper()
	c, err := catalog.Load(catalog.FSLayer(catalog.DemoName, data.Catalog))
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// newDemo builds a selector on the demo design and catalog at w×h, with
// its first ranking done.
func newDemo(t testing.TB, w, h int) *Model {
	t.Helper()
	m := New(Config{Design: demoDesign(t), Catalog: demoCatalog(t), Renderer: asciiRenderer()})
	m.Update(tea.WindowSizeMsg{Width: w, Height: h})
	run(t, m, m.Init())
	return m
}

// run executes cmd and feeds what it returns back to m, until no command
// is left: a synchronous stand-in for the bubbletea loop. Ticks and
// external processes are not run (tests make no timers or editors).
func run(t testing.TB, m *Model, cmd tea.Cmd) {
	t.Helper()
	queue := []tea.Cmd{cmd}
	for n := 0; len(queue) > 0; n++ {
		if n > 1000 {
			t.Fatal("commands keep coming")
		}
		c := queue[0]
		queue = queue[1:]
		if c == nil {
			continue
		}
		msg := c()
		switch msg := msg.(type) {
		case nil:
		case tea.BatchMsg:
			queue = append(queue, msg...)
		case tea.QuitMsg:
		default:
			_, next := m.Update(msg)
			queue = append(queue, next)
		}
	}
}

// press sends keys to m one by one, running what each returns. A key is a
// name bubbletea gives ("enter", "esc", "down", "ctrl+u", "backspace",
// "space") or text typed as runes.
func press(t testing.TB, m *Model, keys ...string) {
	t.Helper()
	for _, k := range keys {
		_, cmd := m.Update(keyMsg(k))
		run(t, m, cmd)
	}
}

// keyMsg makes the tea.KeyMsg a terminal would give for k.
func keyMsg(k string) tea.KeyMsg {
	names := map[string]tea.KeyType{
		"enter": tea.KeyEnter, "esc": tea.KeyEsc, "up": tea.KeyUp, "down": tea.KeyDown,
		"tab": tea.KeyTab, "shift+tab": tea.KeyShiftTab, "backspace": tea.KeyBackspace,
		"ctrl+u": tea.KeyCtrlU, "ctrl+c": tea.KeyCtrlC, "ctrl+s": tea.KeyCtrlS, "space": tea.KeySpace,
		"pgdown": tea.KeyPgDown, "pgup": tea.KeyPgUp, "home": tea.KeyHome, "end": tea.KeyEnd,
	}
	if kt, ok := names[k]; ok {
		if kt == tea.KeySpace {
			return tea.KeyMsg{Type: tea.KeySpace, Runes: []rune{' '}}
		}
		return tea.KeyMsg{Type: kt}
	}
	return tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(k)}
}

// typeText sends each rune of s as its own key, as a user types.
func typeText(t testing.TB, m *Model, s string) {
	t.Helper()
	for _, r := range s {
		press(t, m, string(r))
	}
}

// fieldIndex is the position of a design field in the design pane.
func fieldIndex(t testing.TB, m *Model, path string) int {
	t.Helper()
	for i, f := range m.form.fields {
		if f.Path == path {
			return i
		}
	}
	t.Fatalf("no field %q", path)
	return 0
}

// editField moves the design pane's cursor to path, replaces its text by
// text key by key, and leaves the field with enter.
func editField(t testing.TB, m *Model, path, text string) {
	t.Helper()
	m.focus = paneDesign
	m.form.cursor = fieldIndex(t, m, path)
	press(t, m, "enter", "ctrl+u")
	typeText(t, m, text)
	press(t, m, "enter")
}

// topIDs are the ids of the first n rows of the candidate list.
func topIDs(m *Model, n int) []string {
	var out []string
	for i := 0; i < n && i < len(m.list.view); i++ {
		out = append(out, m.rank.results[m.list.view[i]].Part.ID)
	}
	return out
}

// selectID puts the list cursor on part id.
func selectID(t testing.TB, m *Model, id string) {
	t.Helper()
	for i, ri := range m.list.view {
		if m.rank.results[ri].Part.ID == id {
			m.list.move(i-m.list.cursor, m.rank.results, m.listRows())
			return
		}
	}
	t.Fatalf("part %q is not in the list %v", id, topIDs(m, 100))
}

// checkGolden compares got with DIR/NAME.golden (rewritten with -update).
func checkGolden(t *testing.T, dir, name, got string) {
	t.Helper()
	golden.Check(t, filepath.Join(dir, name+".golden"), []byte(got))
}

// syntheticParts makes n valid, varied parts for benchmarks: figures drawn
// from the ranges real general-purpose parts span, seeded so every run
// ranks the same catalog.
func syntheticParts(n int) []*catalog.Part {
	rng := rand.New(rand.NewPCG(1, 2))
	techs := []catalog.Tech{catalog.TechBipolar, catalog.TechCMOS, catalog.TechJFET, catalog.TechBiCMOS}
	pkgs := []string{"soic8", "soic14", "msop8", "dip8", "sot5", "tssop14"}
	parts := make([]*catalog.Part, n)
	for i := range parts {
		lg := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rng.Float64()) }
		ch := []int{1, 2, 4}[rng.IntN(3)]
		gbw := lg(0.1e6, 100e6)
		slew := lg(0.05e6, 50e6)
		smax := []float64{5.5, 16, 36, 40}[rng.IntN(4)]
		p := &catalog.Part{
			ID:        fmt.Sprintf("syn-%06d", i),
			Name:      fmt.Sprintf("synthetic %d-channel part %d", ch, i),
			Tech:      techs[rng.IntN(len(techs))],
			Channels:  ch,
			Packages:  []string{pkgs[rng.IntN(len(pkgs))], pkgs[rng.IntN(len(pkgs))]},
			Lifecycle: catalog.LifecycleActive,
			UnitCost:  catalog.Some(lg(0.05, 5)),
			Temp:      [2]catalog.Opt{catalog.Some(-40), catalog.Some(125)},
			Supply:    catalog.Span{Min: catalog.Some(smax / 6), Max: catalog.Some(smax)},
			InputCM:   catalog.Headroom{Low: catalog.Some(-0.1), High: catalog.Some(-lg(0.01, 2))},
			Output:    catalog.Swing{Low: catalog.Some(0.02), High: catalog.Some(-lg(0.01, 1.5)), Load: catalog.Some(10e3)},
			GBW:       catalog.Spec{Typ: catalog.Some(gbw), Min: catalog.Some(0.7 * gbw)},
			Slew:      catalog.Spec{Typ: catalog.Some(slew)},
			Aol:       catalog.Spec{Typ: catalog.Some(110), Min: catalog.Some(90)},
			Vos:       catalog.Spec{Typ: catalog.Some(lg(10e-6, 2e-3)), Max: catalog.Some(lg(2e-3, 7e-3))},
			Ib:        catalog.Spec{Typ: catalog.Some(lg(1e-12, 50e-9)), Max: catalog.Some(lg(50e-9, 250e-9))},
			Iq:        catalog.Spec{Typ: catalog.Some(lg(10e-6, 2e-3))},
			Iout:      catalog.Spec{Typ: catalog.Some(lg(5e-3, 80e-3))},
			Notes:     "generated for benchmarks",
			Pos:       catalog.Pos{File: "synthetic.toml", Line: 1 + 25*i},
		}
		parts[i] = p
	}
	return parts
}

// lines splits a screen into its lines.
func lines(s string) []string { return strings.Split(s, "\n") }
