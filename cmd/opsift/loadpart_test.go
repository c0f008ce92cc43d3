package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"testing"
)

// TestLoadPart checks that a command about one part (preview) keeps only
// that part and says on stderr exactly what loadCatalog says: the notes of
// overrides for a clean catalog, and for a catalog with a problem or
// without the part the whole reading, set-aside counts and all.
func TestLoadPart(t *testing.T) {
	part := func(id string) string {
		return fmt.Sprintf("[[part]]\nid = %q\nname = \"Load part test\"\ntech = \"cmos\"\nchannels = 1\n"+
			"packages = [\"soic8\"]\nsupply = { min = \"2 V\", max = \"6 V\" }\ngbw = { typ = \"1 MHz\" }\nslew = { typ = \"1 V/us\" }\n", id)
	}
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	a := write("a.toml", part("lp-1")+part("lp-2")+part("lp-3"))
	b := write("b.toml", part("lp-2")+part("lp-1"))
	bad := write("bad.toml", part("lp-4")+"gbw = 3\n")
	cache := t.TempDir()
	for _, tc := range []struct {
		paths []string
		id    string
		lean  bool // only the part kept
	}{
		{[]string{a, b}, "lp-1", true},
		{[]string{a, b}, "lp-3", true},
		{[]string{a, b}, "lp-9", false}, // not there: read whole, for the suggestions
		{[]string{a, bad}, "lp-1", false},
	} {
		for _, noCache := range []bool{true, false, false} { // no cache, builds it, reads it
			var gotErr, wantErr bytes.Buffer
			e := &env{stderr: &gotErr, noCache: noCache, getenv: func(k string) string {
				return map[string]string{"XDG_CACHE_HOME": cache}[k]
			}}
			c, err := loadPart(e, tc.paths, false, tc.id)
			e.stderr = &wantErr
			full, fullErr := loadCatalog(e, tc.paths, false)
			if fmt.Sprint(err) != fmt.Sprint(fullErr) || gotErr.String() != wantErr.String() {
				t.Fatalf("%v %s: loadPart said %q, %v; loadCatalog %q, %v", tc.paths, tc.id, gotErr.String(), err, wantErr.String(), fullErr)
			}
			if tc.lean && !bytes.Contains(wantErr.Bytes(), []byte("overrides")) {
				t.Fatalf("no override notes to compare: %q, %v", wantErr.String(), fullErr)
			}
			if err != nil {
				continue
			}
			if lean := len(c.Parts) == 1; lean != tc.lean || !reflect.DeepEqual(c.FileSums, full.FileSums) {
				t.Fatalf("%v %s: %d parts kept (want lean %v), sums %v, want %v", tc.paths, tc.id, len(c.Parts), tc.lean, c.FileSums, full.FileSums)
			}
			if tc.lean && !reflect.DeepEqual(c.Parts[0], full.ByID(tc.id)) {
				t.Fatalf("%s: kept %+v, want %+v", tc.id, c.Parts[0], full.ByID(tc.id))
			}
		}
	}
}
