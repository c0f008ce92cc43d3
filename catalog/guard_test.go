package catalog

import (
	"errors"
	"strings"
	"testing"
)

// TestPrescan: the pre-scan counts nesting and dotted-key parts outside
// strings and comments only, and passes every honest shape.
func TestPrescan(t *testing.T) {
	deep := func(n int) string { return "a = " + strings.Repeat("[", n) + strings.Repeat("]", n) + "\n" }
	dotted := func(n int) string { return "a" + strings.Repeat(".a", n-1) + " = 1\n" }
	tests := []struct {
		name, text string
		line       int // 0: accepted
	}{
		{"part table", "[[part]]\nid = \"a\"\ngbw = { typ = \"1.5 MHz\", min = \"1.2 MHz\" }\n", 0},
		{"nesting at the limit", deep(MaxNesting), 0},
		{"nesting past the limit", "\n" + deep(MaxNesting+1), 2},
		{"key at the limit", dotted(MaxKeyParts), 0},
		{"key past the limit", dotted(MaxKeyParts + 1), 1},
		{"header past the limit", "[" + strings.TrimSuffix(dotted(MaxKeyParts+1), " = 1\n") + "]\n", 1},
		{"dots in a string", "name = \"" + strings.Repeat(".", 100) + "\"\n", 0},
		{"dots in a literal string", "name = '" + strings.Repeat(".", 100) + "'\n", 0},
		{"brackets in a string", "name = \"" + strings.Repeat("[{", 100) + "\"\n", 0},
		{"brackets in a comment", "# " + strings.Repeat("[", 100) + "\n", 0},
		{"escaped quote", `name = "a\"[[[[[[[[[[[[[[[[[[[[" ` + "\n", 0},
		{"multi-line string", "notes = \"\"\"\n" + strings.Repeat("[", 100) + "\n\"\"\"\n" + deep(MaxNesting+1), 4},
		{"multi-line literal", "notes = '''\n" + strings.Repeat(".", 100) + "\n'''\n", 0},
		{"quotes closing a multi-line", "notes = \"\"\"a\"\"\"\"\nb = " + strings.Repeat("[", MaxNesting+1) + "\n", 2},
		{"floats and dates", "a = [1.5, 2.5e3, 1979-05-27T07:32:00.999Z]\n", 0},
	}
	for _, tt := range tests {
		err := Prescan(tt.text)
		var le *LimitError
		switch {
		case tt.line == 0 && err != nil:
			t.Errorf("%s: refused: %v", tt.name, err)
		case tt.line > 0 && !errors.As(err, &le):
			t.Errorf("%s: accepted, want a limit error on line %d", tt.name, tt.line)
		case tt.line > 0 && le.Line != tt.line:
			t.Errorf("%s: line %d, want %d (%v)", tt.name, le.Line, tt.line, err)
		case tt.line > 0 && !errors.Is(err, ErrLimit):
			t.Errorf("%s: not ErrLimit", tt.name)
		}
	}
}

// BenchmarkRefuseHostile measures refusing the two decoder-exhausting
// files: a 60 KB key of 30,000 parts and 8,000 nested inline tables
// (the decoder alone took seconds and gigabytes on them). The target is
// well under a second each.
func BenchmarkRefuseHostile(b *testing.B) {
	files := map[string][]byte{
		"dotted": []byte("a" + strings.Repeat(".a", 29999) + " = 1\n"),
		"nested": []byte("a = " + strings.Repeat("{a = ", 8000) + "1" + strings.Repeat("}", 8000) + "\n"),
	}
	for name, data := range files {
		b.Run(name, func(b *testing.B) {
			for b.Loop() {
				if _, err := Decode(name+".toml", data); err == nil {
					b.Fatal("accepted")
				}
			}
		})
	}
}

// TestProblemsCapped: a file with more than MaxProblems problems lists
// MaxProblems of them and one UnlistedError counting the rest, and Count
// gives the whole number (8 problems per empty part: id, name, tech,
// channels, packages, supply, gbw, slew).
func TestProblemsCapped(t *testing.T) {
	_, err := Decode("empty.toml", []byte(strings.Repeat("[[part]]\n", 1000)))
	var ps Problems
	if !errors.As(err, &ps) {
		t.Fatalf("err = %v", err)
	}
	if len(ps) != MaxProblems+1 {
		t.Fatalf("%d problems listed, want %d", len(ps), MaxProblems+1)
	}
	var u *UnlistedError
	if !errors.As(ps[len(ps)-1].Err, &u) {
		t.Fatalf("last problem %v is not the count of the rest", ps[len(ps)-1])
	}
	if got := ps.Count(); got != 8000 {
		t.Fatalf("Count = %d, want 8000", got)
	}
}
