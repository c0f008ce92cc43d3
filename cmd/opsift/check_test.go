package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestCheckClean(t *testing.T) {
	dir := filepath.Join("..", "..", "testdata", "catalog")
	r := runOpsift(t, nil, "check", "--catalog", dir)
	if r.code != 0 || r.stderr != "" {
		t.Fatalf("exit %d, stderr %q", r.code, r.stderr)
	}
	// Counted by hand from contract.toml: xq4-bip gives 11 figures, of which
	// slew, vos_drift, en and in are typical only (slew from a graph);
	// lv2-rr gives gbw (typical only), slew and ib.
	want := "sources:   " + dir + `
files:     1
parts:     2
overrides: 0
figures:   14 given: 5 known only as typical, 1 read from graphs, 0 estimated
           (typical figures are derated or inflated by the design's policy at worst case)
no problems found
`
	if r.stdout != want {
		t.Errorf("got\n%s\nwant\n%s", r.stdout, want)
	}
}

func TestCheckDemoByDefault(t *testing.T) {
	r := runOpsift(t, nil, "check")
	if r.code != 0 {
		t.Fatalf("the embedded demo catalog fails check (exit %d):\n%s%s", r.code, r.stdout, r.stderr)
	}
	if !strings.HasPrefix(r.stdout, "sources:   embedded demo catalog\n") {
		t.Errorf("default check did not read the demo:\n%s", r.stdout)
	}
}

func TestCheckUserDir(t *testing.T) {
	xdg := t.TempDir()
	dir := filepath.Join(xdg, "opsift", "catalog.d")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	bad, err := os.ReadFile(filepath.Join("..", "..", "testdata", "bad", "wrong_dimension.toml"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "mine.toml"), bad, 0o644); err != nil {
		t.Fatal(err)
	}
	r := runOpsift(t, map[string]string{"XDG_CONFIG_HOME": xdg}, "check")
	want := filepath.Join(dir, "mine.toml") + `:10: part "wd-1": field "slew": typ = "1 MHz" is a frequency, want a slew rate such as "0.5 V/us"` + "\n"
	if r.code != 1 || !strings.HasSuffix(r.stdout, "1 problem found:\n"+want) {
		t.Errorf("exit %d, stdout:\n%s", r.code, r.stdout)
	}
}

func TestCheckProblems(t *testing.T) {
	bad := filepath.Join("..", "..", "testdata", "bad")
	good := filepath.Join("..", "..", "testdata", "catalog")
	tests := []struct {
		name  string
		args  []string
		lines []string // lines stdout must hold
	}{
		{"many problems, every one listed", []string{"--catalog", filepath.Join(bad, "many_problems.toml")}, []string{
			"parts:     1 (2 more left out for problems)",
			"5 problems found:",
			filepath.Join(bad, "many_problems.toml") + `:19: part "mp-1": field "gbw": typ 1 MHz is above max 500 kHz`,
			filepath.Join(bad, "many_problems.toml") + `:32: part "mp-2": field "cload": -5 pF is not positive`,
		}},
		{"malformed TOML", []string{"--catalog", filepath.Join(bad, "malformed.toml")}, []string{
			filepath.Join(bad, "malformed.toml") + `:10: not valid TOML: expected a comma or an inline table terminator '}', but got 's' instead`,
		}},
		{"missing path", []string{"--catalog", filepath.Join(bad, "nope.toml")}, []string{
			filepath.Join(bad, "nope.toml") + ": cannot read catalog: no such file or directory",
		}},
		{"override noted, later layer bad", []string{"--catalog", good, "--catalog", filepath.Join(good, "contract.toml"), "--catalog", filepath.Join(bad, "duplicate_id.toml")}, []string{
			"overrides: 2",
			`note: part "xq4-bip" from ` + filepath.Join(good, "contract.toml") + ":3 overrides " + filepath.Join(good, "contract.toml") + ":3",
			filepath.Join(bad, "duplicate_id.toml") + `:13: part "dup-1": field "id": duplicate id "dup-1"`,
		}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runOpsift(t, nil, append([]string{"check"}, tc.args...)...)
			if r.code != 1 {
				t.Errorf("exit %d, want 1", r.code)
			}
			if r.stderr != "" {
				t.Errorf("stderr %q, want nothing: problems are check's output", r.stderr)
			}
			for _, l := range tc.lines {
				if !strings.Contains(r.stdout, l) {
					t.Errorf("output lacks %q:\n%s", l, r.stdout)
				}
			}
		})
	}
}

func TestCheckEveryBadFileFails(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "bad", "*.toml"))
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			if r := runOpsift(t, nil, "check", "--catalog", f); r.code != 1 {
				t.Errorf("exit %d, want 1:\n%s", r.code, r.stdout)
			}
		})
	}
}

func TestCheckUsage(t *testing.T) {
	tests := []struct {
		name string
		args []string
		code int
		out  string // in stdout
		err  string // in stderr
	}{
		{"help", []string{"check", "--help"}, 0, "Usage: opsift check", ""},
		{"stray argument", []string{"check", "cat.toml"}, 2, "", `opsift: check: unexpected argument "cat.toml"`},
		{"unknown flag", []string{"check", "--bogus"}, 2, "", "flag provided but not defined: -bogus"},
		{"empty catalog", []string{"check", "--catalog", ""}, 2, "", "empty path"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runOpsift(t, nil, tc.args...)
			if r.code != tc.code || !strings.Contains(r.stdout, tc.out) || !strings.Contains(r.stderr, tc.err) {
				t.Errorf("exit %d\nstdout %q\nstderr %q", r.code, r.stdout, r.stderr)
			}
		})
	}
}

// TestLoadCatalogErrorLines checks how a command other than check reports
// an invalid catalog: exit 2, each problem on its own "opsift: " line,
// the list cut after maxShown with a pointer to check.
func TestLoadCatalogErrorLines(t *testing.T) {
	bad := filepath.Join("..", "..", "testdata", "bad")
	e := &env{getenv: func(string) string { return "" }}
	_, err := loadCatalog(e, []string{bad}, true)
	if err == nil {
		t.Fatal("invalid catalog loaded")
	}
	var buf bytes.Buffer
	if code := exitCode(err, &buf); code != 2 {
		t.Errorf("exit %d, want 2", code)
	}
	lines := strings.Split(strings.TrimSuffix(buf.String(), "\n"), "\n")
	if len(lines) != maxShown+1 {
		t.Fatalf("%d lines, want %d:\n%s", len(lines), maxShown+1, buf.String())
	}
	for _, l := range lines {
		if !strings.HasPrefix(l, "opsift: ") {
			t.Errorf("line without prefix: %q", l)
		}
	}
	if !strings.HasPrefix(lines[0], "opsift: "+filepath.Join(bad, "bad_id_charset.toml")+":3: part ") {
		t.Errorf("first line %q", lines[0])
	}
	if last := lines[maxShown]; !strings.Contains(last, "more catalog problems (see opsift check --catalog "+bad+")") {
		t.Errorf("last line %q", last)
	}
}
