package preview

import (
	"testing"

	"github.com/opsift/opsift/data"
)

// BenchmarkRunGain is one preview of the default design's gain stage: the
// speed a preview pane following the cursor needs (target well under 20 ms).
func BenchmarkRunGain(b *testing.B) {
	plan := demoPlan(b, data.DefaultDesign)
	p := demoPart(b, "gp4-bip")
	for b.Loop() {
		if _, err := Run(plan, "gain", p, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRunClock is one preview of the relaxation oscillator.
func BenchmarkRunClock(b *testing.B) {
	plan := demoPlan(b, "pickup-counter-6v.toml")
	p := demoPart(b, "gp4-bip")
	for b.Loop() {
		if _, err := Run(plan, "clock", p, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
