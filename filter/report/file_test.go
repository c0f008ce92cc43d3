package report

import (
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// WriteFile replaces a file whole, keeps its permissions and leaves no
// temporary file behind, also when it fails.
func TestWriteFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "shortlist.md")
	if err := os.WriteFile(path, []byte("old"), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := WriteFile(path, []byte("new")); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil || string(got) != "new" {
		t.Fatalf("content %q, %v; want \"new\"", got, err)
	}
	if st, _ := os.Stat(path); st.Mode().Perm() != 0o600 {
		t.Errorf("mode %v, want the old file's 0600", st.Mode().Perm())
	}
	if err := WriteFile(filepath.Join(dir, "missing", "x.md"), []byte("x")); err == nil {
		t.Error("writing into a missing directory succeeded")
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("directory holds %d entries, want only the written file", len(entries))
	}
}

// TestWriteFileTargets covers what -o may replace: a symbolic link's
// target (the link is kept), never a FIFO, a device or a directory, and a
// read-only file only when forced.
func TestWriteFileTargets(t *testing.T) {
	dir := t.TempDir()
	real := filepath.Join(dir, "real.csv")
	if err := os.WriteFile(real, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "link.csv")
	if err := os.Symlink("real.csv", link); err != nil {
		t.Fatal(err)
	}
	if err := WriteFile(link, []byte("via link")); err != nil {
		t.Fatal(err)
	}
	if got, _ := os.ReadFile(real); string(got) != "via link" {
		t.Errorf("link target holds %q, want the new content", got)
	}
	if st, err := os.Lstat(link); err != nil || st.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the link was replaced: %v %v", st, err)
	}
	dangling := filepath.Join(dir, "dangling.csv")
	if err := os.Symlink("new.csv", dangling); err != nil {
		t.Fatal(err)
	}
	if err := WriteFile(dangling, []byte("x")); err != nil {
		t.Fatal(err)
	}
	if got, _ := os.ReadFile(filepath.Join(dir, "new.csv")); string(got) != "x" {
		t.Errorf("dangling link's target holds %q", got)
	}

	fifo := filepath.Join(dir, "pipe.csv")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	ro := filepath.Join(dir, "ro.csv")
	if err := os.WriteFile(ro, []byte("keep"), 0o444); err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct{ path, words string }{
		{fifo, "named pipe"},
		{"/dev/null", "device"},
		{dir, "directory"},
		{ro, "read-only; pass --force"},
	} {
		err := WriteFile(tt.path, []byte("x"))
		if err == nil || !strings.Contains(err.Error(), tt.words) {
			t.Errorf("WriteFile(%s) = %v, want an error with %q", tt.path, err, tt.words)
		}
	}
	if got, _ := os.ReadFile(ro); string(got) != "keep" {
		t.Errorf("refused read-only file holds %q", got)
	}
	if err := WriteFileWith(ro, []byte("forced"), WriteOptions{Force: true}); err != nil {
		t.Fatal(err)
	}
	if got, _ := os.ReadFile(ro); string(got) != "forced" {
		t.Errorf("forced read-only file holds %q", got)
	}
	if st, _ := os.Stat(ro); st.Mode().Perm() != 0o444 {
		t.Errorf("forced file mode %v, want 0444 kept", st.Mode().Perm())
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.Contains(e.Name(), ".tmp-") {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}

// TestRemoveOnSignal runs itself as a child that creates a temporary
// file, arms the handler and sends itself SIGTERM: the child must die of
// the signal and the file must be gone.
func TestRemoveOnSignal(t *testing.T) {
	if name := os.Getenv("OPSIFT_SIGNAL_CHILD"); name != "" {
		if err := os.WriteFile(name, []byte("partial"), 0o644); err != nil {
			os.Exit(3)
		}
		removeOnSignal(name)
		_ = syscall.Kill(os.Getpid(), syscall.SIGTERM)
		time.Sleep(5 * time.Second)
		os.Exit(4) // the signal did not end the process
	}
	tmp := filepath.Join(t.TempDir(), ".out.csv.tmp-1")
	cmd := exec.Command(os.Args[0], "-test.run", "^TestRemoveOnSignal$")
	cmd.Env = append(os.Environ(), "OPSIFT_SIGNAL_CHILD="+tmp)
	err := cmd.Run()
	var ee *exec.ExitError
	if !errors.As(err, &ee) {
		t.Fatalf("child: %v, want it killed by SIGTERM", err)
	}
	if ws, ok := ee.Sys().(syscall.WaitStatus); !ok || !ws.Signaled() || ws.Signal() != syscall.SIGTERM {
		t.Fatalf("child ended with %v, want SIGTERM", ee)
	}
	if _, err := os.Stat(tmp); !errors.Is(err, os.ErrNotExist) {
		t.Fatalf("temporary file still there: %v", err)
	}
}
