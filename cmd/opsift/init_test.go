package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

func TestInitThenCheck(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "proj")
	r := runOpsift(t, nil, "init", dir)
	if r.code != 0 {
		t.Fatalf("init exit %d: %s", r.code, r.stderr)
	}
	cat := filepath.Join(dir, "catalog.d", "example.toml")
	design := filepath.Join(dir, "design.toml")
	for _, want := range []string{"wrote " + cat, "wrote " + design,
		"opsift check --catalog " + filepath.Join(dir, "catalog.d"),
		"opsift --catalog " + filepath.Join(dir, "catalog.d") + " --design " + design} {
		if !strings.Contains(r.stdout, want) {
			t.Errorf("init output lacks %q:\n%s", want, r.stdout)
		}
	}
	c := runOpsift(t, nil, "check", "--catalog", filepath.Join(dir, "catalog.d"))
	if c.code != 0 || !strings.Contains(c.stdout, "parts:     3\n") {
		t.Fatalf("starter catalog fails check (exit %d):\n%s", c.code, c.stdout)
	}
	// No temporary files left behind.
	for _, d := range []string{dir, filepath.Join(dir, "catalog.d")} {
		ents, _ := os.ReadDir(d)
		for _, e := range ents {
			if strings.HasSuffix(e.Name(), ".tmp") {
				t.Errorf("temporary file %s left in %s", e.Name(), d)
			}
		}
	}
}

// TestStarterCatalogKeys checks that the starter catalog shows every key
// of the catalog format at least once, so it can serve as the reference.
func TestStarterCatalogKeys(t *testing.T) {
	parts, err := catalog.Decode("example.toml", []byte(starterCatalog))
	if err != nil {
		t.Fatal(err)
	}
	seen := func(k string) bool {
		for _, p := range parts {
			if catalog.KeyLine([]byte(starterCatalog), p.Pos.Line, k) != p.Pos.Line {
				return true
			}
		}
		return false
	}
	for _, k := range []string{"id", "name", "tech", "channels", "packages", "pinout", "lifecycle",
		"unit_cost", "temp", "supply", "input_cm", "output", "gbw", "slew", "aol", "vos", "vos_drift",
		"ib", "ios", "en", "in", "iq", "iout", "vdiff_max", "cload", "cin", "datasheet", "notes"} {
		if !seen(k) {
			t.Errorf("starter catalog never uses key %q", k)
		}
	}
}

// TestStarterDesign decodes the starter design with the design decoder and
// ranks the starter catalog against it: at least one part must pass, so
// the first thing a new user sees is a result, not an empty list.
func TestStarterDesign(t *testing.T) {
	d, err := filter.DecodeDesign("design.toml", []byte(starterDesign))
	if err != nil {
		t.Fatal(err)
	}
	plan, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	parts, err := catalog.Decode("example.toml", []byte(starterCatalog))
	if err != nil {
		t.Fatal(err)
	}
	pass := 0
	for _, r := range filter.Evaluate(plan, parts, filter.Options{}) {
		if r.Pass {
			pass++
		}
	}
	if pass == 0 || pass == len(parts) {
		t.Errorf("%d of %d starter parts pass; want some to pass and some to fail", pass, len(parts))
	}
}

func TestInitRefusesToOverwrite(t *testing.T) {
	for _, existing := range []string{"design.toml", filepath.Join("catalog.d", "example.toml")} {
		t.Run(existing, func(t *testing.T) {
			dir := t.TempDir()
			path := filepath.Join(dir, existing)
			if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(path, []byte("mine"), 0o644); err != nil {
				t.Fatal(err)
			}
			r := runOpsift(t, nil, "init", dir)
			if r.code != 2 || !strings.Contains(r.stderr, path+" already exists") {
				t.Errorf("exit %d, stderr %q", r.code, r.stderr)
			}
			if b, _ := os.ReadFile(path); string(b) != "mine" {
				t.Errorf("existing file changed to %q", b)
			}
			// Nothing else written either.
			other := filepath.Join(dir, "design.toml")
			if existing == "design.toml" {
				other = filepath.Join(dir, "catalog.d", "example.toml")
			}
			if _, err := os.Stat(other); err == nil {
				t.Errorf("init wrote %s although it refused", other)
			}
		})
	}
}

func TestInitDefaultDir(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	if r := runOpsift(t, nil, "init"); r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	for _, f := range []string{"design.toml", filepath.Join("catalog.d", "example.toml")} {
		b, err := os.ReadFile(filepath.Join(dir, f))
		if err != nil || len(b) == 0 {
			t.Errorf("%s: %v", f, err)
		}
	}
}

func TestInitUsage(t *testing.T) {
	if r := runOpsift(t, nil, "init", "a", "b"); r.code != 2 || !strings.Contains(r.stderr, "at most one directory") {
		t.Errorf("two dirs: exit %d, stderr %q", r.code, r.stderr)
	}
	if r := runOpsift(t, nil, "init", "--help"); r.code != 0 || !strings.Contains(r.stdout, "Usage: opsift init") {
		t.Errorf("help: exit %d, stdout %q", r.code, r.stdout)
	}
}

func TestWriteNewFile(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "f.toml")
	if err := writeNewFile(p, []byte("one")); err != nil {
		t.Fatal(err)
	}
	if err := writeNewFile(p, []byte("two")); err == nil || !strings.Contains(err.Error(), "already exists") {
		t.Errorf("second write: %v", err)
	}
	if b, _ := os.ReadFile(p); string(b) != "one" {
		t.Errorf("file holds %q, want one", b)
	}
	if st, _ := os.Stat(p); st.Mode().Perm() != 0o644 {
		t.Errorf("mode %v, want 0644", st.Mode().Perm())
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("%d entries in dir, want 1 (no temporary left)", len(ents))
	}
}

// TestInitDesignCaution: the design file init writes carries the whole
// caution (in comment lines), not only its first sentence.
func TestInitDesignCaution(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "proj")
	if r := runOpsift(t, nil, "init", dir); r.code != 0 {
		t.Fatalf("init exit %d: %s", r.code, r.stderr)
	}
	b, err := os.ReadFile(filepath.Join(dir, "design.toml"))
	if err != nil {
		t.Fatal(err)
	}
	var text []string
	for _, l := range strings.Split(string(b), "\n") {
		if strings.HasPrefix(l, "# ") {
			text = append(text, strings.TrimPrefix(l, "# "))
		}
	}
	if joined := strings.Join(text, " "); !strings.Contains(joined, "CAUTION: "+caution) {
		t.Errorf("design.toml comments lack the caution %q:\n%s", caution, b)
	}
}

// TestStarterDesignLimitExample uncomments the starter design's
// [choose.limit] example: it must decode and derive to one limit.<figure>
// requirement per side written, so the example a user copies works.
func TestStarterDesignLimitExample(t *testing.T) {
	var lines []string
	for _, l := range strings.Split(starterDesign, "\n") {
		for _, key := range []string{"[choose.limit]", "vos = ", "ib = ", "gbw = "} {
			if rest, ok := strings.CutPrefix(l, "# "); ok && strings.HasPrefix(rest, key) {
				l = rest
			}
		}
		lines = append(lines, l)
	}
	d, err := filter.DecodeDesign("design.toml", []byte(strings.Join(lines, "\n")))
	if err != nil {
		t.Fatal(err)
	}
	plan, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	var keys []string
	for _, q := range plan.Global {
		if strings.HasPrefix(string(q.Key), filter.LimitPrefix) {
			keys = append(keys, string(q.Key)+" "+q.Bound.String())
		}
	}
	if got := strings.Join(keys, ", "); got != "limit.gbw min, limit.gbw max, limit.vos max, limit.ib max" {
		t.Errorf("limits of the uncommented example: %s", got)
	}
}
