package catalog

import (
	"fmt"
	"path/filepath"
	"strings"
	"testing"
)

// TestSetAsideOneOf53 is the case: one broken part among 53 costs
// that part only; the other 52 load, and the broken one is listed with
// its problem.
func TestSetAsideOneOf53(t *testing.T) {
	var b strings.Builder
	for i := range 53 {
		slew := "1 V/us"
		if i == 30 {
			slew = "1 MHz" // a frequency where a slew rate belongs
		}
		b.WriteString(partText(fmt.Sprintf("gen-%02d", i), slew))
	}
	dir := writeFiles(t, map[string]string{"team.toml": b.String()})
	c, err := Load(PathLayer(dir))
	if err == nil {
		t.Fatal("Load reported no problem for a broken part")
	}
	if e := Partial(c, err); e != nil {
		t.Fatalf("Partial refused a catalog with one broken part: %v", e)
	}
	if len(c.Parts) != 52 || c.Invalid != 1 || c.ByID("gen-30") != nil {
		t.Fatalf("parts %d invalid %d, want 52 and 1 without gen-30", len(c.Parts), c.Invalid)
	}
	if len(c.SetAside) != 1 {
		t.Fatalf("set aside %+v, want one entry", c.SetAside)
	}
	s := c.SetAside[0]
	// partText is 9 lines; part 31 starts at line 30·9+1 = 271, its slew on the 9th line.
	if s.ID != "gen-30" || s.Index != 31 || s.Pos.Line != 279 || s.IsFile() || len(s.Problems) != 1 ||
		s.Problems[0].Field != "slew" || s.Subject() != `part "gen-30"` {
		t.Errorf("set aside %+v", s)
	}
	if got, want := c.SetAsideSummary(), "1 of 53 parts set aside for problems"; got != want {
		t.Errorf("summary %q, want %q", got, want)
	}
}

func TestSetAsideGroups(t *testing.T) {
	// A part with two problems is one entry; a duplicate id is its own;
	// a file that is not TOML is a file entry; a top-level key costs no
	// part; a broken override of a valid earlier part names the one used.
	a := writeFiles(t, map[string]string{
		"a.toml": partText("keep-1", "1 V/us") + partText("shadow-1", "1 V/us"),
	})
	bad := partText("two-bad", "1 MHz")
	bad = strings.Replace(bad, `channels = 1`, `channels = 0`, 1)
	b := writeFiles(t, map[string]string{
		"b.toml": "stray = 1\n" + bad + partText("dup-1", "1 V/us") + partText("dup-1", "2 V/us") +
			partText("shadow-1", "1 MHz"),
		"c.toml": "[[part]\n",
	})
	c, err := Load(PathLayer(a), PathLayer(b))
	if err := Partial(c, err); err != nil {
		t.Fatalf("Partial: %v", err)
	}
	subjects := map[string]SetAside{}
	for _, s := range c.SetAside {
		subjects[s.Subject()+"@"+filepath.Base(s.Pos.File)] = s
	}
	checks := []struct {
		key      string
		problems int
		file     bool
		inUse    string
	}{
		{"file " + filepath.Join(b, "b.toml") + "@b.toml", 1, true, ""},
		{`part "two-bad"@b.toml`, 2, false, ""},
		{`part "dup-1"@b.toml`, 1, false, filepath.Join(b, "b.toml") + ":11"},
		{`part "shadow-1"@b.toml`, 1, false, filepath.Join(a, "a.toml") + ":10"},
		{"file " + filepath.Join(b, "c.toml") + "@c.toml", 1, true, ""},
	}
	for _, tc := range checks {
		s, ok := subjects[tc.key]
		if !ok {
			t.Errorf("no entry %s in %v", tc.key, keys(subjects))
			continue
		}
		if len(s.Problems) != tc.problems || s.IsFile() != tc.file || s.InUse != tc.inUse {
			t.Errorf("%s: %d problems, file %v, in use %q; want %d, %v, %q", tc.key, len(s.Problems), s.IsFile(), s.InUse,
				tc.problems, tc.file, tc.inUse)
		}
	}
	if len(c.SetAside) != len(checks) {
		t.Errorf("%d entries, want %d: %v", len(c.SetAside), len(checks), keys(subjects))
	}
	// Parts: two-bad, the second dup-1 and the bad shadow-1; c.toml's parts
	// are unknown and the stray key costs none.
	if c.PartsSetAside() != 3 || c.FilesSetAside() != 1 {
		t.Errorf("parts set aside %d, files %d; want 3 and 1", c.PartsSetAside(), c.FilesSetAside())
	}
	if got, want := c.SetAsideSummary(), "3 of 6 parts set aside for problems, 1 file not read"; got != want {
		t.Errorf("summary %q, want %q", got, want)
	}
}

func keys(m map[string]SetAside) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	return out
}

func TestPartialRefuses(t *testing.T) {
	good := writeFiles(t, map[string]string{"a.toml": partText("ok-1", "1 V/us")})
	allBad := writeFiles(t, map[string]string{"a.toml": partText("bad-1", "1 MHz")})
	tests := []struct {
		name   string
		layers []Layer
		refuse bool
	}{
		{"clean", []Layer{PathLayer(good)}, false},
		{"a source that cannot be read", []Layer{PathLayer(good), PathLayer(filepath.Join(good, "missing"))}, true},
		{"no valid part left", []Layer{PathLayer(allBad)}, true},
		{"one good source, one bad part", []Layer{PathLayer(good), PathLayer(allBad)}, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			c, err := Load(tc.layers...)
			if got := Partial(c, err) != nil; got != tc.refuse {
				t.Errorf("refused %v, want %v (load error %v)", got, tc.refuse, err)
			}
		})
	}
}
