package report

import (
	"fmt"
	"os"
	"path/filepath"
)

// WriteFile writes data to path so that path holds either its old
// content or all of the new: a temporary file in the same directory,
// synced, given the old file's permissions (0644 for a new file), then
// renamed over path. A failure leaves no temporary file behind. Every
// output opsift writes to a user's file goes through it.
func WriteFile(path string, data []byte) (err error) {
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	name := tmp.Name()
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(name)
		}
	}()
	if _, err = tmp.Write(data); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = tmp.Sync(); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	perm := os.FileMode(0o644)
	if st, serr := os.Stat(path); serr == nil {
		perm = st.Mode().Perm()
	}
	if err = os.Chmod(name, perm); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err = os.Rename(name, path); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	return nil
}
