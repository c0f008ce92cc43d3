package tui

import (
	"testing"

	tea "github.com/charmbracelet/bubbletea"
)

// rankStep runs the first step of a new ranking (the passing parts) and
// hands its message to m; it returns the command for the second step.
func rankStep(t *testing.T, m *Model) tea.Cmd {
	t.Helper()
	msg, ok := m.rerank()().(rankedMsg)
	if !ok || msg.rest == nil {
		t.Fatalf("first step gave %T, want a ranking of the passing parts", msg)
	}
	_, next := m.Update(msg)
	if next == nil {
		t.Fatal("no second step after the passing parts")
	}
	return next
}

// TestRankStepsPassingFirst checks the two-step ranking: while failing
// parts are hidden, the passing parts alone are shown at once and draw the
// very screen the ranking of every part draws; when something on screen
// needs a failing part (+failing, a marked failing part), the first step
// is not shown and the screen waits for the second.
func TestRankStepsPassingFirst(t *testing.T) {
	m := newDemo(t, 120, 40)
	full := m.View()
	parts := len(m.cat.Parts)
	if m.rank.nPass == 0 || m.rank.nPass == parts {
		t.Fatalf("demo: %d of %d pass; the test needs both kinds", m.rank.nPass, parts)
	}

	next := rankStep(t, m)
	if m.rank.running || len(m.rank.results) != m.rank.nPass || m.rank.parts != parts {
		t.Fatalf("after the first step: running %v, %d results, %d pass, %d parts; want the %d passing of %d shown",
			m.rank.running, len(m.rank.results), m.rank.nPass, m.rank.parts, m.rank.nPass, parts)
	}
	if got := m.View(); got != full {
		t.Errorf("passing parts alone draw another screen:\n%s\nwant\n%s", got, full)
	}
	run(t, m, next)
	if len(m.rank.results) != parts || m.View() != full {
		t.Fatalf("after the second step: %d results, want %d, and the same screen", len(m.rank.results), parts)
	}

	press(t, m, "f") // +failing
	withFailing := m.View()
	next = rankStep(t, m)
	if !m.rank.running || len(m.rank.results) != parts {
		t.Fatalf("+failing, first step: running %v, %d results; want it not shown", m.rank.running, len(m.rank.results))
	}
	run(t, m, next)
	if m.rank.running || m.View() != withFailing {
		t.Fatalf("+failing, second step: running %v, screen changed", m.rank.running)
	}
	press(t, m, "f")

	var failing string
	for i := range m.rank.results {
		if !m.rank.results[i].Pass {
			failing = m.rank.results[i].Part.ID
			break
		}
	}
	m.marks.toggle(failing)
	rankStep(t, m)
	if !m.rank.running {
		t.Fatalf("failing part %s marked: the passing parts alone were shown", failing)
	}
}
