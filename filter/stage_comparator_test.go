package filter_test

import (
	"math"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// tmplPart is a generous rail-to-rail part with guaranteed figures, so each
// template test changes only the figure it is about.
func tmplPart(id string) *catalog.Part {
	o := catalog.Some
	return &catalog.Part{
		ID: id, Name: "template test part " + id, Tech: catalog.TechBipolar, Channels: 4,
		Packages: []string{"soic14"}, Pinout: "quad-t", Lifecycle: catalog.LifecycleActive,
		UnitCost: o(1), Temp: [2]catalog.Opt{o(-40), o(125)},
		Supply:   catalog.Span{Min: o(2), Max: o(40)},
		InputCM:  catalog.Headroom{Low: o(-0.1), High: o(0.1)},
		Output:   catalog.Swing{Low: o(0), High: o(0)},
		GBW:      catalog.Spec{Min: o(100e6)},
		Slew:     catalog.Spec{Min: o(100e6)},
		Aol:      catalog.Spec{Min: o(140)},
		Vos:      catalog.Spec{Max: o(1e-3)},
		Ib:       catalog.Spec{Max: o(10e-9)},
		Ios:      catalog.Spec{Max: o(1e-9)},
		Iq:       catalog.Spec{Max: o(1e-3)},
		Iout:     catalog.Spec{Min: o(50e-3)},
		VdiffMax: o(40), CLoad: o(1e-9),
	}
}

// tmplPlan decodes and derives a one-stage design on the given supply.
func tmplPlan(t testing.TB, supply, stage string) *filter.Plan {
	t.Helper()
	text := "title = \"template test\"\n[supply]\n" + supply + "\n[[stage]]\nname = \"s\"\n" + stage + "\n"
	d, err := filter.DecodeDesign("t.toml", []byte(text))
	if err != nil {
		t.Fatalf("decode: %v", err)
	}
	p, err := filter.Derive(d)
	if err != nil {
		t.Fatalf("derive: %v", err)
	}
	return p
}

// tmplDeriveErr derives a one-stage design that must fail and returns the error text.
func tmplDeriveErr(t testing.TB, supply, stage string) string {
	t.Helper()
	text := "title = \"template test\"\n[supply]\n" + supply + "\n[[stage]]\nname = \"s\"\n" + stage + "\n"
	d, err := filter.DecodeDesign("t.toml", []byte(text))
	if err != nil {
		return err.Error()
	}
	if _, err := filter.Derive(d); err != nil {
		return err.Error()
	}
	t.Fatalf("design derived, want an error:\n%s", text)
	return ""
}

// tmplReq returns the stage requirement with key; ok false when absent.
func tmplReq(p *filter.Plan, key filter.Key) (filter.Requirement, bool) {
	for _, r := range p.Stages[0].Requirements {
		if r.Key == key {
			return r, true
		}
	}
	return filter.Requirement{}, false
}

// tmplMust returns the stage requirement with key or fails the test.
func tmplMust(t testing.TB, p *filter.Plan, key filter.Key) filter.Requirement {
	t.Helper()
	r, ok := tmplReq(p, key)
	if !ok {
		t.Fatalf("no requirement %q", key)
	}
	return r
}

// tmplCheck evaluates part against p and returns the stage check with key.
func tmplCheck(t testing.TB, p *filter.Plan, part *catalog.Part, key filter.Key) filter.Check {
	t.Helper()
	r := filter.Evaluate(p, []*catalog.Part{part}, filter.Options{})[0]
	for _, c := range r.Checks {
		if c.Req.Stage == "s" && c.Req.Key == key {
			return c
		}
	}
	t.Fatalf("no check s/%s", key)
	return filter.Check{}
}

// tmplNear fails unless got is within rel (fraction) of want.
func tmplNear(t testing.TB, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.6g, want %.6g (±%g %%)", what, got, want, rel*100)
	}
}

// tmplContains fails unless s contains every part.
func tmplContains(t testing.TB, what, s string, parts ...string) {
	t.Helper()
	for _, p := range parts {
		if !strings.Contains(s, p) {
			t.Errorf("%s = %q, want it to contain %q", what, s, p)
		}
	}
}

const rails12 = "pos = \"12 V\"\nneg = \"0 V\""

const comparatorStage = `kind = "comparator"
threshold = "6 V"
input = ["2 V", "10 V"]
out_low = "3.5 V"
out_high = "8.5 V"
transition = "2 us"
load_r = "100 kOhm"`

// A comparator's needs follow from its levels and edges: slew = 0.8·ΔV/t
// is the 10–90 % definition of transition time (any pulse-measurement text,
// e.g. the IEEE transitions-and-pulses vocabulary; from memory); the rest
// is arithmetic on the stage's own numbers, worked by hand below.
func TestComparatorRequirements(t *testing.T) {
	p := tmplPlan(t, rails12, comparatorStage)
	tests := []struct {
		key       filter.Key
		value     float64 // min/max bounds
		low, high float64 // range bounds
	}{
		{filter.KeyInputRange, 0, 2, 10},             // input 2…10 V covers the 6 V threshold
		{filter.KeyOutputRange, 0, 3.5, 8.5},         // the next stage's levels
		{filter.KeySlew, 0.8 * 5 / 2e-6, 0, 0},       // 2 V/µs
		{filter.KeyVdiff, 4, 0, 0},                   // 10 V − 6 V = 6 V − 2 V
		{filter.KeyOutputCurrent, 8.5 / 100e3, 0, 0}, // 85 µA
	}
	for _, tt := range tests {
		t.Run(string(tt.key), func(t *testing.T) {
			r := tmplMust(t, p, tt.key)
			if r.Bound == filter.BoundRange {
				tmplNear(t, "low", r.Low, tt.low, 1e-12)
				tmplNear(t, "high", r.High, tt.high, 1e-12)
				return
			}
			tmplNear(t, "value", r.Value, tt.value, 1e-12)
		})
	}
	t.Run("threshold outside the input widens the input range", func(t *testing.T) {
		p := tmplPlan(t, rails12, strings.Replace(comparatorStage, `threshold = "6 V"`, `threshold = "11 V"`, 1))
		r := tmplMust(t, p, filter.KeyInputRange)
		tmplNear(t, "high", r.High, 11, 1e-12)
		tmplNear(t, "vdiff", tmplMust(t, p, filter.KeyVdiff).Value, 9, 1e-12) // 11 V − 2 V
	})
	t.Run("formulas carry the cautions", func(t *testing.T) {
		tmplContains(t, "slew why", tmplMust(t, p, filter.KeySlew).Why, "saturation", "no response time")
		tmplContains(t, "vdiff why", tmplMust(t, p, filter.KeyVdiff).Why, "damaged")
	})
}

// The vdiff check compares with the part's guaranteed vdiff_max and warns
// that inputs may clamp; a part with a 2.5 V clamp fails a 4 V step.
func TestComparatorVdiffCheck(t *testing.T) {
	p := tmplPlan(t, rails12, comparatorStage)
	tests := []struct {
		name  string
		vdiff catalog.Opt
		want  filter.Status
	}{
		{"32 V rating passes", catalog.Some(32), filter.StatusPass},
		{"2.5 V clamp fails", catalog.Some(2.5), filter.StatusFail},
		{"no rating is unknown", catalog.Opt{}, filter.StatusUnknown},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			part := tmplPart("c")
			part.VdiffMax = tt.vdiff
			c := tmplCheck(t, p, part, filter.KeyVdiff)
			if c.Status != tt.want {
				t.Errorf("status %v, want %v", c.Status, tt.want)
			}
			if tt.want != filter.StatusUnknown {
				tmplContains(t, "note", c.Note, "clamp", "damaged")
				tmplNear(t, "margin", c.Margin, tt.vdiff.V()/4-1, 1e-12)
			}
		})
	}
}

func TestComparatorErrors(t *testing.T) {
	tests := []struct {
		name, old, new, want string
	}{
		{"levels swapped", `out_low = "3.5 V"`, `out_low = "9 V"`, `"out_low"`},
		{"input reversed", `input = ["2 V", "10 V"]`, `input = ["10 V", "2 V"]`, `"input": low 10 V is above high 2 V`},
		{"zero transition", `transition = "2 us"`, `transition = "0 s"`, `"transition": "0 s" is not positive`},
		{"missing threshold", `threshold = "6 V"`, ``, `"threshold": missing`},
		{"time given as frequency", `transition = "2 us"`, `transition = "2 kHz"`, `transition`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			msg := tmplDeriveErr(t, rails12, strings.Replace(comparatorStage, tt.old, tt.new, 1))
			tmplContains(t, "error", msg, `stage "s"`, tt.want)
		})
	}
}
