package filter_test

import (
	"math"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// Margin formulas (DESIGN.md): lower bound available/required − 1; upper
// bound (allowance) required/available − 1; range spare volts / minimum
// supply span. Margin ≥ 0 ⇔ pass. Numbers worked by hand.
func TestMarginFormulas(t *testing.T) {
	_, p := mustDesign(t, `title = "t"
[supply]
pos = "10 V"
[[stage]]
name = "s"
kind = "noninverting"
gain = 2
ref = "5 V"
signal = { peak = "1 V", freq = "1 kHz" }
dc_error = "10 mV"
`)
	tests := []struct {
		name   string
		key    filter.Key
		set    func(p *catalog.Part)
		margin float64
	}{
		// slew need 2π·1 kHz·2 V = 12566 V/s; 25133 available → +1.
		{"lower bound passes", filter.KeySlew, func(p *catalog.Part) { p.Slew = catalog.Spec{Min: opt(4 * math.Pi * 2e3)} }, 1},
		{"lower bound fails", filter.KeySlew, func(p *catalog.Part) { p.Slew = catalog.Spec{Min: opt(4 * math.Pi * 500)} }, -0.5},
		// dc error NG·Vos = 2·2.5 mV = 5 mV against 10 mV → 10/5 − 1 = +1.
		{"allowance passes", filter.KeyDCError, func(p *catalog.Part) { p.Vos = catalog.Spec{Max: opt(2.5e-3)} }, 1},
		// 2·10 mV = 20 mV against 10 mV → −0.5.
		{"allowance fails", filter.KeyDCError, func(p *catalog.Part) { p.Vos = catalog.Spec{Max: opt(10e-3)} }, -0.5},
		// output 3 … 7 V; swing 0.5 … 10 − 1.5 = 8.5 V → spare min(2.5, 1.5) = 1.5 V / 10 V.
		{"range passes", filter.KeyOutputRange, func(p *catalog.Part) {
			p.Output = catalog.Swing{Low: opt(0.5), High: opt(-1.5)}
		}, 0.15},
		// swing up to 10 − 3.5 = 6.5 V → spare −0.5 V / 10 V.
		{"range fails", filter.KeyOutputRange, func(p *catalog.Part) {
			p.Output = catalog.Swing{Low: opt(0.5), High: opt(-3.5)}
		}, -0.05},
		// input 4 … 6 V; CM 0 … 10 − 1.5 → spare min(4, 2.5) / 10.
		{"input range", filter.KeyInputRange, func(p *catalog.Part) {
			p.InputCM = catalog.Headroom{Low: opt(0), High: opt(-1.5)}
		}, 0.25},
		// supply span 10 V exactly, part 3 … 12 V → spare min(7, 2) / 10.
		{"supply", filter.KeySupply, func(p *catalog.Part) { p.Supply = catalog.Span{Min: opt(3), Max: opt(12)} }, 0.2},
		{"supply above the rating", filter.KeySupply, func(p *catalog.Part) { p.Supply = catalog.Span{Min: opt(3), Max: opt(9)} }, -0.1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			part := basePart("x")
			tc.set(part)
			stage := "s"
			if tc.key == filter.KeySupply {
				stage = ""
			}
			c := check(t, evalOne(t, p, part, filter.Options{}), stage, tc.key)
			near(t, "margin", c.Margin, tc.margin, 1e-9)
			if c.Pass != (c.Margin >= 0) {
				t.Errorf("pass = %v with margin %g", c.Pass, c.Margin)
			}
		})
	}
}

// Tolerance: each rail moves by tol × its own magnitude; the span runs from
// both rails inward to both outward. With 0 V between the rails that is
// span × (1 ∓ tol): ±15 V at 5 %: span 28.5 … 31.5 V, rails ±14.25 V (by
// hand).
func TestToleranceHandling(t *testing.T) {
	_, p := mustDesign(t, `title = "t"
[supply]
pos = "15 V"
neg = "-15 V"
tolerance = "5 %"
[[stage]]
name = "s"
kind = "follower"
ref = "0 V"
signal = { peak = "13 V", freq = "1 Hz" }
`)
	r := p.Rails
	wantRails(t, r, 28.5, 31.5, 14.25, -14.25)
	tests := []supplyCase{
		{"36 V part fits 31.5 V", catalog.Span{Min: opt(4), Max: opt(36)}, true},
		{"30 V part fails 31.5 V at +5 %", catalog.Span{Min: opt(4), Max: opt(30)}, false},
		{"part needing 29 V fails 28.5 V at −5 %", catalog.Span{Min: opt(29), Max: opt(40)}, false},
		{"31.5 V part is exactly at +5 %", catalog.Span{Min: opt(4), Max: opt(31.5)}, true},
		{"28.5 V minimum is exactly at −5 %", catalog.Span{Min: opt(28.5), Max: opt(40)}, true},
	}
	supplyCases(t, p, tests)
	// Output 13 V peak: the swing must reach 13 V from a 14.25 V rail, 1.25 V headroom.
	// A part exactly at the headroom (1.25 V) ties and passes.
	for _, tc := range []struct {
		high float64
		pass bool
	}{{-1.2, true}, {-1.25, true}, {-1.3, false}} {
		part := basePart("x")
		part.Output = catalog.Swing{Low: opt(-tc.high), High: opt(tc.high)}
		c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyOutputRange)
		if c.Pass != tc.pass {
			t.Errorf("swing %g V from the rails: pass = %v, want %v", tc.high, c.Pass, tc.pass)
		}
	}
}

// Pass at the limit (DESIGN.md: a margin within 1e-9 of zero is zero). In
// floating point 12·1.05 = 12.600000000000001 and 24·1.1 = 26.400000000000002,
// so a part rated exactly 12.6 V or 26.4 V got a margin of about −1e-16 and
// failed; 30·1.05 = 31.5 exactly passed. All three are exact ties by hand.
func TestTiesAtTheLimit(t *testing.T) {
	for _, tc := range []struct {
		pos, neg, tol, max string
	}{
		{"12 V", "0 V", "5 %", "12.6 V"},
		{"24 V", "0 V", "10 %", "26.4 V"},
		{"15 V", "-15 V", "5 %", "31.5 V"},
	} {
		t.Run(tc.pos+" "+tc.tol, func(t *testing.T) {
			_, p := mustDesign(t, sineDesign("pos = \""+tc.pos+"\"\nneg = \""+tc.neg+"\"\ntolerance = \""+tc.tol+"\"",
				"kind = \"follower\"\nsignal = { peak = \"0.1 V\", freq = \"1 Hz\" }"))
			part := basePart("x")
			part.Supply = catalog.Span{Min: opt(1), Max: opt(q(tc.max, catalog.Volt))}
			c := check(t, evalOne(t, p, part, filter.Options{}), "", filter.KeySupply)
			if !c.Pass || c.Margin != 0 {
				t.Errorf("rated %s: pass %v, margin %g; want a pass at margin 0", tc.max, c.Pass, c.Margin)
			}
		})
	}
	t.Run("slew tie", func(t *testing.T) {
		// Comparator 0…5 V in 1 µs needs 0.8·5/1e-6 = 4 V/µs; 4e6·(1 + 1e-15)
		// is the same figure read back through a unit conversion.
		_, p := mustDesign(t, `title = "t"
[supply]
pos = "5 V"
[[stage]]
name = "s"
kind = "comparator"
threshold = "2.5 V"
input = ["1 V", "4 V"]
out_low = "0 V"
out_high = "5 V"
transition = "1 us"
`)
		part := basePart("x")
		part.Slew = catalog.Spec{Min: opt(4e6 * (1 - 1e-15))}
		if c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeySlew); !c.Pass || c.Margin != 0 {
			t.Errorf("slew at the bound: pass %v, margin %g", c.Pass, c.Margin)
		}
		part.Slew = catalog.Spec{Min: opt(4e6 * (1 - 1e-6))}
		if c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeySlew); c.Pass {
			t.Errorf("slew 1 ppm short passes (margin %g)", c.Margin)
		}
	})
}

// Rails tolerance with both rails positive (DESIGN.md: headroom checks use
// each rail at its tolerance extreme, the span shrinking): V+ 12 V, V− 2 V
// at 10 % gives 10.8 V and 2.2 V by hand. The old rule moved V− to 1.8 V,
// widening the window, and passed a part whose input reaches down only to
// V− + 0.3 V against a 2.4 V signal low (2.2 + 0.3 = 2.5 > 2.4).
func TestRailsBothPositive(t *testing.T) {
	_, p := mustDesign(t, sineDesign("pos = \"12 V\"\nneg = \"2 V\"\ntolerance = \"10 %\"",
		"kind = \"follower\"\nref = \"7 V\"\nsignal = { peak = \"4.6 V\", freq = \"1 Hz\" }"))
	near(t, "V+ worst", p.Rails.PosWorst, 10.8, 1e-12)
	near(t, "V− worst", p.Rails.NegWorst, 2.2, 1e-12)
	part := basePart("x")
	part.InputCM = catalog.Headroom{Low: opt(0.3), High: opt(2)}
	if c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyInputRange); c.Pass {
		t.Errorf("input low reaches %g V, signal at 2.4 V: pass, want a failure", c.AvailLow)
	}
	// Exactly at the limit: V− + 0.2 V = 2.4 V.
	part.InputCM = catalog.Headroom{Low: opt(0.2), High: opt(2)}
	if c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyInputRange); !c.Pass {
		t.Errorf("input low exactly 2.4 V: fail (margin %g), want a pass", c.Margin)
	}
	for _, tc := range []struct{ pos, neg, wp, wn float64 }{
		{15, -15, 13.5, -13.5}, // bipolar: both toward 0 V
		{5, 0, 4.5, 0},         // single supply
		{-2, -12, -2.2, -10.8}, // both negative: mirror image
	} {
		wp, wn := filter.RailsInward(tc.pos, tc.neg, 0.1)
		near(t, "V+ worst", wp, tc.wp, 1e-12)
		near(t, "V− worst", wn, tc.wn, 1e-12)
	}
}

// Load scaling: a swing stated at 10 kΩ is scaled to a 2 kΩ load by ×5
// (linear output resistance); a lighter load is not scaled.
func TestOutputSwingLoadScaling(t *testing.T) {
	design := func(load string) *filter.Plan {
		_, p := mustDesign(t, `title = "t"
[supply]
pos = "10 V"
[[stage]]
name = "s"
kind = "follower"
ref = "5 V"
signal = { peak = "1 V", freq = "1 Hz" }
load_r = "`+load+`"
`)
		return p
	}
	part := basePart("x")
	part.Output = catalog.Swing{Low: opt(0.1), High: opt(-0.2), Load: opt(10e3)}
	tests := []struct {
		load    string
		lo, hi  float64
		scaled  bool
		noteSet bool
	}{
		{"2 kOhm", 0.5, 9, true, true},
		{"10 kOhm", 0.1, 9.8, false, false},
		{"100 kOhm", 0.1, 9.8, false, false},
	}
	for _, tc := range tests {
		t.Run(tc.load, func(t *testing.T) {
			c := check(t, evalOne(t, design(tc.load), part, filter.Options{}), "s", filter.KeyOutputRange)
			near(t, "low", c.AvailLow, tc.lo, 1e-12)
			near(t, "high", c.AvailHigh, tc.hi, 1e-12)
			if (c.Note != "") != tc.noteSet {
				t.Errorf("note = %q, want set = %v", c.Note, tc.noteSet)
			}
		})
	}
}

// Each hard filter: pass/fail, no margin.
func TestHardFilters(t *testing.T) {
	_, p := mustDesign(t, `title = "t"
[supply]
pos = "5 V"
[environment]
temp = ["-40 C", "85 C"]
[choose]
packages = ["soic8", "msop8"]
tech = ["cmos", "bicmos"]
max_unit_cost = 1.5
[[stage]]
name = "s"
kind = "follower"
signal = { peak = "0.1 V", freq = "1 kHz" }
`)
	tests := []struct {
		name string
		key  filter.Key
		set  func(p *catalog.Part)
		want filter.Status
	}{
		{"temperature covered", filter.KeyTemperature, func(p *catalog.Part) {}, filter.StatusPass},
		{"temperature not covered", filter.KeyTemperature, func(p *catalog.Part) { p.Temp[1] = opt(70) }, filter.StatusFail},
		{"temperature unknown", filter.KeyTemperature, func(p *catalog.Part) { p.Temp = [2]catalog.Opt{} }, filter.StatusUnknown},
		{"package any of", filter.KeyPackage, func(p *catalog.Part) { p.Packages = []string{"dip8", "msop8"} }, filter.StatusPass},
		{"package none", filter.KeyPackage, func(p *catalog.Part) { p.Packages = []string{"dip8"} }, filter.StatusFail},
		{"tech any of", filter.KeyTech, func(p *catalog.Part) { p.Tech = catalog.TechBiCMOS }, filter.StatusPass},
		{"tech other", filter.KeyTech, func(p *catalog.Part) { p.Tech = catalog.TechBipolar }, filter.StatusFail},
		{"lifecycle nrnd by default", filter.KeyLifecycle, func(p *catalog.Part) { p.Lifecycle = catalog.LifecycleNRND }, filter.StatusPass},
		{"lifecycle obsolete excluded by default", filter.KeyLifecycle, func(p *catalog.Part) { p.Lifecycle = catalog.LifecycleObsolete }, filter.StatusFail},
		{"cost at the limit", filter.KeyCost, func(p *catalog.Part) { p.UnitCost = opt(1.5) }, filter.StatusPass},
		{"cost over", filter.KeyCost, func(p *catalog.Part) { p.UnitCost = opt(1.51) }, filter.StatusFail},
		{"cost unknown", filter.KeyCost, func(p *catalog.Part) { p.UnitCost = catalog.Opt{} }, filter.StatusUnknown},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			part := basePart("x")
			tc.set(part)
			r := evalOne(t, p, part, filter.Options{})
			c := check(t, r, "", tc.key)
			if c.Status != tc.want {
				t.Errorf("status = %s, want %s", c.Status, tc.want)
			}
			if c.HasMargin() {
				t.Errorf("hard filter has margin %g", c.Margin)
			}
			if (tc.want == filter.StatusFail) == r.Pass {
				t.Errorf("candidate pass = %v with a %s hard filter", r.Pass, c.Status)
			}
		})
	}
	// An explicit lifecycle list replaces the default.
	_, p2 := mustDesign(t, sineDesign(`pos = "5 V"`+"\n[choose]\n"+`lifecycle = ["active"]`,
		`kind = "follower"`+"\n"+`signal = { peak = "0.1 V", freq = "1 kHz" }`))
	part := basePart("x")
	part.Lifecycle = catalog.LifecycleNRND
	if c := check(t, evalOne(t, p2, part, filter.Options{}), "", filter.KeyLifecycle); c.Pass {
		t.Errorf("nrnd passes lifecycle = [active]")
	}
}

// Multi-stage: n stages on a part of c channels need ⌈n/c⌉ packages; cost
// and supply current count whole packages (every channel draws Iq).
func TestMultiStage(t *testing.T) {
	stage := func(name string) string {
		return "[[stage]]\nname = \"" + name + "\"\nkind = \"follower\"\nsignal = { peak = \"0.1 V\", freq = \"1 kHz\" }\n"
	}
	_, p := mustDesign(t, "title = \"t\"\n[supply]\npos = \"5 V\"\n[choose]\nsupply_current = \"5 mA\"\n"+
		stage("a")+stage("b")+stage("c"))
	tests := []struct {
		channels int
		pkgs     int
		cost     float64
		iq       float64
		pass     bool
	}{
		{1, 3, 3, 3e-3, true},
		{2, 2, 2, 4e-3, true},
		{4, 1, 1, 4e-3, true},
		{8, 1, 1, 8e-3, false}, // 8 channels × 1 mA over the 5 mA budget
	}
	for _, tc := range tests {
		part := basePart("x")
		part.Channels = tc.channels
		r := evalOne(t, p, part, filter.Options{})
		if r.Packages != tc.pkgs || r.Cost != tc.cost {
			t.Errorf("%d channels: packages %d cost %g, want %d %g", tc.channels, r.Packages, r.Cost, tc.pkgs, tc.cost)
		}
		near(t, "supply current", r.SupplyCurrent, tc.iq, 1e-12)
		c := check(t, r, "", filter.KeySupplyCurrent)
		if c.Pass != tc.pass {
			t.Errorf("%d channels: supply_current pass = %v, want %v", tc.channels, c.Pass, tc.pass)
		}
		if len(r.FMax) != 3 {
			t.Errorf("fmax per stage: %d entries, want 3", len(r.FMax))
		}
	}
}

// fmax is min(SR/(2π·Vo), GBW·√(1/(1−ε)² − (1 + NG/Aol)²)/NG), the
// inverses of the slew and gbw requirements with the part's own Aol (by
// hand from the single-pole error; Sedra & Smith loop-gain relation, from
// memory); at fmax both checks pass with margin ≥ 0 and one binds at 0.
func TestFMaxIsTheEdge(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "noninverting"`+"\ngain = 10\n"+`ref = "0 V"`+"\n"+`signal = { peak = "0.5 V", freq = "1 kHz" }`))
	part := basePart("x")
	part.Slew = catalog.Spec{Min: opt(2e6)}
	part.GBW = catalog.Spec{Min: opt(5e6)}
	part.Aol = catalog.Spec{Min: opt(60)} // 1000 V/V: 1 % of the 1 % budget spent at DC
	part.Slew = catalog.Spec{Min: opt(4e6)}
	r := evalOne(t, p, part, filter.Options{})
	fs := 4e6 / (2 * math.Pi * 5)
	fg := 5e6 * math.Sqrt(1/(0.99*0.99)-1.01*1.01) / 10
	if fg > fs {
		t.Fatalf("by hand: gbw edge %g above slew edge %g; the case should bind on gbw", fg, fs)
	}
	near(t, "fmax", r.FMax[0], fg, 1e-12)
	// Re-derive at fmax: the binding check sits at margin 0.
	d, _ := mustDesign(t, sineDesign(`pos = "15 V"`+"\n"+`neg = "-15 V"`,
		`kind = "noninverting"`+"\ngain = 10\n"+`ref = "0 V"`+"\n"+`signal = { peak = "0.5 V", freq = "1 kHz" }`))
	d.Stages[0].Values["signal.freq"] = filter.Value{Raw: "fmax", V: r.FMax[0], Set: true}
	p2, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	r2 := evalOne(t, p2, part, filter.Options{})
	if math.Abs(r2.WorstMargin) > 1e-9 {
		t.Errorf("worst margin at fmax = %g, want 0", r2.WorstMargin)
	}
}

// dc_error with source resistance and nothing at the inverting input:
// NG·(Vos + (Ib + Ios/2)·Rs), the + input's current being up to Ib + Ios/2
// (input bias and offset currents, Sedra & Smith; from memory).
func TestDCErrorWithBias(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "5 V"`,
		`kind = "noninverting"`+"\ngain = 5\n"+`signal = { peak = "0.1 V", freq = "1 kHz" }`+"\n"+`source_r = "1 MOhm"`+"\n"+`dc_error = "20 mV"`))
	part := basePart("x")
	part.Vos = catalog.Spec{Max: opt(1e-3)}
	part.Ib = catalog.Spec{Max: opt(1e-9)}
	part.Ios = catalog.Spec{Max: opt(0.4e-9)}
	c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyDCError)
	// 5·(1 mV + 1 nA·1 MΩ + 0.2 nA·1 MΩ) = 11 mV against 20 mV.
	near(t, "dc error", c.Available, 5*(1e-3+1e-9*1e6+0.2e-9*1e6), 1e-12)
	near(t, "margin", c.Margin, 20.0/11-1, 1e-12)

	// Right at the edge: a 10 mV budget on a part without Ios passes at
	// 5·(1 mV + 1 nA·1 MΩ) = 10 mV; any Ios pushes the + input's current
	// past Ib and fails it.
	_, p10 := mustDesign(t, sineDesign(`pos = "5 V"`,
		`kind = "noninverting"`+"\ngain = 5\n"+`signal = { peak = "0.1 V", freq = "1 kHz" }`+"\n"+`source_r = "1 MOhm"`+"\n"+`dc_error = "10 mV"`))
	part.Ios = catalog.Spec{}
	c = check(t, evalOne(t, p10, part, filter.Options{}), "s", filter.KeyDCError)
	if c.Status != filter.StatusPass {
		t.Errorf("without Ios at 10 mV: status %v, margin %g; want a pass at the limit", c.Status, c.Margin)
	}
	part.Ios = catalog.Spec{Max: opt(0.02e-9)}
	c = check(t, evalOne(t, p10, part, filter.Options{}), "s", filter.KeyDCError)
	near(t, "dc error with 20 pA Ios", c.Available, 5*(1e-3+1e-9*1e6+0.01e-9*1e6), 1e-12) // 10.05 mV
	if c.Status != filter.StatusFail {
		t.Errorf("with 20 pA Ios at 10 mV: status %v, margin %g; want a fail", c.Status, c.Margin)
	}
}

// A Summary evaluation gives the same outcome as a full one, and Explain
// restores the same checks.
func TestSummaryMatchesFull(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "12 V"`,
		`kind = "noninverting"`+"\ngain = 10\n"+`signal = { peak = "0.5 V", freq = "20 kHz" }`+"\n"+`load_r = "10 kOhm"`+"\n"+`dc_error = "100 mV"`))
	parts := synthetic(500)
	full := filter.Evaluate(p, parts, filter.Options{})
	sum := filter.Evaluate(p, parts, filter.Options{Summary: true})
	for i := range full {
		a, b := full[i], sum[i]
		if b.Checks != nil {
			t.Fatalf("summary kept checks")
		}
		if a.Pass != b.Pass || a.Failed != b.Failed || a.Unknown != b.Unknown || a.Binding != b.Binding ||
			!(a.WorstMargin == b.WorstMargin || math.IsNaN(a.WorstMargin) && math.IsNaN(b.WorstMargin)) {
			t.Fatalf("%s: summary %+v differs from full %+v", a.Part.ID, b, a)
		}
		filter.Explain(p, &b, filter.Options{})
		for j := range a.Checks {
			x, y := a.Checks[j], b.Checks[j]
			if x.Req.Key != y.Req.Key || x.Status != y.Status || !(x.Margin == y.Margin || math.IsNaN(x.Margin) && math.IsNaN(y.Margin)) {
				t.Fatalf("%s check %d: %+v vs %+v", a.Part.ID, j, x, y)
			}
		}
	}
}

// With both rails on one side of 0 V the span is not span × (1 ∓ tol): V+
// 12 V, V− 2 V at 10 % gives inward 10.8 − 2.2 = 8.6 V and outward
// 13.2 − 1.8 = 11.4 V (by hand, each rail ± 10 % of itself), where
// 10 V × (1 ∓ 10 %) would say 9 … 11 V. The cases sit at and just past
// both edges.
func TestSupplySpanSameSignRails(t *testing.T) {
	_, p := mustDesign(t, `title = "t"
[supply]
pos = "12 V"
neg = "2 V"
tolerance = "10 %"
[[stage]]
name = "s"
kind = "follower"
ref = "6 V"
signal = { peak = "1 V", freq = "1 kHz" }
`)
	r := p.Rails
	wantRails(t, r, 8.6, 11.4, 10.8, 2.2)
	tests := []supplyCase{
		{"11 V part is overstressed at 11.4 V", catalog.Span{Min: opt(3), Max: opt(11)}, false},
		{"11.4 V part is exactly at the outward rails", catalog.Span{Min: opt(3), Max: opt(11.4)}, true},
		{"11.39 V part is just short", catalog.Span{Min: opt(3), Max: opt(11.39)}, false},
		{"9 V minimum is not met at 8.6 V", catalog.Span{Min: opt(9), Max: opt(36)}, false},
		{"8.6 V minimum is exactly at the inward rails", catalog.Span{Min: opt(8.6), Max: opt(36)}, true},
		{"8.61 V minimum is just short", catalog.Span{Min: opt(8.61), Max: opt(36)}, false},
	}
	supplyCases(t, p, tests)
	var why string
	for _, q := range p.Global {
		if q.Key == filter.KeySupply {
			why = q.Why
		}
	}
	for _, w := range []string{"10.8 V − 2.2 V = 8.6 V", "13.2 V − 1.8 V = 11.4 V"} {
		if !strings.Contains(why, w) {
			t.Errorf("supply why %q lacks %q", why, w)
		}
	}
}

// supplyCase is a part's rated supply and whether it must pass the plan's
// supply check.
type supplyCase struct {
	name   string
	supply catalog.Span
	pass   bool
}

// supplyCases evaluates a part of each rated supply against p.
func supplyCases(t *testing.T, p *filter.Plan, tests []supplyCase) {
	t.Helper()
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			part := basePart("x")
			part.Supply = tc.supply
			if c := check(t, evalOne(t, p, part, filter.Options{}), "", filter.KeySupply); c.Pass != tc.pass {
				t.Errorf("supply pass = %v, want %v (margin %g)", c.Pass, tc.pass, c.Margin)
			}
		})
	}
}

// wantRails checks the spans and the inward rails.
func wantRails(t *testing.T, r filter.Rails, spanMin, spanMax, posWorst, negWorst float64) {
	t.Helper()
	near(t, "span min", r.SpanMin, spanMin, 1e-12)
	near(t, "span max", r.SpanMax, spanMax, 1e-12)
	near(t, "V+ worst", r.PosWorst, posWorst, 1e-12)
	near(t, "V− worst", r.NegWorst, negWorst, 1e-12)
}

// The output swing is judged at the whole resistance the output drives,
// load_r ∥ the feedback network, as the output_current check counts it. By
// hand (the swing rule headroom × R_spec/R_load of README): ±5 V at 5 %
// (4.75 V), a swing 0.5 V from each rail at 10 kΩ, gain 11 from Rf 10 kΩ
// and Rg 1 kΩ, 0.18 V in (1.98 V out) into 2 kΩ: 2 kΩ ∥ 11 kΩ = 1.6923 kΩ,
// headroom 0.5·10/1.6923 = 2.9545 V, window ±1.7955 V, margin
// (1.7955 − 1.98)/9.5 = −1.94 %: it fails, where load_r alone (headroom
// 2.5 V, window ±2.25 V) would pass by +2.8 %. The inverting stage with
// Rf 10 kΩ, Rin 1 kΩ drives 2 kΩ ∥ 10 kΩ (Rf ends at the virtual ground).
func TestOutputSwingCountsFeedbackNetwork(t *testing.T) {
	part := basePart("x")
	part.Output = catalog.Swing{Low: opt(0.5), High: opt(-0.5), Load: opt(10e3)}
	tests := []struct {
		name, stage string
		rt          float64 // the resistance the output drives, by hand
		vo          float64 // the output peak, V
		pass        bool
	}{
		{"noninverting", `kind = "noninverting"` + "\nrf = \"10 kOhm\"\nrg = \"1 kOhm\"", 2e3 * 11e3 / 13e3, 1.98, false},
		// Gain 10: 1.8 V out; 1.6667 kΩ, headroom 3 V, window ±1.75 V, −0.53 %.
		{"inverting", `kind = "inverting"` + "\nrf = \"10 kOhm\"\nrin = \"1 kOhm\"", 2e3 * 10e3 / 12e3, 1.8, false},
		{"load only", `kind = "noninverting"` + "\ngain = 11", 2e3, 1.98, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, p := mustDesign(t, sineDesign("pos = \"5 V\"\nneg = \"-5 V\"\ntolerance = \"5 %\"",
				tc.stage+"\nref = \"0 V\"\nsignal = { peak = \"0.18 V\", freq = \"1 kHz\" }\nload_r = \"2 kOhm\""))
			c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyOutputRange)
			head := 0.5 * 10e3 / tc.rt
			near(t, "high", c.AvailHigh, 4.75-head, 1e-9)
			near(t, "low", c.AvailLow, -4.75+head, 1e-9)
			near(t, "margin", c.Margin, (4.75-head-tc.vo)/9.5, 1e-9)
			if (c.Status == filter.StatusPass) != tc.pass {
				t.Errorf("status %v, margin %g; want pass = %v", c.Status, c.Margin, tc.pass)
			}
		})
	}
}
