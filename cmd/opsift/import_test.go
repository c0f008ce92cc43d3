package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// importCSV is an Excel-style sheet (BOM, ";", decimal comma) of invented
// parts, one row of which cannot be read.
const importCSV = "\ufeffPart;Description;Tech;Channels;Packages;Supply min (V);Supply max (V);GBW (MHz);Slew rate (V/us);Ib max (nA);Shelf\r\n" +
	"imp-x1;Imported single;cmos;1;sot23-5;1,8;5,5;3,2;1,6;0,01;B4\r\n" +
	"imp-x2;Imported dual;bipolar;2;soic8;3;32;1,1;quick;150;B5\r\n" +
	"imp-x3;Imported quad;bicmos;4;soic14;2,7;16;12;9,5;0,5;B6\r\n"

func TestImportThenCheck(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "parts.csv")
	out := filepath.Join(dir, "imported.toml")
	if err := os.WriteFile(in, []byte(importCSV), 0o644); err != nil {
		t.Fatal(err)
	}
	r := runOpsift(t, nil, "import", in, "-o", out)
	if r.code != 0 || r.stdout != "" {
		t.Fatalf("import exit %d, stdout %q, stderr:\n%s", r.code, r.stdout, r.stderr)
	}
	for _, want := range []string{
		"opsift: " + in + `:3:9: column "Slew rate (V/us)": field "slew": typ = "quick" is not a number with a unit`,
		`opsift: note: columns not imported (no catalog key; name one in --map, or "-" to skip): 11 "Shelf"`,
		"opsift: " + in + ": 2 parts of 3 rows imported; 1 left out for problems",
	} {
		if !strings.Contains(r.stderr, want) {
			t.Errorf("stderr lacks %q:\n%s", want, r.stderr)
		}
	}
	c := runOpsift(t, nil, "check", "--catalog", out)
	if c.code != 0 || !strings.Contains(c.stdout, "parts:     2\n") {
		t.Errorf("check of the imported file: exit %d\n%s", c.code, c.stdout)
	}
	text, _ := os.ReadFile(out)
	for _, want := range []string{"# opsift import from " + in, "CAUTION:", `id = "imp-x3"`, `gbw = { typ = "12 MHz" }`, `ib = { max = "500 pA" }`} {
		if !strings.Contains(string(text), want) {
			t.Errorf("imported file lacks %q:\n%s", want, text)
		}
	}
	// The file is there now: a second import does not replace it without --force.
	again := runOpsift(t, nil, "import", in, "-o", out)
	if again.code != 2 || !strings.Contains(again.stderr, "already exists; pass --force") {
		t.Errorf("second import: exit %d, stderr %s", again.code, again.stderr)
	}
	if f := runOpsift(t, nil, "import", in, "-o", out, "--force"); f.code != 0 {
		t.Errorf("--force: exit %d, stderr %s", f.code, f.stderr)
	}
}

func TestImportDryRunAndErrors(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "parts.csv")
	if err := os.WriteFile(in, []byte(importCSV), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "never.toml")
	r := runOpsift(t, nil, "import", "--dry-run", in, "-o", out)
	if r.code != 0 || !strings.Contains(r.stdout, `id = "imp-x1"`) || !strings.Contains(r.stderr, "dry run: would write "+out) {
		t.Errorf("dry run: exit %d\nstdout %s\nstderr %s", r.code, r.stdout, r.stderr)
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("--dry-run wrote the file")
	}
	allBad := filepath.Join(dir, "bad.csv")
	if err := os.WriteFile(allBad, []byte("id,gbw (MHz)\nimp-z,fast\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	badMap := filepath.Join(dir, "map.toml")
	if err := os.WriteFile(badMap, []byte("[columns]\nX = \"gbx.typ\"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"import"}, "import: want one FILE.csv"},
		{[]string{"import", filepath.Join(dir, "missing.csv")}, "missing.csv: no such file or directory"},
		{[]string{"import", allBad}, "bad.csv: no row could be imported"},
		{[]string{"import", in, "--map", badMap}, `"gbx.typ" is not a catalog key`},
	}
	for _, tc := range tests {
		r := runOpsift(t, nil, tc.args...)
		if r.code != 2 || !strings.Contains(r.stderr, tc.want) {
			t.Errorf("%v: exit %d, stderr %s", tc.args, r.code, r.stderr)
		}
	}
}
