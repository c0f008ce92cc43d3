package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/opsift/opsift/filter/report"
)

// -o writes the same document as stdout, for every command that writes one;
// a table in a file is never fitted to a terminal's width.
func TestOutputFiles(t *testing.T) {
	dir := t.TempDir()
	tests := []struct {
		name string
		args []string
	}{
		{"derive", []string{"derive", "--design", rankDesign}},
		{"derive json", []string{"derive", "--design", rankDesign, "--format", "json"}},
		{"preview", []string{"preview", "tb-fet-fast", "--catalog", rankCat, "--design", rankDesign, "--height", "6"}},
		{"list", []string{"list", "--catalog", rankCat}},
	}
	for i, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			out := filepath.Join(dir, tc.name)
			want := runCLI(t, false, nil, tc.args...)
			got := runCLI(t, false, nil, append(tc.args, "-o", out)...)
			if want.code != 0 || got.code != 0 || got.stdout != "" {
				t.Fatalf("exit %d/%d, stdout %q, stderr %q", want.code, got.code, got.stdout, got.stderr)
			}
			b, err := os.ReadFile(out)
			if err != nil || string(b) != want.stdout {
				t.Errorf("file %d differs from stdout (%v)", i, err)
			}
		})
	}
	// COLUMNS=60 fits a terminal; the same table into a file keeps every
	// name whole.
	full := "Test: CMOS quad, 40 V, rail-to-rail output"
	args := []string{"rank", "--catalog", rankCat, "--design", rankDesign}
	if r := runCLI(t, true, map[string]string{"COLUMNS": "60"}, args...); strings.Contains(r.stdout, full) {
		t.Errorf("a 60-column terminal shows the whole name:\n%s", r.stdout)
	}
	out := filepath.Join(dir, "rank.txt")
	runCLI(t, true, map[string]string{"COLUMNS": "60"}, append(args, "-o", out)...)
	if b, _ := os.ReadFile(out); !strings.Contains(string(b), full) {
		t.Errorf("rank -o shortened the name:\n%s", b)
	}
}

// --bom starts CSV with the UTF-8 byte-order mark (U+FEFF, the Unicode
// Standard's signature; from memory), and only CSV.
func TestBOM(t *testing.T) {
	for _, args := range [][]string{
		{"rank", "--catalog", rankCat, "--design", rankDesign, "--format", "csv"},
		{"list", "--catalog", rankCat, "--format", "csv"},
		{"replace", "ta-slow-bip", "--catalog", rankCat, "--format", "csv"},
		{"compare", "ta-slow-bip", "tb-fet-fast", "--catalog", rankCat, "--design", rankDesign, "--format", "csv"},
	} {
		plain := runCLI(t, false, nil, args...)
		bom := runCLI(t, false, nil, append(args, "--bom")...)
		if strings.HasPrefix(plain.stdout, report.BOM) || bom.stdout != "\xef\xbb\xbf"+plain.stdout {
			t.Errorf("%s: --bom output does not start with EF BB BF before the same CSV", args[0])
		}
	}
	table := runCLI(t, false, nil, "rank", "--catalog", rankCat, "--design", rankDesign, "--bom")
	if strings.HasPrefix(table.stdout, report.BOM) {
		t.Error("--bom marked a table")
	}
}

// JSON carries the catalog's datasheet reference, as md does.
func TestJSONDatasheet(t *testing.T) {
	r := runCLI(t, false, nil, "rank", "--catalog", rankCat, "--design", rankDesign, "--format", "json")
	var doc struct {
		Candidates []struct{ ID, Datasheet string }
	}
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	for _, c := range doc.Candidates {
		want := ""
		if c.ID == "tb-fet-fast" {
			want = "https://example.invalid/tb-fet-fast.pdf"
		}
		if c.Datasheet != want {
			t.Errorf("%s: datasheet %q, want %q", c.ID, c.Datasheet, want)
		}
	}
}
