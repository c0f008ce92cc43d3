package catalog

import (
	"bytes"
	"os"
	"reflect"
	"strings"
	"testing"
)

// TestDecodeTOMLPieces checks the split decoder against decoding the whole
// file, on large files of several shapes, well-formed and broken.
func TestDecodeTOMLPieces(t *testing.T) {
	var buf bytes.Buffer
	if err := Encode(&buf, synthParts(parallelMinParts+50, 5)); err != nil {
		t.Fatal(err)
	}
	base := buf.String()
	// A sub-table and a multi-line string holding a fake header, in a late part.
	i := strings.LastIndex(base, "[[part]]")
	withSub := base[:i] + "[[part]]\nnotes = \"\"\"\n[[part]]\n\"\"\"\n[part.cin]\nx = 1\n" + base[i+len("[[part]]\n"):]
	tests := []struct {
		name    string
		text    string
		wantErr bool
	}{
		{"plain", base, false},
		{"top-level key first", "currency = \"EUR\"\n" + base, false},
		{"table at the end", base + "[extra]\na = 1\n", false},
		{"sub-table and string", withSub, false},
		{"syntax error late", base + "[[part]]\nid = \"x\n", true},
		{"duplicate key across pieces", "a = 1\n" + base + "[a]\n", true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lines := scanLines(tc.text)
			if len(lines.parts) < parallelMinParts {
				t.Fatalf("only %d parts: the split is not exercised", len(lines.parts))
			}
			got, gotErr := decodePieces(tc.text, lines, 4)
			want, wantErr := decodeWhole(tc.text)
			if (wantErr != nil) != tc.wantErr {
				t.Fatalf("whole-file error %v, want error %v", wantErr, tc.wantErr)
			}
			if !reflect.DeepEqual(gotErr, wantErr) {
				t.Fatalf("errors differ: %v / %v", gotErr, wantErr)
			}
			if !reflect.DeepEqual(got, want) {
				t.Fatal("decoded documents differ")
			}
		})
	}
}

// BenchmarkDecodeTOML10k compares the split decoder with one-piece
// decoding on a 10k-part file; the ratio is what matters.
func BenchmarkDecodeTOML10k(b *testing.B) {
	data, err := os.ReadFile(writeSynth(b, 10000))
	if err != nil {
		b.Fatal(err)
	}
	text := string(data)
	lines := scanLines(text)
	b.Run("whole", func(b *testing.B) {
		for b.Loop() {
			if _, err := decodeWhole(text); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("pieces", func(b *testing.B) {
		for b.Loop() {
			if _, err := decodePieces(text, lines, 4); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("scanLines", func(b *testing.B) {
		for b.Loop() {
			scanLines(text)
		}
	})
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
