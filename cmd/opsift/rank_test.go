package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
)

const (
	rankCat    = "testdata/rank-parts.toml"
	rankDesign = "../../testdata/designs/audio-split.toml"
)

// Every format of rank and derive, pinned on a test design and catalog.
func TestRankGolden(t *testing.T) {
	tests := []struct {
		name string
		args []string
	}{
		{"rank_table.golden", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--all"}},
		{"rank_table_top.golden", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--top", "1"}},
		{"rank_table_cost.golden", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--sort", "cost"}},
		{"rank_csv.golden", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--format", "csv", "--all"}},
		{"rank_json.golden", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--format", "json"}},
		{"rank_md.golden", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--format", "md", "--all"}},
		{"rank_toml.golden", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--format", "toml"}},
		{"rank_strict_table.golden", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--strict", "--all"}},
		{"derive_text.golden", []string{"derive", "--design", rankDesign}},
		{"derive_json.golden", []string{"derive", "--design", rankDesign, "--format", "json"}},
		{"derive_demo_text.golden", []string{"derive"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runCLI(t, false, nil, tc.args...)
			if r.code != 0 || r.stderr != "" {
				t.Fatalf("exit %d, stderr %q", r.code, r.stderr)
			}
			assertGolden(t, tc.name, r.stdout)
		})
	}
}

// The demo catalog and design run with no flags at all.
func TestRankDemo(t *testing.T) {
	r := runCLI(t, false, nil, "rank", "--format", "json")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	var doc struct {
		Candidates []struct{ ID string }
		Passing    int
	}
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Passing == 0 || len(doc.Candidates) != doc.Passing {
		t.Errorf("demo: %d passing, %d listed", doc.Passing, len(doc.Candidates))
	}
}

// Colour only on a terminal, never with NO_COLOR, never into a file; the
// width follows COLUMNS.
func TestRankColourAndWidth(t *testing.T) {
	args := []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--all"}
	if r := runCLI(t, true, nil, args...); !strings.Contains(r.stdout, "\x1b[") {
		t.Errorf("no colour on a terminal")
	}
	if r := runCLI(t, true, map[string]string{"NO_COLOR": "1"}, args...); strings.Contains(r.stdout, "\x1b[") {
		t.Errorf("colour with NO_COLOR")
	}
	if r := runCLI(t, false, nil, args...); strings.Contains(r.stdout, "\x1b[") {
		t.Errorf("colour when not a terminal")
	}
	r := runCLI(t, false, map[string]string{"COLUMNS": "64"}, args...)
	for _, l := range strings.Split(r.stdout, "\n") {
		if n := len([]rune(l)); n > 64 {
			t.Errorf("COLUMNS=64: line of %d: %q", n, l)
		}
	}
}

// Exit codes per DESIGN.md: 2 for bad usage and bad input files, 0 for a
// rank with no passing part.
func TestRankErrors(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.toml")
	os.WriteFile(bad, []byte("[supply]\npos = \"5 V\"\n[[stage]]\nname = \"g\"\nkind = \"follower\"\nsignal = { peak = \"1 V\", freq = \"2 kHz/s\" }\n"), 0o644)
	strictDesign := filepath.Join(dir, "none.toml")
	os.WriteFile(strictDesign, []byte("[supply]\npos = \"5 V\"\n[[stage]]\nname = \"g\"\nkind = \"follower\"\nsignal = { peak = \"1 V\", freq = \"200 MHz\" }\n"), 0o644)
	tests := []struct {
		name   string
		args   []string
		code   int
		stderr string
	}{
		{"bad format", []string{"rank", "--format", "xml"}, 2, `unknown format "xml"`},
		{"bad sort", []string{"rank", "--sort", "speed"}, 2, `unknown sort key "speed"`},
		{"negative top", []string{"rank", "--top", "-1"}, 2, "--top -1"},
		{"extra argument", []string{"rank", "extra"}, 2, `unexpected argument "extra"`},
		{"unknown flag", []string{"rank", "--colour"}, 2, "flag provided but not defined"},
		{"missing design", []string{"rank", "--design", filepath.Join(dir, "nope.toml")}, 2, "nope.toml"},
		{"bad design", []string{"rank", "--design", bad}, 2, `bad.toml:6: stage "g": field "signal.freq": "2 kHz/s"`},
		{"missing catalog", []string{"rank", "--catalog", filepath.Join(dir, "none")}, 2, "none"},
		{"nothing passes is success", []string{"rank", "--design", strictDesign, "--catalog", rankCat}, 0, ""},
		{"derive bad format", []string{"derive", "--format", "csv"}, 2, "want text or json"},
		{"derive bad design", []string{"derive", "--design", bad}, 2, "bad.toml:6"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runCLI(t, false, nil, tc.args...)
			if r.code != tc.code {
				t.Errorf("exit %d, want %d (stderr %q)", r.code, tc.code, r.stderr)
			}
			if !strings.Contains(r.stderr, tc.stderr) {
				t.Errorf("stderr %q, want it to contain %q", r.stderr, tc.stderr)
			}
		})
	}
}

func TestRankHelp(t *testing.T) {
	for _, cmd := range []string{"rank", "derive"} {
		r := runCLI(t, false, nil, cmd, "--help")
		if r.code != 0 || !strings.Contains(r.stdout, "Usage: opsift "+cmd) {
			t.Errorf("%s --help: exit %d, stdout %q", cmd, r.code, r.stdout)
		}
	}
}

// -o writes the file atomically (no temporary left behind) and the toml
// export is a catalog that check accepts and that ranks in the same order.
func TestRankOutputFileAndTOMLRoundTrip(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "short.toml")
	os.WriteFile(out, []byte("old"), 0o600)
	r := runCLI(t, false, nil, "rank", "--design", rankDesign, "--catalog", rankCat, "--format", "toml", "-o", out)
	if r.code != 0 || r.stdout != "" {
		t.Fatalf("exit %d, stdout %q, stderr %q", r.code, r.stdout, r.stderr)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("files left in the output directory: %v", entries)
	}
	if st, _ := os.Stat(out); st.Mode().Perm() != 0o600 {
		t.Errorf("mode %v, want the old file's 0600", st.Mode().Perm())
	}
	if c := runCLI(t, false, nil, "check", "--catalog", out); c.code != 0 {
		t.Errorf("check on the export: exit %d: %s%s", c.code, c.stdout, c.stderr)
	}
	ids := func(args ...string) []string {
		r := runCLI(t, false, nil, append([]string{"rank", "--design", rankDesign, "--format", "json"}, args...)...)
		var doc struct{ Candidates []struct{ ID string } }
		if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
			t.Fatal(err)
		}
		var out []string
		for _, c := range doc.Candidates {
			out = append(out, c.ID)
		}
		return out
	}
	a, b := ids("--catalog", rankCat), ids("--catalog", out)
	if strings.Join(a, ",") != strings.Join(b, ",") || len(a) == 0 {
		t.Errorf("order on the export %v, want %v", b, a)
	}
	data, _ := os.ReadFile(out)
	if _, err := catalog.Decode(out, data); err != nil {
		t.Errorf("export does not decode: %v", err)
	}
}

// Every command's --help goes to stdout once and leaves stderr empty; a bad
// flag puts the error and the usage on stderr once.
func TestHelpPrintedOnce(t *testing.T) {
	for _, c := range commands() {
		t.Run(c.name, func(t *testing.T) {
			r := runOpsift(t, nil, c.name, "--help")
			want := "Usage: opsift " + c.name
			if r.code != 0 || strings.Count(r.stdout, want) != 1 || r.stderr != "" {
				t.Errorf("--help: exit %d, %d usage(s) on stdout, stderr %q", r.code, strings.Count(r.stdout, want), r.stderr)
			}
			r = runOpsift(t, nil, c.name, "--no-such-flag")
			if r.code != 2 || r.stdout != "" || strings.Count(r.stderr, want) != 1 || !strings.Contains(r.stderr, "no-such-flag") {
				t.Errorf("bad flag: exit %d, stdout %q, stderr %q", r.code, r.stdout, r.stderr)
			}
		})
	}
	r := runOpsift(t, nil, "--help")
	if r.code != 0 || r.stderr != "" || strings.Count(r.stdout, "Usage:") != 1 {
		t.Errorf("opsift --help: exit %d, stderr %q", r.code, r.stderr)
	}
}
