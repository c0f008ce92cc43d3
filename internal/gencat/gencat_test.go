package gencat

import (
	"os"
	"testing"

	"github.com/opsift/opsift/catalog"
)

// TestWriteLoadsClean checks that a generated catalog is valid, spread
// over several files, and has the share of typical-only figures the
// package promises.
func TestWriteLoadsClean(t *testing.T) {
	dir := t.TempDir()
	const n = 2500
	files, err := Write(dir, n, 1000, 3)
	if err != nil {
		t.Fatal(err)
	}
	if len(files) != 3 {
		t.Fatalf("%d files, want 3", len(files))
	}
	c, err := catalog.Load(catalog.PathLayer(dir))
	if err != nil {
		t.Fatalf("generated catalog has problems: %v", err)
	}
	if len(c.Parts) != n {
		t.Fatalf("%d parts, want %d", len(c.Parts), n)
	}
	share := float64(c.TypicalOnly) / float64(c.Figures)
	if share < 0.35 || share > 0.5 {
		t.Errorf("typical-only share %.2f, want 0.35…0.50", share)
	}
	size := int64(0)
	for _, f := range files {
		st, err := os.Stat(f)
		if err != nil {
			t.Fatal(err)
		}
		size += st.Size()
	}
	if per := size / n; per < 700 || per > 1200 {
		t.Errorf("%d bytes of TOML per part, want about 950", per)
	}
}

// TestPartsRepeatable checks that a seed gives the same parts.
func TestPartsRepeatable(t *testing.T) {
	a, b := Parts(50, 9), Parts(50, 9)
	for i := range a {
		if a[i].GBW != b[i].GBW || a[i].Name != b[i].Name {
			t.Fatalf("part %d differs between runs", i)
		}
	}
	if c := Parts(50, 10); c[0].GBW == a[0].GBW && c[1].GBW == a[1].GBW {
		t.Fatal("another seed gives the same parts")
	}
}
