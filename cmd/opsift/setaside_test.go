package main

import (
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"
)

// demoPlusBroken returns the demo catalog directory (52 parts) and a file
// holding one broken part, its slew rate on line 12: 53 parts, one bad.
func demoPlusBroken(t *testing.T) (demo, bad string) {
	t.Helper()
	return filepath.Join("..", "..", "data", "catalog"), filepath.Join("..", "..", "testdata", "partial", "broken.toml")
}

// TestBadPartCostsOnePart: with one broken part out of 53, rank ranks the
// other 52 and warns on stderr and in the JSON and md documents;
// --strict-catalog refuses the catalog (exit 2) and check fails (exit 1).
func TestBadPartCostsOnePart(t *testing.T) {
	demo, bad := demoPlusBroken(t)
	cat := []string{"--catalog", demo, "--catalog", bad}
	problem := bad + `:12: part "zz1-broken": field "slew": typ = "3 MHz" is a frequency`

	r := runOpsift(t, nil, append([]string{"rank", "--format", "json", "--all"}, cat...)...)
	if r.code != 0 {
		t.Fatalf("rank exit %d, stderr:\n%s", r.code, r.stderr)
	}
	for _, want := range []string{
		"opsift: warning: 1 of 53 parts set aside for problems; 52 valid parts in use (--strict-catalog refuses the catalog instead)",
		"opsift: " + problem,
	} {
		if !strings.Contains(r.stderr, want) {
			t.Errorf("stderr lacks %q:\n%s", want, r.stderr)
		}
	}
	var doc struct {
		Parts    int `json:"parts"`
		SetAside []struct {
			Kind, ID, File string
			Line           int
			Problems       []string
		} `json:"set_aside"`
	}
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Parts != 52 || len(doc.SetAside) != 1 {
		t.Fatalf("json: %d parts, set aside %+v; want 52 and one", doc.Parts, doc.SetAside)
	}
	if s := doc.SetAside[0]; s.Kind != "part" || s.ID != "zz1-broken" || s.File != bad || s.Line != 12 ||
		len(s.Problems) != 1 || !strings.HasPrefix(s.Problems[0], problem) {
		t.Errorf("json set_aside %+v", s)
	}

	md := runOpsift(t, nil, append([]string{"rank", "--format", "md"}, cat...)...)
	if md.code != 0 || !strings.Contains(md.stdout, "## Set aside") || !strings.Contains(md.stdout, "zz1-broken") {
		t.Errorf("md exit %d lacks the set-aside section:\n%s", md.code, md.stdout)
	}

	strict := runOpsift(t, nil, append([]string{"rank", "--strict-catalog"}, cat...)...)
	if strict.code != 2 || strict.stdout != "" || !strings.Contains(strict.stderr, "opsift: "+problem) {
		t.Errorf("--strict-catalog: exit %d, stdout %q, stderr %q", strict.code, strict.stdout, strict.stderr)
	}
	check := runOpsift(t, nil, append([]string{"check"}, cat...)...)
	if check.code != 1 || !strings.Contains(check.stdout, problem) {
		t.Errorf("check: exit %d, stdout %q", check.code, check.stdout)
	}
}

// TestSetAsidePartByID: replace, preview and compare name a set-aside part as
// such, with its problem, rather than as an unknown id; the other parts
// work as usual.
func TestSetAsidePartByID(t *testing.T) {
	demo, bad := demoPlusBroken(t)
	for _, cmd := range []string{"replace", "preview", "compare"} {
		t.Run(cmd, func(t *testing.T) {
			bad1, good := []string{cmd, "zz1-broken"}, []string{cmd, "gp4-bip"}
			if cmd == "compare" {
				bad1, good = append(bad1, "gp4-bip"), append(good, "rr4-cmos")
			}
			r := runOpsift(t, nil, append(bad1, "--catalog", demo, "--catalog", bad)...)
			if r.code != 2 || !strings.Contains(r.stderr, `opsift: `+cmd+`: part "zz1-broken" is set aside for problems: `+bad+`:12:`) {
				t.Errorf("exit %d, stderr:\n%s", r.code, r.stderr)
			}
			ok := runOpsift(t, nil, append(good, "--catalog", demo, "--catalog", bad)...)
			if ok.code != 0 || !strings.Contains(ok.stderr, "1 of 53 parts set aside") {
				t.Errorf("a valid part: exit %d, stderr:\n%s", ok.code, ok.stderr)
			}
		})
	}
}

// TestSetAsideRefused: the cases where a partial catalog is not possible
// stay input errors (exit 2).
func TestSetAsideRefused(t *testing.T) {
	demo, bad := demoPlusBroken(t)
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"no valid part left", []string{"rank", "--catalog", bad}, `part "zz1-broken": field "slew"`},
		{"a source that cannot be read", []string{"rank", "--catalog", demo, "--catalog", filepath.Join(demo, "nope")},
			"cannot read catalog: no such file or directory"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runOpsift(t, nil, tc.args...)
			if r.code != 2 || r.stdout != "" || !strings.Contains(r.stderr, tc.want) {
				t.Errorf("exit %d, stdout %q, stderr:\n%s", r.code, r.stdout, r.stderr)
			}
		})
	}
}
