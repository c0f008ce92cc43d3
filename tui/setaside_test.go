package tui

import (
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
)

// TestSelectorSetsAsideBadPart is the case in the selector: the
// demo catalog (52 parts) plus one broken part ranks the 52, the status
// line counts the one set aside, and a reload keeps the partial catalog.
func TestSelectorSetsAsideBadPart(t *testing.T) {
	dir := t.TempDir()
	names, err := fs.Glob(data.Catalog, "*.toml")
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range names {
		b, err := fs.ReadFile(data.Catalog, n)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, n), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	broken, err := os.ReadFile(filepath.Join("..", "testdata", "partial", "broken.toml"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "zz-broken.toml"), broken, 0o644); err != nil {
		t.Fatal(err)
	}
	load := func() (*catalog.Catalog, error) {
		c, err := catalog.Load(catalog.PathLayer(dir))
		return c, catalog.Partial(c, err)
	}
	cat, err := load()
	if err != nil {
		t.Fatal(err)
	}
	m := New(Config{Design: demoDesign(t), Catalog: cat, CatalogErr: cat.Problems().AsError(), Load: load,
		Renderer: asciiRenderer()})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	run(t, m, m.Init())
	if len(m.rank.results) != 52 {
		t.Fatalf("%d parts ranked, want the demo's 52", len(m.rank.results))
	}
	status := m.statusView(120)
	if !strings.Contains(status, "of 52 parts pass · 1 set aside") {
		t.Errorf("status line %q lacks the set-aside count", status)
	}
	if !strings.Contains(m.message, `part "zz1-broken": field "slew"`) {
		t.Errorf("start message %q does not name the broken part", m.message)
	}
	press(t, m, "r")
	if len(m.rank.results) != 52 || !strings.Contains(m.message, "52 parts (1 set aside for problems") {
		t.Errorf("after reload: %d results, message %q", len(m.rank.results), m.message)
	}
	if !strings.Contains(m.View(), "1 set aside") {
		t.Error("the screen does not show the set-aside count")
	}
}
