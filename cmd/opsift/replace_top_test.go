package main

import (
	"encoding/json"
	"regexp"
	"strconv"
	"testing"
)

// TestReplaceTop checks --top and its default: a screenful ($LINES less
// the header) for a table on a terminal, every candidate otherwise and in
// JSON unless --top is given; what is left out is counted.
func TestReplaceTop(t *testing.T) {
	all := runCLI(t, false, nil, "replace", "gp1-bip", "--format", "json")
	var doc struct {
		Candidates []json.RawMessage `json:"candidates"`
		TopLeftOut int               `json:"top_left_out"`
	}
	if err := json.Unmarshal([]byte(all.stdout), &doc); err != nil || all.code != 0 {
		t.Fatalf("%v, exit %d: %s", err, all.code, all.stderr)
	}
	total := len(doc.Candidates)
	if total < 20 || doc.TopLeftOut != 0 {
		t.Fatalf("%d candidates, %d left out: the test needs a long list", total, doc.TopLeftOut)
	}
	details := regexp.MustCompile(`(?m)^\d+\. `)
	tests := []struct {
		name   string
		tty    bool
		vars   map[string]string
		args   []string
		listed int
	}{
		{"terminal default", true, map[string]string{"LINES": "20"}, nil, 20 - replaceHeaderRows},
		{"terminal without LINES", true, nil, nil, 24 - replaceHeaderRows},
		{"tiny terminal", true, map[string]string{"LINES": "3"}, nil, replaceTopMin},
		{"pipe", false, map[string]string{"LINES": "20"}, nil, total},
		{"terminal --top 0", true, map[string]string{"LINES": "20"}, []string{"--top", "0"}, total},
		{"--top 3", false, nil, []string{"--top", "3"}, 3},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runCLI(t, tc.tty, tc.vars, append([]string{"replace", "gp1-bip"}, tc.args...)...)
			if got := len(details.FindAllString(r.stdout, -1)); r.code != 0 || got != tc.listed {
				t.Fatalf("%d candidates listed (exit %d), want %d", got, r.code, tc.listed)
			}
			note := regexp.MustCompile(`(\d+) more candidates not listed \(--top 0 lists all\)`).FindStringSubmatch(r.stdout)
			if hidden := total - tc.listed; (hidden > 0) != (note != nil) || (note != nil && note[1] != strconv.Itoa(hidden)) {
				t.Fatalf("left-out note %q, want %d left out", note, hidden)
			}
		})
	}
	j := runCLI(t, true, map[string]string{"LINES": "20"}, "replace", "gp1-bip", "--format", "json", "--top", "3")
	if err := json.Unmarshal([]byte(j.stdout), &doc); err != nil || len(doc.Candidates) != 3 || doc.TopLeftOut != total-3 {
		t.Fatalf("JSON with --top 3: %d candidates, %d left out, %v", len(doc.Candidates), doc.TopLeftOut, err)
	}
	j = runCLI(t, true, map[string]string{"LINES": "20"}, "replace", "gp1-bip", "--format", "json")
	if err := json.Unmarshal([]byte(j.stdout), &doc); err != nil || len(doc.Candidates) != total {
		t.Fatalf("JSON on a terminal lists %d of %d candidates", len(doc.Candidates), total)
	}
	if r := runCLI(t, false, nil, "replace", "gp1-bip", "--top", "-2"); r.code != 2 {
		t.Fatalf("--top -2: exit %d, want 2", r.code)
	}
}
