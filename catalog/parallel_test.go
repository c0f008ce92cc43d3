package catalog

import (
	"bytes"
	"os"
	"reflect"
	"regexp"
	"strings"
	"testing"
)

// TestDecodePieces checks decoding in pieces against decoding the whole
// file in one go and turning its maps into parts, on files of several
// shapes, well-formed and broken: the parts, problems and count of parts
// left out must be the same, and the pieces must be what read the
// well-formed files.
func TestDecodePieces(t *testing.T) {
	var buf bytes.Buffer
	if err := Encode(&buf, synthParts(3*pieceParts+50, 5)); err != nil {
		t.Fatal(err)
	}
	base := buf.String()
	late := strings.LastIndex(base, "[[part]]")
	// A multi-line string holding a fake header, in a late part: the quick
	// header scan gives up and the full position index places the cuts.
	withString := base[:late] + notesRE.ReplaceAllLiteralString(base[late:], "\nnotes = \"\"\"\n[[part]]\n\"\"\"\n")
	if withString == base {
		t.Fatal("the late part has no notes to rewrite")
	}
	withSub := base[:late] + "[[part]]\n[part.cin]\nx = 1\n" + base[late+len("[[part]]\n"):]
	badLate := strings.Replace(base[late:], `gbw = { typ = "`, `gbw = { typ = "-`, 1)
	tests := []struct {
		name         string
		text         string
		pieces, errs bool // read by the pieces; has problems
	}{
		{"plain", base, true, false},
		{"multi-line string", withString, true, false},
		{"top-level key first", "currency = \"EUR\"\n" + base, false, true},
		{"table at the end", base + "[extra]\na = 1\n", false, true},
		{"sub-table", withSub, false, true},
		{"invalid late part", base[:late] + badLate, false, true},
		{"syntax error late", base + "[[part]]\nid = \"x\n", false, true},
		{"duplicate key across pieces", "a = 1\n" + base + "[a]\n", false, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lines := scanLines(tc.text)
			if len(lines.parts) < 3*pieceParts {
				t.Fatalf("only %d parts: the split is not exercised", len(lines.parts))
			}
			wantParts, wantProbs, wantInvalid := decodeText("f.toml", tc.text, lines)
			if (len(wantProbs) > 0) != tc.errs {
				t.Fatalf("whole-file problems %v, want problems %v", wantProbs, tc.errs)
			}
			if _, ok := decodeInPieces("f.toml", tc.text, lines, 3, nil); ok != tc.pieces {
				t.Fatalf("read by the pieces %v, want %v", ok, tc.pieces)
			}
			for _, workers := range []int{1, 4} {
				parts, probs, invalid := decodeFile("f.toml", []byte(tc.text), workers, make(chan struct{}, 2))
				if !reflect.DeepEqual(probs, wantProbs) || invalid != wantInvalid {
					t.Fatalf("%d workers: problems %v (%d invalid), want %v (%d)", workers, probs, invalid, wantProbs, wantInvalid)
				}
				if !reflect.DeepEqual(parts, wantParts) {
					t.Fatalf("%d workers: parts differ from the whole-file decode", workers)
				}
			}
		})
	}
}

// notesRE matches a one-line notes key.
var notesRE = regexp.MustCompile(`\nnotes = "[^"\n]*"\n`)

// BenchmarkScanLines measures the full position index on a 10k-part file.
func BenchmarkScanLines(b *testing.B) {
	data, err := os.ReadFile(writeSynth(b, 10000))
	if err != nil {
		b.Fatal(err)
	}
	text := string(data)
	for b.Loop() {
		scanLines(text)
	}
}

// TestScanHeaders checks the quick header scan against the full position
// index on the files the index is tested with, and that it gives up on
// what it could misread.
func TestScanHeaders(t *testing.T) {
	var buf bytes.Buffer
	if err := Encode(&buf, synthParts(40, 5)); err != nil {
		t.Fatal(err)
	}
	plain := "# comment\n" + strings.Replace(buf.String(), "[[part]]\n", "  [[ part ]]  # indented\n", 3)
	fast, ok := scanHeaders(plain)
	if !ok {
		t.Fatal("a plain file was not scanned")
	}
	full := scanLines(plain)
	if len(fast.parts) != len(full.parts) {
		t.Fatalf("%d headers, want %d", len(fast.parts), len(full.parts))
	}
	for i := range fast.parts {
		if fast.parts[i].line != full.parts[i].line {
			t.Fatalf("header %d at line %d, want %d", i, fast.parts[i].line, full.parts[i].line)
		}
	}
	for _, text := range []string{
		plain + "[[part]]\nnotes = \"\"\"\n[[part]]\n\"\"\"\n",
		plain + "[[part]]\nnotes = '''\nx'''\n",
		plain + "[part.cin]\nx = 1\n",
		plain + "[[part]]\ntemp = [\n[\"a\"]]\n",
		"[[parts]]\nid = \"a\"\n",
	} {
		if _, ok := scanHeaders(text); ok {
			t.Errorf("quick scan accepted %q…", text[len(text)-20:])
		}
	}
}

// TestPartKeysFitSlots: decode reads a part's keys through an array of
// maxPartKeys slots and takes a slower path for every part when there are
// more keys than that; a new key past the bound must raise it.
func TestPartKeysFitSlots(t *testing.T) {
	if len(partKeys) > maxPartKeys {
		t.Fatalf("%d part keys, but decode has %d slots: raise maxPartKeys", len(partKeys), maxPartKeys)
	}
}
