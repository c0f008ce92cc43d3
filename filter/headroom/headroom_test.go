package headroom

import (
	"math"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// handParts are two invented parts whose worst-case figures are their
// guaranteed limits at 25 °C, so the closed forms can be worked by hand:
// a slow one (slew binds) and a fast one (gbw and swing bind). Both swing
// to 1.5 V of each rail at any load and take inputs to 1 V of each rail.
const handParts = `
[[part]]
id = "hand-slow"
name = "hand case, slew-limited"
tech = "bipolar"
channels = 1
packages = ["soic8"]
temp = ["-40 C", "85 C"]
supply = { min = "5 V", max = "36 V" }
input_cm = { low = "1 V", high = "-1 V" }
output = { low = "1.5 V", high = "-1.5 V" }
gbw = { typ = "12 MHz", min = "10 MHz" }
slew = { typ = "0.45 V/us", min = "0.35 V/us" }
aol = { typ = "110 dB", min = "100 dB" }
iout = { typ = "30 mA", min = "20 mA" }

[[part]]
id = "hand-fast"
name = "hand case, gbw-limited"
tech = "bipolar"
channels = 1
packages = ["soic8"]
temp = ["-40 C", "85 C"]
supply = { min = "5 V", max = "36 V" }
input_cm = { low = "1 V", high = "-1 V" }
output = { low = "1.5 V", high = "-1.5 V" }
gbw = { typ = "12 MHz", min = "10 MHz" }
slew = { typ = "25 V/us", min = "20 V/us" }
aol = { typ = "110 dB", min = "100 dB" }
iout = { typ = "30 mA", min = "20 mA" }
`

// handDesign is a ±15 V non-inverting stage at 25 °C, no rail tolerance:
// gain 10, 50 mV peak at 10 kHz, 1 % gain error.
const handDesign = `
title = "hand case"
[supply]
pos = "15 V"
neg = "-15 V"
[[stage]]
name = "amp"
kind = "noninverting"
ref = "0 V"
gain = 10
signal = { shape = "sine", peak = "50 mV", freq = "10 kHz" }
`

func handPart(t *testing.T, id string) *catalog.Part {
	t.Helper()
	ps, err := catalog.Decode("hand.toml", []byte(handParts))
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range ps {
		if p.ID == id {
			return p
		}
	}
	t.Fatalf("no part %q", id)
	return nil
}

// find returns the limit of ls on input in direction dir.
func find(ls []Limit, stage, in string, dir Direction) (Limit, bool) {
	for _, l := range ls {
		if l.Stage == stage && l.Input == in && l.Dir == dir {
			return l, true
		}
	}
	return Limit{}, false
}

// TestHandCases checks one textbook case per input against numbers worked
// by hand from the formulas, not from the code:
//   - slew-limited full-power bandwidth f = SR/(2π·Vo) (Sedra & Smith,
//     "Microelectronic Circuits", slew rate and full-power bandwidth; from
//     memory), and its rearrangement for the peak, Vp = SR/(2π·f·G);
//   - the single-pole closed loop |A| = NG/√((1 + NG/Aol)² + (NG·f/GBW)²)
//     (Sedra & Smith, from memory) held to 1 − ε with the part's own Aol
//     (100 dB = 10⁵ V/V): f = GBW·√(1/(1−ε)² − (1 + NG/Aol)²)/NG =
//     10 MHz·√(1/0.99² − 1.0001²)/10 = 141.7887 kHz; in NG the root of
//     (1/Aol² + (f/GBW)²)·NG² + 2·NG/Aol − (1/(1−ε)² − 1) = 0, with
//     f/GBW = 10⁻³: NG = 132.8357 (by hand, quadratic formula);
//   - swing: G·Vp ≤ V+ − 1.5 V (the part's stated headroom);
//   - rails: V+ − 1.5 V ≥ G·Vp and V+ − V− ≤ 36 V (arithmetic);
//   - temperature: the rated range's end (the hard check).
func TestHandCases(t *testing.T) {
	d, plan := decodeDesign(t, "hand.toml", []byte(handDesign))
	kDC := 1/(0.99*0.99) - 1                                   // 1/(1−ε)² − 1 at 1 %
	a := 1e-10 + 1e-6                                          // 1/Aol² + (f/GBW)²
	ngMax := (-1e-5 + math.Sqrt(1e-10+a*kDC)) / a              // 132.8357
	fMax := 10e6 * math.Sqrt(kDC+1-(1+10/1e5)*(1+10/1e5)) / 10 // 141.7887 kHz
	cases := []struct {
		part, input string
		dir         Direction
		want        float64
		key         filter.Key
		method      Method
		tol         float64
	}{
		// 0.35 V/µs / (2π·0.5 V) = 111.408 kHz (Vo = 10 × 50 mV), under gbw's 141.789 kHz.
		{"hand-slow", "signal.freq", Up, 0.35e6 / (2 * math.Pi * 0.5), filter.KeySlew, ClosedForm, 1e-9},
		// 10 MHz·√(1/0.99² − 1.0001²)/10 = 141.789 kHz.
		{"hand-fast", "signal.freq", Up, fMax, filter.KeyGBW, ClosedForm, 1e-9},
		// 0.35 V/µs / (2π·10 kHz·10) = 0.557042 V, under the swing's 1.35 V.
		{"hand-slow", "signal.peak", Up, 0.35e6 / (2 * math.Pi * 10e3 * 10), filter.KeySlew, ClosedForm, 1e-9},
		// (15 V − 1.5 V)/10 = 1.35 V.
		{"hand-fast", "signal.peak", Up, 1.35, filter.KeyOutputRange, ClosedForm, 1e-9},
		// 0.35 V/µs / (2π·10 kHz·50 mV) = 111.408, under gbw's 132.836.
		{"hand-slow", "gain", Up, 0.35e6 / (2 * math.Pi * 10e3 * 0.05), filter.KeySlew, ClosedForm, 1e-9},
		// the quadratic's root 132.836 (NG = G).
		{"hand-fast", "gain", Up, ngMax, filter.KeyGBW, ClosedForm, 1e-9},
		// swing: V+ − 1.5 V ≥ 10 × 50 mV → V+ ≥ 2 V (before the inputs,
		// V+ − 1 V ≥ 50 mV, and the 5 V minimum span, V+ ≥ −10 V).
		{"hand-fast", "supply.pos", Down, 2, filter.KeyOutputRange, Bisection, 0},
		// span ≤ 36 V: V+ = −15 V + 36 V = 21 V.
		{"hand-fast", "supply.pos", Up, 21, filter.KeySupply, Bisection, 0},
		// the rated range ends at 85 °C and −40 °C.
		{"hand-fast", "environment.temp_high", Up, 85, filter.KeyTemperature, Bisection, 0},
		{"hand-fast", "environment.temp_low", Down, -40, filter.KeyTemperature, Bisection, 0},
	}
	for _, c := range cases {
		ls := Find(d, plan, handPart(t, c.part), filter.Options{})
		stage := "amp"
		if c.input == "supply.pos" || c.input == "environment.temp_high" || c.input == "environment.temp_low" {
			stage = ""
		}
		l, ok := find(ls, stage, c.input, c.dir)
		if !ok {
			t.Errorf("%s %s %s: no limit; have %v", c.part, c.input, c.dir, ls)
			continue
		}
		tol := c.tol * math.Abs(c.want)
		if c.method == Bisection {
			// the bisection's bracket: RelTol of the 30 V span or of the value
			tol = RelTol * math.Max(30, math.Abs(c.want))
		}
		if math.Abs(l.Limit-c.want) > tol {
			t.Errorf("%s %s %s: limit %.9g, want %.9g", c.part, c.input, c.dir, l.Limit, c.want)
		}
		if l.Breaks.Key != c.key || l.Method != c.method {
			t.Errorf("%s %s %s: breaks %s by %s, want %s by %s", c.part, c.input, c.dir, l.Breaks.Key, l.Method, c.key, c.method)
		}
	}
}

// TestFreqIsFMax: on every demo design, the frequency headroom of every
// passing part equals the fmax the evaluator reports for the stage
// (DESIGN.md: the inverses of the slew and gbw formulas).
func TestFreqIsFMax(t *testing.T) {
	parts := demoParts(t)
	seen := 0
	for _, name := range demoDesigns(t) {
		d, plan := loadDesign(t, name)
		for _, p := range passing(plan, parts) {
			r := filter.Evaluate(plan, []*catalog.Part{p}, filter.Options{})[0]
			ls := Find(d, plan, p, filter.Options{})
			for si, sp := range plan.Stages {
				fmax := r.FMax[si]
				l, ok := find(ls, sp.Name, "signal.freq", Up)
				if math.IsNaN(fmax) {
					continue
				}
				seen++
				if !ok {
					t.Errorf("%s %s %s: no frequency limit, fmax %g", name, p.ID, sp.Name, fmax)
					continue
				}
				if math.Abs(l.Limit-fmax) > 1e-9*fmax || l.Method != ClosedForm {
					t.Errorf("%s %s %s: limit %g by %s, fmax %g", name, p.ID, sp.Name, l.Limit, l.Method, fmax)
				}
			}
		}
	}
	if seen == 0 {
		t.Fatal("no demo stage has an fmax: the test checks nothing")
	}
}

// TestFlipAtLimit: on every demo design, for every passing part and every
// reported limit, the part passes 0.5 % inside the limit and fails 0.5 %
// outside it on the requirement named.
func TestFlipAtLimit(t *testing.T) {
	parts := demoParts(t)
	n := 0
	for _, name := range demoDesigns(t) {
		d, plan := loadDesign(t, name)
		for _, p := range passing(plan, parts) {
			s := &searcher{design: d, part: p}
			ins := inputs(d, plan)
			for _, l := range Find(d, plan, p, filter.Options{}) {
				in := inputFor(t, ins, l)
				delta := 0.005 * math.Abs(l.Limit)
				if delta == 0 {
					delta = 0.005 * in.unit
				}
				inside := s.at(&in, l.Limit-float64(l.Dir)*delta)
				outside := s.at(&in, l.Limit+float64(l.Dir)*delta)
				if !inside.valid || !inside.pass {
					t.Errorf("%s %s %s %s: fails 0.5 %% inside %g", name, p.ID, l.Label(), l.Dir, l.Limit)
				}
				if !outside.valid || outside.pass || !hasBinding(outside.fails, l.Breaks) {
					t.Errorf("%s %s %s %s: 0.5 %% outside %g does not fail on %v (fails %v)", name, p.ID, l.Label(), l.Dir, l.Limit, l.Breaks, outside.fails)
				}
				n++
			}
		}
	}
	if n < 50 {
		t.Fatalf("only %d limits checked", n)
	}
}

func inputFor(t *testing.T, ins []input, l Limit) input {
	t.Helper()
	for _, in := range ins {
		if in.stage == l.Stage && in.name == l.Input {
			return in
		}
	}
	t.Fatalf("no input %s", l.Label())
	return input{}
}

func hasBinding(bs []filter.Binding, b filter.Binding) bool {
	for _, x := range bs {
		if x == b {
			return true
		}
	}
	return false
}

// TestEdges: a failing part has no headroom; an input the stage does not
// give is not searched; a direction in which nothing breaks within the
// search (a lower frequency) has no limit; a gain cannot go below 1 on a
// non-inverting stage, so nothing is reported downward; Strict makes an
// unknown check a failure before the search starts.
func TestEdges(t *testing.T) {
	d, plan := decodeDesign(t, "hand.toml", []byte(handDesign))
	fast := handPart(t, "hand-fast")
	ls := Find(d, plan, fast, filter.Options{})
	if _, ok := find(ls, "amp", "cload", Up); ok {
		t.Error("cload searched though the stage gives none")
	}
	for _, in := range []string{"signal.freq", "signal.peak", "gain"} {
		if l, ok := find(ls, "amp", in, Down); ok {
			t.Errorf("%s: a limit downward: %v", in, l)
		}
	}
	// 100 kHz: gbw needs 7.02 × 10 × 100 kHz = 7.02 MHz < 10 MHz, passes; 200 kHz fails.
	d2 := d.Clone()
	d2.Stage("amp").Values["signal.freq"] = quantity(200e3, catalog.Hertz)
	plan2, err := filter.Derive(d2)
	if err != nil {
		t.Fatal(err)
	}
	if got := Find(d2, plan2, fast, filter.Options{}); got != nil {
		t.Errorf("failing part has headroom %v", got)
	}
	// hand-fast gives no vos: no dc_error in this design, so no unknown;
	// add one and Strict fails the part outright.
	d3 := d.Clone()
	d3.Stage("amp").Values["dc_error"] = quantity(0.01, catalog.Volt)
	plan3, err := filter.Derive(d3)
	if err != nil {
		t.Fatal(err)
	}
	if got := Find(d3, plan3, fast, filter.Options{Strict: true}); got != nil {
		t.Errorf("strict: part with an unknown check has headroom %v", got)
	}
	if got := Find(d3, plan3, fast, filter.Options{}); len(got) == 0 {
		t.Error("not strict: the unknown dc_error check should not stop the search")
	}
}

// TestFirst picks the input with the least room.
func TestFirst(t *testing.T) {
	ls := []Limit{
		{Input: "signal.freq", Dim: catalog.Hertz, Value: 1e3, Limit: 3e3},
		{Input: "gain", Dim: catalog.Dimensionless, Value: 10, Limit: 11},
		{Input: "supply.pos", Dim: catalog.Volt, Value: 5, Limit: 4.4},
	}
	if f, _ := First(ls); f.Input != "gain" {
		t.Errorf("first %s, want gain (10 %% room)", f.Input)
	}
	if _, ok := First(nil); ok {
		t.Error("first of none")
	}
}
