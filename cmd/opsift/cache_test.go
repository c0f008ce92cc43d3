package main

import (
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/opsift/opsift/catalog"
)

// TestCatalogCacheFlag checks that commands build the parsed-catalog cache
// in $XDG_CACHE_HOME/opsift (else ~/.cache/opsift), print the same with it
// as without, and leave it alone with --no-cache.
func TestCatalogCacheFlag(t *testing.T) {
	cat := filepath.Join("..", "..", "testdata", "catalog", "contract.toml")
	entries := func(dir string) int {
		got, err := filepath.Glob(filepath.Join(dir, "catalog", "*.bin"))
		if err != nil {
			t.Fatal(err)
		}
		return len(got)
	}
	tests := []struct {
		name  string
		vars  func(home string) map[string]string
		cache func(home string) string
	}{
		{"XDG_CACHE_HOME", func(h string) map[string]string {
			return map[string]string{"HOME": h, "XDG_CACHE_HOME": filepath.Join(h, "xdg")}
		}, func(h string) string { return filepath.Join(h, "xdg", "opsift") }},
		{"HOME", func(h string) map[string]string { return map[string]string{"HOME": h} },
			func(h string) string { return filepath.Join(h, ".cache", "opsift") }},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			home := t.TempDir()
			vars := tc.vars(home)
			plain := runCLI(t, false, vars, "check", "--no-cache", "--catalog", cat)
			if n := entries(tc.cache(home)); n != 0 {
				t.Fatalf("--no-cache wrote %d cache entries", n)
			}
			first := runCLI(t, false, vars, "check", "--catalog", cat)
			if n := entries(tc.cache(home)); n != 1 {
				t.Fatalf("%d cache entries after a check, want 1", n)
			}
			second := runCLI(t, false, vars, "rank", "--catalog", cat, "--format", "csv", "--all")
			third := runCLI(t, false, vars, "rank", "--no-cache", "--catalog", cat, "--format", "csv", "--all")
			if plain != first || second != third || plain.code != 0 || second.code != 0 {
				t.Fatalf("output differs with the cache:\n%+v\n%+v\n%+v\n%+v", plain, first, second, third)
			}
		})
	}
}

// TestStderrProgress checks that a catalog read shows progress only once
// it has run progressDelay, and clears its line when done.
func TestStderrProgress(t *testing.T) {
	var quick, slow strings.Builder
	q := &stderrProgress{w: &quick, start: time.Now()}
	q.report(catalog.Progress{Files: 1, TotalFiles: 2, Parts: 10})
	q.done()
	if quick.Len() != 0 {
		t.Fatalf("a quick read printed %q", quick.String())
	}
	s := &stderrProgress{w: &slow, start: time.Now().Add(-time.Second)}
	s.report(catalog.Progress{Files: 1, TotalFiles: 2, Parts: 10})
	s.done()
	if want := "\r\x1b[Kopsift: reading the catalog: 1 of 2 files, 10 parts\r\x1b[K"; slow.String() != want {
		t.Fatalf("slow read printed %q, want %q", slow.String(), want)
	}
}
