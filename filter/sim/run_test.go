package sim

import (
	"math"
	"strings"
	"testing"
)

var testAmp = Amp{Aol: 1e5, GBW: 1e6, SlewRise: 0.5e6, VOL: -5, VOH: 5}

// TestRunRejectsBadInput: every bad value gets an error naming the field
// and showing the value; none panics.
func TestRunRejectsBadInput(t *testing.T) {
	sine := Input{Shape: Sine, Peak: 1, Freq: 1e3}
	for _, tc := range []struct {
		name string
		c    Circuit
		amp  Amp
		in   Input
		opt  Options
		want string
	}{
		{"no circuit", nil, testAmp, sine, Options{}, "no circuit"},
		{"aol", Follower{}, Amp{Aol: 1, GBW: 1e6, SlewRise: 1e6, VOH: 1}, sine, Options{}, "aol = 1"},
		{"gbw", Follower{}, Amp{Aol: 1e5, GBW: -1, SlewRise: 1e6, VOH: 1}, sine, Options{}, "gbw = -1"},
		{"slew", Follower{}, Amp{Aol: 1e5, GBW: 1e6, VOH: 1}, sine, Options{}, "slew_rise = 0"},
		{"slew fall", Follower{}, Amp{Aol: 1e5, GBW: 1e6, SlewRise: 1e6, SlewFall: -2, VOH: 1}, sine, Options{}, "slew_fall = -2"},
		{"swing", Follower{}, Amp{Aol: 1e5, GBW: 1e6, SlewRise: 1e6, VOL: 2, VOH: 1}, sine, Options{}, "swing 2 V … 1 V"},
		{"nan gbw", Follower{}, Amp{Aol: 1e5, GBW: math.NaN(), SlewRise: 1e6, VOH: 1}, sine, Options{}, "gbw = NaN"},
		{"rf", NonInverting{Rf: 0, Rg: 1e3}, testAmp, sine, Options{}, "rf = 0"},
		{"rin", Inverting{Rf: 1e3, Rin: -5}, testAmp, sine, Options{}, "rin = -5"},
		{"relaxation ref", Relaxation{R: 1e3, C: 1e-9, R1: 1e3, R2: 1e3, Ref: 7}, testAmp, Input{}, Options{}, "ref = 7"},
		{"sallen-key c2", SallenKeyLowPass{R1: 1e3, R2: 1e3, C1: 1e-9}, testAmp, sine, Options{}, "c2 = 0"},
		{"transimpedance caps", Transimpedance{Rf: 1e6}, testAmp, Input{Shape: Step, Peak: 1e-6}, Options{}, "cin + cf = 0"},
		{"no input", Follower{}, testAmp, Input{}, Options{}, "shape none"},
		{"freq", Follower{}, testAmp, Input{Shape: Sine, Peak: 1}, Options{}, "freq = 0"},
		{"square rise", Follower{}, testAmp, Input{Shape: Square, Peak: 1, Freq: 1e3, Rise: 1e-3}, Options{}, "rise = 0.001"},
		{"points", Follower{}, testAmp, sine, Options{PointsPerPeriod: 8}, "points per period = 8"},
		{"negative option", Follower{}, testAmp, sine, Options{MeasurePeriods: -1}, "no negative values"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			w, err := Run(tc.c, tc.amp, tc.in, tc.opt)
			if err == nil {
				t.Fatalf("no error; got a waveform of %d points", len(w.T))
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %q, want it to mention %q", err, tc.want)
			}
		})
	}
}

// TestMetricsApply: only the figures that apply to a stage are set (the
// others stay nil, and opsift preview leaves them out of its JSON).
func TestMetricsApply(t *testing.T) {
	for _, tc := range []struct {
		name string
		c    Circuit
		in   Input
		want []string
	}{
		{"follower sine", Follower{}, Input{Shape: Sine, Peak: 1, Freq: 100e3}, []string{"peak_error", "thd"}},
		{"inverting square", Inverting{Rf: 2e3, Rin: 1e3}, Input{Shape: Square, Peak: 0.5, Freq: 10e3},
			[]string{"peak_error", "transition_time"}},
		{"comparator", Comparator{}, Input{Shape: Sine, Peak: 1, Freq: 1e3}, []string{"transition_time"}},
		{"relaxation", Relaxation{R: 10e3, C: 1e-9, R1: 10e3, R2: 10e3}, Input{},
			[]string{"duty", "frequency", "ideal_frequency"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := run(t, tc.c, testAmp, tc.in).Metrics
			var set []string
			for _, f := range []struct {
				name string
				v    *float64
			}{{"duty", m.Duty}, {"frequency", m.Frequency}, {"ideal_frequency", m.IdealFrequency},
				{"peak_error", m.PeakError}, {"thd", m.THD}, {"transition_time", m.TransitionTime}} {
				if f.v != nil {
					set = append(set, f.name)
				}
			}
			if strings.Join(set, " ") != strings.Join(tc.want, " ") {
				t.Errorf("metrics set %v, want %v", set, tc.want)
			}
		})
	}
}

// TestWaveformArrays: arrays have one length, at most MaxPoints, time from
// 0 upward, and cover whole periods.
func TestWaveformArrays(t *testing.T) {
	for _, maxPts := range []int{0, 500, 333} {
		w, err := Run(Follower{}, testAmp, Input{Shape: Sine, Peak: 1, Freq: 1e3}, Options{MaxPoints: maxPts})
		if err != nil {
			t.Fatal(err)
		}
		limit := maxPts
		if limit == 0 {
			limit = 2000
		}
		n := len(w.T)
		if n == 0 || n > limit || len(w.In) != n || len(w.Out) != n || len(w.Ideal) != n || len(w.Slewing) != n {
			t.Fatalf("max %d: lengths t %d in %d out %d ideal %d slewing %d", maxPts, n, len(w.In), len(w.Out), len(w.Ideal), len(w.Slewing))
		}
		if w.T[0] != 0 {
			t.Errorf("t starts at %g", w.T[0])
		}
		for k := 1; k < n; k++ {
			if w.T[k] <= w.T[k-1] {
				t.Fatalf("t not increasing at %d", k)
			}
		}
		if span := w.Span(); span < 4.9e-3 || span > 5e-3 {
			t.Errorf("max %d: span %g s, want about 5 periods of 1 ms", maxPts, span)
		}
		lo, hi := w.Range()
		if lo > -0.99 || hi < 0.99 {
			t.Errorf("range %g … %g, want about ±1 V", lo, hi)
		}
	}
}
