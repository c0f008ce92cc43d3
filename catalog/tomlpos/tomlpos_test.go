package tomlpos

import (
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	_ "github.com/opsift/opsift/internal/golden" // takes -update, so go test ./... -update runs here too
)

// TestScan checks the line of key paths in documents built around each
// TOML string form; the expected lines are counted by hand from the text.
func TestScan(t *testing.T) {
	tests := []struct {
		name string
		text string
		want map[string]int // path → line
	}{
		{
			name: "multi-line basic string holding a stage header",
			text: "title = \"\"\"\n[[stage]]\nname = \"fake\"\n\"\"\"\n[[stage]]\nname = \"a\"\n[[stage]]\nname = \"b\"\n",
			want: map[string]int{"title": 1, "stage.0": 5, "stage.0.name": 6, "stage.1": 7, "stage.1.name": 8},
		},
		{
			name: "multi-line literal string holding a part header",
			text: "[[part]]\nid = 'a'\nnotes = '''\n[[part]]\nid = \"b\"\n'''\nslew = { typ = \"1 V/us\" }\n",
			want: map[string]int{"part.0": 1, "part.0.id": 2, "part.0.notes": 3, "part.0.slew": 7, "part.0.slew.typ": 7},
		},
		{
			name: "escaped quotes and a closing run of five quotes",
			text: "a = \"\"\"one \\\"\"\" still in\ntwo\"\"\"\"\"\nb = 1\nc = \"x \\\" [[part]]\"\nd = '''it''''\ne = 2\n",
			want: map[string]int{"a": 1, "b": 3, "c": 4, "d": 5, "e": 6},
		},
		{
			name: "line-ending backslash in a multi-line basic string",
			text: "a = \"\"\"first \\\n   [[stage]] \\\n\"\"\"\nb = 'c:\\path\\'\nc = 3\n",
			want: map[string]int{"a": 1, "b": 4, "c": 5},
		},
		{
			name: "arrays of tables inside strings and arrays",
			text: "x = [\n  \"[[part]]\",\n  '''\n[[part]]\n''',\n  { id = \"in\" },\n  { id = \"two\", k = [1, 2] }, # [[part]]\n]\n[[part]]\nid = \"p\"\n",
			want: map[string]int{"x": 1, "x.2": 6, "x.2.id": 6, "x.3.id": 7, "x.3.k": 7, "part.0": 9, "part.0.id": 10},
		},
		{
			name: "dotted and quoted keys",
			text: "[[part]]\nslew.typ = \"1 V/us\"\n\"gbw\" . 'min' = \"1 MHz\"\nsite.\"a.b\" = 1\n[part.aol]\ntyp = \"100 dB\"\n",
			want: map[string]int{"part.0.slew": 2, "part.0.slew.typ": 2, "part.0.gbw.min": 3, "part.0.site": 4, "part.0.aol": 5, "part.0.aol.typ": 6},
		},
		{
			name: "inline tables, nested",
			text: "[supply]\npos = \"5 V\"\n[[stage]]\nsignal = { shape = \"sine\", peak = { v = \"1 V\" }, freq = \"1 kHz\" }\n",
			want: map[string]int{"supply": 1, "supply.pos": 2, "stage.0.signal.shape": 4, "stage.0.signal.peak.v": 4, "stage.0.signal.freq": 4},
		},
		{
			name: "sub-arrays of tables",
			text: "[[part]]\nid = \"a\"\n[[part.pin]]\nn = 1\n[[part.pin]]\nn = 2\n[[part]]\nid = \"b\"\n[[part.pin]]\nn = 3\n",
			want: map[string]int{"part.0.pin.0.n": 4, "part.0.pin.1.n": 6, "part.1.id": 8, "part.1.pin.0.n": 10},
		},
		{
			name: "CRLF line ends and comments with brackets",
			text: "a = 1 # ] } [[x]]\r\n[t] # [[u]]\r\nb = [ # [\r\n 1,\r\n]\r\nc = 2\r\n",
			want: map[string]int{"a": 1, "t": 2, "t.b": 3, "t.c": 6},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var doc map[string]any
			if _, err := toml.Decode(tc.text, &doc); err != nil {
				t.Fatalf("test document is not valid TOML: %v", err)
			}
			ix := Scan(tc.text)
			for path, line := range tc.want {
				if p, ok := posOf(ix, path); !ok || p.Line != line {
					t.Errorf("%s at %+v (found %v), want line %d", path, p, ok, line)
				}
			}
		})
	}
}

func TestIndexQueries(t *testing.T) {
	text := "top = 1\n[[part]]\nid = \"a\"\n  gbw = { typ = \"1 MHz\" }\n[[part]]\nid = \"é\" ; x = 1\n"
	ix := Scan(text)
	n := 0
	ix.Elements("part", func(i int, at Pos, keys []Entry) { n++ })
	if n != 2 {
		t.Errorf("Elements(part) gave %d parts, want 2", n)
	}
	if got, want := ix.Keys(""), []string{"top", "part"}; !slices.Equal(got, want) {
		t.Errorf("Keys(\"\") = %q, want %q", got, want)
	}
	if got, want := ix.Keys("part.0"), []string{"id", "gbw"}; !slices.Equal(got, want) {
		t.Errorf("Keys(part.0) = %q, want %q", got, want)
	}
	if p, _ := posOf(ix, "part.0.gbw"); p.Line != 4 || p.Col != 3 || text[p.Offset:p.Offset+3] != "gbw" {
		t.Errorf("gbw at %+v, want line 4 column 3 at the key", p)
	}
	if p, _ := posOf(ix, "part.1"); text[p.Offset:p.Offset+8] != "[[part]]" {
		t.Errorf("second header offset %d does not point at its '['", p.Offset)
	}
	if l := ix.Line("part.0.gbw.max"); l != 4 {
		t.Errorf("Line of an unwritten key = %d, want its parent's line 4", l)
	}
	if l := ix.Line("nothing.here"); l != 0 {
		t.Errorf("Line of an unknown path = %d, want 0", l)
	}
}

// TestScanAgreesWithDecoder checks, over every TOML file in the project,
// that each key the TOML decoder reports has a position on a line that
// really holds that key.
func TestScanAgreesWithDecoder(t *testing.T) {
	var files []string
	for _, root := range []string{"../../data", "../../testdata", "../../filter/testdata"} {
		filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err == nil && !d.IsDir() && strings.HasSuffix(p, ".toml") {
				files = append(files, p)
			}
			return nil
		})
	}
	if len(files) < 5 {
		t.Fatalf("found only %d TOML files", len(files))
	}
	for _, f := range files {
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		checkAgainstDecoder(t, f, string(data))
	}
}

// checkAgainstDecoder compares Scan with the decoder's own key list on
// one document; invalid TOML is skipped.
func checkAgainstDecoder(t *testing.T, name, text string) {
	t.Helper()
	var doc map[string]any
	md, err := toml.Decode(text, &doc)
	if err != nil {
		return
	}
	ix := Scan(text)
	found := map[string]bool{} // index paths with element numbers removed
	all := paths(ix)
	for path := range all {
		var segs []string
		for _, s := range strings.Split(path, ".") {
			if _, err := strconv.Atoi(s); err != nil {
				segs = append(segs, s)
			}
		}
		found[strings.Join(segs, "\x00")] = true
	}
	for _, k := range md.Keys() {
		if slices.ContainsFunc(k, func(s string) bool { _, err := strconv.Atoi(s); return err == nil || strings.Contains(s, ".") }) {
			continue // numeric or dotted segments cannot be told from element numbers here
		}
		if !found[strings.Join(k, "\x00")] {
			t.Errorf("%s: key %q not indexed", name, k.String())
		}
	}
	for path, p := range all {
		if p.Offset >= len(text) || !strings.ContainsAny(text[p.Offset:p.Offset+1], "[\"'abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_-{") {
			t.Errorf("%s: %s at offset %d does not point at a key", name, path, p.Offset)
		}
		if got := 1 + strings.Count(text[:p.Offset], "\n"); got != p.Line {
			t.Errorf("%s: %s on line %d, but its offset is on line %d", name, path, p.Line, got)
		}
	}
}

// FuzzScan checks that Scan ends on any text without panicking, and on
// valid TOML indexes every key the decoder reports.
func FuzzScan(f *testing.F) {
	f.Add("a = \"\"\"x\n[[b]]\n\"\"\"\n[[b]]\nc = { d = [1, '''e'''] }\n")
	f.Add("[[part]]\nid = 'a'\nslew.typ = \"1 V/us\"\n")
	f.Add("x = [\n{ a = 1 },\n]\n\"q\\\"k\" = 2\n")
	f.Fuzz(func(t *testing.T, text string) {
		checkAgainstDecoder(t, "fuzz", text)
	})
}

// paths lists every indexed path with its position.
func paths(ix *Index) map[string]Pos {
	out := map[string]Pos{}
	var walk func(n int32, path string)
	walk = func(n int32, path string) {
		nd := &ix.nodes[n]
		if n != 0 {
			out[path] = nd.pos()
		}
		for k := nd.first; k != 0; k = ix.nodes[k].next {
			walk(k, Join(path, ix.nodes[k].key))
		}
		for i, e := range nd.elems {
			walk(e, Element(path, i))
		}
	}
	walk(0, "")
	return out
}

// posOf returns the position of path, and whether it was written.
func posOf(ix *Index, path string) (Pos, bool) {
	n, ok := ix.find(path)
	if !ok || n == 0 {
		return Pos{}, false
	}
	return ix.nodes[n].pos(), true
}

// TestScanByteOrderMark: a document that starts with a UTF-8 byte-order
// mark (which the TOML decoder skips) has every key on the same line and
// column as without it, three bytes further on.
func TestScanByteOrderMark(t *testing.T) {
	const doc = "[[part]]\nid = \"a1\"\nslew = { typ = \"5 V/us\" }\n\n[[part]]\nid = \"b2\"\n"
	plain, marked := Scan(doc), Scan("\ufeff"+doc)
	for _, path := range []string{"part.0", "part.0.id", "part.0.slew.typ", "part.1", "part.1.id"} {
		want, ok := plain.Pos(path)
		if !ok {
			t.Fatalf("%s not found without the mark", path)
		}
		got, ok := marked.Pos(path)
		if !ok || got.Line != want.Line || got.Col != want.Col || got.Offset != want.Offset+3 {
			t.Errorf("%s with the mark at %+v (found %v), want %+v three bytes on", path, got, ok, want)
		}
	}
}
