package sim

import (
	"math"
	"strings"
	"testing"
)

// TestSlewEdgesAreStraight: a slew-limited edge is a straight ramp (its
// second derivative is zero while slewing) where an RC- or
// bandwidth-limited edge curves (common practice, no source).
func TestSlewEdgesAreStraight(t *testing.T) {
	in := Input{Shape: Square, Peak: 1, Freq: 10e3, Rise: 10e-9}
	slewed := run(t, Follower{}, Amp{Aol: 1e6, GBW: 1e9, SlewRise: 0.5e6, VOL: -5, VOH: 5}, in)
	curved := run(t, Follower{}, Amp{Aol: 1e6, GBW: 100e3, SlewRise: 1e9, VOL: -5, VOH: 5}, in)

	// Slewing: interior samples of a slewing run, where the steps on both
	// sides slewed throughout.
	maxD2, maxD1, n := 0.0, 0.0, 0
	o, s := slewed.Out, slewed.Slewing
	for k := 2; k+2 < len(o); k++ {
		if s[k-2] && s[k-1] && s[k] && s[k+1] {
			maxD2 = math.Max(maxD2, math.Abs(o[k+1]-2*o[k]+o[k-1]))
			maxD1 = math.Max(maxD1, math.Abs(o[k+1]-o[k]))
			n++
		}
	}
	if n < 20 {
		t.Fatalf("only %d samples inside slewing edges", n)
	}
	if maxD2 > 1e-9*maxD1 {
		t.Errorf("slew-limited edge curves: |Δ²out| up to %g against |Δout| %g", maxD2, maxD1)
	}

	// Bandwidth-limited: on the edge (10–90 % of the swing) the second
	// difference is a sizeable part of the first.
	o = curved.Out
	lo, hi := curved.Range()
	maxD2, maxD1 = 0, 0
	for k := 1; k+1 < len(o); k++ {
		if o[k] > lo+0.1*(hi-lo) && o[k] < lo+0.9*(hi-lo) {
			maxD2 = math.Max(maxD2, math.Abs(o[k+1]-2*o[k]+o[k-1]))
			maxD1 = math.Max(maxD1, math.Abs(o[k+1]-o[k]))
		}
	}
	if curved.Metrics.SlewingFraction != 0 || maxD2 < 0.05*maxD1 {
		t.Errorf("bandwidth-limited edge: slewing %g, |Δ²out| %g against |Δout| %g, want a curve",
			curved.Metrics.SlewingFraction, maxD2, maxD1)
	}
}

// TestSlewLimitedOscillatorRunsSlow: a slew-limited relaxation oscillator
// runs slower than its RC predicts; with the same RC an astable on a
// 0.5 V/µs part swinging 10 V loses well over 10 % of its frequency at a
// few tens of kHz, one on 5 V/µs far less (common practice, no source).
func TestSlewLimitedOscillatorRunsSlow(t *testing.T) {
	osc := Relaxation{R: 10e3, C: 1.517e-9, R1: 10e3, R2: 10e3} // ideal ≈ 30 kHz
	loss := map[float64]float64{}
	for _, sr := range []float64{0.5e6, 5e6, 50e6} {
		amp := Amp{Aol: 1e5, GBW: 2 * sr, SlewRise: sr, VOL: -5, VOH: 5}
		w := run(t, osc, amp, Input{})
		f, fi := *w.Metrics.Frequency, *w.Metrics.IdealFrequency
		if f >= fi {
			t.Errorf("SR %g V/s: %g Hz, not slower than the RC's %g Hz", sr, f, fi)
		}
		loss[sr] = 1 - f/fi
		t.Logf("SR %4g V/us: %.0f Hz of %.0f Hz ideal, loses %.1f %%", sr/1e6, f, fi, 100*loss[sr])
	}
	if loss[0.5e6] < 0.2 {
		t.Errorf("0.5 V/us loses %.1f %%, want well over 10 %%", 100*loss[0.5e6])
	}
	if loss[5e6] > loss[0.5e6]/3 || loss[50e6] > loss[5e6] {
		t.Errorf("losses %v do not shrink fast with slew rate", loss)
	}
}

// TestNoWindup: the amp node is held at the swing, so a clipped follower
// leaves the rail as soon as the input comes back inside the swing. A node
// that wound up past the rail would first have to slew back (common
// practice, no source).
func TestNoWindup(t *testing.T) {
	amp := Amp{Aol: 1e5, GBW: 10e6, SlewRise: 10e6, VOL: -5, VOH: 5}
	w := run(t, Follower{}, amp, Input{Shape: Sine, Peak: 8, Freq: 1e3})
	if !w.Metrics.Clipped {
		t.Fatal("an 8 V sine into a ±5 V swing did not clip")
	}
	for k, v := range w.Out {
		if v > amp.VOH || v < amp.VOL {
			t.Fatalf("out[%d] = %g V outside the swing", k, v)
		}
	}
	// Time from the input falling back through VOH to the output leaving it.
	var tIn, tOut float64
	for k := 1; k < len(w.T); k++ {
		if tIn == 0 && w.In[k-1] >= amp.VOH && w.In[k] < amp.VOH {
			tIn = w.T[k]
		}
		if tIn != 0 && w.Out[k] < amp.VOH-1e-3 {
			tOut = w.T[k]
			break
		}
	}
	if tIn == 0 || tOut == 0 || tOut-tIn > 2*w.T[1] {
		t.Errorf("input back inside at %g s, output left the rail at %g s; want within two samples", tIn, tOut)
	}
}

// TestCommonModeFlag: input pins beyond the amp's common-mode range are
// flagged with a note; inside it, not.
func TestCommonModeFlag(t *testing.T) {
	amp := Amp{Aol: 1e5, GBW: 1e6, SlewRise: 1e6, VOL: 0.02, VOH: 3.28, CMLow: 0, CMHigh: 1.8}
	for _, tc := range []struct {
		peak float64
		want bool
	}{{0.1, false}, {1, true}} {
		w := run(t, Follower{}, amp, Input{Shape: Sine, Peak: tc.peak, Freq: 1e3, Offset: 1.65})
		m := w.Metrics
		if m.CMExceeded != tc.want {
			t.Errorf("peak %g V: cm_exceeded %v, want %v (pins %g … %g V)", tc.peak, m.CMExceeded, tc.want, m.InputLow, m.InputHigh)
		}
		noted := strings.Contains(strings.Join(m.Notes, "\n"), "common-mode")
		if noted != tc.want {
			t.Errorf("peak %g V: notes %q", tc.peak, m.Notes)
		}
		near(t, "highest input pin", m.InputHigh, 1.65+tc.peak, 1e-6)
	}
}

// TestOscillatorTooSlow: a part whose edges alone take many ideal periods
// is reported as not oscillating within the allowed slowdown, with a note,
// instead of running without end.
func TestOscillatorTooSlow(t *testing.T) {
	amp := Amp{Aol: 1e5, GBW: 1e6, SlewRise: 1e3, VOL: -5, VOH: 5} // 10 ms per edge
	w := run(t, Relaxation{R: 10e3, C: 1e-9, R1: 10e3, R2: 10e3}, amp, Input{})
	m := w.Metrics
	if m.Frequency == nil || *m.Frequency != 0 || len(m.Notes) == 0 || !strings.Contains(m.Notes[0], "no steady oscillation") {
		t.Errorf("frequency %v, notes %q; want 0 and a note", m.Frequency, m.Notes)
	}
	if len(w.T) == 0 || len(w.T) > 2000 {
		t.Errorf("%d points", len(w.T))
	}
}
