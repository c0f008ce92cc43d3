package preview

import (
	"io/fs"
	"math"
	"os"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"

	_ "github.com/opsift/opsift/internal/golden" // takes -update, so go test ./... -update runs here too
)

// demoPart returns a part of the embedded demo catalog.
func demoPart(t testing.TB, id string) *catalog.Part {
	t.Helper()
	c, err := catalog.Load(catalog.FSLayer("demo", data.Catalog))
	if err != nil {
		t.Fatalf("demo catalog: %v", err)
	}
	for _, p := range c.Parts {
		if p.ID == id {
			return p
		}
	}
	t.Fatalf("demo catalog has no part %q", id)
	return nil
}

// planOf decodes and derives a design text.
func planOf(t testing.TB, name string, text []byte) *filter.Plan {
	t.Helper()
	d, err := filter.DecodeDesign(name, text)
	if err != nil {
		t.Fatalf("design %s: %v", name, err)
	}
	p, err := filter.Derive(d)
	if err != nil {
		t.Fatalf("design %s: %v", name, err)
	}
	return p
}

// demoPlan derives one of the embedded example designs.
func demoPlan(t testing.TB, name string) *filter.Plan {
	t.Helper()
	b, err := fs.ReadFile(data.Designs, name)
	if err != nil {
		t.Fatal(err)
	}
	return planOf(t, name, b)
}

// filePlan derives a design under testdata.
func filePlan(t testing.TB, path string) *filter.Plan {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return planOf(t, path, b)
}

// mustRun runs a preview or fails the test.
func mustRun(t testing.TB, plan *filter.Plan, stage string, part *catalog.Part, o Options) *Result {
	t.Helper()
	r, err := Run(plan, stage, part, o)
	if err != nil {
		t.Fatalf("Run(%s, %s): %v", stage, part.ID, err)
	}
	return r
}

// near fails when got is not within rel of want.
func near(t testing.TB, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.6g, want %.6g within %.3g %%", what, got, want, 100*rel)
	}
}

// val dereferences a metric that must apply.
func val(t testing.TB, what string, p *float64) float64 {
	t.Helper()
	if p == nil {
		t.Fatalf("%s: not set, want a value", what)
	}
	return *p
}
