package preview

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
)

// TestDemoGainStage: the default design's gain stage (×6.2, 5.58 Vpp at
// 24 kHz) needs 2π·24 kHz·2.79 V = 0.421 V/µs; the slow bipolar quad has
// 0.42 V/µs × 0.7 = 0.294 V/µs at worst case, so it slews over most of each
// period and its output falls short of the ideal, while the CMOS quad
// (3.9 V/µs) tracks the ideal.
func TestDemoGainStage(t *testing.T) {
	plan := demoPlan(t, data.DefaultDesign)
	t.Run("gp4-bip slews", func(t *testing.T) {
		r := mustRun(t, plan, "gain", demoPart(t, "gp4-bip"), Options{})
		m := r.Metrics
		near(t, "ideal_pp", m.IdealPP, 2*6.2*0.45, 1e-3)
		if m.SlewingFraction < 0.3 {
			t.Errorf("slewing_fraction = %.3g, want well above 0 (needed slew is 1.43× the part's)", m.SlewingFraction)
		}
		if m.OutputPP > 0.95*m.IdealPP {
			t.Errorf("output_pp = %.4g V, want below ideal_pp %.4g V", m.OutputPP, m.IdealPP)
		}
		if thd := val(t, "thd", m.THD); thd < 0.02 {
			t.Errorf("thd = %.3g, want a visibly distorted sine (a few %%)", thd)
		}
		if r.Basis != WorstCase {
			t.Errorf("basis = %q, want %q", r.Basis, WorstCase)
		}
	})
	t.Run("rr4-cmos tracks", func(t *testing.T) {
		r := mustRun(t, plan, "gain", demoPart(t, "rr4-cmos"), Options{})
		m := r.Metrics
		near(t, "output_pp", m.OutputPP, m.IdealPP, 0.03)
		if m.SlewingFraction != 0 {
			t.Errorf("slewing_fraction = %.3g, want 0 (9× the slew needed)", m.SlewingFraction)
		}
		if thd := val(t, "thd", m.THD); thd > 1e-3 {
			t.Errorf("thd = %.3g, want a clean sine", thd)
		}
	})
}

// TestSameFiguresAsEngine: the amp is built from filter.Figures, the swing
// at the rails' tolerance extremes as the output_range check takes them.
func TestSameFiguresAsEngine(t *testing.T) {
	plan := demoPlan(t, data.DefaultDesign)
	for _, id := range []string{"gp4-bip", "rr4-cmos"} {
		t.Run(id, func(t *testing.T) {
			p := demoPart(t, id)
			f := filter.Figures(p, plan)
			r := mustRun(t, plan, "gain", p, Options{})
			near(t, "slew", r.Amp.SlewRise, f.Slew.V, 1e-12)
			near(t, "gbw", r.Amp.GBW, f.GBW.V, 1e-12)
			near(t, "aol", 20*math.Log10(r.Amp.Aol), f.Aol.V, 1e-12)
			w, _ := f.OutputAt(10e3)
			near(t, "voh", r.Amp.VOH, plan.Rails.PosWorst+w.High, 1e-12)
			near(t, "vol", r.Amp.VOL, plan.Rails.NegWorst+w.Low, 1e-12)
			// The engine's check for the same figures (margin ≥ 0 ⇔ pass).
			res := filter.Evaluate(plan, []*catalog.Part{p}, filter.Options{})[0]
			for _, c := range res.Checks {
				if c.Stage() == "gain" && c.Key() == filter.KeySlew {
					passes := c.Pass
					slews := r.Metrics.SlewingFraction > 0
					if passes == slews {
						t.Errorf("slew check pass = %v but slewing_fraction = %.3g: the picture and the margin disagree", passes, r.Metrics.SlewingFraction)
					}
				}
			}
		})
	}
}

// TestTypical: the typical run uses the catalog's typical figures, not
// derated, on the nominal rails, and the slow part slews less.
func TestTypical(t *testing.T) {
	plan := demoPlan(t, data.DefaultDesign)
	p := demoPart(t, "gp4-bip")
	worst := mustRun(t, plan, "gain", p, Options{})
	typ := mustRun(t, plan, "gain", p, Options{Typical: true})
	if typ.Basis != Typical {
		t.Errorf("basis = %q, want %q", typ.Basis, Typical)
	}
	near(t, "typical slew", typ.Amp.SlewRise, p.Slew.Typ.V(), 1e-12)
	near(t, "typical gbw", typ.Amp.GBW, p.GBW.Typ.V(), 1e-12)
	near(t, "typical voh", typ.Amp.VOH, plan.Rails.Pos+p.Output.High.V(), 1e-12)
	if !(typ.Metrics.OutputPP > worst.Metrics.OutputPP) || !(typ.Metrics.SlewingFraction < worst.Metrics.SlewingFraction) {
		t.Errorf("typical output_pp %.4g V, slewing %.3g; worst case %.4g V, %.3g: want the typical run faster",
			typ.Metrics.OutputPP, typ.Metrics.SlewingFraction, worst.Metrics.OutputPP, worst.Metrics.SlewingFraction)
	}
}

// followerDesign is a ±6 V follower, 4 V peak at freq, no tolerance.
func followerDesign(freq float64) []byte {
	return []byte(fmt.Sprintf(`title = "follower"
[supply]
pos = "6 V"
neg = "-6 V"
[[stage]]
name = "buf"
kind = "follower"
ref = "0 V"
signal = { shape = "sine", peak = "4 V", freq = "%g Hz" }
`, freq))
}

// TestFullPowerBandwidth: a sine of peak Vp needs a slew rate of 2π·f·Vp,
// so slewing sets in at the full-power bandwidth f = SR/(2π·Vp)
// (textbook, e.g. Sedra & Smith, "full-power bandwidth"; from memory).
// The follower's closed-loop gain is 1 within 0.1 % this far below GBW,
// so the onset is checked ±3 % around it.
func TestFullPowerBandwidth(t *testing.T) {
	p := demoPart(t, "rr4-cmos")
	sr := filter.Figures(p, planOf(t, "f.toml", followerDesign(1e3))).Slew.V
	fpbw := sr / (2 * math.Pi * 4)
	for _, tc := range []struct {
		name  string
		k     float64
		slews bool
	}{{"below", 0.97, false}, {"above", 1.03, true}, {"far above", 3, true}} {
		t.Run(tc.name, func(t *testing.T) {
			plan := planOf(t, "f.toml", followerDesign(tc.k*fpbw))
			m := mustRun(t, plan, "buf", p, Options{}).Metrics
			if got := m.SlewingFraction > 0; got != tc.slews {
				t.Errorf("at %.3g × SR/(2πVp) = %s: slewing_fraction = %.3g, want slewing %v",
					tc.k, catalog.Format(tc.k*fpbw, catalog.Hertz), m.SlewingFraction, tc.slews)
			}
			if !tc.slews {
				near(t, "output_pp", m.OutputPP, 8, 2e-3)
			}
		})
	}
}

// TestRelaxation: the clock stage of pickup-counter-6v runs within 10 % of
// the engine's slew-limited closed form (the predicted frequency its gbw
// check reports) for the same part, and slower than the ideal astable.
func TestRelaxation(t *testing.T) {
	plan := demoPlan(t, "pickup-counter-6v.toml")
	for _, id := range []string{"gp4-bip", "rr4-cmos"} {
		t.Run(id, func(t *testing.T) {
			p := demoPart(t, id)
			r := mustRun(t, plan, "clock", p, Options{})
			want, ok := 0.0, false
			for _, c := range filter.Evaluate(plan, []*catalog.Part{p}, filter.Options{})[0].Checks {
				if c.Stage() == "clock" && c.Aside.Kind == filter.AsidePredictedFreq {
					want, ok = c.Aside.V, true
				}
			}
			if !ok {
				t.Fatal("no predicted frequency")
			}
			got := val(t, "frequency", r.Metrics.Frequency)
			near(t, "frequency", got, want, 0.10)
			if ideal := val(t, "ideal_frequency", r.Metrics.IdealFrequency); !(got < ideal) {
				t.Errorf("frequency %.4g Hz, want below the ideal %.4g Hz (finite slew and GBW lengthen the period)", got, ideal)
			}
			if d := val(t, "duty", r.Metrics.Duty); d <= 0 || d >= 1 {
				t.Errorf("duty = %.3g, want a fraction", d)
			}
		})
	}
}

// TestKinds runs every other kind against textbook ideal figures.
func TestKinds(t *testing.T) {
	plan := filePlan(t, "testdata/kinds.toml")
	fast := demoPart(t, "rr4-cmos")
	slow := demoPart(t, "gp4-bip")
	tests := []struct {
		stage  string
		part   string  // default rr4-cmos
		idealP float64 // ideal peak-to-peak
		check  func(t *testing.T, r *Result)
	}{
		// Inverting: |G|·2Vp (ideal op-amp; from memory).
		{"inv", "", 8, func(t *testing.T, r *Result) {
			near(t, "output_pp", r.Metrics.OutputPP, 8, 0.01)
			if in, out := r.Waveform.In[len(r.Waveform.In)/8], r.Waveform.Out[len(r.Waveform.Out)/8]; in*out >= 0 {
				t.Errorf("in %.3g V, out %.3g V at the same instant: want opposite signs (inverting)", in, out)
			}
		}},
		{"inv_r", "", 4, nil}, // Rf/Rin = 2
		{"unity", "", 2, nil},
		// Square: the output edge settles and reports a transition time.
		{"edge", "", 8, func(t *testing.T, r *Result) {
			tt := val(t, "transition_time", r.Metrics.TransitionTime)
			if tt <= 0 || tt > 20e-6 {
				t.Errorf("transition_time = %s, want within the allowed 20 µs", catalog.Format(tt, catalog.Second))
			}
		}},
		// Second-order low-pass at f0: |H(f0)| = Q (textbook; from memory).
		{"lowpass", "", 2 * 2 * 1, func(t *testing.T, r *Result) {
			near(t, "output_pp", r.Metrics.OutputPP, 4, 0.02)
		}},
		// Transimpedance: Rf·i_max = 100 kΩ·50 µA = 5 V. Cf is chosen
		// maximally flat (Q = 1/√2), whose step overshoots by
		// e^(−π/√(4Q²−1)) = e^(−π) = 4.32 % on each edge (second-order
		// step response, textbook; from memory). A fast part, so the edge
		// is not slew-limited, given a high Aol (see fastIntegrator).
		{"photo", "fast-integrator", 5, func(t *testing.T, r *Result) {
			if r.Metrics.SlewingFraction != 0 {
				t.Fatalf("slewing_fraction = %.3g, want 0 for this check", r.Metrics.SlewingFraction)
			}
			near(t, "output_pp", r.Metrics.OutputPP, 5*(1+math.Exp(-math.Pi)), 0.005)
			if hi := maxOf(r.Waveform.Out); hi < 4.9 {
				t.Errorf("highest output %.3g V, want it to rise above ref to 5 V", hi)
			}
		}},
		{"photo_neg", "", 5, func(t *testing.T, r *Result) {
			if lo := minOf(r.Waveform.Out); lo > -4.9 {
				t.Errorf("lowest output %.3g V, want it to fall below ref to −5 V", lo)
			}
		}},
		// Comparator: rail to rail of the part's swing; the edge is timed
		// 10–90 % between the stage's levels (−10 … 10 V), 0.8·20 V/SR when
		// slew-limited. The slow bipolar quad is slew-limited over nearly
		// all of the edge, so the closed form (which leaves out the short
		// linear start) holds within 10 %.
		{"check", "gp4-bip", slow.Output.High.V() - slow.Output.Low.V() + 24, func(t *testing.T, r *Result) {
			tt := val(t, "transition_time", r.Metrics.TransitionTime)
			near(t, "transition_time", tt, 0.8*20/r.Amp.SlewRise, 0.1)
		}},
	}
	for _, tc := range tests {
		t.Run(tc.stage, func(t *testing.T) {
			part := fast
			switch tc.part {
			case "":
			case "fast-integrator":
				part = fastIntegrator(t)
			default:
				part = demoPart(t, tc.part)
			}
			r := mustRun(t, plan, tc.stage, part, Options{})
			near(t, "ideal_pp", r.Metrics.IdealPP, tc.idealP, 1e-3)
			if tc.check != nil {
				tc.check(t, r)
			}
			if len(r.Waveform.T) == 0 || len(r.Waveform.T) != len(r.Waveform.Out) || len(r.Waveform.Out) != len(r.Waveform.Ideal) {
				t.Errorf("arrays t %d, out %d, ideal %d: want equal, non-empty", len(r.Waveform.T), len(r.Waveform.Out), len(r.Waveform.Ideal))
			}
		})
	}
}

// TestComparatorAtTheSlewBound: a part whose slew is exactly the
// requirement 0.8·(VOH − VOL)/transition = 0.8·20 V/10 µs = 1.6 V/µs (by
// hand) must show the allowed 10 µs edge in the preview. Before, the
// preview timed 10–90 % of the part's full swing (±12 V rails here), which
// showed 1.2× the allowed time for a part the rule passed.
func TestComparatorAtTheSlewBound(t *testing.T) {
	plan := filePlan(t, "testdata/kinds.toml")
	part := *demoPart(t, "rr4-cmos")
	part.Slew = catalog.Spec{Min: catalog.Some(1.6e6)}
	part.GBW = catalog.Spec{Min: catalog.Some(100e6)}
	r := mustRun(t, plan, "check", &part, Options{})
	tt := val(t, "transition_time", r.Metrics.TransitionTime)
	near(t, "transition at the bound", tt, 10e-6, 0.01)
}

// TestCommonModeNote: a JFET quad's inputs stop 2.7 V above V−, at
// −4.75 V + 2.7 V = −2.05 V, and cannot follow the default design's buffer
// down to −2.79 V; the note says so. The CMOS quad's range reaches
// V− − 0.15 V.
func TestCommonModeNote(t *testing.T) {
	plan := demoPlan(t, data.DefaultDesign)
	r := mustRun(t, plan, "buffer", demoPart(t, "jf4-jfet"), Options{})
	if !r.Metrics.CMExceeded || !hasNote(r.Notes, "common-mode") {
		t.Errorf("cm_exceeded %v, notes %q: want the input common-mode excursion flagged", r.Metrics.CMExceeded, r.Notes)
	}
	ok := mustRun(t, plan, "buffer", demoPart(t, "rr4-cmos"), Options{})
	if ok.Metrics.CMExceeded {
		t.Errorf("rr4-cmos: cm_exceeded, notes %q: want none (its range spans −4.9 V … 3.4 V)", ok.Notes)
	}
}

// TestErrors: bad requests give clear errors, never a panic.
func TestErrors(t *testing.T) {
	mixed := demoPlan(t, "pickup-counter-6v.toml")
	turbidity := demoPlan(t, "turbidity-5v.toml")
	kinds := filePlan(t, "testdata/kinds.toml")
	good := demoPart(t, "rr4-cmos")
	noSlew := *good
	noSlew.Slew = catalog.Spec{}
	noGBW := *good
	noGBW.GBW = catalog.Spec{}
	tests := []struct {
		name  string
		plan  *filter.Plan
		stage string
		part  *catalog.Part
		want  string
		is    error
	}{
		{"rail splitter", turbidity, "pedestal", good, "stage kind rail_splitter has no waveform preview", filter.ErrNoWaveform},
		{"direct", kinds, "spec", good, "stage kind direct has no waveform preview", filter.ErrNoWaveform},
		{"unknown stage", mixed, "clok", good, `no stage "clok" in the design, want one of "lowpass", "detect", "clock"`, nil},
		{"no slew", mixed, "clock", &noSlew, `field "slew": the catalog gives no figure`, nil},
		{"no gbw", kinds, "photo", &noGBW, `field "gbw": the catalog gives no figure`, nil},
		{"no part", mixed, "clock", nil, "a plan and a part are needed", nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Run(tc.plan, tc.stage, tc.part, Options{})
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want it to contain %q", err, tc.want)
			}
			if tc.is != nil && !errors.Is(err, tc.is) {
				t.Errorf("error %v, want errors.Is %v", err, tc.is)
			}
		})
	}
}

// TestStages lists the stages with a waveform in design order.
func TestStages(t *testing.T) {
	plan := demoPlan(t, "pickup-counter-6v.toml")
	if got := strings.Join(Stages(plan), ","); got != "lowpass,detect,clock" {
		t.Errorf("Stages = %q, want lowpass,detect,clock", got)
	}
	if s, ok := FirstStage(plan); !ok || s != "lowpass" {
		t.Errorf("FirstStage = %q, %v; want lowpass", s, ok)
	}
	if _, ok := FirstStage(filePlan(t, "testdata/direct-only.toml")); ok {
		t.Error("FirstStage of a design with only a direct stage: ok, want none")
	}
}

// fastIntegrator is the fast demo part hs2-bip with a 140 dB open-loop
// gain: the maximally flat Cf assumes an integrating amp (gain ωT/s), and
// hs2-bip's own 66 dB puts its open-loop pole at 60 kHz, close enough to
// the loop's 1.4 MHz to damp the step response measurably.
func fastIntegrator(t *testing.T) *catalog.Part {
	t.Helper()
	p := *demoPart(t, "hs2-bip")
	p.ID = "hs2-bip-hiaol"
	p.Aol = catalog.Spec{Min: catalog.Some(140)}
	return &p
}

func hasNote(notes []string, sub string) bool {
	for _, n := range notes {
		if strings.Contains(n, sub) {
			return true
		}
	}
	return false
}

func maxOf(xs []float64) float64 {
	m := math.Inf(-1)
	for _, x := range xs {
		m = math.Max(m, x)
	}
	return m
}

func minOf(xs []float64) float64 {
	m := math.Inf(1)
	for _, x := range xs {
		m = math.Min(m, x)
	}
	return m
}
