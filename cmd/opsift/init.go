package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"github.com/opsift/opsift/filter/schema"
)

const initUsage = `Usage: opsift init [DIR]

Write a starter catalog and design to edit into DIR (default: the current
directory):

  DIR/catalog.d/example.toml   three invented parts, every key explained
  DIR/design.toml              a one-stage design using the design keys
  DIR/opsift-catalog.schema.json, DIR/opsift-design.schema.json
                               JSON Schemas of both formats, which the two
                               files name on their first line (#:schema) so
                               a TOML language server checks and completes
                               keys while you edit

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
	catSchema, err := schemaText("catalog")
	if err != nil {
		return err
	}
	designSchema, err := schemaText("design")
	if err != nil {
		return err
	}
	files := []struct{ path, text string }{
		{filepath.Join(catDir, "example.toml"), starterCatalog},
		{filepath.Join(dir, "design.toml"), starterDesign},
		{filepath.Join(dir, catalogSchemaFile), catSchema},
		{filepath.Join(dir, designSchemaFile), designSchema},
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
wrote %s and %s (editors with a TOML language server check keys against them)

Next:
  edit the parts in %s (the figures are invented examples)
  opsift check --catalog %s
  opsift --catalog %s --design %s
`, files[0].path, files[1].path, files[2].path, files[3].path, files[0].path, catDir, catDir, files[1].path)
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

// The schema files init writes beside design.toml and catalog.d
// (schema.FileName; init_test.go checks they agree).
const (
	catalogSchemaFile = "opsift-catalog.schema.json"
	designSchemaFile  = "opsift-design.schema.json"
)

// schemaText is the JSON Schema called name, as init writes it.
func schemaText(name string) (string, error) {
	s, err := schema.ByName(name)
	if err != nil {
		return "", err
	}
	b, err := schema.Marshal(s)
	return string(b), err
}
