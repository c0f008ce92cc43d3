// Package golden is opsift's test support for golden files: the one
// -update flag of every test binary, and the comparison that rewrites a
// golden file under it. A golden file is a record of an output, reviewed
// in the diff when it changes; it is not evidence that a formula is right.
//
//	go test ./... -update   # rewrite every golden file the tests read
package golden

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"
)

// flagName is the flag every opsift test binary takes to rewrite goldens.
const flagName = "update"

func init() {
	// teatest's golden package defines the same flag in the test binaries
	// that import it; it is initialised first (import paths are initialised
	// in sorted order), so the flag is only defined when still missing.
	if flag.Lookup(flagName) == nil {
		flag.Bool(flagName, false, "rewrite golden files")
	}
}

// Update reports whether -update was given: golden files are to be
// rewritten rather than compared with.
func Update() bool {
	f := flag.Lookup(flagName)
	return f != nil && f.Value.String() == "true"
}

// Check compares got with the golden file at path. Under -update it first
// writes got there (creating the directory).
func Check(t testing.TB, path string, got []byte) {
	t.Helper()
	if Update() {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (go test -update creates it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("output differs from %s (go test -update rewrites it; review the diff)\n--- got\n%s\n--- want\n%s", path, got, want)
	}
}
