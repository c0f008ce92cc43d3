package present

import (
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/charmbracelet/x/ansi"
)

// Width is the number of terminal cells s takes (escape codes take none).
func Width(s string) int { return ansi.StringWidth(s) }

// Clip shortens s to at most w cells, ending in "…" when cut.
func Clip(s string, w int) string {
	if Width(s) <= w {
		return s
	}
	if w <= 0 {
		return ""
	}
	return ansi.Truncate(s, w, "…")
}

// Wrap breaks text at spaces into lines of at most width cells, never
// between a number and its unit ("0.628 V/µs" stays whole); continuation
// lines start with indent; a word longer than a line is clipped. Empty
// text gives no lines.
func Wrap(text string, width int, indent string) []string {
	width = max(width, 1)
	var out []string
	line := ""
	for _, word := range glueUnits(strings.Fields(text)) {
		switch {
		case line == "":
			line = word
		case Width(line)+1+Width(word) > width:
			out = append(out, Clip(line, width))
			line = indent + word
		default:
			line += " " + word
		}
	}
	if line != "" {
		out = append(out, Clip(line, width))
	}
	return out
}

// glueUnits joins a number and the unit after it ("0.628" "V/µs,") into
// one word so a line never breaks between them.
func glueUnits(words []string) []string {
	out := words[:0:0]
	for _, w := range words {
		if n := len(out); n > 0 {
			prev, _ := utf8.DecodeLastRuneInString(out[n-1])
			first, _ := utf8.DecodeRuneInString(w)
			if unicode.IsDigit(prev) && (unicode.IsLetter(first) || strings.ContainsRune("%°Ωµ", first)) {
				out[n-1] += " " + w
				continue
			}
		}
		out = append(out, w)
	}
	return out
}

// Column is one column of a table to fit.
type Column struct {
	Width int  // cells the column wants (its widest cell)
	Min   int  // cells it may be shortened to instead of dropped; 0 = not shortened
	Drop  int  // drop order when short of width: the highest goes first; 0 never
	Flex  bool // takes any width left over
	// Grow is the width a kept column widens to from the width left over,
	// before a Flex column takes the rest (a column of long ids); 0 = none.
	Grow int
}

// Fit lays columns into width cells with gap cells between them. While
// they do not fit, the kept column with the highest Drop goes: shortened
// towards its Min first when it has one, else dropped; when no droppable
// column is left, a column that is never dropped (Drop 0) but has a Min is
// shortened, the last first. Columns with a Grow then widen towards it
// from what is left, in order, and a Flex column takes the rest. It
// returns each column's width, 0 for a dropped one.
func Fit(cols []Column, width, gap int) []int {
	w := make([]int, len(cols))
	for i, c := range cols {
		w[i] = c.Width
	}
	total := func() int {
		t, n := 0, 0
		for _, x := range w {
			if x > 0 {
				t += x
				n++
			}
		}
		return t + gap*max(0, n-1)
	}
	shrink := func(i int) bool {
		if cols[i].Min <= 0 || w[i] <= cols[i].Min {
			return false
		}
		w[i] -= min(total()-width, w[i]-cols[i].Min)
		return true
	}
	for total() > width {
		best := -1
		for i, c := range cols {
			if w[i] > 0 && c.Drop > 0 && (best < 0 || c.Drop > cols[best].Drop) {
				best = i
			}
		}
		if best >= 0 {
			if !shrink(best) {
				w[best] = 0
			}
			continue
		}
		done := true
		for i := len(cols) - 1; i >= 0; i-- {
			if w[i] > 0 && shrink(i) {
				done = false
				break
			}
		}
		if done {
			break
		}
	}
	for i, c := range cols {
		if spare := width - total(); spare > 0 && w[i] > 0 && c.Grow > w[i] {
			w[i] += min(spare, c.Grow-w[i])
		}
	}
	if spare := width - total(); spare > 0 {
		for i, c := range cols {
			if c.Flex && w[i] > 0 {
				w[i] += spare
				break
			}
		}
	}
	return w
}
