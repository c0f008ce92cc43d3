package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const previewMixed = "../../data/designs/pickup-counter-6v.toml"

func TestPreviewGolden(t *testing.T) {
	tests := []struct {
		name string
		vars map[string]string
		args []string
	}{
		{"preview_gain_text", nil, []string{"gp4-bip", "--stage", "gain", "--height", "12"}},
		{"preview_default_text", map[string]string{"COLUMNS": "60"}, []string{"rr4-cmos", "--height", "8"}},
		{"preview_typical_text", nil, []string{"gp4-bip", "--stage", "gain", "--typical", "--width", "60", "--height", "8"}},
		{"preview_clock_text", nil, []string{"gp4-bip", "--design", previewMixed, "--stage", "clock", "--height", "10"}},
		{"preview_detect_text", nil, []string{"--design", previewMixed, "rr4-cmos", "--stage", "detect", "--height", "10"}},
		{"preview_json", nil, []string{"gp4-bip", "--stage", "gain", "--format", "json", "--points", "6"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runOpsift(t, tc.vars, append([]string{"preview"}, tc.args...)...)
			if r.code != 0 {
				t.Fatalf("exit %d, stderr %q", r.code, r.stderr)
			}
			assertGolden(t, tc.name+".golden", r.stdout)
		})
	}
}

// TestPreviewJSONFields pins the contract's field names and SI values: the
// demo gain stage is 5.58 Vpp at 24 kHz, so ideal_pp is 5.58 (V) and the
// arrays cover whole periods of 41.7 µs.
func TestPreviewJSONFields(t *testing.T) {
	r := runOpsift(t, nil, "preview", "gp4-bip", "--stage", "gain", "--format", "json")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	var got map[string]any
	if err := json.Unmarshal([]byte(r.stdout), &got); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"part", "stage", "metrics", "t", "in", "out", "ideal", "basis", "notes"} {
		if _, ok := got[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	m := got["metrics"].(map[string]any)
	for _, k := range []string{"output_pp", "ideal_pp", "peak_error", "thd", "slewing_fraction"} {
		if _, ok := m[k]; !ok {
			t.Errorf("metrics lack %q", k)
		}
	}
	for _, k := range []string{"frequency", "duty", "transition_time", "input_low", "cm_exceeded"} {
		if _, ok := m[k]; ok {
			t.Errorf("metrics have %q, which does not apply to an amplifier or is not in the contract", k)
		}
	}
	// 2 × 6.2 × 0.45 V = 5.58 V by hand from the default design.
	if v := m["ideal_pp"].(float64); v < 5.575 || v > 5.585 {
		t.Errorf("ideal_pp = %g, want 5.58 (V)", v)
	}
	ts := got["t"].([]any)
	if n := len(ts); n < 100 || len(got["out"].([]any)) != n || len(got["ideal"].([]any)) != n || len(got["in"].([]any)) != n {
		t.Errorf("arrays of %d samples, want equal lengths ≥ 100", n)
	}
	// 5 periods of 1/24 kHz = 208.3 µs.
	if span := ts[len(ts)-1].(float64); span < 200e-6 || span > 5/24e3 {
		t.Errorf("t ends at %g s, want just under 5 periods of 41.7 µs", span)
	}
	if got["basis"] != "worst_case" || got["part"] != "gp4-bip" || got["stage"] != "gain" {
		t.Errorf("part %v, stage %v, basis %v", got["part"], got["stage"], got["basis"])
	}
}

func TestPreviewErrors(t *testing.T) {
	dir := t.TempDir()
	broken := filepath.Join(dir, "broken.toml")
	if err := os.WriteFile(broken, []byte("title = \"x\"\n[supply]\npos = \"5 V\"\n[[stage]]\nname = \"a\"\nkind = \"follower\"\nsignal = { peak = \"1 V\", freq = \"fast\" }\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name string
		args []string
		code int
		want string
	}{
		{"no part", nil, 2, "missing PART-ID"},
		{"two parts", []string{"a", "b"}, 2, "one PART-ID expected"},
		{"unknown part", []string{"gp4-bi"}, 2, `no part with id "gp4-bi" in the catalog; did you mean one of "gp4-bip"`},
		{"unknown stage", []string{"gp4-bip", "--stage", "gian"}, 2, `--stage "gian": no such stage, want one of "gain", "buffer"`},
		{"no waveform", []string{"gp4-bip", "--design", "../../data/designs/turbidity-5v.toml", "--stage", "pedestal"}, 2, "stage kind rail_splitter has no waveform preview"},
		{"missing design", []string{"gp4-bip", "--design", filepath.Join(dir, "none.toml")}, 2, "none.toml: no such file"},
		{"broken design", []string{"gp4-bip", "--design", broken}, 2, `broken.toml:7: stage "a": field "signal.freq": "fast"`},
		{"bad format", []string{"gp4-bip", "--format", "xml"}, 2, "want text or json"},
		{"bad width", []string{"gp4-bip", "--width", "3"}, 2, "want 20 to 1000 columns"},
		{"huge height", []string{"gp4-bip", "--height", "100000000"}, 2, "want 4 to 500 lines"},
		{"huge points", []string{"gp4-bip", "--points", "1000000000"}, 2, "want 2 to 100000"},
		{"bad flag", []string{"gp4-bip", "--nope"}, 2, "flag provided but not defined"},
		{"bad catalog", []string{"gp4-bip", "--catalog", filepath.Join(dir, "none")}, 2, "cannot read catalog"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runOpsift(t, nil, append([]string{"preview"}, tc.args...)...)
			if r.code != tc.code || !strings.Contains(r.stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want exit %d and %q", r.code, r.stderr, tc.code, tc.want)
			}
			if strings.Contains(r.stderr, "panic") || r.stdout != "" {
				t.Errorf("stdout %q, stderr %q: want only an error", r.stdout, r.stderr)
			}
		})
	}
}

func TestPreviewHelp(t *testing.T) {
	r := runOpsift(t, nil, "preview", "--help")
	if r.code != 0 || !strings.Contains(r.stdout, "Usage: opsift preview PART-ID") {
		t.Errorf("exit %d, stdout %q", r.code, r.stdout)
	}
}
