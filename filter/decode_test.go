package filter_test

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/internal/golden"
)

// checkGolden compares got with testdata/name; go test -update rewrites it.
func checkGolden(t *testing.T, name string, got []byte) {
	t.Helper()
	golden.Check(t, filepath.Join("testdata", name), got)
}

const goodStage = `
[[stage]]
name = "gain"
kind = "noninverting"
gain = 11
signal = { shape = "sine", peak = "0.1 V", freq = "2 kHz" }
`

// Design decode and derive errors name file, line, stage and field, show
// the bad value and what was wanted.
func TestDesignErrors(t *testing.T) {
	tests := []struct{ name, text string }{
		{"toml syntax", "title = \"x\n"},
		{"unknown top key", "titel = \"x\"\n[supply]\npos = \"5 V\"\n" + goodStage},
		{"unknown supply key", "[supply]\npos = \"5 V\"\ntolerence = \"5 %\"\n" + goodStage},
		{"wrong dimension in stage", "[supply]\npos = \"5 V\"\n" + strings.Replace(goodStage, `"2 kHz"`, `"20 kHz/s"`, 1)},
		{"unknown stage key", "[supply]\npos = \"5 V\"\n" + strings.Replace(goodStage, "gain = 11", "gian = 11", 1)},
		{"unknown signal key", "[supply]\npos = \"5 V\"\n" + strings.Replace(goodStage, "freq =", "frequency =", 1)},
		{"kind unknown", "[supply]\npos = \"5 V\"\n" + strings.Replace(goodStage, "noninverting", "bandpass", 1)},
		{"kind typo", "[supply]\npos = \"5 V\"\n" + strings.Replace(goodStage, "noninverting", "noninvertng", 1)},
		{"missing stage name", "[supply]\npos = \"5 V\"\n[[stage]]\nkind = \"follower\"\n"},
		{"duplicate stage", "[supply]\npos = \"5 V\"\n" + goodStage + goodStage},
		{"bad shape", "[supply]\npos = \"5 V\"\n" + strings.Replace(goodStage, `"sine"`, `"triangle"`, 1)},
		{"temp not a pair", "[supply]\npos = \"5 V\"\n[environment]\ntemp = \"25 C\"\n" + goodStage},
		{"bad tech", "[supply]\npos = \"5 V\"\n[choose]\ntech = [\"cmos\", \"gaas\"]\n" + goodStage},
		{"volts without unit", "[supply]\npos = 5\n" + goodStage},
		{"no supply", goodStage},
		{"pos below neg", "[supply]\npos = \"-5 V\"\nneg = \"0 V\"\n" + goodStage},
		{"tolerance too big", "[supply]\npos = \"5 V\"\ntolerance = 5\n" + goodStage},
		{"temperature backwards", "[supply]\npos = \"5 V\"\n[environment]\ntemp = [\"85 C\", \"-40 C\"]\n" + goodStage},
		{"sine without frequency", "[supply]\npos = \"5 V\"\n" + strings.Replace(goodStage, `, freq = "2 kHz"`, "", 1)},
		{"gain below one", "[supply]\npos = \"5 V\"\n" + strings.Replace(goodStage, "gain = 11", "gain = 0.5", 1)},
		{"no stages", "[supply]\npos = \"5 V\"\n"},
		{"direct half range", "[supply]\npos = \"5 V\"\n[[stage]]\nname = \"d\"\nkind = \"direct\"\ninput = [\"1 V\"]\n"},
	}
	var out bytes.Buffer
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			d, err := filter.DecodeDesign("bad.toml", []byte(tc.text))
			if err == nil {
				_, err = filter.Derive(d)
			}
			if err == nil {
				t.Fatalf("no error")
			}
			fmt.Fprintf(&out, "%s\n\t%v\n", tc.name, err)
		})
	}
	checkGolden(t, "design_errors.golden", out.Bytes())
}

// Every test design and demo design decodes, derives, and survives an
// EncodeDesign → DecodeDesign round trip with the same fields and plan.
func TestEncodeRoundTrip(t *testing.T) {
	paths, _ := filepath.Glob("../testdata/designs/*.toml")
	demo, _ := filepath.Glob("../data/designs/*.toml")
	paths = append(paths, demo...)
	if len(paths) == 0 {
		t.Fatal("no designs found")
	}
	for _, path := range paths {
		t.Run(filepath.Base(path), func(t *testing.T) {
			b, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			d, err := filter.DecodeDesign(path, b)
			if err != nil {
				t.Fatal(err)
			}
			var enc bytes.Buffer
			if err := filter.EncodeDesign(&enc, d); err != nil {
				t.Fatal(err)
			}
			d2, err := filter.DecodeDesign("encoded.toml", enc.Bytes())
			if err != nil {
				t.Fatalf("encoded design does not decode: %v\n%s", err, enc.String())
			}
			if !reflect.DeepEqual(stripFields(d.Fields()), stripFields(d2.Fields())) {
				t.Errorf("fields differ after round trip:\n%s", enc.String())
			}
			p1, err1 := filter.Derive(d)
			p2, err2 := filter.Derive(d2)
			if err1 != nil || err2 != nil {
				t.Fatalf("derive: %v / %v", err1, err2)
			}
			if !reflect.DeepEqual(reqText(p1), reqText(p2)) {
				t.Errorf("requirements differ after round trip")
			}
		})
	}
}

func stripFields(fs []filter.Field) []string {
	var out []string
	for _, f := range fs {
		out = append(out, fmt.Sprintf("%s=%q/%v", f.Path, f.Raw, f.Set))
	}
	return out
}

func reqText(p *filter.Plan) []string {
	var out []string
	for _, r := range p.Requirements() {
		out = append(out, fmt.Sprintf("%s %s %s %.12g %.12g %.12g %s", r.Stage, r.Key, r.Bound, r.Value, r.Low, r.High, r.Why))
	}
	return out
}

// Set parses with the field's dimension; a bad value leaves the old one in
// force and returns an error for inline display.
func TestSet(t *testing.T) {
	d, _ := mustDesign(t, "title = \"t\"\n[supply]\npos = \"5 V\"\n"+goodStage)
	tests := []struct {
		path, raw string
		ok        bool
		check     func(d *filter.Design) bool
	}{
		{"supply.pos", "12 V", true, func(d *filter.Design) bool { return d.Supply.Pos.V == 12 }},
		{"supply.pos", "12 Hz", false, func(d *filter.Design) bool { return d.Supply.Pos.V == 12 && d.Supply.Pos.Raw == "12 V" }},
		{"supply.tolerance", "5 %", true, func(d *filter.Design) bool { return d.Supply.Tolerance.V == 0.05 }},
		{"environment.temp.high", "85 C", true, func(d *filter.Design) bool { return d.Temp[1].V == 85 }},
		{"choose.packages", "soic8, msop8", true, func(d *filter.Design) bool { return len(d.Choose.Packages.List()) == 2 }},
		{"choose.tech", "cmos, gaas", false, func(d *filter.Design) bool { return !d.Choose.Tech.Set }},
		{"stage.gain.signal.freq", "20 kHz", true, func(d *filter.Design) bool { return d.Stages[0].Values["signal.freq"].V == 20e3 }},
		{"stage.gain.signal.freq", "20 kHz/s", false, func(d *filter.Design) bool { return d.Stages[0].Values["signal.freq"].V == 20e3 }},
		{"stage.gain.signal.shape", "square", true, func(d *filter.Design) bool { return d.Stages[0].Values["signal.shape"].Raw == "square" }},
		{"stage.gain.dc_error", "", true, func(d *filter.Design) bool { return !d.Stages[0].Values["dc_error"].Set }},
		{"stage.gain.gain", "", false, func(d *filter.Design) bool { return d.Stages[0].Values["gain"].V == 11 }},
		{"stage.gain.kind", "inverting", true, func(d *filter.Design) bool { return d.Stages[0].Kind == "inverting" }},
		{"stage.gain.kind", "bandpass", false, func(d *filter.Design) bool { return d.Stages[0].Kind == "inverting" }},
		{"stage.nope.gain", "2", false, func(d *filter.Design) bool { return true }},
		{"supply.nope", "2", false, func(d *filter.Design) bool { return true }},
	}
	for _, tc := range tests {
		t.Run(tc.path+"="+tc.raw, func(t *testing.T) {
			err := d.Set(tc.path, tc.raw)
			if (err == nil) != tc.ok {
				t.Fatalf("Set error = %v, want ok = %v", err, tc.ok)
			}
			if !tc.check(d) {
				t.Errorf("design not as expected after Set")
			}
		})
	}
	// Clone is independent.
	c := d.Clone()
	if err := c.Set("stage.gain.gain", "3"); err != nil {
		t.Fatal(err)
	}
	if d.Stages[0].Values["gain"].V != 11 {
		t.Errorf("Clone shares stage values with the original")
	}
	// Edit → encode → decode keeps the edit.
	var b bytes.Buffer
	if err := filter.EncodeDesign(&b, c); err != nil {
		t.Fatal(err)
	}
	d2, err := filter.DecodeDesign("saved.toml", b.Bytes())
	if err != nil {
		t.Fatalf("%v\n%s", err, b.String())
	}
	if d2.Stages[0].Values["gain"].Raw != "3" || d2.Supply.Pos.Raw != "12 V" || d2.Stages[0].Kind != "inverting" {
		t.Errorf("saved design lost edits:\n%s", b.String())
	}
}

// Fields lists every design and stage input with a settable path.
func TestFieldsAreSettable(t *testing.T) {
	d, _ := mustDesign(t, "title = \"t\"\n[supply]\npos = \"5 V\"\n"+goodStage+
		"[[stage]]\nname = \"d\"\nkind = \"direct\"\ninput = [\"1 V\", \"2 V\"]\n")
	for _, f := range d.Fields() {
		if f.Raw == "" {
			continue
		}
		if err := d.Set(f.Path, f.Raw); err != nil {
			t.Errorf("Set(%q, %q): %v", f.Path, f.Raw, err)
		}
	}
}

// TestDesignErrorLinesPastStrings checks the line of an error that follows
// multi-line strings holding [[stage]] lines; lines counted by hand.
func TestDesignErrorLinesPastStrings(t *testing.T) {
	text := `title = """
A title that quotes a header:
[[stage]]
name = "fake"
"""
[supply]
pos = "5 V"
[choose]
packages = ["soic8", '''
[[stage]]''']
[[stage]]
name = "first"
kind = "follower"
signal = { shape = "sine", peak = "0.1 V", freq = "2 kHz" }
[[stage]]
name = "gain"
kind = "noninverting"
gain = 2
signal = { shape = "sine", peak = "0.1 V", freq = "2 kHz/s" }
`
	_, err := filter.DecodeDesign("d.toml", []byte(text))
	var e *filter.Error
	if !errors.As(err, &e) {
		t.Fatalf("got %v, want a *filter.Error", err)
	}
	if e.File != "d.toml" || e.Line != 19 || e.Stage != "gain" || e.Field != "signal.freq" {
		t.Errorf("error at %s:%d stage %q field %q, want d.toml:19 stage \"gain\" field \"signal.freq\" (%v)",
			e.File, e.Line, e.Stage, e.Field, err)
	}
}

// TestErrorFields checks that Derive and Set report the stage and field
// as fields of *Error, and that the message carries them once.
func TestErrorFields(t *testing.T) {
	text := "[supply]\npos = \"5 V\"\n[[stage]]\nname = \"gain\"\nkind = \"noninverting\"\ngain = 0.5\nsignal = { shape = \"sine\", peak = \"0.1 V\", freq = \"2 kHz\" }\n"
	d, err := filter.DecodeDesign("d.toml", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	_, err = filter.Derive(d)
	var e *filter.Error
	if !errors.As(err, &e) || e.Stage != "gain" || e.Field != "gain" || e.Line != 6 {
		t.Fatalf("Derive: %#v, want stage gain, field gain, line 6", err)
	}
	if want := `d.toml:6: stage "gain": field "gain": "0.5" is below 1, want a non-inverting gain ≥ 1 V/V`; err.Error() != want {
		t.Errorf("Derive: %q, want %q", err, want)
	}
	err = d.Set("stage.gain.signal.freq", "3 V")
	if !errors.As(err, &e) || e.Stage != "gain" || e.Field != "signal.freq" || strings.Contains(e.Err.Error(), "field") {
		t.Errorf("Set: %#v, want stage gain, field signal.freq and the bare reason in Err", err)
	}
}

// TestNoiseBandErrorLines: noise_band and noise_order errors name the
// field's own line (counted by hand), not the [[stage]] header's.
func TestNoiseBandErrorLines(t *testing.T) {
	head := "title = \"t\"\n[supply]\npos = \"5 V\"\n[[stage]]\nname = \"g\"\nkind = \"noninverting\"\ngain = 2\n" +
		"signal = { shape = \"sine\", peak = \"0.1 V\", freq = \"2 kHz\" }\nnoise = \"1 mV\"\n"
	tests := []struct {
		name, tail, field string
		line              int
	}{
		{"band not positive", "noise_band = \"0 Hz\"\n", "noise_band", 10},
		{"order not whole", "noise_band = \"1 kHz\"\nnoise_order = 2.5\n", "noise_order", 11},
		{"order without band", "noise_order = 2\n", "noise_order", 10},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			d, err := filter.DecodeDesign("n.toml", []byte(head+tc.tail))
			if err == nil {
				_, err = filter.Derive(d)
			}
			var e *filter.Error
			if !errors.As(err, &e) {
				t.Fatalf("got %v, want a *filter.Error", err)
			}
			if e.Line != tc.line || e.Field != tc.field || e.Stage != "g" {
				t.Errorf("error at line %d stage %q field %q, want line %d stage \"g\" field %q (%v)",
					e.Line, e.Stage, e.Field, tc.line, tc.field, err)
			}
		})
	}
}
