package catalog

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"testing/fstest"

	"github.com/opsift/opsift/data"
)

// partText is a minimal valid part with the given id and slew rate.
func partText(id, slew string) string {
	return `[[part]]
id = "` + id + `"
name = "Layer test part"
tech = "cmos"
channels = 1
packages = ["sot23-5"]
supply = { min = "1.8 V", max = "5.5 V" }
gbw = { typ = "1 MHz", min = "0.8 MHz" }
slew = { typ = "` + slew + `" }
`
}

// writeFiles writes name → text into a new directory.
func writeFiles(t *testing.T, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for n, text := range files {
		if err := os.WriteFile(filepath.Join(dir, n), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func TestLoadDemoCatalog(t *testing.T) {
	c, err := Load(FSLayer(DemoName, data.Catalog))
	if err != nil {
		t.Fatalf("the embedded demo catalog has problems:\n%v", err)
	}
	if len(c.Parts) < 10 || c.Files < 2 {
		t.Errorf("demo catalog has %d parts in %d files", len(c.Parts), c.Files)
	}
	for _, p := range c.Parts {
		if !strings.HasPrefix(p.Pos.File, DemoName+"/") || p.Pos.Line == 0 {
			t.Errorf("part %q at %v", p.ID, p.Pos)
		}
	}
}

func TestLoadLayers(t *testing.T) {
	a := writeFiles(t, map[string]string{
		"1.toml":       partText("aa-1", "1 V/us") + partText("bb-1", "2 V/us"),
		"2.toml":       partText("cc-1", "3 V/us"),
		"notes.txt":    "not a catalog",
		".#1.toml":     "editor lock file, skipped",
		"sub.toml.bak": "not toml",
	})
	b := writeFiles(t, map[string]string{"over.toml": partText("bb-1", "20 V/us") + partText("dd-1", "4 V/us")})
	c, err := Load(PathLayer(a), PathLayer(filepath.Join(b, "over.toml")))
	if err != nil {
		t.Fatal(err)
	}
	var ids []string
	for _, p := range c.Parts {
		ids = append(ids, p.ID)
	}
	if got := strings.Join(ids, " "); got != "aa-1 bb-1 cc-1 dd-1" {
		t.Errorf("parts %s, want aa-1 bb-1 cc-1 dd-1 (first-appearance order)", got)
	}
	if p := c.ByID("bb-1"); p == nil || p.Slew.Typ.V() != 20e6 || !strings.HasSuffix(p.Pos.File, "over.toml") {
		t.Errorf("bb-1 not overridden by the later layer: %+v", p)
	}
	if c.ByID("zz") != nil {
		t.Error("ByID found a part that does not exist")
	}
	if c.Files != 3 || c.Overrides != 1 || len(c.Sources) != 2 {
		t.Errorf("files %d overrides %d sources %v", c.Files, c.Overrides, c.Sources)
	}
	want := `part "bb-1" from ` + filepath.Join(b, "over.toml") + `:1 overrides ` + filepath.Join(a, "1.toml") + `:10`
	if len(c.Notes) != 1 || c.Notes[0] != want {
		t.Errorf("notes %q, want [%q]", c.Notes, want)
	}
	// 4 parts × (gbw, slew); gbw has a min, slew only typ.
	if c.Figures != 8 || c.TypicalOnly != 4 || c.FromGraph != 0 {
		t.Errorf("figures %d typical-only %d graph %d, want 8 4 0", c.Figures, c.TypicalOnly, c.FromGraph)
	}
}

func TestLoadProblems(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"a.toml": partText("same", "1 V/us"),
		"b.toml": partText("same", "2 V/us") + partText("ok-1", "1 V/us") + partText("bad-1", "1 MHz"),
		"c.toml": "[[part]\n",
	})
	missing := filepath.Join(dir, "nope")
	c, err := Load(PathLayer(dir), PathLayer(missing))
	var ps Problems
	if !errors.As(err, &ps) {
		t.Fatalf("error %v is not Problems", err)
	}
	got := err.Error()
	for _, want := range []string{
		filepath.Join(dir, "b.toml") + `:2: part "same": field "id": duplicate id "same", first given at ` + filepath.Join(dir, "a.toml") + ":1",
		filepath.Join(dir, "b.toml") + `:27: part "bad-1": field "slew": typ = "1 MHz" is a frequency`,
		filepath.Join(dir, "c.toml") + ":1: not valid TOML",
		missing + ": cannot read catalog: no such file or directory",
	} {
		if !strings.Contains(got, want) {
			t.Errorf("problems lack %q:\n%s", want, got)
		}
	}
	if !errors.Is(err, fs.ErrNotExist) {
		t.Error("errors.Is(err, fs.ErrNotExist) = false for a missing source")
	}
	if len(ps) != 4 {
		t.Errorf("%d problems, want 4:\n%s", len(ps), got)
	}
	// The good parts are still there for check's summary.
	if c == nil || c.ByID("ok-1") == nil || c.ByID("same") == nil || c.ByID("bad-1") != nil {
		t.Errorf("catalog after problems: %+v", c)
	}
	if c.Invalid != 2 {
		t.Errorf("invalid %d, want 2 (duplicate and bad-1)", c.Invalid)
	}
}

func TestLoadFS(t *testing.T) {
	fsys := fstest.MapFS{
		"x.toml":      {Data: []byte(partText("fs-1", "1 V/us"))},
		"dir/y.toml":  {Data: []byte(partText("fs-2", "1 V/us"))},
		"readme.md":   {Data: []byte("#")},
		"z.toml":      {Data: []byte(partText("fs-3", "1 V/us"))},
		"empty.toml":  {Data: nil},
		".hide.toml":  {Data: []byte("broken [[")},
		"other/.keep": {},
	}
	c, err := Load(FSLayer("mem", fsys))
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Parts) != 2 || c.Files != 3 || c.Parts[0].Pos.File != "mem/x.toml" {
		t.Errorf("parts %d files %d first at %v", len(c.Parts), c.Files, c.Parts[0].Pos)
	}
	empty, err := Load(FSLayer("nothing", fstest.MapFS{}))
	if err != nil || len(empty.Notes) != 1 || empty.Notes[0] != "nothing holds no *.toml files" {
		t.Errorf("empty layer: %v %q", err, empty.Notes)
	}
}

func TestDefaultSources(t *testing.T) {
	demo := fstest.MapFS{}
	home := t.TempDir()
	xdg := t.TempDir()
	userHome := filepath.Join(home, ".config", "opsift", "catalog.d")
	userXDG := filepath.Join(xdg, "opsift", "catalog.d")
	env := func(m map[string]string) func(string) string {
		return func(k string) string { return m[k] }
	}
	tests := []struct {
		name string
		env  map[string]string
		mk   string // directory to create first
		want string // Layer.Path, or "" for the demo
	}{
		{"nothing exists", map[string]string{"HOME": home}, "", ""},
		{"home dir", map[string]string{"HOME": home}, userHome, userHome},
		{"xdg wins", map[string]string{"HOME": home, "XDG_CONFIG_HOME": xdg}, userXDG, userXDG},
		{"xdg set but missing: demo, not home", map[string]string{"HOME": home, "XDG_CONFIG_HOME": filepath.Join(xdg, "none")}, "", ""},
		{"relative xdg ignored", map[string]string{"HOME": home, "XDG_CONFIG_HOME": "rel"}, "", userHome},
		{"no env", map[string]string{}, "", ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if tc.mk != "" {
				if err := os.MkdirAll(tc.mk, 0o755); err != nil {
					t.Fatal(err)
				}
			}
			got := DefaultSources(env(tc.env), demo)
			if len(got) != 1 {
				t.Fatalf("got %d layers", len(got))
			}
			switch {
			case tc.want == "" && (got[0].FS == nil || got[0].Name != DemoName):
				t.Errorf("got %+v, want the demo", got[0])
			case tc.want != "" && got[0].Path != tc.want:
				t.Errorf("got %+v, want %s", got[0], tc.want)
			}
		})
	}
}

// TestLoadOnly checks that a Loader with Only keeps just the parts it
// accepts and says everything else as the full load does: notes of
// overrides (one of them of a part it does not keep), file sums, counts,
// problems and set-aside parts, through the cache and without it.
func TestLoadOnly(t *testing.T) {
	a := writeFiles(t, map[string]string{
		"1.toml": partText("aa-1", "1 V/us") + partText("bb-1", "2 V/us"),
		"2.toml": partText("cc-1", "3 V/us") + partText("bb-1", "5 V/us"), // a duplicate id
		"3.toml": partText("ee-1", "1 MHz"),                               // a problem
	})
	b := writeFiles(t, map[string]string{"over.toml": partText("bb-1", "20 V/us") + partText("aa-1", "4 V/us")})
	layers := []Layer{PathLayer(a), PathLayer(filepath.Join(b, "over.toml"))}
	for _, cache := range []*Cache{nil, {Dir: t.TempDir()}} {
		for range 2 { // builds the cache, then reads it
			full, fullErr := Loader{Cache: cache}.Load(layers...)
			c, err := Loader{Cache: cache, Only: func(id string) bool { return id == "bb-1" }}.Load(layers...)
			if fmt.Sprint(err) != fmt.Sprint(fullErr) || fullErr == nil {
				t.Fatalf("error %v, want the full load's %v", err, fullErr)
			}
			if len(c.Parts) != 1 || c.Parts[0].Slew.Typ.V() != 20e6 || c.ByID("bb-1") != c.Parts[0] || c.ByID("aa-1") != nil {
				t.Fatalf("parts %v; want only bb-1 as the later layer gives it", c.Parts)
			}
			if !reflect.DeepEqual(c.Notes, full.Notes) || len(c.Notes) != 2 || !reflect.DeepEqual(c.FileSums, full.FileSums) ||
				!reflect.DeepEqual(c.SetAside, full.SetAside) || c.Files != full.Files || c.Overrides != full.Overrides || c.Invalid != full.Invalid {
				t.Errorf("only bb-1:\nnotes %q\nsums %v\nset aside %v\nwant\n%q\n%v\n%v", c.Notes, c.FileSums, c.SetAside, full.Notes, full.FileSums, full.SetAside)
			}
		}
	}
}
