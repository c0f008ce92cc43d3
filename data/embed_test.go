package data_test

import (
	"io/fs"
	"math"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"

	_ "github.com/opsift/opsift/internal/golden" // takes -update, so go test ./... -update runs here too
)

// demoParts decodes every embedded catalog file with the real decoder and
// fails the test on any problem, so the demo always passes `opsift check`.
func demoParts(t *testing.T) map[string]*catalog.Part {
	t.Helper()
	byID := map[string]*catalog.Part{}
	for _, name := range tomlNames(t, data.Catalog) {
		b, err := fs.ReadFile(data.Catalog, name)
		if err != nil {
			t.Fatalf("read %s: %v", name, err)
		}
		parts, err := catalog.Decode(name, b)
		if err != nil {
			t.Fatalf("decode %s: %v", name, err)
		}
		for _, p := range parts {
			if q, dup := byID[p.ID]; dup {
				t.Fatalf("part %q in %s:%d repeats %s:%d", p.ID, p.Pos.File, p.Pos.Line, q.Pos.File, q.Pos.Line)
			}
			byID[p.ID] = p
		}
	}
	return byID
}

// demoDesign decodes one embedded design.
func demoDesign(t *testing.T, name string) *filter.Design {
	t.Helper()
	b, err := fs.ReadFile(data.Designs, name)
	if err != nil {
		t.Fatalf("read %s: %v", name, err)
	}
	d, err := filter.DecodeDesign(name, b)
	if err != nil {
		t.Fatalf("decode: %v", err)
	}
	return d
}

// demoPlan decodes and derives one embedded design.
func demoPlan(t *testing.T, name string) *filter.Plan {
	t.Helper()
	plan, err := filter.Derive(demoDesign(t, name))
	if err != nil {
		t.Fatalf("derive %s: %v", name, err)
	}
	return plan
}

// part returns a demo part or fails.
func part(t *testing.T, parts map[string]*catalog.Part, id string) *catalog.Part {
	t.Helper()
	p, ok := parts[id]
	if !ok {
		t.Fatalf("demo catalog has no part %q", id)
	}
	return p
}

// requirement returns the value of a stage's min/max requirement or fails.
func requirement(t *testing.T, plan *filter.Plan, stage string, key filter.Key) float64 {
	t.Helper()
	for _, r := range plan.Requirements() {
		if r.Stage == stage && r.Key == key {
			return r.Value
		}
	}
	t.Fatalf("design %q has no %s requirement in stage %q", plan.Title, key, stage)
	return 0
}

func TestFileLists(t *testing.T) {
	tests := []struct {
		name string
		got  []string
		want []string
	}{
		{"catalog", tomlNames(t, data.Catalog), []string{
			"cmos.toml", "general.toml", "jfet.toml", "micropower.toml",
			"power.toml", "precision.toml", "speed.toml"}},
		{"designs", tomlNames(t, data.Designs), []string{
			"battery-sensor-3v3.toml", "instrumentation-15v.toml", "pickup-counter-6v.toml",
			"turbidity-5v.toml", "vibration-monitor-5v.toml"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if !slices.Equal(tt.got, tt.want) {
				t.Errorf("files = %q, want %q", tt.got, tt.want)
			}
		})
	}
	t.Run("default design is embedded", func(t *testing.T) {
		if !slices.Contains(tomlNames(t, data.Designs), data.DefaultDesign) {
			t.Errorf("DefaultDesign %q is not among %q", data.DefaultDesign, tomlNames(t, data.Designs))
		}
	})
}

func TestDesignsDerive(t *testing.T) {
	for _, name := range tomlNames(t, data.Designs) {
		t.Run(name, func(t *testing.T) {
			plan := demoPlan(t, name)
			if plan.Title == "" {
				t.Error("design has no title")
			}
			if len(plan.Stages) == 0 {
				t.Error("design has no stage")
			}
		})
	}
}

// TestCatalogCoverage keeps the demo catalog covering the classes of part
// the demo designs and the documentation rely on. Class boundaries are
// common practice, no source.
func TestCatalogCoverage(t *testing.T) {
	parts := demoParts(t)
	if len(parts) < 44 {
		t.Errorf("demo catalog holds %d parts, want at least 44", len(parts))
	}
	typ := func(s catalog.Spec) float64 { return s.Typ.V() }
	tests := []struct {
		class string
		min   int
		is    func(p *catalog.Part) bool
	}{
		{"general-purpose bipolar, slew ≤ 1 V/µs, supply to 24 V or more", 6, func(p *catalog.Part) bool {
			return p.Tech == catalog.TechBipolar && typ(p.Slew) <= 1e6 && p.Supply.Max.V() >= 24 && typ(p.Iq) > 100e-6
		}},
		{"low-voltage CMOS rail-to-rail in and out", 5, func(p *catalog.Part) bool {
			return p.Tech == catalog.TechCMOS && p.Supply.Max.V() <= 5.5 && p.InputCM.Low.V() < 0 && p.InputCM.High.V() > 0
		}},
		{"micropower, Iq ≤ 50 µA", 4, func(p *catalog.Part) bool { return typ(p.Iq) <= 50e-6 }},
		{"JFET input", 4, func(p *catalog.Part) bool { return p.Tech == catalog.TechJFET }},
		{"precision, Vos max ≤ 200 µV", 4, func(p *catalog.Part) bool { return p.Vos.Max.Known() && p.Vos.Max.V() <= 200e-6 }},
		{"zero-drift, drift ≤ 0.1 µV/K", 3, func(p *catalog.Part) bool { return p.VosDrift.Typ.Known() && typ(p.VosDrift) <= 0.1e-6 }},
		{"high-speed, GBW ≥ 50 MHz", 4, func(p *catalog.Part) bool { return typ(p.GBW) >= 50e6 }},
		{"high-voltage, supply ≥ 40 V", 3, func(p *catalog.Part) bool { return p.Supply.Max.V() >= 40 }},
		{"high output current, ≥ 100 mA", 3, func(p *catalog.Part) bool { return typ(p.Iout) >= 0.1 }},
		{"not recommended for new designs", 3, func(p *catalog.Part) bool { return p.Lifecycle == catalog.LifecycleNRND }},
		{"obsolete", 3, func(p *catalog.Part) bool { return p.Lifecycle == catalog.LifecycleObsolete }},
		{"slew read off a graph", 3, func(p *catalog.Part) bool { return p.Slew.Source == catalog.SourceGraph }},
		{"slew known only as typical", 3, func(p *catalog.Part) bool { return !p.Slew.Min.Known() && !p.Slew.MinOT.Known() }},
		{"offset limit over temperature", 10, func(p *catalog.Part) bool { return p.Vos.MaxOT.Known() }},
		{"bias-current limit over temperature", 10, func(p *catalog.Part) bool { return p.Ib.MaxOT.Known() }},
	}
	for _, tt := range tests {
		t.Run(tt.class, func(t *testing.T) {
			var ids []string
			for _, p := range parts {
				if tt.is(p) {
					ids = append(ids, p.ID)
				}
			}
			if len(ids) < tt.min {
				t.Errorf("%d parts %q, want at least %d", len(ids), ids, tt.min)
			}
		})
	}
}

// TestDropInPairs keeps the story the default design tells: a CMOS part in
// the same footprint as the slow bipolar one is at least five times faster
// but has a lower supply limit.
func TestDropInPairs(t *testing.T) {
	parts := demoParts(t)
	tests := []struct{ slow, fast string }{
		{"gp4-bip", "rr4-cmos"},
		{"gp2-bip", "rr2-cmos"},
	}
	for _, tt := range tests {
		t.Run(tt.slow+" to "+tt.fast, func(t *testing.T) {
			slow, fast := part(t, parts, tt.slow), part(t, parts, tt.fast)
			if slow.Pinout != fast.Pinout || slow.Channels != fast.Channels {
				t.Errorf("pinout %q/%d channels vs %q/%d, want the same footprint",
					slow.Pinout, slow.Channels, fast.Pinout, fast.Channels)
			}
			for _, pkg := range slow.Packages {
				if !fast.HasPackage(pkg) {
					t.Errorf("%s comes in %s, %s does not", slow.ID, pkg, fast.ID)
				}
			}
			if r := fast.Slew.Typ.V() / slow.Slew.Typ.V(); r < 5 {
				t.Errorf("typical slew ratio %.2f, want ≥ 5", r)
			}
			if fast.Supply.Max.V() >= slow.Supply.Max.V() {
				t.Errorf("supply max %g V vs %g V, want the CMOS part lower", fast.Supply.Max.V(), slow.Supply.Max.V())
			}
			if slow.Slew.Source != catalog.SourceGraph || slow.Slew.Min.Known() {
				t.Errorf("slow part's slew: source %q, min set %v; want typical from a graph", slow.Slew.Source, slow.Slew.Min.Known())
			}
		})
	}
	t.Run("an obsolete variant shares the quad footprint", func(t *testing.T) {
		gp := part(t, parts, "gp4-bip")
		old := part(t, parts, "gp4-bip-old")
		if old.Lifecycle != catalog.LifecycleObsolete || old.Pinout != gp.Pinout || !slices.Equal(old.Packages, gp.Packages) {
			t.Errorf("gp4-bip-old: lifecycle %q pinout %q packages %q", old.Lifecycle, old.Pinout, old.Packages)
		}
	})
}

// TestDefaultDesignSlewStory checks the numbers the default design is built
// on. A sine of peak Vo at f slews at most 2π·f·Vo (textbook: d/dt of
// Vo·sin(2πft) peaks at 2πf·Vo); by hand, Vo = 6.2 × 0.45 V = 2.79 V and
// 2π·24 kHz·2.79 V = 0.4207 V/µs.
func TestDefaultDesignSlewStory(t *testing.T) {
	parts := demoParts(t)
	plan := demoPlan(t, data.DefaultDesign)
	const want = 2 * math.Pi * 24e3 * 6.2 * 0.45 // V/s, hand-computed from the design: 24 kHz, 2.79 V peak
	for _, stage := range []string{"gain", "buffer"} {
		got := requirement(t, plan, stage, filter.KeySlew)
		if math.Abs(got-want) > 1e-6*want {
			t.Fatalf("%s stage slew requirement %g V/s, want %g V/s", stage, got, want)
		}
	}
	tests := []struct {
		id       string
		slewOK   bool
		supplyOK bool
	}{
		{"gp4-bip", false, true}, // 0.42 V/µs typical from a graph, × 0.7 = 0.294 V/µs
		{"rr4-cmos", true, true}, // 3.9 V/µs guaranteed
		{"rr2-cmos", true, true}, // same die as rr4-cmos
		{"rr4-lv", true, false},  // fast enough but a 5.5 V part
		{"gp4-bip-old", false, true},
	}
	for _, tt := range tests {
		t.Run(tt.id, func(t *testing.T) {
			p := part(t, parts, tt.id)
			// The worst-case figure: the guaranteed minimum, else the typical
			// × derate_typ (0.7, the documented default).
			slew := 0.7 * p.Slew.Typ.V()
			if p.Slew.Min.Known() {
				slew = p.Slew.Min.V()
			}
			if ok := slew >= want; ok != tt.slewOK {
				t.Errorf("slew %g V/s ≥ %g V/s is %v, want %v", slew, want, ok, tt.slewOK)
			}
			ok := p.Supply.Min.V() <= plan.Rails.SpanMin && p.Supply.Max.V() >= plan.Rails.SpanMax
			if ok != tt.supplyOK {
				t.Errorf("supply %g…%g V covers %g…%g V is %v, want %v",
					p.Supply.Min.V(), p.Supply.Max.V(), plan.Rails.SpanMin, plan.Rails.SpanMax, ok, tt.supplyOK)
			}
		})
	}
	// ±5 V is a 10 V span; + 5 % = 10.5 V is the largest, inside the 18 V CMOS limit.
	if math.Abs(plan.Rails.SpanMax-10.5) > 1e-9 {
		t.Errorf("span max %g V, want 10 V × 1.05 = 10.5 V", plan.Rails.SpanMax)
	}
}

// TestDemoDesignScenarios keeps the demo designs off the one bench example
// the project must not lean on: no design on a 0–12 V supply with its
// signals referred to 6 V, and none that puts a mid-rail splitter, a
// relaxation oscillator, a low-pass and a comparator on one board.
func TestDemoDesignScenarios(t *testing.T) {
	for _, name := range tomlNames(t, data.Designs) {
		t.Run(name, func(t *testing.T) {
			d := demoDesign(t, name)
			plan := demoPlan(t, name)
			if plan.Rails.Neg == 0 && math.Abs(plan.Rails.Pos-12) < 0.5 {
				t.Errorf("a 0–%g V supply: pick another scenario", plan.Rails.Pos)
			}
			kinds := map[string]bool{}
			for _, s := range d.Stages {
				kinds[s.Kind] = true
			}
			if kinds["rail_splitter"] && kinds["relaxation"] && kinds["sallen_key_lowpass"] && kinds["comparator"] {
				t.Error("splitter, oscillator, low-pass and comparator on one board: pick another scenario")
			}
		})
	}
	t.Run("every template has a demo", func(t *testing.T) {
		have := map[string]bool{}
		for _, name := range tomlNames(t, data.Designs) {
			for _, s := range demoDesign(t, name).Stages {
				have[s.Kind] = true
			}
		}
		for _, k := range filter.KnownKinds() {
			if !have[k] {
				t.Errorf("stage kind %q has no demo design", k)
			}
		}
	})
}

// TestNoPastedFigureSets guards against a parameter set pasted from one
// family into another: two parts of different families (the id without its
// channel count and suffix, so gp2-bip and gp4-bip-t are one family) must
// not share the tuple of offset, bias current, open-loop gain, GBW and slew.
func TestNoPastedFigureSets(t *testing.T) {
	type tuple struct{ vosTyp, vosMax, ibTyp, ibMax, aolMin, gbwTyp, slewTyp float64 }
	seen := map[tuple]string{}
	parts := demoParts(t)
	ids := make([]string, 0, len(parts))
	for id := range parts {
		ids = append(ids, id)
	}
	slices.Sort(ids)
	for _, id := range ids {
		p := parts[id]
		k := tuple{p.Vos.Typ.V(), p.Vos.Max.V(), p.Ib.Typ.V(), p.Ib.Max.V(), p.Aol.Min.V(), p.GBW.Typ.V(), p.Slew.Typ.V()}
		if other, dup := seen[k]; dup && family(other) != family(id) {
			t.Errorf("%s and %s (families %q, %q) share vos, ib, aol, gbw and slew figures", other, id, family(other), family(id))
		}
		if _, dup := seen[k]; !dup {
			seen[k] = id
		}
	}
	for _, tt := range []struct{ id, want string }{
		{"gp4-bip-old", "gp-bip"}, {"rr2-cmos", "rr-cmos"}, {"mp1-cmos-f", "mp-cmos"}, {"zd1-lp", "zd-lp"},
	} {
		if got := family(tt.id); got != tt.want {
			t.Errorf("family(%q) = %q, want %q", tt.id, got, tt.want)
		}
	}
}

// family is a demo id's family: its first two parts with the channel
// digits dropped ("gp4-bip-old" → "gp-bip").
func family(id string) string {
	f := strings.SplitN(id, "-", 3)
	head := strings.TrimRight(f[0], "0123456789")
	if len(f) == 1 {
		return head
	}
	return head + "-" + f[1]
}

// TestOriginality keeps the embedded text free of anything shaped like a
// manufacturer's part number and of real web addresses (project rules).
func TestOriginality(t *testing.T) {
	partNumber := regexp.MustCompile(`\b[A-Z]{2,4}[0-9]{3,5}`)
	url := regexp.MustCompile(`https?://[^\s"]*`)
	id := regexp.MustCompile(`^[a-z0-9._-]+$`)
	check := func(fsys fs.FS, names []string) {
		for _, name := range names {
			t.Run(name, func(t *testing.T) {
				b, err := fs.ReadFile(fsys, name)
				if err != nil {
					t.Fatal(err)
				}
				for i, line := range strings.Split(string(b), "\n") {
					if m := partNumber.FindString(line); m != "" {
						t.Errorf("line %d: %q looks like a part number", i+1, m)
					}
					for _, u := range url.FindAllString(line, -1) {
						if !strings.HasPrefix(u, "https://example.invalid/") {
							t.Errorf("line %d: address %q, want https://example.invalid/…", i+1, u)
						}
					}
				}
			})
		}
	}
	check(data.Catalog, tomlNames(t, data.Catalog))
	check(data.Designs, tomlNames(t, data.Designs))
	for _, p := range demoParts(t) {
		if !id.MatchString(p.ID) {
			t.Errorf("part id %q, want [a-z0-9._-]", p.ID)
		}
	}
}

// tomlNames lists the *.toml files at the root of fsys, sorted.
func tomlNames(t *testing.T, fsys fs.FS) []string {
	t.Helper()
	m, err := fs.Glob(fsys, "*.toml")
	if err != nil {
		t.Fatal(err)
	}
	slices.Sort(m)
	return m
}
