package tui

import (
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
	"github.com/muesli/termenv"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
)

// hostileText holds what a shared catalog could use against a terminal:
// OSC 52 (clipboard write), OSC 0 (window title), CSI 2J (clear screen),
// CR LF (broken rows), a C1 CSI and a bidi override (ECMA-48 and Unicode
// Standard Annex #9; from memory).
const hostileText = "evil\x1b]52;c;aGVsbG8=\x07\x1b]0;pwned\x07\x1b[2J\r\n\u009b2J\u202eRLO"

// TestSelectorFrameHasNoControlBytes draws the selector in colour with a
// hostile part name, design title and error message, and scans every
// frame for control bytes that are not the program's own styling.
func TestSelectorFrameHasNoControlBytes(t *testing.T) {
	hostile := filepath.Join("..", "testdata", "hostile")
	b, err := os.ReadFile(filepath.Join(hostile, "designs", "hostile_title.toml"))
	if err != nil {
		t.Fatal(err)
	}
	d, err := filter.DecodeDesign("hostile_title.toml", b)
	if err != nil {
		t.Fatal(err)
	}
	cat, err := catalog.Load(catalog.PathLayer(filepath.Join(hostile, "catalog", "plain.toml")))
	if err != nil {
		t.Fatal(err)
	}
	// Parts built in code bypass the catalog's checks: the selector must
	// still escape them.
	bad := *cat.Parts[0]
	bad.Name, bad.Notes = hostileText, hostileText
	cat.Parts = []*catalog.Part{&bad}
	r := lipgloss.NewRenderer(io.Discard)
	r.SetColorProfile(termenv.TrueColor)
	m := New(Config{Design: d, Catalog: cat, Renderer: r, DesignFile: "design\x1b[2J.toml"})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	run(t, m, m.Init())
	m.focus = paneList
	frames := []string{m.View()}
	m.setMessage("file %s", "x\x1b]0;t\x07.toml")
	frames = append(frames, m.View())
	press(t, m, "enter")
	frames = append(frames, m.View())
	press(t, m, "tab", "tab")
	frames = append(frames, m.View())
	for i, f := range frames {
		if err := safe.CheckOutput(f); err != nil {
			t.Errorf("frame %d: %v", i, err)
		}
		// Escaping at the source keeps the layout: a string escaped only by
		// the last net (safe.Styled) would overflow its line.
		for j, l := range strings.Split(f, "\n") {
			if w := ansi.StringWidth(l); w > 120 {
				t.Errorf("frame %d line %d is %d cells wide: %q", i, j, w, ansi.Strip(l))
			}
		}
	}
	if !strings.Contains(frames[0], `\x1b]52`) {
		t.Errorf("the hostile name is not shown escaped:\n%s", frames[0])
	}
}

// TestReloadNewestWins: two reads overlap and the older one finishes
// last; the catalog of the newer read stays on screen.
func TestReloadNewestWins(t *testing.T) {
	cat := demoCatalog(t)
	smaller := *cat
	smaller.Parts = cat.Parts[:3]
	var next *catalog.Catalog
	m := New(Config{Design: demoDesign(t), Catalog: cat, Renderer: asciiRenderer(),
		Load: func() (*catalog.Catalog, error) { return next, nil }})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	run(t, m, m.Init())
	older := m.reload("first")
	newer := m.reload("second")
	next = &smaller
	newMsg := newer()
	next = cat
	oldMsg := older()
	run(t, m, func() tea.Msg { return newMsg })
	run(t, m, func() tea.Msg { return oldMsg })
	if got := len(m.cat.Parts); got != 3 {
		t.Fatalf("catalog has %d parts after the stale read came last, want the newer read's 3", got)
	}
}

// TestWatchSurvivesReplacedDir moves the watched catalog directory away,
// makes it again and writes a file into the new one: the watcher must
// report it.
func TestWatchSurvivesReplacedDir(t *testing.T) {
	root := t.TempDir()
	dir := filepath.Join(root, "catalog.d")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	w := startWatcher([]string{dir})
	if w == nil {
		t.Skip("no file watching on this system")
	}
	defer w.Close()
	if err := os.Rename(dir, filepath.Join(root, "old")); err != nil {
		t.Fatal(err)
	}
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	want := filepath.Join(dir, "new.toml")
	got := make(chan string, 16)
	go func() {
		for {
			msg, ok := waitForChange(w)().(fileChangedMsg)
			if !ok {
				close(got)
				return
			}
			got <- msg.name
		}
	}()
	// An editor writes the file some time later; the test writes it again
	// every 50 ms until the event comes (waiting is not a speed test).
	deadline := time.After(10 * time.Second)
	tick := time.NewTicker(50 * time.Millisecond)
	defer tick.Stop()
	var seen []string
	for {
		select {
		case name, ok := <-got:
			if !ok {
				t.Fatalf("watcher closed; saw %v", seen)
			}
			seen = append(seen, name)
			if name == want {
				return
			}
		case <-tick.C:
			if err := os.WriteFile(want, []byte("# new\n"), 0o644); err != nil {
				t.Fatal(err)
			}
		case <-deadline:
			t.Fatalf("no event for %s after the directory was replaced; saw %v", want, seen)
		}
	}
}
