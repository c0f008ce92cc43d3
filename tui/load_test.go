package tui

import (
	"errors"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
)

// TestFirstLoad checks the selector's start before the catalog is read:
// the first frame shows the design and the progress of the read, a key
// edits the design meanwhile, and the ranking fills in when the catalog
// arrives.
func TestFirstLoad(t *testing.T) {
	parts := syntheticParts(50)
	release := make(chan struct{})
	progress := catalog.Progress{Files: 1, TotalFiles: 4, Parts: 12}
	m := New(Config{Design: demoDesign(t), LoadFirst: true, Renderer: asciiRenderer(),
		Load: func() (*catalog.Catalog, error) {
			<-release
			return &catalog.Catalog{Parts: parts, Sources: []string{"synthetic"}}, nil
		},
		LoadProgress: func() catalog.Progress { return progress },
	})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	init := m.Init()
	frame := m.View()
	for _, want := range []string{"reading the catalog…", "DESIGN"} {
		if !strings.Contains(frame, want) {
			t.Fatalf("first frame lacks %q:\n%s", want, frame)
		}
	}
	m.Update(loadTickMsg{})
	if frame := m.View(); !strings.Contains(frame, "reading the catalog [#####···············] 1 of 4 files, 12 parts") {
		t.Fatalf("progress not shown:\n%s", frame)
	}
	m.form.cursor = fieldIndex(t, m, gainFreq)
	press(t, m, "enter", "ctrl+u", "3", "0", " ", "k", "H", "z", "enter")
	if got := m.design.Stage("gain").Value("signal.freq").Raw; got != "30 kHz" {
		t.Fatalf("editing during the load: freq %q, want 30 kHz", got)
	}
	close(release)
	run(t, m, init)
	if len(m.rank.results) != len(parts) || m.rank.loading != "" || m.Fatal() != nil {
		t.Fatalf("after the load: %d results, loading %q, fatal %v", len(m.rank.results), m.rank.loading, m.Fatal())
	}
	if strings.Contains(m.View(), "reading the catalog") {
		t.Fatal("progress still shown after the load")
	}
	if m.rank.resPlan.Design.Stage("gain").Value("signal.freq").Raw != "30 kHz" {
		t.Fatal("the ranking is not of the edited design")
	}
}

func TestFirstLoadFails(t *testing.T) {
	bad := errors.New("cannot read catalog")
	m := New(Config{Design: demoDesign(t), LoadFirst: true, Renderer: asciiRenderer(),
		Load: func() (*catalog.Catalog, error) { return nil, bad }})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	run(t, m, m.Init())
	if !errors.Is(m.Fatal(), bad) {
		t.Fatalf("Fatal() = %v, want the load's error", m.Fatal())
	}
}
