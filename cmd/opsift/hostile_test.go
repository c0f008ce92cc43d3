package main

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/opsift/opsift/catalog/safe"
)

// hostileCase is one [[case]] of testdata/hostile/cases.toml.
type hostileCase struct {
	Name     string
	Make     string
	Args     []string
	Exit     int
	Words    []string
	Absent   []string
	MaxLines int `toml:"max_lines"`
	Recheck  bool
}

// TestHostileInputs runs the hostile-input suite: every case of
// testdata/hostile/cases.toml, with its special files made at test time,
// must exit as listed, say the listed words, and print no control byte.
func TestHostileInputs(t *testing.T) {
	var suite struct{ Case []hostileCase }
	if _, err := toml.DecodeFile("../../testdata/hostile/cases.toml", &suite); err != nil {
		t.Fatal(err)
	}
	if len(suite.Case) < 30 {
		t.Fatalf("only %d hostile cases", len(suite.Case))
	}
	t.Chdir("../../testdata/hostile")
	for _, tc := range suite.Case {
		t.Run(tc.Name, func(t *testing.T) {
			tmp := t.TempDir()
			makeHostile(t, tc.Make, tmp)
			args := make([]string, len(tc.Args))
			for i, a := range tc.Args {
				args[i] = strings.ReplaceAll(a, "$TMP", tmp)
			}
			res := runOpsift(t, nil, args...)
			out := res.stdout + res.stderr
			if res.code != tc.Exit {
				t.Errorf("exit %d, want %d\n%s", res.code, tc.Exit, out)
			}
			for _, w := range tc.Words {
				if !strings.Contains(out, w) {
					t.Errorf("output lacks %q:\n%s", w, out)
				}
			}
			for _, w := range tc.Absent {
				if strings.Contains(out, w) {
					t.Errorf("output holds %q:\n%s", w, out)
				}
			}
			if n := strings.Count(out, "\n"); tc.MaxLines > 0 && n > tc.MaxLines {
				t.Errorf("%d lines of output, want at most %d", n, tc.MaxLines)
			}
			for _, s := range []string{res.stdout, res.stderr} {
				if err := safe.CheckOutput(s); err != nil {
					t.Errorf("%v", err)
				}
			}
			if tc.Recheck {
				exported := filepath.Join(tmp, "export.toml")
				if err := os.WriteFile(exported, []byte(res.stdout), 0o644); err != nil {
					t.Fatal(err)
				}
				if r := runOpsift(t, nil, "check", "--catalog", exported); r.code != 0 {
					t.Errorf("check of the export: exit %d\n%s%s", r.code, r.stdout, r.stderr)
				}
			}
		})
	}
}

// makeHostile makes the files a case names in dir.
func makeHostile(t *testing.T, what, dir string) {
	t.Helper()
	write := func(name, text string, perm os.FileMode) {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), perm); err != nil {
			t.Fatal(err)
		}
	}
	fifo := func(name string) {
		if err := syscall.Mkfifo(filepath.Join(dir, name), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	switch what {
	case "":
	case "fifo":
		fifo("x.toml")
	case "fifo_design":
		fifo("d.toml")
	case "fifo_dir":
		good, err := os.ReadFile("catalog/plain.toml")
		if err != nil {
			t.Fatal(err)
		}
		write("good.toml", string(good), 0o644)
		fifo("x.toml")
	case "device_link":
		if err := os.Symlink("/dev/zero", filepath.Join(dir, "zero.toml")); err != nil {
			t.Fatal(err)
		}
	case "dotted": // 30,000 parts: 60 KB
		write("dotted.toml", "a"+strings.Repeat(".a", 29999)+" = 1\n", 0o644)
	case "nested":
		write("nested.toml", "a = "+strings.Repeat("{a = ", 8000)+"1"+strings.Repeat("}", 8000)+"\n", 0o644)
	case "big":
		write("big.toml", strings.Repeat("# padding line of a file over the cap\n", 5<<20/38+1), 0o644)
	case "empty_parts":
		write("empty.toml", strings.Repeat("[[part]]\n", 100000), 0o644)
	case "escape_file":
		write("x\x1b[2J.toml", "this is [ not toml\n", 0o644)
	case "readonly":
		write("ro.txt", "keep\n", 0o444)
	default:
		t.Fatalf("unknown make %q", what)
	}
}
