package golden

import (
	"flag"
	"os"
	"path/filepath"
	"testing"
)

// recorder is a testing.TB that records failures instead of stopping.
type recorder struct {
	testing.TB
	failed bool
}

func (r *recorder) Errorf(string, ...any) { r.failed = true }
func (r *recorder) Fatalf(string, ...any) { r.failed = true }
func (r *recorder) Helper()               {}

func TestCheck(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "sub", "out.golden")
	if err := flag.Set(flagName, "true"); err != nil {
		t.Fatal(err)
	}
	Check(t, path, []byte("one\n")) // writes and compares
	if err := flag.Set(flagName, "false"); err != nil {
		t.Fatal(err)
	}
	if b, err := os.ReadFile(path); err != nil || string(b) != "one\n" {
		t.Fatalf("under -update the file holds %q, %v; want %q", b, err, "one\n")
	}
	r := &recorder{TB: t}
	Check(r, path, []byte("one\n"))
	if r.failed {
		t.Error("equal output reported as different")
	}
	Check(r, path, []byte("two\n"))
	if !r.failed {
		t.Error("different output not reported")
	}
	r = &recorder{TB: t}
	Check(r, filepath.Join(dir, "missing.golden"), []byte("x"))
	if !r.failed {
		t.Error("a missing golden file not reported")
	}
}
