package tui

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/exp/teatest"

	"github.com/opsift/opsift/filter"
)

// TestEndToEnd drives the whole program with teatest at the two sizes the
// layout is made for: start on the demo, raise the gain stage's frequency
// until the top candidate drops out, show the failing parts, mark two parts
// and export them as Markdown, then quit discarding the unsaved edit. The screen after each step is compared
// with a golden file (go test ./tui -update rewrites them) and the export
// is read back.
func TestEndToEnd(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		t.Run(fmt.Sprintf("%dx%d", sz[0], sz[1]), func(t *testing.T) {
			golden, err := filepath.Abs("testdata")
			if err != nil {
				t.Fatal(err)
			}
			t.Chdir(t.TempDir()) // the export goes to ./shortlist.md, a path the golden screen can show
			design := demoDesign(t)
			before := topPassing(t, design)
			steps := fieldIndexIn(design.Fields(), gainFreq)
			if steps < 0 {
				t.Fatalf("no field %s", gainFreq)
			}
			m := New(Config{Design: design, Catalog: demoCatalog(t), Renderer: asciiRenderer()})
			tm := teatest.NewTestModel(t, m, teatest.WithInitialTermSize(sz[0], sz[1]))
			out := &screenLog{r: tm.Output()}
			out.waitFor(t, "sort margin · 1/")

			// Edit: down to the gain stage's frequency, replace it, leave it.
			for range steps {
				tm.Send(tea.KeyMsg{Type: tea.KeyDown})
			}
			tm.Send(tea.KeyMsg{Type: tea.KeyEnter})
			tm.Send(tea.KeyMsg{Type: tea.KeyCtrlU})
			tm.Type("250 kHz")
			out.waitFor(t, "250 kHz")
			tm.Send(tea.KeyMsg{Type: tea.KeyEnter})

			// Failing parts, then two marks in the list.
			tm.Type("f")
			out.waitFor(t, "sort margin · +failing")
			tm.Send(tea.KeyMsg{Type: tea.KeyTab})
			tm.Send(tea.KeyMsg{Type: tea.KeySpace, Runes: []rune{' '}})
			tm.Send(tea.KeyMsg{Type: tea.KeyDown})
			tm.Send(tea.KeyMsg{Type: tea.KeySpace, Runes: []rune{' '}})
			out.waitFor(t, "2 marked")

			// Export through the prompt.
			path := "shortlist.md"
			tm.Type("x")
			out.waitFor(t, "export 2 marked parts")
			tm.Send(tea.KeyMsg{Type: tea.KeyCtrlU})
			tm.Type(path)
			tm.Send(tea.KeyMsg{Type: tea.KeyEnter})
			out.waitFor(t, "exported 2 parts")

			// The frequency edit is unsaved: q asks, d discards and quits.
			tm.Type("q")
			out.waitFor(t, "d discard and quit")
			tm.Type("d")
			tm.WaitFinished(t, teatest.WithFinalTimeout(5*time.Second))
			fm := tm.FinalModel(t).(*Model)

			after := fm.rank.results[fm.list.view[0]].Part.ID
			if after == before {
				t.Errorf("top candidate is still %s after raising the frequency", before)
			}
			checkGolden(t, golden, strings.ReplaceAll(t.Name(), "/", "_"), fm.screen())

			b, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			md := string(b)
			marked := fm.marks.results(fm.rank.results)
			if len(marked) != 2 {
				t.Fatalf("%d marked results, want 2", len(marked))
			}
			for _, want := range []string{
				marked[0].Part.ID, marked[1].Part.ID, // the parts
				fm.design.Title,     // the design
				"2π·250 kHz·2.79 V", // a requirement with its formula, at the edited frequency
				"advisory",          // the caution
				"## Made from",      // what it was made from, as the CLI's md
				"**with unsaved edits**",
				"edited: " + gainFreq + " = 250 kHz", // the title names the edit
				"| " + gainFreq + " | 250 kHz | yes |",
			} {
				if !strings.Contains(md, want) {
					t.Errorf("exported Markdown lacks %q:\n%s", want, md)
				}
			}
		})
	}
}

// screen is the view without the quitting check: what was on the screen
// when q was pressed.
func (m *Model) screen() string {
	q := m.quitting
	m.quitting = false
	defer func() { m.quitting = q }()
	return m.View()
}

// topPassing is the id of the engine's top passing part for d.
func topPassing(t *testing.T, d *filter.Design) string {
	t.Helper()
	plan, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	res := filter.Evaluate(plan, demoCatalog(t).Parts, filter.Options{})
	filter.Rank(res, filter.SortMargin)
	if len(res) == 0 || !res[0].Pass {
		t.Fatal("no part passes the demo design")
	}
	return res[0].Part.ID
}

// fieldIndexIn is the position of a design field, -1 when missing.
func fieldIndexIn(fields []filter.Field, path string) int {
	for i, f := range fields {
		if f.Path == path {
			return i
		}
	}
	return -1
}

// screenLog keeps the program's output so a wait can look at everything
// written since the previous wait (teatest's reader is consumed as read).
type screenLog struct {
	r    io.Reader
	prev []byte // output read by earlier waits
}

// waitFor waits until the output since the previous wait holds s. The
// last few hundred bytes before are kept too, so a string split across
// two reads is still found.
func (l *screenLog) waitFor(t *testing.T, s string) {
	t.Helper()
	var last []byte
	teatest.WaitFor(t, l.r, func(b []byte) bool {
		last = b
		return bytes.Contains(append(slices.Clip(l.prev), b...), []byte(s))
	}, teatest.WithDuration(5*time.Second), teatest.WithCheckInterval(10*time.Millisecond))
	l.prev = last[max(0, len(last)-512):]
}
