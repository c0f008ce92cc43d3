package catalog

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"sync"
	"testing"
)

// cacheFixture writes an n-part catalog file into a fresh directory and
// returns the file, a cache in another directory, and the parts a plain
// Load reads from the file.
func cacheFixture(t *testing.T, n int) (string, *Cache, []*Part) {
	t.Helper()
	file := writeSynth(t, n)
	c, err := Load(PathLayer(file))
	if err != nil {
		t.Fatal(err)
	}
	return file, &Cache{Dir: t.TempDir()}, c.Parts
}

// loadCached loads file through the cache and checks it gives want.
func loadCached(t *testing.T, cache *Cache, file string, want []*Part) {
	t.Helper()
	c, err := Loader{Cache: cache}.Load(PathLayer(file))
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(c.Parts, want) {
		t.Fatal("parts through the cache differ from a plain load")
	}
}

// entry returns the path of the cache's one entry.
func entry(t *testing.T, cache *Cache) string {
	t.Helper()
	got, err := filepath.Glob(filepath.Join(cache.Dir, "catalog", "*"))
	if err != nil || len(got) != 1 {
		t.Fatalf("cache holds %v (%v), want one entry", got, err)
	}
	return got[0]
}

func TestCacheRoundTrip(t *testing.T) {
	file, cache, want := cacheFixture(t, 300)
	loadCached(t, cache, file, want) // builds
	if cache.hits.Load() != 0 {
		t.Fatal("a hit in an empty cache")
	}
	loadCached(t, cache, file, want) // reads
	if cache.hits.Load() != 1 {
		t.Fatalf("%d hits after the second load, want 1", cache.hits.Load())
	}
}

// TestCacheCorrupt damages the entry in many ways: every load must still
// give the parts of the file, never trust the entry, and rebuild it.
func TestCacheCorrupt(t *testing.T) {
	file, cache, want := cacheFixture(t, 40)
	loadCached(t, cache, file, want)
	path := entry(t, cache)
	good, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	damage := map[string][]byte{"empty": nil, "magic only": []byte(cacheMagic)}
	for _, n := range []int{1, len(cacheMagic) + 1, len(good) / 3, len(good) / 2, len(good) - 5, len(good) - 1} {
		damage["truncated to "+strconv.Itoa(n)] = good[:n]
	}
	for _, at := range []int{0, len(cacheMagic), len(cacheMagic) + 3, len(good) / 4, len(good) / 2, len(good) - 10, len(good) - 1} {
		b := bytes.Clone(good)
		b[at] ^= 0x5a
		damage["byte flipped at "+strconv.Itoa(at)] = b
	}
	damage["trailing bytes"] = append(bytes.Clone(good), 0, 1, 2)
	for name, b := range damage {
		t.Run(name, func(t *testing.T) {
			if err := os.WriteFile(path, b, 0o600); err != nil {
				t.Fatal(err)
			}
			hits := cache.hits.Load()
			loadCached(t, cache, file, want)
			if cache.hits.Load() != hits {
				t.Fatal("a damaged entry was used")
			}
			if rebuilt, _ := os.ReadFile(path); !bytes.Equal(rebuilt, good) {
				t.Fatal("the damaged entry was not rebuilt")
			}
		})
	}
}

// TestCacheFileEdited edits the file after caching, keeping its size and
// modification time, then giving it a problem: the cache must follow the
// file's contents every time.
func TestCacheFileEdited(t *testing.T) {
	file, cache, _ := cacheFixture(t, 20)
	c, err := Loader{Cache: cache}.Load(PathLayer(file))
	if err != nil {
		t.Fatal(err)
	}
	st, err := os.Stat(file)
	if err != nil {
		t.Fatal(err)
	}
	old := c.Parts[3].ID
	data, _ := os.ReadFile(file)
	renamed := bytes.Replace(data, []byte(`"`+old+`"`), []byte(`"zz-`+old[3:]+`"`), 1)
	if len(renamed) != len(data) {
		t.Fatal("edit changed the size")
	}
	write := func(b []byte) {
		t.Helper()
		if err := os.WriteFile(file, b, 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.Chtimes(file, st.ModTime(), st.ModTime()); err != nil {
			t.Fatal(err)
		}
	}
	write(renamed)
	c, err = Loader{Cache: cache}.Load(PathLayer(file))
	if err != nil {
		t.Fatal(err)
	}
	if c.ByID(old) != nil || c.ByID("zz-"+old[3:]) == nil {
		t.Fatal("a same-size edit with the same time was not seen")
	}
	hits := cache.hits.Load()
	write(bytes.Replace(renamed, []byte(`tech = "cmos"`), []byte(`tech = "cmoz"`), 1))
	c, err = Loader{Cache: cache}.Load(PathLayer(file))
	var ps Problems
	if !errors.As(err, &ps) || len(c.Parts) != 19 {
		t.Fatalf("edited file with a problem: %d parts, %v", len(c.Parts), err)
	}
	if _, err = (Loader{Cache: cache}).Load(PathLayer(file)); !errors.As(err, &ps) || cache.hits.Load() != hits {
		t.Fatal("a file with a problem was served from the cache")
	}
}

// TestCacheConcurrentBuilders has several loaders build the same entry at
// once, as two opsift processes would: each must get the parts, and the
// entry left behind must be whole.
func TestCacheConcurrentBuilders(t *testing.T) {
	file, cache, want := cacheFixture(t, 200)
	var wg sync.WaitGroup
	errs := make([]error, 6)
	for i := range errs {
		wg.Go(func() {
			c, err := Loader{Cache: &Cache{Dir: cache.Dir}}.Load(PathLayer(file))
			if err == nil && !reflect.DeepEqual(c.Parts, want) {
				err = errors.New("parts differ")
			}
			errs[i] = err
		})
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			t.Fatal(err)
		}
	}
	loadCached(t, cache, file, want)
	if cache.hits.Load() != 1 {
		t.Fatal("the entry the builders left is not whole")
	}
	if left, _ := filepath.Glob(filepath.Join(cache.Dir, "catalog", ".entry-*")); len(left) > 0 {
		t.Fatalf("temporary files left: %v", left)
	}
}

func TestCacheUnwritable(t *testing.T) {
	file, _, want := cacheFixture(t, 10)
	blocker := filepath.Join(t.TempDir(), "file")
	if err := os.WriteFile(blocker, nil, 0o600); err != nil {
		t.Fatal(err)
	}
	// The cache directory is under a regular file: nothing can be written.
	loadCached(t, &Cache{Dir: filepath.Join(blocker, "opsift")}, file, want)
}

func TestCacheDir(t *testing.T) {
	env := func(kv map[string]string) func(string) string { return func(k string) string { return kv[k] } }
	tests := []struct {
		env  map[string]string
		want string
	}{
		{map[string]string{"XDG_CACHE_HOME": "/x", "HOME": "/h"}, "/x/opsift"},
		{map[string]string{"XDG_CACHE_HOME": "rel", "HOME": "/h"}, "/h/.cache/opsift"},
		{map[string]string{"HOME": "/h"}, "/h/.cache/opsift"},
		{map[string]string{"HOME": "h"}, ""},
	}
	for _, tc := range tests {
		if got := CacheDir(env(tc.env)); got != tc.want {
			t.Errorf("CacheDir(%v) = %q, want %q", tc.env, got, tc.want)
		}
	}
}

// TestLoadProgress checks the progress reports of a load over several
// files: one before the first file, one after each, counting every part.
func TestLoadProgress(t *testing.T) {
	dir := t.TempDir()
	parts := synthParts(30, 2)
	for i := range 3 {
		var buf bytes.Buffer
		if err := Encode(&buf, parts[i*10:(i+1)*10]); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, "f"+strconv.Itoa(i)+".toml"), buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	var got []Progress
	if _, err := (Loader{Progress: func(p Progress) { got = append(got, p) }}).Load(PathLayer(dir)); err != nil {
		t.Fatal(err)
	}
	want := []Progress{{0, 3, 0}, {1, 3, 10}, {2, 3, 20}, {3, 3, 30}}
	if !reflect.DeepEqual(got, want) {
		t.Fatalf("progress %v, want %v", got, want)
	}
}
