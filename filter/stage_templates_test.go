package filter_test

import (
	"bytes"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/report"
	"github.com/opsift/opsift/internal/golden"
)

// tmplGolden compares got with testdata/templates/name; go test -update
// rewrites it.
func tmplGolden(t *testing.T, name string, got []byte) {
	t.Helper()
	golden.Check(t, filepath.Join("testdata", "templates", name), got)
}

// tmplDeriveFile decodes and derives a design file under testdata/templates.
func tmplDeriveFile(t *testing.T, name string) *filter.Plan {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", "templates", name))
	if err != nil {
		t.Fatal(err)
	}
	d, err := filter.DecodeDesign(name, b)
	if err != nil {
		t.Fatalf("decode: %v", err)
	}
	p, err := filter.Derive(d)
	if err != nil {
		t.Fatalf("derive: %v", err)
	}
	return p
}

// TestTemplateDeriveGolden renders each circuit template's derivation the
// way `opsift derive --format json` does (and the every-template design as
// text too) and compares it with the reviewed golden files.
func TestTemplateDeriveGolden(t *testing.T) {
	for _, kind := range []string{"comparator", "relaxation", "sallen_key_lowpass", "rail_splitter", "transimpedance", "every-template"} {
		t.Run(kind, func(t *testing.T) {
			p := tmplDeriveFile(t, kind+".toml")
			formats := []string{"json"}
			if kind == "every-template" {
				formats = append(formats, "text")
			}
			for _, f := range formats {
				var b bytes.Buffer
				if err := report.WriteDerive(&b, f, p, nil); err != nil {
					t.Fatal(err)
				}
				ext := map[string]string{"json": ".json", "text": ".txt"}[f]
				tmplGolden(t, kind+ext, b.Bytes())
			}
			for _, s := range p.Stages {
				for _, r := range s.Requirements {
					if !strings.ContainsAny(r.Why, "0123456789") || strings.Contains(r.Why, "\n") {
						t.Errorf("%s/%s: why %q is not one line with the numbers put in", s.Name, r.Key, r.Why)
					}
				}
			}
		})
	}
}

// TestTemplatesRegistered keeps every kind the design format names
// buildable, with documented inputs.
func TestTemplatesRegistered(t *testing.T) {
	for _, kind := range []string{"comparator", "relaxation", "sallen_key_lowpass", "rail_splitter", "transimpedance"} {
		t.Run(kind, func(t *testing.T) {
			tp, ok := filter.TemplateFor(kind)
			if !ok {
				t.Fatal("no template")
			}
			if tp.Summary() == "" {
				t.Error("no summary")
			}
			for _, p := range tp.Params() {
				if p.Help == "" || p.Label == "" {
					t.Errorf("param %q has no label or help", p.Key)
				}
			}
		})
	}
}

// demoRanked derives an embedded demo design and ranks the demo catalog on it.
func demoRanked(t *testing.T, name string) (*filter.Plan, []filter.Result) {
	t.Helper()
	b, err := fs.ReadFile(data.Designs, name)
	if err != nil {
		t.Fatal(err)
	}
	d, err := filter.DecodeDesign(name, b)
	if err != nil {
		t.Fatal(err)
	}
	p, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	c, err := catalog.Load(catalog.FSLayer("demo", data.Catalog))
	if err != nil {
		t.Fatal(err)
	}
	rs := filter.Evaluate(p, c.Parts, filter.Options{})
	filter.Rank(rs, filter.SortMargin)
	return p, rs
}

// TestPickupCounterDemo derives and ranks the embedded demo design that
// puts three templates on one quad. By hand (formulas in the README,
// Sedra & Smith for the astable, from memory): the detector's edges need
// 0.8·(3 V − (−3 V))/2.5 µs = 1.92 V/µs; the clock's period is
// T = 2·33 kΩ·10 nF·ln((1 + β)/(1 − β)) with β = 10/37, and both
// transitions in 5 % of it need 2·12 V/(0.05·T) ≈ 1.31 V/µs. The 18 V CMOS
// quad serves all three stages in one package; the slow bipolar quad in the
// same footprint (0.42 V/µs typical from a graph, × 0.7) fails both.
func TestPickupCounterDemo(t *testing.T) {
	p, rs := demoRanked(t, "pickup-counter-6v.toml")
	kinds := map[string]bool{}
	for _, s := range p.Stages {
		kinds[s.Kind] = true
	}
	if len(p.Stages) != 3 || len(kinds) != 3 {
		t.Fatalf("%d stages of %d kinds, want three templates", len(p.Stages), len(kinds))
	}
	beta := 10.0 / 37
	period := 2 * 33e3 * 10e-9 * math.Log((1+beta)/(1-beta))
	for _, tt := range []struct {
		stage string
		want  float64
	}{
		{"detect", 0.8 * 6 / 2.5e-6},
		{"clock", 2 * 12 / (0.05 / 0.95 * period)}, // f ≥ 0.95·f0: T may grow by 5/95
	} {
		if got := requirement(t, p, tt.stage, filter.KeySlew).Value; math.Abs(got-tt.want) > 1e-9*tt.want {
			t.Errorf("%s slew requirement %g V/s, want %g V/s", tt.stage, got, tt.want)
		}
	}
	if !rs[0].Pass {
		t.Fatalf("no part passes; best %s fails %d checks", rs[0].Part.ID, rs[0].Failed)
	}
	best := rs[0]
	if best.Part.Channels < 4 || best.Packages != 1 {
		t.Errorf("best %s: %d channels in %d packages, want one quad serving all three stages", best.Part.ID, best.Part.Channels, best.Packages)
	}
	for _, r := range rs {
		if r.Part.ID != "gp4-bip" {
			continue
		}
		failed := map[string]bool{}
		for _, ch := range r.Failing() {
			failed[ch.Stage()+"/"+string(ch.Key())] = true
		}
		for _, want := range []string{"detect/slew", "clock/slew"} {
			if !failed[want] {
				t.Errorf("gp4-bip does not fail %s (fails %v)", want, failed)
			}
		}
		return
	}
	t.Error("gp4-bip not in the demo catalog")
}

// TestTurbidityDemo: the photodiode amplifier of the turbidity demo
// (1 MΩ, 22 pF, 10 kHz) needs the GBW at which the maximally flat response
// with its Cf reaches 10 kHz; the independent nodal sweep (tiaNodal) at
// that GBW and Cf must end at 10 kHz, while the shortcut 2π·Rf·Cin·f² =
// 13.8 kHz (Graeme, Photodiode Amplifiers, 1996, from memory) falls short.
// A bipolar input fails its DC error: Ib·Rf alone is 330 nA × 1 MΩ =
// 330 mV against 10 mV allowed.
func TestTurbidityDemo(t *testing.T) {
	p, rs := demoRanked(t, "turbidity-5v.toml")
	gbw := requirement(t, p, "photo", filter.KeyGBW).Value
	shortcut := 2 * math.Pi * 1e6 * 22e-12 * 1e4 * 1e4
	part := tmplPart("t")
	part.Cin = catalog.Opt{}
	sp := stagePlan(t, p, "photo")
	// sweep returns the nodal −3 dB bandwidth at GBW g with the flat Cf the
	// engine picks for it (figures pinned to g: no temperature derating).
	sweep := func(g float64) float64 {
		f := filter.Figures(part, p)
		f.GBW = filter.Figure{V: g, Known: true, Basis: filter.BasisGuaranteed}
		cf, _, _ := filter.TIAFeedbackCap(sp, part, &f)
		f3, _ := tiaBandwidth(1e6, 22e-12, cf, g)
		return f3
	}
	tmplNear(t, "swept −3 dB at the requirement", sweep(gbw), 1e4, 1e-3)
	if f3 := sweep(shortcut); f3 > 0.8e4 {
		t.Errorf("shortcut GBW reaches %g Hz, want well short of 10 kHz", f3)
	}
	seen := 0
	for _, r := range rs {
		switch r.Part.ID {
		case "rr2-cmos":
			seen++
			if !r.Pass {
				t.Errorf("rr2-cmos fails %d checks, want a pass", r.Failed)
			}
		case "gp2-bip":
			seen++
			failed := map[string]bool{}
			for _, ch := range r.Failing() {
				failed[ch.Stage()+"/"+string(ch.Key())] = true
			}
			if !failed["photo/dc_error"] {
				t.Errorf("gp2-bip does not fail photo/dc_error (fails %v)", failed)
			}
		}
	}
	if seen != 2 {
		t.Errorf("found %d of rr2-cmos and gp2-bip in the ranking", seen)
	}
}

// TestTemplateDesignsRoundTrip writes each template design back as TOML
// (what the TUI saves after an edit) and checks that it derives the same
// requirements, and that every template input shows up as a form field.
func TestTemplateDesignsRoundTrip(t *testing.T) {
	for _, kind := range []string{"comparator", "relaxation", "sallen_key_lowpass", "rail_splitter", "transimpedance", "every-template"} {
		t.Run(kind, func(t *testing.T) {
			p := tmplDeriveFile(t, kind+".toml")
			var b bytes.Buffer
			if err := filter.EncodeDesign(&b, p.Design); err != nil {
				t.Fatal(err)
			}
			d2, err := filter.DecodeDesign("again.toml", b.Bytes())
			if err != nil {
				t.Fatalf("decode the written design: %v\n%s", err, b.String())
			}
			p2, err := filter.Derive(d2)
			if err != nil {
				t.Fatal(err)
			}
			a, z := p.Requirements(), p2.Requirements()
			if len(a) != len(z) {
				t.Fatalf("%d requirements after the round trip, want %d", len(z), len(a))
			}
			for i := range a {
				if a[i].Key != z[i].Key || a[i].Value != z[i].Value || a[i].Low != z[i].Low || a[i].High != z[i].High || a[i].Why != z[i].Why {
					t.Errorf("requirement %d: %+v, want %+v", i, z[i], a[i])
				}
			}
			fields := map[string]bool{}
			for _, f := range p.Design.Fields() {
				fields[f.Path] = true
			}
			for _, s := range p.Design.Stages {
				for key := range s.Values {
					if !fields["stage."+s.Name+"."+key] {
						t.Errorf("stage %s input %q has no form field", s.Name, key)
					}
				}
			}
		})
	}
}

// BenchmarkEvaluateTemplates evaluates the every-template design (six
// stages, Measure-based checks included) against the demo catalog repeated
// to 10 000 parts: the re-rank a keystroke in the TUI triggers.
func BenchmarkEvaluateTemplates(b *testing.B) {
	raw, err := os.ReadFile(filepath.Join("testdata", "templates", "every-template.toml"))
	if err != nil {
		b.Fatal(err)
	}
	d, err := filter.DecodeDesign("every-template.toml", raw)
	if err != nil {
		b.Fatal(err)
	}
	p, err := filter.Derive(d)
	if err != nil {
		b.Fatal(err)
	}
	c, err := catalog.Load(catalog.FSLayer("demo", data.Catalog))
	if err != nil {
		b.Fatal(err)
	}
	parts := make([]*catalog.Part, 0, 10000)
	for len(parts) < 10000 {
		parts = append(parts, c.Parts...)
	}
	parts = parts[:10000]
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		rs := filter.Evaluate(p, parts, filter.Options{})
		filter.Rank(rs, filter.SortMargin)
	}
}

// stagePlan finds a stage of a plan by name.
func stagePlan(t *testing.T, p *filter.Plan, name string) *filter.StagePlan {
	t.Helper()
	for i := range p.Stages {
		if p.Stages[i].Name == name {
			return &p.Stages[i]
		}
	}
	t.Fatalf("no stage %q", name)
	return nil
}
