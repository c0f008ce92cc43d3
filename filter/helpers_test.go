package filter_test

import (
	"math"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// q parses a quantity for test tables; a typo in a test is a test bug.
func q(text string, d catalog.Dim) float64 {
	v, err := catalog.Parse(text, d)
	if err != nil {
		panic(err)
	}
	return v
}

// opt is a set catalog figure.
func opt(v float64) catalog.Opt { return catalog.Some(v) }

// basePart is a generous rail-to-rail part that passes the test designs:
// every figure a guaranteed limit, so each test changes only what it tests.
func basePart(id string) *catalog.Part {
	return &catalog.Part{
		ID: id, Name: "test part " + id, Tech: catalog.TechCMOS, Channels: 1,
		Packages: []string{"soic8"}, Pinout: "single-a", Lifecycle: catalog.LifecycleActive,
		UnitCost: opt(1), Temp: [2]catalog.Opt{opt(-40), opt(125)},
		Supply:   catalog.Span{Min: opt(1.8), Max: opt(40)},
		InputCM:  catalog.Headroom{Low: opt(-0.1), High: opt(0.1)},
		Output:   catalog.Swing{Low: opt(0.01), High: opt(-0.01), Load: opt(10e3)},
		GBW:      catalog.Spec{Min: opt(100e6)},
		Slew:     catalog.Spec{Min: opt(100e6)},
		Aol:      catalog.Spec{Min: opt(140)},
		Vos:      catalog.Spec{Max: opt(1e-6)},
		VosDrift: catalog.Spec{Max: opt(1e-9)},
		Ib:       catalog.Spec{Max: opt(1e-12)},
		Ios:      catalog.Spec{Max: opt(1e-12)},
		En:       catalog.Spec{Typ: opt(1e-9)},
		In:       catalog.Spec{Typ: opt(1e-15)},
		Iq:       catalog.Spec{Max: opt(1e-3)},
		Iout:     catalog.Spec{Min: opt(100e-3)},
		VdiffMax: opt(40), CLoad: opt(1e-6),
	}
}

// mustDesign decodes and derives a design from TOML text.
func mustDesign(t testing.TB, text string) (*filter.Design, *filter.Plan) {
	t.Helper()
	d, err := filter.DecodeDesign("test.toml", []byte(text))
	if err != nil {
		t.Fatalf("decode: %v", err)
	}
	p, err := filter.Derive(d)
	if err != nil {
		t.Fatalf("derive: %v", err)
	}
	return d, p
}

// evalOne evaluates one part.
func evalOne(t testing.TB, p *filter.Plan, part *catalog.Part, o filter.Options) filter.Result {
	t.Helper()
	rs := filter.Evaluate(p, []*catalog.Part{part}, o)
	return rs[0]
}

// check finds the check of stage/key in a result.
func check(t testing.TB, r filter.Result, stage string, key filter.Key) filter.Check {
	t.Helper()
	for _, c := range r.Checks {
		if c.Req.Stage == stage && c.Req.Key == key {
			return c
		}
	}
	t.Fatalf("%s: no check %s/%s", r.Part.ID, stage, key)
	return filter.Check{}
}

// requirement finds the requirement of stage/key in a plan.
func requirement(t testing.TB, p *filter.Plan, stage string, key filter.Key) filter.Requirement {
	t.Helper()
	for _, r := range p.Requirements() {
		if r.Stage == stage && r.Key == key {
			return r
		}
	}
	t.Fatalf("no requirement %s/%s", stage, key)
	return filter.Requirement{}
}

// near asserts |got − want| ≤ rel·|want|.
func near(t testing.TB, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.6g, want %.6g (±%g %%)", what, got, want, rel*100)
	}
}

// sineDesign is a one-stage design around the given stage body.
func sineDesign(supply, stage string) string {
	return "title = \"t\"\n[supply]\n" + supply + "\n[[stage]]\nname = \"s\"\n" + stage + "\n"
}
