package tui

import (
	"fmt"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
)

// BenchmarkKeystroke measures one keystroke in a design field to the next
// frame: Update with the key (parse, derive), the ranking job it starts
// (evaluate and rank every part: the parts that fail are shown, f, so
// the screen waits for the job's second step), Update with the results
// (narrowing, selection) and View. Keys alternate between typing "1"
// before the frequency (20 kHz → 120 kHz) and deleting it, so every key
// re-ranks. The selector's default keystroke, failing parts hidden, is
// the one scalebench measures (the passing parts ranked alone).
// Target: under one 60 Hz frame (16.7 ms) at 10k parts.
func BenchmarkKeystroke(b *testing.B) {
	for _, n := range []int{1_000, 10_000, 100_000} {
		b.Run(fmt.Sprintf("parts=%d", n), func(b *testing.B) {
			parts := syntheticParts(n)
			m := New(Config{Design: demoDesign(b), Catalog: &catalog.Catalog{Parts: parts, Sources: []string{"synthetic"}},
				Renderer: asciiRenderer()})
			m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
			run(b, m, m.Init())
			m.form.cursor = fieldIndex(b, m, gainFreq)
			press(b, m, "f", "enter", "home")
			keys := []tea.KeyMsg{keyMsg("1"), keyMsg("backspace")}
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; b.Loop(); i++ {
				_, cmd := m.Update(keys[i%2])
				if cmd == nil {
					b.Fatalf("key %d started no ranking: %q", i, m.form.editErr)
				}
				_, rest := m.Update(cmd()) // the passing parts, not shown (+failing)
				m.Update(rest())           // every part
				_ = m.View()
			}
			b.StopTimer()
			if len(m.rank.results) != n {
				b.Fatalf("%d results, want %d", len(m.rank.results), n)
			}
		})
	}
}

// BenchmarkKeystrokeUI measures the UI path alone: Update with the key
// (parse, derive, start the job) and View, the frame the user sees at once
// while the ranking runs in its tea.Cmd.
func BenchmarkKeystrokeUI(b *testing.B) {
	for _, n := range []int{10_000, 100_000} {
		b.Run(fmt.Sprintf("parts=%d", n), func(b *testing.B) {
			m := New(Config{Design: demoDesign(b), Catalog: &catalog.Catalog{Parts: syntheticParts(n)},
				Renderer: asciiRenderer()})
			m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
			run(b, m, m.Init())
			m.form.cursor = fieldIndex(b, m, gainFreq)
			press(b, m, "f", "enter", "home")
			keys := []tea.KeyMsg{keyMsg("1"), keyMsg("backspace")}
			b.ReportAllocs()
			for i := 0; b.Loop(); i++ {
				if _, cmd := m.Update(keys[i%2]); cmd == nil {
					b.Fatalf("key %d started no ranking", i)
				}
				_ = m.View()
			}
		})
	}
}

// BenchmarkFrame measures drawing alone (no re-ranking): moving the cursor
// in the candidate list and drawing the next frame.
func BenchmarkFrame(b *testing.B) {
	for _, n := range []int{10_000, 100_000} {
		b.Run(fmt.Sprintf("parts=%d", n), func(b *testing.B) {
			m := New(Config{Design: demoDesign(b), Catalog: &catalog.Catalog{Parts: syntheticParts(n)},
				Renderer: asciiRenderer()})
			m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
			run(b, m, m.Init())
			press(b, m, "f", "tab")
			keys := []tea.KeyMsg{keyMsg("down"), keyMsg("up")}
			b.ReportAllocs()
			for i := 0; b.Loop(); i++ {
				m.Update(keys[i%2])
				_ = m.View()
			}
		})
	}
}
