package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// TestMain lets the test binary stand in for the opsift command when
// OPSIFT_TEST_AS_OPSIFT is set: the completion scripts call "opsift"
// back, and the tests put this binary on PATH under that name.
func TestMain(m *testing.M) {
	if os.Getenv("OPSIFT_TEST_AS_OPSIFT") == "1" {
		os.Exit(exitCode(run(os.Args[1:], newEnv()), os.Stderr))
	}
	os.Exit(m.Run())
}

// TestCandidates: what the completion callback offers for a command line
// (the last word is the one being completed).
func TestCandidates(t *testing.T) {
	design := filepath.Join("..", "..", "data", "designs", "pickup-counter-6v.toml")
	cat := filepath.Join("..", "..", "testdata", "catalog", "contract.toml")
	for _, tc := range []struct {
		words []string
		want  []string // exactly, in order; nil: none
		has   []string // at least these
	}{
		{words: []string{""}, has: []string{"rank", "list", "add", "completion", "import", "schema", "help"}},
		{words: []string{"ra"}, want: []string{"rank"}},
		{words: []string{"co"}, want: []string{"compare", "completion"}},
		{words: []string{"-"}, has: []string{"--catalog", "--design", "--strict-catalog", "--version", "--help"}},
		{words: []string{"add", "--"}, has: []string{"--to", "--catalog", "--design"}},
		{words: []string{"rank", "--fo"}, want: []string{"--force", "--format"}},
		{words: []string{"rank", "--format", ""}, want: []string{"table", "csv", "json", "md", "toml"}},
		{words: []string{"rank", "--format", "j"}, want: []string{"json"}},
		{words: []string{"rank", "--format=m"}, want: []string{"--format=md"}},
		{words: []string{"rank", "--format", "=", ""}, want: []string{"table", "csv", "json", "md", "toml"}},
		{words: []string{"rank", "--format", "="}, want: []string{"table", "csv", "json", "md", "toml"}},
		{words: []string{"derive", "--format", ""}, want: []string{"text", "json"}},
		{words: []string{"compare", "--format", ""}, want: []string{"table", "md", "json", "csv"}},
		{words: []string{"rank", "--sort", "s"}, want: []string{"supply_current"}},
		{words: []string{"rank", "--catalog", ""}, want: []string{completeFiles}},
		{words: []string{"import", ""}, want: []string{completeFiles}},
		{words: []string{"init", ""}, want: []string{completeDirs}},
		{words: []string{"schema", ""}, want: []string{"catalog", "design"}},
		{words: []string{"completion", ""}, want: []string{"bash", "zsh", "fish"}},
		{words: []string{"list", "--columns", "vos"}, want: []string{"vos", "vos_drift"}},
		// Stages of the design given, else of the demo design.
		{words: []string{"preview", "--design", design, "--stage", ""}, want: []string{"lowpass", "detect", "clock"}},
		{words: []string{"preview", "--stage", "g"}, want: []string{"gain"}},
		// Part ids of the catalog given, else the demo's.
		{words: []string{"replace", "--catalog", cat, ""}, want: []string{"lv2-rr", "xq4-bip"}},
		{words: []string{"preview", "--catalog=" + cat, "x"}, want: []string{"xq4-bip"}},
		{words: []string{"compare", "--catalog", cat, "xq4-bip", ""}, want: []string{"lv2-rr", "xq4-bip"}},
		{words: []string{"replace", "--catalog", cat, "xq4-bip", ""}, want: nil}, // one id only
		{words: []string{"replace", "gp4-bip-"}, has: []string{"gp4-bip-e", "gp4-bip-old"}},
		{words: []string{"nosuch", ""}, want: nil},
	} {
		name := strings.Join(tc.words, " ")
		r := runOpsift(t, nil, append([]string{candidatesCmd, "--"}, tc.words...)...)
		if r.code != 0 || r.stderr != "" {
			t.Errorf("%q: exit %d, stderr %q", name, r.code, r.stderr)
		}
		got := strings.Fields(r.stdout)
		if tc.has == nil && !slices.Equal(got, tc.want) {
			t.Errorf("%q: got %q, want %q", name, got, tc.want)
		}
		for _, w := range tc.has {
			if !slices.Contains(got, w) {
				t.Errorf("%q: %q lacks %q", name, got, w)
			}
		}
	}
}

// TestCompletionScripts: each script parses in its shell (zsh and fish
// only where installed; CI has bash), and the bash one, run against this
// binary as opsift, completes a format, a stage and a file name.
func TestCompletionScripts(t *testing.T) {
	dir := t.TempDir()
	for _, sh := range shells {
		r := runOpsift(t, nil, "completion", sh)
		if r.code != 0 || !strings.Contains(r.stdout, "opsift "+candidatesCmd+" --") {
			t.Fatalf("%s: exit %d, script does not call back:\n%s", sh, r.code, r.stdout)
		}
		file := filepath.Join(dir, "opsift."+sh)
		if err := os.WriteFile(file, []byte(r.stdout), 0o644); err != nil {
			t.Fatal(err)
		}
		check := map[string][]string{"bash": {"bash", "-n", file}, "zsh": {"zsh", "-n", file}, "fish": {"fish", "--no-execute", file}}[sh]
		if _, err := exec.LookPath(check[0]); err != nil {
			t.Logf("%s not installed: its script is not syntax-checked", sh)
			continue
		}
		if out, err := exec.Command(check[0], check[1:]...).CombinedOutput(); err != nil {
			t.Errorf("%s -n: %v\n%s", sh, err, out)
		}
	}
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("no bash to run the completion in")
	}
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	bin := filepath.Join(dir, "bin")
	if err := os.MkdirAll(bin, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(self, filepath.Join(bin, "opsift")); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "parts-a.toml"), nil, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		line string // the words, the last being completed
		want string
	}{
		{`opsift rank --format j`, "json"},
		{`opsift preview --stage ""`, "gain buffer"},
		{`opsift rank --catalog parts-`, "parts-a.toml"},
		{`opsift comp`, "compare completion"},
	} {
		script := `source ` + filepath.Join(dir, "opsift.bash") + `
COMP_WORDS=(` + tc.line + `)
COMP_CWORD=$((${#COMP_WORDS[@]} - 1))
_opsift
echo "${COMPREPLY[*]}"`
		cmd := exec.Command("bash", "-c", script)
		cmd.Dir = dir
		cmd.Env = []string{"PATH=" + bin + ":/usr/bin:/bin", "OPSIFT_TEST_AS_OPSIFT=1", "HOME=" + dir, "XDG_CACHE_HOME=" + dir}
		out, err := cmd.CombinedOutput()
		if err != nil {
			t.Errorf("%s: %v\n%s", tc.line, err, out)
			continue
		}
		if got := strings.TrimSpace(string(out)); got != tc.want {
			t.Errorf("%s: bash completes %q, want %q", tc.line, got, tc.want)
		}
	}
}

// TestVersion: --version and version print the same line, the version
// the binary was built with.
func TestVersion(t *testing.T) {
	a, b := runOpsift(t, nil, "--version"), runOpsift(t, nil, "version")
	if a.code != 0 || a.stdout != b.stdout || a.stdout != "opsift "+version+"\n" {
		t.Errorf("--version %q (exit %d), version %q", a.stdout, a.code, b.stdout)
	}
}
