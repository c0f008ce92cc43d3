package replace

import (
	"slices"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
)

// TestCMOSQuadReplacesBipolarQuad is the trade fact (common practice, no
// source): a CMOS quad in the footprint of a slow bipolar quad is much
// faster (≥ 5× slew) but has a lower maximum supply. It must be listed as a
// drop-in with the maximum supply as its first regression.
func TestCMOSQuadReplacesBipolarQuad(t *testing.T) {
	old := bipQuad("bq4-old")
	old.Lifecycle = catalog.LifecycleObsolete
	res := Find(old, []*catalog.Part{old, bipQuad("bq4-new"), cmosQuad("cq4")}, Options{})
	c := byID(res, "cq4")
	if c == nil {
		t.Fatalf("cmos quad not listed; candidates %v", ids(res))
	}
	if !c.DropIn {
		t.Errorf("cmos quad in the same pinout and package is not a drop-in: %s", c.Footprint)
	}
	slew := field(t, c.Fields, "slew")
	if slew.Verdict != Better || slew.Candidate.V < 5*slew.Original.V {
		t.Errorf("slew %v against %v (%s), want ≥ 5× and better", slew.Candidate.V, slew.Original.V, slew.Verdict)
	}
	if f := field(t, c.Fields, "supply_max"); f.Verdict != Worse {
		t.Errorf("supply_max verdict %s, want worse", f.Verdict)
	}
	if len(c.Regressions) == 0 || c.Regressions[0].Key != "supply_max" {
		t.Fatalf("regressions %v, want supply_max first", keys(c.Regressions))
	}
	if !strings.Contains(c.Regressions[0].Reason(), "lower maximum supply: 16 V against 32 V") {
		t.Errorf("reason %q", c.Regressions[0].Reason())
	}
	if c.Strict {
		t.Error("a candidate with a regression is strict")
	}
	// The active bipolar variant is the same part: strict, listed first.
	if got := ids(res); !slices.Equal(got, []string{"bq4-new", "cq4"}) {
		t.Errorf("candidates %v, want [bq4-new cq4]", got)
	}
	if v := byID(res, "bq4-new"); v == nil || !v.Strict || len(v.Improvements) != 0 {
		t.Errorf("identical variant should be strict with no changes: %+v", v)
	}
}

// TestRegressionOrder: a candidate worse in every figure lists its
// regressions in the order of the issue — maximum supply, a common-mode
// range that no longer reaches a rail, output swing, slew and GBW, vdiff,
// Ib — then the rest.
func TestRegressionOrder(t *testing.T) {
	o := bipQuad("o")
	c := &catalog.Part{
		ID: "c", Channels: 4, Packages: []string{"dip14"}, Pinout: "quad-a",
		Temp:    [2]catalog.Opt{catalog.Some(0), catalog.Some(70)},
		Supply:  catalog.Span{Min: catalog.Some(5), Max: catalog.Some(15)},
		InputCM: catalog.Headroom{Low: catalog.Some(1), High: catalog.Some(-2)},
		Output:  catalog.Swing{Low: catalog.Some(1), High: catalog.Some(-2), Load: catalog.Some(10e3)},
		GBW:     typMin(0.5e6, 0.3e6), Slew: typ(0.2e6), Aol: typMin(90, 80),
		Vos: catalog.Spec{Typ: catalog.Some(5e-3), Max: catalog.Some(10e-3)}, VosDrift: typ(20e-6),
		Ib: typMax(100e-9, 500e-9), Ios: typMax(10e-9, 100e-9), En: typ(50e-9), In: typ(1e-12),
		Iq: typMax(1e-3, 2e-3), Iout: typMin(10e-3, 5e-3), VdiffMax: catalog.Some(5), CLoad: catalog.Some(50e-12),
	}
	res := Find(o, []*catalog.Part{c}, Options{})
	got := keys(res.Candidates[0].Regressions)
	want := []string{
		"supply_max", "input_cm_low", "output_low", "output_high", "slew", "gbw", "vdiff_max", "ib",
		"input_cm_high", "supply_min", "temp_low", "temp_high", "iout", "cload", "aol",
		"vos", "vos_drift", "ios", "en", "in", "iq",
	}
	if !slices.Equal(got, want) {
		t.Errorf("regressions\n got %v\nwant %v", got, want)
	}
	r := res.Candidates[0].Regressions
	if r[1].Class != 2 || !strings.Contains(r[1].Reason(), "no longer reaches V−") {
		t.Errorf("input range off the rail: %+v", r[1])
	}
	if r[8].Class != 7 {
		t.Errorf("input range that never reached V+: class %d, want 7", r[8].Class)
	}
	// Mirror: the original against the bad part improves in the same order.
	back := Find(c, []*catalog.Part{o}, Options{})
	if got := keys(back.Candidates[0].Improvements); !slices.Equal(got, want) {
		t.Errorf("improvements\n got %v\nwant %v", got, want)
	}
}

// TestRailReach: only losing a rail the original reached is a class-2
// regression; moving past the rail by less is not.
func TestRailReach(t *testing.T) {
	tests := []struct {
		name       string
		orig, cand float64
		key        string
		wantClass  int
		wantReason string
	}{
		{"low end leaves V−", 0, 0.3, "input_cm_low", 2, "no longer reaches V−"},
		{"low end still reaches V−", -0.2, 0, "input_cm_low", 7, "input range at V− worse"},
		{"high end leaves V+", 0.1, -0.5, "input_cm_high", 2, "no longer reaches V+"},
		{"high end never reached V+", -1, -1.5, "input_cm_high", 7, "input range at V+ worse"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			o, c := &catalog.Part{ID: "o"}, &catalog.Part{ID: "c"}
			setTyp(o, tt.key, tt.orig)
			setTyp(c, tt.key, tt.cand)
			r := Find(o, []*catalog.Part{c}, Options{}).Candidates[0].Regressions
			if len(r) != 1 || r[0].Class != tt.wantClass || !strings.Contains(r[0].Reason(), tt.wantReason) {
				t.Errorf("regressions %+v, want one of class %d with %q", r, tt.wantClass, tt.wantReason)
			}
		})
	}
}

func TestDropIn(t *testing.T) {
	tests := []struct {
		name     string
		edit     func(p *catalog.Part)
		want     bool
		whyWords string
	}{
		{"same pinout and a shared package", func(p *catalog.Part) { p.Packages = []string{"soic14", "qfn16"} }, true, "drop-in: pinout quad-a, soic14"},
		{"more channels is still a drop-in", func(p *catalog.Part) { p.Channels = 8 }, true, "drop-in"},
		{"other pinout", func(p *catalog.Part) { p.Pinout = "quad-b" }, false, "pinout quad-b, not quad-a"},
		{"no pinout", func(p *catalog.Part) { p.Pinout = "" }, false, "no pinout family given"},
		{"no shared package", func(p *catalog.Part) { p.Packages = []string{"tssop14"} }, false, "no package in common (tssop14)"},
		{"fewer channels", func(p *catalog.Part) { p.Channels = 2 }, false, "2 channels, not 4"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			o, c := bipQuad("o"), bipQuad("c")
			tt.edit(c)
			got := Find(o, []*catalog.Part{c}, Options{}).Candidates[0]
			if got.DropIn != tt.want || !strings.Contains(got.Footprint, tt.whyWords) {
				t.Errorf("drop-in %v (%q), want %v with %q", got.DropIn, got.Footprint, tt.want, tt.whyWords)
			}
		})
	}
	t.Run("original without pinout has no drop-ins", func(t *testing.T) {
		o, c := bipQuad("o"), bipQuad("c")
		o.Pinout, c.Pinout = "", ""
		if got := Find(o, []*catalog.Part{c}, Options{}).Candidates[0]; got.DropIn {
			t.Errorf("empty pinout families matched: %s", got.Footprint)
		}
	})
}

func TestObsoleteAndOriginal(t *testing.T) {
	orig := bipQuad("bq4")
	override := bipQuad("bq4") // a later catalog layer's copy of the same id
	dead := cmosQuad("cq4-old")
	dead.Lifecycle = catalog.LifecycleObsolete
	nrnd := cmosQuad("cq4-nrnd")
	nrnd.Lifecycle = catalog.LifecycleNRND
	parts := []*catalog.Part{orig, override, dead, nrnd}
	tests := []struct {
		name    string
		opts    Options
		want    []string
		leftOut int
	}{
		{"obsolete left out", Options{}, []string{"cq4-nrnd"}, 1},
		{"obsolete asked for", Options{IncludeObsolete: true}, []string{"cq4-nrnd", "cq4-old"}, 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			res := Find(orig, parts, tt.opts)
			if got := ids(res); !slices.Equal(got, tt.want) {
				t.Errorf("candidates %v, want %v", got, tt.want)
			}
			if res.ObsoleteLeftOut != tt.leftOut {
				t.Errorf("obsolete left out %d, want %d", res.ObsoleteLeftOut, tt.leftOut)
			}
		})
	}
}

func TestStrictAndMissing(t *testing.T) {
	o := bipQuad("o")
	better := bipQuad("better")
	better.Slew = typ(1e6)
	sparse := bipQuad("sparse")
	sparse.En = catalog.Spec{}
	o.CLoad = catalog.Opt{} // the original lacks cload; a candidate giving it is no problem
	res := Find(o, []*catalog.Part{sparse, better}, Options{})
	if c := byID(res, "better"); !c.Strict || len(c.Improvements) != 1 || c.Improvements[0].Key != "slew" {
		t.Errorf("better part: strict %v, improvements %v", c.Strict, keys(c.Improvements))
	}
	if c := byID(res, "sparse"); c.Strict || !slices.Equal(c.Missing, []string{"en"}) {
		t.Errorf("part lacking en: strict %v, missing %v", c.Strict, c.Missing)
	}
	if got := ids(res); !slices.Equal(got, []string{"better", "sparse"}) {
		t.Errorf("order %v, want strict first", got)
	}
}

func TestCandidateOrder(t *testing.T) {
	o := bipQuad("o")
	mild := bipQuad("mild") // only more supply current: a class-7 regression
	mild.Iq = typMax(0.5e-3, 1e-3)
	harsh := cmosQuad("harsh") // lower maximum supply: class 1
	other := bipQuad("other")  // strict but needs a new footprint
	other.Pinout = "quad-b"
	parts := []*catalog.Part{other, harsh, mild, bipQuad("same")}
	t.Run("catalog only", func(t *testing.T) {
		got := ids(Find(o, parts, Options{}))
		want := []string{"same", "mild", "harsh", "other"}
		if !slices.Equal(got, want) {
			t.Errorf("order %v, want %v", got, want)
		}
	})
	t.Run("with a design", func(t *testing.T) {
		margin := map[string]float64{"same": 0.1, "mild": 0.5, "harsh": 2, "other": 3}
		eval := func(p *catalog.Part) Fit {
			return Fit{Pass: p.ID != "mild", WorstMargin: catalog.Some(margin[p.ID])}
		}
		res := Find(o, parts, Options{Evaluate: eval})
		// Passing first (drop-ins before a footprint change, then by
		// margin), failing after.
		want := []string{"harsh", "same", "other", "mild"}
		if got := ids(res); !slices.Equal(got, want) {
			t.Errorf("order %v, want %v", got, want)
		}
		if !res.Designed || res.Candidates[0].Design == nil || res.Candidates[0].Design.WorstMargin.V() != 2 {
			t.Errorf("design fit not carried: %+v", res.Candidates[0].Design)
		}
	})
}

func TestLookup(t *testing.T) {
	parts := []*catalog.Part{bipQuad("xq4-bip"), bipQuad("xq4-bip-old"), cmosQuad("lv4-cmos"), cmosQuad("zz9")}
	tests := []struct {
		id      string
		found   bool
		suggest []string
	}{
		{"xq4-bip", true, nil},
		{"xq4-bp", false, []string{"xq4-bip"}},
		{"XQ4-BIP", false, []string{"xq4-bip", "xq4-bip-old"}}, // case ignored; substring match second
		{"lv4", false, []string{"lv4-cmos"}},
		{"qqqqqqqq", false, nil},
	}
	for _, tt := range tests {
		t.Run(tt.id, func(t *testing.T) {
			p, err := Lookup(tt.id, parts)
			if tt.found {
				if err != nil || p.ID != tt.id {
					t.Fatalf("Lookup(%q) = %v, %v", tt.id, p, err)
				}
				return
			}
			ue, ok := err.(*UnknownPartError)
			if !ok {
				t.Fatalf("Lookup(%q) error %v, want *UnknownPartError", tt.id, err)
			}
			if !slices.Equal(ue.Suggestions, tt.suggest) {
				t.Errorf("suggestions %v, want %v", ue.Suggestions, tt.suggest)
			}
			if len(tt.suggest) > 0 && (!strings.Contains(err.Error(), "did you mean") || !strings.Contains(err.Error(), "\""+tt.suggest[0]+"\"")) {
				t.Errorf("message %q", err)
			}
			// Every unknown id points at the command that lists the ids.
			if !strings.HasSuffix(err.Error(), "(opsift list shows every part id)") {
				t.Errorf("message %q does not name opsift list", err)
			}
		})
	}
}

// TestSameWorstRegressionBySize: two candidates whose worst regression is
// the same figure are ordered by how far they fall short — a 16 V
// maximum supply before a 5.5 V one, against 32 V — even when the smaller
// shortfall comes with more regressions elsewhere.
func TestSameWorstRegressionBySize(t *testing.T) {
	o := bipQuad("o")
	near := bipQuad("near")
	near.Supply.Max = catalog.Some(16)
	near.Iq = typMax(1e-3, 2e-3)
	far := bipQuad("far")
	far.Supply.Max = catalog.Some(5.5)
	got := ids(Find(o, []*catalog.Part{far, near}, Options{}))
	if !slices.Equal(got, []string{"near", "far"}) {
		t.Errorf("order %v, want [near far]", got)
	}
}
