package replace

import (
	"fmt"
	"testing"

	"github.com/opsift/opsift/catalog"
)

// synthetic returns n parts alternating between the two test quads with
// spread figures and pinouts, so every comparison path is exercised.
func synthetic(n int) []*catalog.Part {
	parts := make([]*catalog.Part, n)
	for i := range parts {
		var p *catalog.Part
		if i%2 == 0 {
			p = bipQuad(fmt.Sprintf("b%06d", i))
		} else {
			p = cmosQuad(fmt.Sprintf("c%06d", i))
		}
		p.Slew.Typ = catalog.Some(p.Slew.Typ.V() * (1 + float64(i%17)/10))
		if i%3 == 0 {
			p.Pinout = "quad-b"
		}
		if i%11 == 0 {
			p.Lifecycle = catalog.LifecycleObsolete
		}
		parts[i] = p
	}
	return parts
}

func BenchmarkFind(b *testing.B) {
	for _, n := range []int{1_000, 10_000, 100_000} {
		parts := synthetic(n)
		orig := bipQuad("orig")
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				Find(orig, parts, Options{})
			}
		})
	}
}
