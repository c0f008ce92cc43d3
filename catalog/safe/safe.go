// Package safe makes text from untrusted files harmless to show: it is the
// one sanitiser every string from a catalog, a design or a file name passes
// through before it reaches a terminal or a document.
//
// A rune is unsafe when a terminal or a text layout engine may act on it
// instead of drawing it: the C0 controls (U+0000–U+001F, which include ESC,
// CR and LF), DEL (U+007F), the C1 controls (U+0080–U+009F, which include
// CSI and OSC), the bidirectional controls (U+061C, U+200E, U+200F,
// U+202A–U+202E, U+2066–U+2069), the zero-width and invisible format
// characters (U+180E, U+200B–U+200D, U+2060–U+2064, U+FEFF), the line and
// paragraph separators (U+2028, U+2029), and bytes that are not UTF-8.
// Text shows each of them as a visible escape: \x1b, \u202e, \xff.
package safe

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// Unsafe reports whether r is a rune Text escapes.
func Unsafe(r rune) bool {
	switch {
	case r < 0x20, r == 0x7f, r >= 0x80 && r <= 0x9f:
		return true
	case r == 0x061c, r == 0x180e, r == 0x200e, r == 0x200f, r == 0xfeff:
		return true
	case r >= 0x200b && r <= 0x200d, r >= 0x202a && r <= 0x202e:
		return true
	case r >= 0x2060 && r <= 0x2064, r >= 0x2066 && r <= 0x2069:
		return true
	case r == 0x2028, r == 0x2029:
		return true
	}
	return false
}

// Clean reports whether s holds nothing Text would escape.
func Clean(s string) bool {
	_, _, found := First(s)
	return !found
}

// First finds the first unsafe rune of s and its byte offset. A byte that
// is not UTF-8 is reported as utf8.RuneError.
func First(s string) (r rune, offset int, found bool) {
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && n <= 1 || Unsafe(r) {
			return r, i, true
		}
		i += n
	}
	return 0, 0, false
}

// Text returns s with every unsafe rune replaced by a visible escape: \xHH
// for C0 controls, DEL and bytes that are not UTF-8, \uHHHH for the rest.
// A clean string is returned as it is.
func Text(s string) string {
	if Clean(s) {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	for i := 0; i < len(s); {
		i += writeEscaped(&b, s, i)
	}
	return b.String()
}

// writeEscaped writes the rune at s[i] to b, escaped when unsafe, and
// returns its length in bytes.
func writeEscaped(b *strings.Builder, s string, i int) int {
	r, n := utf8.DecodeRuneInString(s[i:])
	switch {
	case r == utf8.RuneError && n <= 1:
		fmt.Fprintf(b, `\x%02x`, s[i])
	case r < 0x80 && Unsafe(r):
		fmt.Fprintf(b, `\x%02x`, r)
	case Unsafe(r):
		fmt.Fprintf(b, `\u%04x`, r)
	default:
		b.WriteString(s[i : i+n])
	}
	return n
}

// Name describes an unsafe rune for messages: "U+001B (a control
// character)", "U+202E (a bidirectional control)".
func Name(r rune) string {
	what := "an invisible format character"
	switch {
	case r == utf8.RuneError:
		return "a byte that is not UTF-8"
	case r < 0x20 || r == 0x7f || r >= 0x80 && r <= 0x9f:
		what = "a control character"
	case r == 0x061c || r == 0x200e || r == 0x200f || r >= 0x202a && r <= 0x202e || r >= 0x2066 && r <= 0x2069:
		what = "a bidirectional control"
	case r >= 0x200b && r <= 0x200d || r == 0xfeff || r == 0x2060:
		what = "a zero-width character"
	case r == 0x2028 || r == 0x2029:
		what = "a line separator"
	}
	return fmt.Sprintf("U+%04X (%s)", r, what)
}

// Problem returns the error a catalog or design check reports for a string
// holding an unsafe rune, or nil for a clean one.
func Problem(s string) error {
	r, off, found := First(s)
	if !found {
		return nil
	}
	return fmt.Errorf("holds %s at byte %d: %s; remove it (terminals may act on it)", Name(r), off, Text(s))
}

// JSON escapes, inside an encoded JSON document, the unsafe runes that
// encoding/json leaves as they are (C1 and format characters) as \uHHHH.
// The document decodes to the same strings; only the bytes on screen change.
func JSON(doc []byte) []byte {
	s := string(doc)
	var b strings.Builder
	b.Grow(len(s))
	for _, r := range s {
		if r != '\n' && r != '\t' && r >= 0x7f && Unsafe(r) {
			fmt.Fprintf(&b, `\u%04x`, r)
			continue
		}
		b.WriteRune(r)
	}
	return []byte(b.String())
}

// Lines is Text for a multi-line document the program itself lays out:
// line feeds and tabs are kept, every other unsafe rune is escaped.
func Lines(s string) string {
	if Clean(strings.NewReplacer("\n", " ", "\t", " ").Replace(s)) {
		return s
	}
	return keepLayout(s, func(string) int { return 0 })
}

// keepLayout escapes s as Text does but keeps line feeds, tabs and the
// sequences keep measures (their length in bytes, 0 for none).
func keepLayout(s string, keep func(string) int) string {
	var b strings.Builder
	b.Grow(len(s) + 16)
	for i := 0; i < len(s); {
		if n := keep(s[i:]); n > 0 {
			b.WriteString(s[i : i+n])
			i += n
			continue
		}
		if s[i] == '\n' || s[i] == '\t' {
			b.WriteByte(s[i])
			i++
			continue
		}
		i += writeEscaped(&b, s, i)
	}
	return b.String()
}

// CheckOutput is the test of "no control byte from data reaches the
// terminal": it returns an error for the first byte below 0x20 in out
// that is not a line feed, a tab or the start of an SGR styling sequence
// (ESC [ digits and semicolons m, the only escapes opsift writes), and
// for any C1 control, bidirectional control or zero-width character.
func CheckOutput(out string) error {
	for i := 0; i < len(out); i++ {
		c := out[i]
		switch {
		case c == '\n' || c == '\t':
		case c == 0x1b:
			if n := sgrLen(out[i:]); n > 0 {
				i += n - 1
				continue
			}
			return fmt.Errorf("escape sequence that is not styling at byte %d: %q", i, context(out, i))
		case c < 0x20 || c == 0x7f:
			return fmt.Errorf("control byte 0x%02x at byte %d: %q", c, i, context(out, i))
		}
	}
	for i, r := range out {
		if r >= 0x80 && Unsafe(r) {
			return fmt.Errorf("%s at byte %d: %q", Name(r), i, context(out, i))
		}
	}
	return nil
}

// context is the text around byte i, for messages.
func context(s string, i int) string {
	return s[max(i-20, 0):min(i+20, len(s))]
}

// Styled is the last safety net for a frame the program has styled
// itself: it keeps line feeds, tabs and SGR styling sequences (ESC [
// digits and semicolons m) and escapes every other unsafe rune, so that
// whatever slipped past escaping at the source can still move no cursor,
// clear no screen and set no title or clipboard. The result always passes
// CheckOutput.
func Styled(frame string) string {
	if CheckOutput(frame) == nil {
		return frame
	}
	return keepLayout(frame, sgrLen)
}

// sgrLen is the length of the SGR sequence s starts with, or 0.
func sgrLen(s string) int {
	if len(s) < 3 || s[0] != 0x1b || s[1] != '[' {
		return 0
	}
	j := 2
	for j < len(s) && (s[j] >= '0' && s[j] <= '9' || s[j] == ';') {
		j++
	}
	if j < len(s) && s[j] == 'm' {
		return j + 1
	}
	return 0
}
