package fourier

import (
	"math"
	"testing"
)

// TestClippedSineSeriesSanity checks the hand-integrated series at its
// two ends: no clipping (c = A) leaves a pure sine, and a hard clip
// (c → 0) tends to a square wave, whose harmonics are 1/n (standard
// Fourier series tables, from memory): THD → √(Σ_{3,5,7,9} 1/n²) = 0.4291.
func TestClippedSineSeriesSanity(t *testing.T) {
	if got := ClippedSineTHD(1); math.Abs(got) > 1e-12 {
		t.Errorf("unclipped THD %g, want 0", got)
	}
	sq := 0.0
	for n := 3.0; n <= 9; n += 2 {
		sq += 1 / (n * n)
	}
	if got, want := ClippedSineTHD(1e-6), math.Sqrt(sq); math.Abs(got/want-1) > 1e-5 {
		t.Errorf("hard-clip THD %g, want the square wave's %g", got, want)
	}
}

// TestClipForTHD: the clip level found gives back the THD asked for.
func TestClipForTHD(t *testing.T) {
	for _, thd := range []float64{0.001, 0.01, 0.1} {
		if got := ClippedSineTHD(ClipForTHD(thd)); math.Abs(got/thd-1) > 1e-9 {
			t.Errorf("THD at ClipForTHD(%g) = %g", thd, got)
		}
	}
}
