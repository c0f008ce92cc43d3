package safe

import (
	"encoding/json"
	"strings"
	"testing"
	"unicode/utf8"

	_ "github.com/opsift/opsift/internal/golden" // takes -update, so go test ./... -update runs here too
)

// TestText checks the escape of each class of unsafe rune. The code points
// are those of ECMA-48 (C0, C1, DEL) and Unicode's bidirectional and
// format characters (Unicode Standard Annex #9, table 4; from memory).
func TestText(t *testing.T) {
	tests := []struct{ in, want string }{
		{"plain name, 10 kΩ ±5 %", "plain name, 10 kΩ ±5 %"},
		{"a\x1b]52;c;aGk=\x07b", `a\x1b]52;c;aGk=\x07b`},
		{"clear\x1b[2J", `clear\x1b[2J`},
		{"row\r\nbreak\ttab", `row\x0d\x0abreak\x09tab`},
		{"del\x7f", `del\x7f`},
		{"csi\u009b31m", `csi\u009b31m`},
		{"\u202eevil", `\u202eevil`},
		{"iso\u2066late\u2069", `iso\u2066late\u2069`},
		{"zero\u200bwidth\ufeff", `zero\u200bwidth\ufeff`},
		{"sep\u2028", `sep\u2028`},
		{"bad\xffutf8", `bad\xffutf8`},
		{"C:\\dir\\file", "C:\\dir\\file"},
	}
	for _, tt := range tests {
		if got := Text(tt.in); got != tt.want {
			t.Errorf("Text(%q) = %q, want %q", tt.in, got, tt.want)
		}
		if Clean(tt.in) != (tt.in == tt.want) {
			t.Errorf("Clean(%q) = %v", tt.in, Clean(tt.in))
		}
	}
}

func TestProblem(t *testing.T) {
	if err := Problem("fine"); err != nil {
		t.Fatalf("Problem(clean) = %v", err)
	}
	err := Problem("ab\x1b[2J")
	if err == nil || !strings.Contains(err.Error(), "U+001B (a control character) at byte 2") ||
		strings.ContainsRune(err.Error(), 0x1b) {
		t.Fatalf("Problem = %v", err)
	}
	if err := Problem("x\u202e"); err == nil || !strings.Contains(err.Error(), "bidirectional") {
		t.Fatalf("Problem(bidi) = %v", err)
	}
}

// TestJSON checks that escaping keeps the decoded strings (RFC 8259 §7:
// any character may be written as \uXXXX).
func TestJSON(t *testing.T) {
	in := "csi\u009b[2J \u202e del\x7f ok"
	doc, _ := json.Marshal(map[string]string{"name": in})
	out := JSON(doc)
	if !Clean(string(out)) {
		t.Fatalf("JSON left unsafe runes: %q", out)
	}
	var back map[string]string
	if err := json.Unmarshal(out, &back); err != nil || back["name"] != in {
		t.Fatalf("round trip = %q, %v", back["name"], err)
	}
}

// FuzzText checks, for any input, that Text's output is clean, that clean
// input is unchanged, and that JSON keeps a document's strings.
func FuzzText(f *testing.F) {
	for _, s := range []string{"", "plain", "\x1b[2J", "\u202e\u200b", "\xff\xfe", "\u009b", "a\nb"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if err := CheckOutput(Styled(s)); err != nil {
			t.Fatalf("Styled(%q): %v", s, err)
		}
		out := Text(s)
		if !Clean(out) {
			t.Fatalf("Text(%q) = %q is not clean", s, out)
		}
		if !utf8.ValidString(out) {
			t.Fatalf("Text(%q) = %q is not UTF-8", s, out)
		}
		if Clean(s) && out != s {
			t.Fatalf("Text changed clean %q to %q", s, out)
		}
		if _, _, found := First(s); found != !Clean(s) {
			t.Fatalf("First and Clean disagree on %q", s)
		}
		doc, err := json.Marshal(s)
		if err != nil {
			t.Fatal(err)
		}
		var back string
		if err := json.Unmarshal(JSON(doc), &back); err != nil {
			t.Fatalf("JSON(%s) no longer decodes: %v", doc, err)
		}
		var want string
		_ = json.Unmarshal(doc, &want)
		if back != want {
			t.Fatalf("JSON changed %q to %q", want, back)
		}
		if !Clean(strings.NewReplacer("\n", "", "\t", "").Replace(string(JSON(doc)))) {
			t.Fatalf("JSON(%s) is not clean", doc)
		}
	})
}

func TestLines(t *testing.T) {
	in := "title\x1b[2J\n\tcell\u202e\r\n"
	want := "title\\x1b[2J\n\tcell\\u202e\\x0d\n"
	if got := Lines(in); got != want {
		t.Fatalf("Lines(%q) = %q, want %q", in, got, want)
	}
	if got := Lines("a\nb\tc"); got != "a\nb\tc" {
		t.Fatalf("Lines changed clean text: %q", got)
	}
}

// TestStyled keeps the program's SGR styling and escapes everything else.
func TestStyled(t *testing.T) {
	in := "\x1b[1;36mtitle\x1b[0m \x1b]0;pwned\x07 \x1b[2J\n\u009b\x1b[m"
	want := "\x1b[1;36mtitle\x1b[0m \\x1b]0;pwned\\x07 \\x1b[2J\n\\u009b\x1b[m"
	if got := Styled(in); got != want {
		t.Fatalf("Styled = %q, want %q", got, want)
	}
	if err := CheckOutput(Styled(in)); err != nil {
		t.Fatal(err)
	}
	if err := CheckOutput(in); err == nil {
		t.Fatal("CheckOutput passed an OSC sequence")
	}
}
