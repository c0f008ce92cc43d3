package tui

import (
	"strings"
	"testing"

	"github.com/opsift/opsift/filter/report"
)

// statusLine is the first line of the status area, above the key help.
func statusLine(t *testing.T, m *Model) string {
	t.Helper()
	lines := strings.Split(m.View(), "\n")
	foot := len(m.footLines()) // the key help under it wraps to one or two lines
	status := len(m.statusLines(m.ui.width))
	if len(lines) < status+foot {
		t.Fatalf("screen of %d lines", len(lines))
	}
	return lines[len(lines)-status-foot]
}

// TestCautionOnEveryScreen: the status area carries the advisory note in
// the main screen, replacement mode, the waveform preview and the
// shortlist, at both sizes the layout is drawn for, also with a long
// message beside it; the ? overlay shows the whole caution.
func TestCautionOnEveryScreen(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		screens := []struct {
			name  string
			setup func(t *testing.T, m *Model)
		}{
			{"main", func(t *testing.T, m *Model) {}},
			{"replace mode", func(t *testing.T, m *Model) {
				press(t, m, "R")
				if m.mode != modeReplace {
					t.Fatalf("R did not open replacement mode (message %q)", m.message)
				}
			}},
			{"preview", func(t *testing.T, m *Model) { openPreviewOn(t, m, "gp4-bip") }},
			{"shortlist", func(t *testing.T, m *Model) {
				press(t, m, "tab", "space", "l")
				if !m.narrow.shortlist {
					t.Fatal("l did not switch to the shortlist")
				}
			}},
			{"long message", func(t *testing.T, m *Model) {
				m.setMessage("%s", strings.Repeat("a long message that fills the status line ", 5))
			}},
		}
		for _, sc := range screens {
			t.Run(sc.name, func(t *testing.T) {
				m := newDemo(t, sz[0], sz[1])
				sc.setup(t, m)
				if line := statusLine(t, m); !strings.Contains(line, cautionStatusShort) && !strings.Contains(line, cautionStatus) {
					t.Errorf("%dx%d status line lacks the caution: %q", sz[0], sz[1], line)
				}
			})
		}
	}
	t.Run("help overlay", func(t *testing.T) {
		m := newDemo(t, 120, 40)
		press(t, m, "?")
		screen := strings.Join(strings.Fields(strings.NewReplacer("│", " ", "╭", " ", "╰", " ").Replace(m.View())), " ")
		if !strings.Contains(screen, "Caution: "+report.Caution) {
			t.Errorf("the ? overlay lacks the full caution:\n%s", m.View())
		}
	})
}
