package tui

import (
	"fmt"
	"testing"
)

// TestViewIsPure drives the selector into each of its screens and checks
// that View changes nothing: two renders are identical, and the model
// (every pane, the ranking with its explained checks, the status line)
// reads the same after them as before. Run with -race it also shows the
// drawing does not race the background jobs.
func TestViewIsPure(t *testing.T) {
	tests := []struct {
		name string
		w, h int
		keys []string
	}{
		{"start", 120, 40, nil},
		{"list at the bottom", 120, 40, []string{"tab", "f", "G"}},
		{"list paged", 80, 24, []string{"tab", "f", "pgdown", "pgdown", "up"}},
		{"checks scrolled past the end", 120, 40, []string{"tab", "tab", "pgdown", "pgdown", "pgdown", "pgdown"}},
		{"checks stacked", 80, 24, []string{"tab", "tab", "pgdown", "pgdown", "pgdown"}},
		{"design pane at the bottom", 80, 24, []string{"G"}},
		{"editing a field", 120, 40, []string{"enter", "ctrl+u", "2", "0", " ", "k", "H", "z", "z"}},
		{"find", 120, 40, []string{"/", "c", "m"}},
		{"replacement mode", 120, 40, []string{"tab", "R", "down", "down", "tab", "pgdown", "pgdown", "pgdown"}},
		{"preview", 120, 40, []string{"tab", "v", "down"}},
		{"export prompt", 120, 40, []string{"tab", "space", "x"}},
		{"help overlay", 80, 24, []string{"?"}},
		{"too small", 40, 10, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := newDemo(t, tc.w, tc.h)
			press(t, m, tc.keys...)
			before := modelState(m)
			first := m.View()
			second := m.View()
			if first != second {
				t.Errorf("two renders differ:\n%s\n---\n%s", first, second)
			}
			if after := modelState(m); after != before {
				t.Errorf("View changed the model:\nbefore %s\nafter  %s", before, after)
			}
		})
	}
}

// modelState prints everything View could write: the root model's
// fields and, through them, every pane's (a result's checks included).
func modelState(m *Model) string {
	return fmt.Sprintf("%#v %#v %#v %#v %#v %#v %#v %#v %#v %#v", *m, m.rank, m.list, m.checks, m.form, m.prompt, m.repl, m.prev, m.narrow, m.rank.results)
}
