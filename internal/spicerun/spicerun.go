// Package spicerun is opsift's test support for checks against ngspice:
// it runs a deck in batch mode and reads the one number a test asks for.
// The tests that use it run ngspice live when it is on PATH (CI installs
// it) and otherwise hold the code to results recorded beside them.
package spicerun

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"testing"
	"time"
)

// Installed reports whether ngspice is on PATH.
func Installed() bool {
	_, err := exec.LookPath("ngspice")
	return err == nil
}

// Value runs deck with ngspice -b in a temporary directory, within a
// minute, and returns the number the first group of re matches in its
// output. It fails the test when ngspice fails or prints no match.
func Value(t testing.TB, deck string, re *regexp.Regexp) float64 {
	t.Helper()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "deck.cir"), []byte(deck), 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, "ngspice", "-b", "deck.cir")
	cmd.Dir = dir
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("ngspice: %v\n%s", err, out)
	}
	m := re.FindSubmatch(out)
	if m == nil {
		t.Fatalf("no %s in the ngspice output:\n%s", re, out)
	}
	v, err := strconv.ParseFloat(string(m[1]), 64)
	if err != nil {
		t.Fatalf("ngspice printed %q: %v", m[1], err)
	}
	return v
}
