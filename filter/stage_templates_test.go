package filter_test

import (
	"bytes"
	"io/fs"
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

// TestMixedTemplatesDemo derives and ranks the embedded demo design that
// puts four templates on one quad: the 16 V CMOS quad serves all four
// stages in one package, while the slow bipolar quad in the same footprint
// fails the comparator's and the oscillator's slew (0.5 V/µs typical from a
// graph, × 0.7, against 2 V/µs and 2.3 V/µs; worked in the design's header).
func TestMixedTemplatesDemo(t *testing.T) {
	const name = "mixed-templates.toml"
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
	kinds := map[string]bool{}
	for _, s := range p.Stages {
		kinds[s.Kind] = true
	}
	if len(p.Stages) != 4 || len(kinds) != 4 {
		t.Fatalf("%d stages of %d kinds, want four templates", len(p.Stages), len(kinds))
	}
	c, err := catalog.Load(catalog.FSLayer("demo", data.Catalog))
	if err != nil {
		t.Fatal(err)
	}
	rs := filter.Evaluate(p, c.Parts, filter.Options{})
	filter.Rank(rs, filter.SortMargin)
	if !rs[0].Pass {
		t.Fatalf("no part passes; best %s fails %d checks", rs[0].Part.ID, rs[0].Failed)
	}
	best := rs[0]
	if best.Part.Channels < 4 || best.Packages != 1 {
		t.Errorf("best %s: %d channels in %d packages, want one quad serving all four stages", best.Part.ID, best.Part.Channels, best.Packages)
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
