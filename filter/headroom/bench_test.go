package headroom

import (
	"testing"

	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
)

// BenchmarkFind is the headroom of one candidate over all its inputs: the
// demo design's first passing part. It runs only when a front end shows
// or exports that candidate, never on the per-keystroke path.
func BenchmarkFind(b *testing.B) {
	d, plan := loadDesign(b, data.DefaultDesign)
	ps := passing(plan, demoParts(b))
	if len(ps) == 0 {
		b.Fatal("no passing part")
	}
	b.ReportAllocs()
	for b.Loop() {
		Find(d, plan, ps[0], filter.Options{})
	}
}
