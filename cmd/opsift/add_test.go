package main

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
)

// TestAddCommand: opsift add documents --to and, like the selector,
// needs a terminal (a script gets a usage error, exit status 2).
func TestAddCommand(t *testing.T) {
	r := runOpsift(t, nil, "add", "--help")
	if r.code != 0 || !strings.Contains(r.stdout, "--to") || !strings.Contains(r.stdout, "entry form") {
		t.Errorf("add --help: exit %d\n%s", r.code, r.stdout)
	}
	r = runOpsift(t, nil, "add", "--to", filepath.Join(t.TempDir(), "new.toml"))
	if r.code != 2 || !strings.Contains(r.stderr, "needs a terminal") {
		t.Errorf("add without a terminal: exit %d, %q", r.code, r.stderr)
	}
}

// TestCoveredBy: a catalog file is read by a layer that is the file or
// its directory (a *.toml name only), never by the embedded catalog.
func TestCoveredBy(t *testing.T) {
	dir := t.TempDir()
	layers := []catalog.Layer{catalog.FSLayer("demo", data.Catalog), catalog.PathLayer(dir), catalog.PathLayer(filepath.Join("x", "one.toml"))}
	for _, tc := range []struct {
		path string
		want bool
	}{
		{filepath.Join(dir, "a.toml"), true},
		{filepath.Join(dir, "a.csv"), false},
		{filepath.Join(dir, "sub", "a.toml"), false},
		{filepath.Join("x", "one.toml"), true},
		{filepath.Join("x", "two.toml"), false},
	} {
		if got := coveredBy(layers, tc.path); got != tc.want {
			t.Errorf("coveredBy(%s) = %v, want %v", tc.path, got, tc.want)
		}
	}
}
