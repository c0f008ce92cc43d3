package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// withChoose writes the audio-split test design with a [choose] table
// added and returns its path.
func withChoose(t *testing.T, choose string) string {
	t.Helper()
	raw, err := os.ReadFile(rankDesign)
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(raw), "[[stage]]", "[choose]\n"+choose+"\n\n[[stage]]", 1)
	p := filepath.Join(t.TempDir(), "design.toml")
	if err := os.WriteFile(p, []byte(text), 0o600); err != nil {
		t.Fatal(err)
	}
	return p
}

// A part failing only on the package filter shows no margin, names the
// filter, and lists no positive worst margin in any rank format; replace
// names it the same way.
func TestFailingPartNamesHardFilter(t *testing.T) {
	// tc-rr-quad comes in soic14 only: the soic8 filter fails it, while its
	// numeric checks pass (+5.1 % on buffer/noise in rank_table.golden).
	d := withChoose(t, `packages = ["soic8"]`)
	table := runOpsift(t, nil, "rank", "--design", d, "--catalog", rankCat, "--all")
	var row string
	for _, l := range strings.Split(table.stdout, "\n") {
		if strings.Contains(l, "tc-rr-quad") {
			row = l
		}
	}
	if !strings.Contains(row, "—  fails: package not offered") || strings.Contains(row, "+") {
		t.Errorf("table row %q, want no margin and the package filter named", row)
	}
	if !strings.Contains(table.stdout, "✗ package not offered: needs soic8, has soic14") {
		t.Errorf("table lacks the failing-filter line:\n%s", table.stdout)
	}
	md := runOpsift(t, nil, "rank", "--design", d, "--catalog", rankCat, "--all", "--format", "md")
	if !strings.Contains(md.stdout, "| – | `tc-rr-quad` | **no** | — | fails: package not offered |") {
		t.Errorf("md ranking row wrong:\n%s", md.stdout)
	}
	js := runOpsift(t, nil, "rank", "--design", d, "--catalog", rankCat, "--all", "--format", "json")
	i := strings.Index(js.stdout, `"id": "tc-rr-quad"`)
	if i < 0 || !strings.Contains(js.stdout[i:i+400], `"worst_margin": null`) || !strings.Contains(js.stdout[i:i+500], `"fail_reason": "package not offered"`) {
		t.Errorf("json candidate: %s", js.stdout[max(i, 0):max(i, 0)+500])
	}
	csv := runOpsift(t, nil, "rank", "--design", d, "--catalog", rankCat, "--all", "--format", "csv")
	for _, l := range strings.Split(csv.stdout, "\n") {
		if strings.Contains(l, "tc-rr-quad") && !strings.Contains(l, ",false,,—,,package not offered,") {
			t.Errorf("csv row %q", l)
		}
	}
	rep := runOpsift(t, nil, "replace", "tb-fet-fast", "--design", d, "--catalog", rankCat, "--all")
	for _, l := range strings.Split(rep.stdout, "\n") {
		if strings.Contains(l, "tc-rr-quad") && strings.Contains(l, "FAIL") && !strings.Contains(l, "FAIL package not offered") {
			t.Errorf("replace row %q", l)
		}
	}
}

// Package filters are matched whatever the case and separators, checked
// against the catalog with a did-you-mean, and a filter leaving no part
// says so.
func TestPackageFilterNotes(t *testing.T) {
	// notWant is the phrase both package warnings carry ("is not in the
	// catalog", "no part in the catalog passes"); the design's other
	// warnings are not this test's business.
	tests := []struct {
		choose, want, notWant string
	}{
		{`packages = ["SOIC-8"]`, "1 of 5 parts pass", "in the catalog"},
		{`packages = ["SOIC-14"]`, "1 of 5 parts pass", "in the catalog"},
		{`packages = ["soic8 soic14"]`, "2 of 5 parts pass", "in the catalog"},
		{`packages = ["soic80"]`, `⚠ package "soic80" is not in the catalog (did you mean "soic8"?)`, ""},
		{`packages = ["qfn16"]`, "⚠ no part in the catalog passes the package filter", ""},
	}
	for _, tc := range tests {
		r := runOpsift(t, nil, "rank", "--design", withChoose(t, tc.choose), "--catalog", rankCat)
		if r.code != 0 || !strings.Contains(r.stdout, tc.want) || tc.notWant != "" && strings.Contains(r.stdout, tc.notWant) {
			t.Errorf("%s: exit %d, want %q (not %q):\n%s", tc.choose, r.code, tc.want, tc.notWant, r.stdout)
		}
	}
}

// An impossible design derives, with a warning, in derive and rank alike.
func TestImpossibleDesignWarns(t *testing.T) {
	p := filepath.Join(t.TempDir(), "big.toml")
	// Gain 10 × 10 V peak around the 6 V mid-rail of 12 V: -94 … 106 V.
	os.WriteFile(p, []byte(`title = "too big"
[supply]
pos = "12 V"
[[stage]]
name = "gain"
kind = "noninverting"
gain = 10
signal = { shape = "sine", peak = "10 V", freq = "1 kHz" }
`), 0o600)
	for _, args := range [][]string{{"derive", "--design", p}, {"rank", "--design", p, "--catalog", rankCat}} {
		r := runOpsift(t, nil, args...)
		out := strings.Join(strings.Fields(r.stdout), " ")
		for _, want := range []string{`⚠ stage "gain": the output must reach -94 V … 106 V, beyond the rails 0 V … 12 V`,
			"⚠ no temperature range given ([environment] temp): evaluated at 25 °C only"} {
			if r.code != 0 || !strings.Contains(out, want) {
				t.Errorf("%s: exit %d, want %q in:\n%s", args[0], r.code, want, r.stdout)
			}
		}
	}
}
