package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// cmdResult is what one run of opsift printed and returned.

const (
	replaceCat    = "testdata/replace_quads.toml"
	replaceDesign = "testdata/replace_split5.toml"
)

// TestReplaceGolden pins every output format, with and without a design.
func TestReplaceGolden(t *testing.T) {
	tests := []struct {
		name string
		tty  bool
		vars map[string]string
		args []string
	}{
		{"table", false, nil, []string{"bq4-old"}},
		{"json", false, nil, []string{"bq4-old", "--format", "json"}},
		{"md", false, nil, []string{"bq4-old", "--format", "md"}},
		{"csv", false, nil, []string{"bq4-old", "--format", "csv"}},
		{"design_table", false, nil, []string{"bq4-old", "--design", replaceDesign}},
		{"design_all_table", false, nil, []string{"bq4-old", "--design", replaceDesign, "--all"}},
		{"design_json", false, nil, []string{"bq4-old", "--design", replaceDesign, "--format", "json"}},
		{"design_md", false, nil, []string{"bq4-old", "--design", replaceDesign, "--format", "md"}},
		{"design_csv", false, nil, []string{"bq4-old", "--design", replaceDesign, "--format", "csv"}},
		{"obsolete_table", false, nil, []string{"bq4-bip", "--obsolete"}},
		{"color_table", true, nil, []string{"bq4-old"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			args := append([]string{"replace", "--catalog", replaceCat}, tt.args...)
			r := runCLI(t, tt.tty, tt.vars, args...)
			if r.code != 0 {
				t.Fatalf("exit %d, stderr %s", r.code, r.stderr)
			}
			assertGolden(t, "replace_"+tt.name+".golden", r.stdout)
		})
	}
}

// TestReplaceColour: colour only on a terminal, never with NO_COLOR
// (no-color.org: any non-empty value), never in files or other formats.
func TestReplaceColour(t *testing.T) {
	tests := []struct {
		name string
		tty  bool
		vars map[string]string
		args []string
		want bool
	}{
		{"terminal", true, nil, nil, true},
		{"pipe", false, nil, nil, false},
		{"NO_COLOR", true, map[string]string{"NO_COLOR": "1"}, nil, false},
		{"markdown on a terminal", true, nil, []string{"--format", "md"}, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			args := append([]string{"replace", "bq4-old", "--catalog", replaceCat}, tt.args...)
			r := runCLI(t, tt.tty, tt.vars, args...)
			if got := strings.Contains(r.stdout, "\x1b["); got != tt.want {
				t.Errorf("escape codes %v, want %v", got, tt.want)
			}
		})
	}
}

func TestReplaceErrors(t *testing.T) {
	tests := []struct {
		name     string
		args     []string
		code     int
		stderr   string
		stdoutIn string
	}{
		{"unknown id with a near miss", []string{"replace", "bq4-od", "--catalog", replaceCat}, 2, `did you mean "bq4-old"?`, ""},
		{"unknown id far from all", []string{"replace", "zzzzzzzzzz", "--catalog", replaceCat}, 2, `no part with id "zzzzzzzzzz"`, ""},
		{"missing id", []string{"replace", "--catalog", replaceCat}, 2, "missing PART-ID", ""},
		{"two ids", []string{"replace", "bq4-old", "cq4-lv", "--catalog", replaceCat}, 2, "one PART-ID expected", ""},
		{"bad format", []string{"replace", "bq4-old", "--catalog", replaceCat, "--format", "xml"}, 2, `--format "xml": want one of table, json, md, csv`, ""},
		{"unknown flag", []string{"replace", "bq4-old", "--colour"}, 2, "flag provided but not defined: -colour", ""},
		{"missing design file", []string{"replace", "bq4-old", "--catalog", replaceCat, "--design", "testdata/no-such.toml"}, 2, "no-such.toml", ""},
		{"missing catalog", []string{"replace", "bq4-old", "--catalog", "testdata/no-such-catalog.toml"}, 2, "no-such-catalog.toml", ""},
		{"help", []string{"replace", "--help"}, 0, "", "Usage: opsift replace PART-ID"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := runCLI(t, false, nil, tt.args...)
			if r.code != tt.code {
				t.Errorf("exit %d, want %d (stderr %q)", r.code, tt.code, r.stderr)
			}
			if !strings.Contains(r.stderr, tt.stderr) {
				t.Errorf("stderr %q, want it to contain %q", r.stderr, tt.stderr)
			}
			if !strings.Contains(r.stdout, tt.stdoutIn) {
				t.Errorf("stdout %q, want it to contain %q", r.stdout, tt.stdoutIn)
			}
		})
	}
}

// TestReplaceJSONContract checks the contract fields of the JSON and that
// values are SI: the 16 V CMOS quad's slew of 5 V/µs is 5e6 V/s.
func TestReplaceJSONContract(t *testing.T) {
	r := runCLI(t, false, nil, "replace", "--catalog", replaceCat, "bq4-old", "--design", replaceDesign, "--format", "json", "--all")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	var doc struct {
		Original   struct{ ID string }
		Candidates []struct {
			ID           string
			DropIn       *bool `json:"drop_in"`
			Strict       *bool
			Regressions  []struct{ Key, Reason string }
			Improvements []struct{ Key, Reason string }
			Fields       []struct {
				Key       string
				Original  *float64
				Candidate *float64
				Unit      string
				Verdict   string
			}
			Design *struct {
				Pass        *bool
				WorstMargin *float64 `json:"worst_margin"`
				Binding     *struct{ Stage, Key string }
			}
		}
		Caution string
	}
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Original.ID != "bq4-old" || len(doc.Candidates) != 4 || doc.Caution == "" {
		t.Fatalf("original %q, %d candidates, caution %q", doc.Original.ID, len(doc.Candidates), doc.Caution)
	}
	c := doc.Candidates[0]
	if c.ID != "cq4-cmos" || c.DropIn == nil || !*c.DropIn || c.Strict == nil || *c.Strict {
		t.Errorf("first candidate %+v, want the non-strict drop-in cq4-cmos", c)
	}
	if len(c.Regressions) == 0 || c.Regressions[0].Key != "supply_max" || c.Regressions[0].Reason == "" {
		t.Errorf("regressions %+v, want supply_max first with a reason", c.Regressions)
	}
	if c.Design == nil || c.Design.Pass == nil || !*c.Design.Pass || c.Design.WorstMargin == nil || c.Design.Binding == nil {
		t.Errorf("design %+v, want pass with a worst margin and binding", c.Design)
	}
	for _, f := range c.Fields {
		if f.Key == "slew" && (f.Unit != "V/s" || f.Candidate == nil || *f.Candidate != 5.4e6 || f.Verdict != "better") {
			t.Errorf("slew field %+v, want 5.4e6 V/s better", f)
		}
		if f.Key == "supply_max" && (f.Unit != "V" || *f.Original != 30 || *f.Candidate != 17 || f.Verdict != "worse") {
			t.Errorf("supply_max field %+v", f)
		}
	}
	if len(c.Fields) != 23 {
		t.Errorf("%d fields, want 23", len(c.Fields))
	}
}

// TestReplaceOutputFile: -o writes the file (replacing an old one whole)
// and prints nothing.
func TestReplaceOutputFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "review.md")
	if err := os.WriteFile(path, []byte("old review\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	r := runCLI(t, true, nil, "replace", "bq4-old", "--catalog", replaceCat, "--format", "md", "-o", path)
	if r.code != 0 || r.stdout != "" {
		t.Fatalf("exit %d, stdout %q, stderr %q", r.code, r.stdout, r.stderr)
	}
	got, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(string(got), "# Replacement review: bq4-old") || strings.Contains(string(got), "\x1b[") {
		t.Errorf("file starts %q", string(got[:min(60, len(got))]))
	}
	if st, _ := os.Stat(path); st.Mode().Perm() != 0o600 {
		t.Errorf("mode %v, want the old file's 0600 kept", st.Mode().Perm())
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("%d files in the directory, want only review.md (no temporary left)", len(ents))
	}
}

// TestReplaceDemoObsoletePart is the "done when" on the embedded
// demo catalog and design: the obsolete bipolar quad's drop-ins are listed
// with their regressions, and with the demo design the 18 V CMOS quad
// passes while its lower maximum supply shows as a warning.
func TestReplaceDemoObsoletePart(t *testing.T) {
	r := runCLI(t, false, nil, "replace", "gp4-bip-old", "--format", "json")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	if !strings.Contains(r.stdout, `"id": "rr4-cmos"`) || !strings.Contains(r.stdout, `"key": "supply_max"`) {
		t.Errorf("demo: rr4-cmos with a supply_max regression not listed:\n%s", r.stdout)
	}
	d := runCLI(t, false, nil, "replace", "gp4-bip-old", "--design", "../../data/designs/vibration-monitor-5v.toml", "--format", "json")
	if d.code != 0 {
		t.Fatalf("with the demo design: exit %d: %s", d.code, d.stderr)
	}
	var doc struct {
		Candidates []struct {
			ID          string
			DropIn      bool `json:"drop_in"`
			Regressions []struct{ Key string }
			Design      struct{ Pass bool }
		}
	}
	if err := json.Unmarshal([]byte(d.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Candidates) == 0 {
		t.Fatal("no candidate passes the demo design")
	}
	first := doc.Candidates[0]
	if first.ID != "rr4-cmos" || !first.DropIn || !first.Design.Pass || len(first.Regressions) == 0 || first.Regressions[0].Key != "supply_max" {
		t.Errorf("first candidate %+v, want the passing drop-in rr4-cmos warning of supply_max", first)
	}
}
