package headroom

import (
	"math"
	"testing"
	"time"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/internal/fourier"
)

// thdPart is a fast invented part whose catalog entry gives no output
// swing and no common-mode range: both range checks are unknown, so only
// the simulated thd check sees the output clip (at the rails, where the
// simulation takes a swing the catalog does not give).
const thdPart = `
[[part]]
id = "thd-noswing"
name = "thd case, no swing figures"
tech = "cmos"
channels = 1
packages = ["soic8"]
temp = ["-40 C", "85 C"]
supply = { min = "2 V", max = "36 V" }
gbw = { min = "1 GHz" }
slew = { min = "1000 V/us" }
aol = { min = "140 dB" }
iout = { min = "100 mA" }
`

// thdHeadroomDesign is a ±5 V follower (no tolerance) at 4 V, 1 kHz with
// thd ≤ 1 %.
const thdHeadroomDesign = `
title = "thd headroom"
[supply]
pos = "5 V"
neg = "-5 V"
[[stage]]
name = "amp"
kind = "follower"
signal = { shape = "sine", peak = "4 V", freq = "1 kHz" }
thd = "1 %"
`

// TestTHDHeadroom: the signal peak's headroom on a thd design is found by
// bisection on the evaluator, simulated check included, and breaks on
// thd where a sine clipped at the ±5 V rails reaches 1 % THD: A = 5 V/c
// with c the clip level at which the clipped sine's Fourier series gives
// 1 % (fourier.ClipForTHD, worked outside the simulator).
func TestTHDHeadroom(t *testing.T) {
	ps, err := catalog.Decode("thd.toml", []byte(thdPart))
	if err != nil {
		t.Fatal(err)
	}
	d, plan := decodeDesign(t, "thd.toml", []byte(thdHeadroomDesign))
	start := time.Now()
	ls := Find(d, plan, ps[0], filter.Options{})
	t.Logf("Find with a thd check: %d limits in %v", len(ls), time.Since(start))
	l, ok := find(ls, "amp", "signal.peak", Up)
	if !ok {
		t.Fatalf("no peak limit; have %v", ls)
	}
	want := 5 / fourier.ClipForTHD(0.01)
	if math.Abs(l.Limit/want-1) > 1e-3 || l.Breaks.Key != filter.KeyTHD || l.Method != Bisection {
		t.Errorf("peak limit %.6g V, breaks %s by %s; want %.6g V (clipped-sine series), thd, bisection", l.Limit, l.Breaks.Key, l.Method, want)
	}
}
