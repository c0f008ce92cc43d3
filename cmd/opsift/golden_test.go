package main

import (
	"path/filepath"
	"testing"

	"github.com/opsift/opsift/internal/golden"
)

// assertGolden compares got with testdata/name; go test -update rewrites it.
func assertGolden(t *testing.T, name, got string) {
	t.Helper()
	golden.Check(t, filepath.Join("testdata", name), []byte(got))
}
