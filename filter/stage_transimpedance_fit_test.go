package filter_test

import (
	"fmt"
	"math"
	"regexp"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/internal/spicerun"
)

// tiaFitStage is a photodiode stage of our own: 500 kΩ, 30 pF, 100 kHz.
const tiaFitStage = `kind = "transimpedance"
rf = "500 kOhm"
cin = "30 pF"
bandwidth = "100 kHz"
i_max = "4 uA"
ref = "1 V"`

// tiaFitPart has a worst-case GBW of 2 MHz, a typical of 4 MHz, and
// guaranteed noise densities (so neither is inflated).
func tiaFitPart() *catalog.Part {
	part := tmplPart("t")
	part.Cin = catalog.Opt{}
	part.GBW = catalog.Spec{Min: catalog.Some(2e6), Typ: catalog.Some(4e6)}
	part.En = catalog.Spec{Max: catalog.Some(12e-9)}
	part.In = catalog.Spec{Max: catalog.Some(0.5e-12)}
	return part
}

// tiaNoiseDeck is an ngspice .noise deck of the transimpedance stage on a
// single-pole op-amp, independent of circuit.TIANoise: en is the thermal
// noise of a resistor en²/(4kT) at the + input, in the thermal noise of
// 1 Ω times a transconductance in/√(4kT), the op-amp a unit
// transconductance into 1/(2π·GBW) F (A = ωT/s), buffered. Rf is noisy at
// the deck's 25 °C.
func tiaNoiseDeck(rf, cin, cf, gbw, en, in float64) string {
	kT4 := 4 * 1.380649e-23 * 298.15
	return fmt.Sprintf(`* transimpedance output noise
.options TEMP=25 TNOM=25
Ren inp 0 %.12g
Rn nn 0 1
Gin 0 inn nn 0 %.12g
Cin inn 0 %.12g
Rf inn out %.12g
Cf inn out %.12g
G1 0 x inp inn 1
Cx x 0 %.12g
Rx x 0 1e15
E1 out 0 x 0 1
Vs src 0 DC 0 AC 1
Rsrc src inn 1e18
.noise v(out) Vs dec 400 0.1 1e10
.control
option numdgt=10
run
setplot noise2
print onoise_total
quit
.endc
.end
`, en*en/kT4, in/math.Sqrt(kT4), cin, rf, cf, 1/(2*math.Pi*gbw))
}

var onoiseTotal = regexp.MustCompile(`onoise_total = (\S+)`)

// The noise check judges the circuit the user is told to build: the Cf
// the gbw check reports (fitted flat at the worst-case GBW 2 MHz), on the
// op-amp at its typical 4 MHz (with Cf fixed, more GBW is more noise).
// ngspice-39 on tiaNoiseDeck of that circuit prints the value recorded
// here; with ngspice on PATH the test runs it live. The Cf fitted at
// 4 MHz (the circuit the noise check used to assume, a different one)
// gives 168.89 µV in ngspice. The budget is then put just above and just
// below the ngspice value: the failing edge.
func TestTransimpedanceNoiseFittedCf(t *testing.T) {
	const rf, cin = 500e3, 30e-12
	const recorded = 143.7032267e-6 // ngspice-39, onoise_total of tiaNoiseDeck(500k, 30p, told Cf, 4 MHz, 12n, 0.5p)
	p := tmplPlan(t, rails12, tiaFitStage+"\nnoise = \"1 mV\"")
	part := tiaFitPart()
	g := tmplCheck(t, p, part, filter.KeyGBW)
	cf := circuit.FeedbackCapForTIAFlat(rf, cin, 2e6)
	if g.Aside.Kind.Key() != "cf" {
		t.Fatalf("gbw check aside %+v, want a cf", g.Aside)
	}
	tmplNear(t, "told Cf = flat at the worst-case GBW", g.Aside.V, cf, 1e-12)
	c := tmplCheck(t, p, part, filter.KeyNoise)

	want := recorded
	if spicerun.Installed() {
		live := spicerun.Value(t, tiaNoiseDeck(rf, cin, cf, 4e6, 12e-9, 0.5e-12), onoiseTotal)
		t.Logf("ngspice onoise_total %.10g V", live)
		tmplNear(t, "live ngspice vs recorded", live, recorded, 1e-6)
		other := spicerun.Value(t, tiaNoiseDeck(rf, cin, circuit.FeedbackCapForTIAFlat(rf, cin, 4e6), 4e6, 12e-9, 0.5e-12), onoiseTotal)
		tmplNear(t, "ngspice with Cf fitted at 4 MHz", other, 168.891062e-6, 1e-6)
	}
	tmplNear(t, "noise check vs ngspice on the told circuit", c.Available, want, 2e-4)

	for _, tc := range []struct {
		name  string
		scale float64
		pass  bool
	}{{"budget 0.1 % above", 1.001, true}, {"budget 0.1 % below", 0.999, false}} {
		t.Run(tc.name, func(t *testing.T) {
			p := tmplPlan(t, rails12, tiaFitStage+fmt.Sprintf("\nnoise = \"%.9g V\"", want*tc.scale))
			if c := tmplCheck(t, p, part, filter.KeyNoise); c.Pass != tc.pass {
				t.Errorf("noise %g V against %g V: pass %v, want %v", c.Available, want*tc.scale, c.Pass, tc.pass)
			}
		})
	}

	// With Cf fixed, the noise grows with the GBW over the part's span, so
	// the typical end is the worst (a dense scan, circuit.TIANoise).
	prev := 0.0
	for k := 1.0; k <= 2; k += 0.05 {
		n := circuit.TIANoise{En: 12e-9, In: 0.5e-12, Rf: rf, Cf: cf, Cin: cin, GBW: k * 2e6, TempK: 298.15}
		v := n.OutputRMS()
		if v < prev {
			t.Errorf("noise falls from %g to %g V at GBW %g Hz", prev, v, k*2e6)
		}
		prev = v
	}
}

// The gbw check judges the same Cf: on a part whose typical GBW is twice
// its worst case, the need is the worst-case GBW whose fitted Cf keeps the
// bandwidth at both ends of that span (the nodal sweep tiaBandwidth,
// independent of the closed forms: the Cf fitted at the slow end is
// overdamped and slower on the fast end). The check shows the part's own
// GBW as available and the per-part need as required, as the amplifier's
// gbw does with its Aol. A part exactly at the need passes and the sweep
// at its fast end reaches 100 kHz; 0.5 % below, it fails and the sweep
// falls short.
func TestTransimpedanceGBWFittedCf(t *testing.T) {
	const rf, cin, f = 500e3, 30e-12, 100e3
	p := tmplPlan(t, rails12, tiaFitStage)
	floor := tmplMust(t, p, filter.KeyGBW).Value
	part := tiaFitPart()
	c := tmplCheck(t, p, part, filter.KeyGBW)
	if c.Available != 2e6 {
		t.Errorf("available %g Hz, want the part's worst-case 2 MHz", c.Available)
	}
	tmplContains(t, "note", c.Note, "holds only near the GBW it was fitted at")
	need := c.Required
	if !(need > floor) {
		t.Fatalf("need %g Hz with a 2× spread, want above the flat floor %g Hz", need, floor)
	}
	for _, tc := range []struct {
		name  string
		scale float64
		pass  bool
	}{{"at the need", 1, true}, {"0.5 % below", 0.995, false}} {
		t.Run(tc.name, func(t *testing.T) {
			part := tiaFitPart()
			g := need * tc.scale
			part.GBW = catalog.Spec{Min: catalog.Some(g), Typ: catalog.Some(2 * g)}
			c := tmplCheck(t, p, part, filter.KeyGBW)
			if c.Pass != tc.pass {
				t.Errorf("pass %v (margin %g), want %v", c.Pass, c.Margin, tc.pass)
			}
			slow, _ := tiaBandwidth(rf, cin, c.Aside.V, g)
			fast, peak := tiaBandwidth(rf, cin, c.Aside.V, 2*g)
			if peak > 1.001 {
				t.Errorf("fast end peaks %.4f × Rf, want none", peak)
			}
			if tc.pass {
				tmplNear(t, "swept −3 dB at the fast end", fast, f, 1e-3)
				if slow < f*(1-1e-3) {
					t.Errorf("slow end %g Hz below %g", slow, f)
				}
			} else if !(fast < f) {
				t.Errorf("fast end reaches %g Hz, want below %g", fast, f)
			}
		})
	}
}

// In a low-gain fast stage (Rf 1 kΩ, Cin 10 pF) on a part of worst-case
// GBW 9.55 MHz and typical 14.3 MHz (2π·Rf·Cin·GBW = 0.6 and 0.9), the flat
// Cf of the worst case would peak on the typical part. The Cf the check
// reports is the smallest that peaks on neither (0.994·Cin, by hand from
// √(2/u − 1/u²) at u = 0.9), by the nodal sweep at both ends, and the
// noise check integrates that Cf on the typical GBW, the worst end (a
// dense scan of circuit.TIANoise over the span with that Cf).
func TestTransimpedanceLowGainCf(t *testing.T) {
	const rf, cin = 1e3, 10e-12
	lo, hi := 0.6/(2*math.Pi*rf*cin), 0.9/(2*math.Pi*rf*cin)
	p := tmplPlan(t, rails12, `kind = "transimpedance"
rf = "1 kOhm"
cin = "10 pF"
bandwidth = "1 MHz"
i_max = "1 mA"
ref = "1 V"
noise = "1 mV"`)
	part := tiaFitPart()
	part.GBW = catalog.Spec{Min: catalog.Some(lo), Typ: catalog.Some(hi)}
	c := tmplCheck(t, p, part, filter.KeyGBW)
	tmplNear(t, "cf/cin", c.Aside.V/cin, math.Sqrt(2/0.9-1/0.81), 1e-9)
	for _, g := range []float64{lo, hi} {
		if _, peak := tiaBandwidth(rf, cin, c.Aside.V, g); peak > 1+1e-6 {
			t.Errorf("GBW %g: the reported Cf peaks at %.7f × Rf", g, peak)
		}
	}
	if _, peak := tiaBandwidth(rf, cin, circuit.FeedbackCapForTIAFlat(rf, cin, lo), hi); !(peak > 1+1e-6) {
		t.Errorf("the worst case's flat Cf on the typical part: peak %.7f × Rf, want peaking (the case this guards)", peak)
	}
	noise := tmplCheck(t, p, part, filter.KeyNoise)
	n := circuit.TIANoise{En: 12e-9, In: 0.5e-12, Rf: rf, Cf: c.Aside.V, Cin: cin, GBW: hi, TempK: 298.15}
	tmplNear(t, "noise on the typical GBW with the reported Cf", noise.Available, n.OutputRMS(), 1e-12)
	prev := 0.0
	for k := 0; k <= 20; k++ {
		n.GBW = lo * math.Pow(hi/lo, float64(k)/20)
		v := n.OutputRMS()
		if v < prev {
			t.Errorf("noise falls from %g to %g V at GBW %g Hz", prev, v, n.GBW)
		}
		prev = v
	}
}
