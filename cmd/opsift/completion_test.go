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

// completionShell is how a test drives one shell's completion script:
// the syntax check (bash -n, zsh -n, fish --no-execute), a line that breaks
// the syntax (so the check is seen to fail), and a script that completes
// LINE — the words, the last being completed — after sourcing FILE and
// prints the candidates, one a line or space-separated.
type completionShell struct {
	syntax   []string // FILE stands for the script's path
	broken   string
	complete []string // LINE and FILE are substituted
}

// completionShells are the three shells. zsh runs without its completion
// system (zsh -f): compadd and _files are stubbed to print what they are
// given, and words/CURRENT are set as the completion system sets them.
var completionShells = map[string]completionShell{
	"bash": {
		syntax: []string{"bash", "-n", "FILE"},
		broken: "if true; then",
		complete: []string{"bash", "-c", `source FILE
COMP_WORDS=(LINE)
COMP_CWORD=$((${#COMP_WORDS[@]} - 1))
_opsift
echo "${COMPREPLY[*]}"`},
	},
	"zsh": {
		syntax: []string{"zsh", "-n", "FILE"},
		broken: "if [[ x",
		complete: []string{"zsh", "-f", "-c", `compadd() { print -r -- "${@[2,-1]}" }
_files() { print -r -- "(_files $*)" }
compdef() { : }
source FILE
words=(LINE)
CURRENT=${#words}
_opsift`},
	},
	"fish": {
		syntax: []string{"fish", "--no-execute", "FILE"},
		broken: "function broken",
		complete: []string{"fish", "--no-config", "-c", `source FILE
complete -C 'LINE'`},
	},
}

// TestCompletionScripts: each script passes its shell's syntax check
// (a broken copy fails it), and, run against this binary as opsift,
// completes a format, a stage, a file name and a command. A shell that is
// not installed is skipped here; .ci/run installs zsh and fish, so CI runs
// all three.
func TestCompletionScripts(t *testing.T) {
	dir := t.TempDir()
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
	for _, sh := range shells {
		t.Run(sh, func(t *testing.T) {
			cs, ok := completionShells[sh]
			if !ok {
				t.Fatalf("no test driver for shell %q", sh)
			}
			r := runOpsift(t, nil, "completion", sh)
			if r.code != 0 || !strings.Contains(r.stdout, "opsift "+candidatesCmd+" --") {
				t.Fatalf("exit %d, script does not call back:\n%s", r.code, r.stdout)
			}
			if _, err := exec.LookPath(cs.syntax[0]); err != nil {
				t.Skipf("%s not installed (.ci/run installs it)", sh)
			}
			file := filepath.Join(dir, "opsift."+sh)
			bad := filepath.Join(dir, "broken."+sh)
			if err := os.WriteFile(file, []byte(r.stdout), 0o644); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(bad, []byte(r.stdout+cs.broken+"\n"), 0o644); err != nil {
				t.Fatal(err)
			}
			run := func(argv []string, line, file string) (string, error) {
				args := make([]string, len(argv))
				for i, a := range argv {
					args[i] = strings.NewReplacer("FILE", file, "LINE", line).Replace(a)
				}
				cmd := exec.Command(args[0], args[1:]...)
				cmd.Dir = dir
				cmd.Env = []string{"PATH=" + bin + ":/usr/bin:/bin", "OPSIFT_TEST_AS_OPSIFT=1", "HOME=" + dir, "XDG_CACHE_HOME=" + dir,
					"XDG_CONFIG_HOME=" + dir, "XDG_DATA_HOME=" + dir}
				out, err := cmd.CombinedOutput()
				return string(out), err
			}
			if out, err := run(cs.syntax, "", file); err != nil {
				t.Errorf("syntax check: %v\n%s", err, out)
			}
			if out, err := run(cs.syntax, "", bad); err == nil {
				t.Errorf("syntax check passes a script ending in %q:\n%s", cs.broken, out)
			}
			for _, tc := range []struct {
				line string // the words, the last being completed
				want string
			}{
				{`opsift rank --format j`, "json"},
				{`opsift preview --stage ""`, "buffer gain"},
				{`opsift rank --catalog parts-`, "parts-a.toml"},
				{`opsift comp`, "compare completion"},
			} {
				line := tc.line
				if sh == "fish" {
					// fish completes what follows the last space.
					line = strings.TrimSuffix(line, `""`)
				}
				out, err := run(cs.complete, line, file)
				if err != nil {
					t.Errorf("%s: %v\n%s", tc.line, err, out)
					continue
				}
				// fish sorts the candidates; compare them as sets.
				fields := strings.Fields(out)
				slices.Sort(fields)
				got := strings.Join(fields, " ")
				if sh == "zsh" && tc.want == "parts-a.toml" {
					// zsh's own _files lists the names; the script hands over.
					got = strings.TrimSpace(out)
					if got != "(_files )" {
						t.Errorf("%s: zsh runs %q, want _files", tc.line, got)
					}
					continue
				}
				if got != tc.want {
					t.Errorf("%s: %s completes %q, want %q", tc.line, sh, got, tc.want)
				}
			}
		})
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
