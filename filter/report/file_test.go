package report

import (
	"os"
	"path/filepath"
	"testing"
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
