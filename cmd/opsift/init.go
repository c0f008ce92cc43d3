package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
)

const initUsage = `Usage: opsift init [DIR]

Write a starter catalog and design to edit into DIR (default: the current
directory):

  DIR/catalog.d/example.toml   three invented parts, every key explained
  DIR/design.toml              a one-stage design using the design keys

Existing files are never overwritten: if either file exists, nothing is
written.
`

func runInit(e *env, args []string) error {
	fset := newFlagSet(e, "init", initUsage)
	if helped, err := parseFlags(e, fset, args); helped || err != nil {
		return err
	}
	if fset.NArg() > 1 {
		return usageError("init: want at most one directory, got %d arguments (see opsift init --help)", fset.NArg())
	}
	dir := "."
	if fset.NArg() == 1 {
		dir = fset.Arg(0)
	}
	catDir := filepath.Join(dir, "catalog.d")
	files := []struct{ path, text string }{
		{filepath.Join(catDir, "example.toml"), starterCatalog},
		{filepath.Join(dir, "design.toml"), starterDesign},
	}
	// Refuse before writing anything, so init never leaves half a starter.
	for _, f := range files {
		if _, err := os.Lstat(f.path); err == nil {
			return inputError(fmt.Errorf("init: %s already exists; not overwriting it (choose another DIR or move the file)", f.path))
		} else if !errors.Is(err, fs.ErrNotExist) {
			return inputError(fmt.Errorf("init: %w", err))
		}
	}
	if err := os.MkdirAll(catDir, 0o755); err != nil {
		return inputError(fmt.Errorf("init: %w", err))
	}
	for _, f := range files {
		if err := writeNewFile(f.path, []byte(f.text)); err != nil {
			return inputError(fmt.Errorf("init: %w", err))
		}
	}
	fmt.Fprintf(e.stdout, `wrote %s
wrote %s

Next:
  edit the parts in %s (the figures are invented examples)
  opsift check --catalog %s
  opsift --catalog %s --design %s
`, files[0].path, files[1].path, files[0].path, catDir, catDir, files[1].path)
	return nil
}

// writeNewFile writes data to path atomically and only if path does not
// exist: the data goes to a temporary file in the same directory, which is
// then hard-linked into place (link fails rather than replace an existing
// file) and removed. Where hard links are not supported it falls back to
// rename after checking that path is still free.
func writeNewFile(path string, data []byte) (err error) {
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return err
	}
	name := tmp.Name()
	defer func() {
		if rmErr := os.Remove(name); rmErr != nil && !errors.Is(rmErr, fs.ErrNotExist) && err == nil {
			err = rmErr
		}
	}()
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Sync(); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Close(); err != nil {
		return err
	}
	if err := os.Chmod(name, 0o644); err != nil {
		return err
	}
	linkErr := os.Link(name, path)
	switch {
	case linkErr == nil:
		return nil
	case errors.Is(linkErr, fs.ErrExist):
		return fmt.Errorf("%s already exists; not overwriting it", path)
	}
	if _, err := os.Lstat(path); err == nil {
		return fmt.Errorf("%s already exists; not overwriting it", path)
	}
	return os.Rename(name, path)
}
