package headroom

import (
	"io/fs"
	"path"
	"sort"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
)

// demoParts decodes the embedded demo catalog.
func demoParts(t testing.TB) []*catalog.Part {
	t.Helper()
	names, err := fs.Glob(data.Catalog, "*.toml")
	if err != nil {
		t.Fatal(err)
	}
	sort.Strings(names)
	var out []*catalog.Part
	for _, n := range names {
		b, err := fs.ReadFile(data.Catalog, n)
		if err != nil {
			t.Fatal(err)
		}
		ps, err := catalog.Decode(n, b)
		if err != nil {
			t.Fatalf("decode %s: %v", n, err)
		}
		out = append(out, ps...)
	}
	return out
}

// demoDesigns returns the names of the embedded demo designs.
func demoDesigns(t testing.TB) []string {
	t.Helper()
	names, err := fs.Glob(data.Designs, "*.toml")
	if err != nil {
		t.Fatal(err)
	}
	sort.Strings(names)
	return names
}

// loadDesign decodes and derives one embedded design.
func loadDesign(t testing.TB, name string) (*filter.Design, *filter.Plan) {
	t.Helper()
	b, err := fs.ReadFile(data.Designs, path.Clean(name))
	if err != nil {
		t.Fatal(err)
	}
	return decodeDesign(t, name, b)
}

// decodeDesign decodes and derives a design text.
func decodeDesign(t testing.TB, name string, b []byte) (*filter.Design, *filter.Plan) {
	t.Helper()
	d, err := filter.DecodeDesign(name, b)
	if err != nil {
		t.Fatal(err)
	}
	p, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	return d, p
}

// passing evaluates parts against plan and returns the ones that pass.
func passing(plan *filter.Plan, parts []*catalog.Part) []*catalog.Part {
	var out []*catalog.Part
	for i, r := range filter.Evaluate(plan, parts, filter.Options{}) {
		if r.Pass {
			out = append(out, parts[i])
		}
	}
	return out
}
