package tui

import (
	"fmt"
	"regexp"
	"strings"
	"testing"
)

// gluedMark is a basis mark (~ typical, g graph, report.BasisMark) right
// after a unit, which reads as part of it: "27.5 kHzg", "104 kHz~", "-35 %g".
var gluedMark = regexp.MustCompile(`(Hz|%|dB|V|A|/K|µs)[~g]( |$)`)

// TestBasisMarkSeparated: wherever the selector shows figures with a basis
// mark — the candidate list (margin and fmax), the explorer, replacement
// mode — the mark stands apart from the unit, at 120×40 and 80×24, and
// the marks are still there.
func TestBasisMarkSeparated(t *testing.T) {
	for _, sz := range [][2]int{{120, 40}, {80, 24}} {
		t.Run(fmt.Sprintf("%dx%d", sz[0], sz[1]), func(t *testing.T) {
			m := newDemo(t, sz[0], sz[1])
			press(t, m, "f", "tab") // failing parts in the list
			var screens []string
			for i := 0; i < len(m.rank.results); i += max(1, m.listRows()) {
				screens = append(screens, m.View())
				press(t, m, "pgdown")
			}
			press(t, m, "E")
			screens = append(screens, m.View())
			press(t, m, "esc")
			selectID(t, m, obsoleteQuad)
			press(t, m, "R")
			screens = append(screens, m.View())
			all := strings.Join(screens, "\n")
			for _, l := range lines(all) {
				if gluedMark.MatchString(l) {
					t.Errorf("a basis mark glued to its unit: %q", l)
				}
			}
			for _, want := range []string{" kHz g", " % ~", " kHz ~"} {
				if !strings.Contains(all, want) {
					t.Errorf("no %q on any screen: the marks went missing", want)
				}
			}
		})
	}
}
