package replace

import (
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// loadQuads reads testdata/quads.toml and returns its parts by id.
func loadQuads(t *testing.T) ([]*catalog.Part, map[string]*catalog.Part) {
	t.Helper()
	path := filepath.Join("testdata", "quads.toml")
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	parts, err := catalog.Decode(path, data)
	if err != nil {
		t.Fatalf("decode %s: %v", path, err)
	}
	m := map[string]*catalog.Part{}
	for _, p := range parts {
		m[p.ID] = p
	}
	return parts, m
}

// loadPlan reads and derives a design from testdata.
func loadPlan(t *testing.T, name string) *filter.Plan {
	t.Helper()
	path := filepath.Join("testdata", name)
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	d, err := filter.DecodeDesign(path, data)
	if err != nil {
		t.Fatalf("decode %s: %v", path, err)
	}
	plan, err := filter.Derive(d)
	if err != nil {
		t.Fatalf("derive %s: %v", path, err)
	}
	return plan
}

// TestCMOSQuadPassesOnSplit5V is the design half of the trade fact (common
// practice, no source): on ±5 V rails the 17 V CMOS quad is a drop-in
// that passes, its lower maximum supply only a warning, while the bipolar
// quads fail on slew (0.44 V/µs typical × 0.7 = 0.308 V/µs < 0.421 V/µs
// needed, see testdata/split5.toml) and the 5 V CMOS quad fails on supply.
func TestCMOSQuadPassesOnSplit5V(t *testing.T) {
	parts, by := loadQuads(t)
	plan := loadPlan(t, "split5.toml")
	res := Find(by["bq4-old"], parts, Options{Plan: plan})
	if !res.Designed {
		t.Fatal("result not marked as designed")
	}
	c := byID(res, "cq4-cmos")
	if c == nil || !c.DropIn || c.Design == nil {
		t.Fatalf("cq4-cmos not a designed drop-in: %+v", c)
	}
	if !c.Design.Pass {
		t.Errorf("cq4-cmos fails the 12 V design: %v", c.Design.Failed)
	}
	if len(c.Regressions) == 0 || c.Regressions[0].Key != "supply_max" {
		t.Errorf("cq4-cmos regressions %v, want supply_max first", keys(c.Regressions))
	}
	if res.Candidates[0].Part.ID != "cq4-cmos" {
		t.Errorf("first candidate %s, want the passing drop-in cq4-cmos (order %v)", res.Candidates[0].Part.ID, ids(res))
	}
	for _, id := range []string{"bq4-bip", "cq4-lv"} {
		if c := byID(res, id); c == nil || c.Design.Pass {
			t.Errorf("%s should fail the 12 V design: %+v", id, c)
		}
	}
	if c := byID(res, "bq4-bip"); c != nil && !slices.Contains(c.Design.Failed, "gain/slew") {
		t.Errorf("bq4-bip fails %v, want gain/slew among them", c.Design.Failed)
	}
	if c := byID(res, "cq4-lv"); c != nil && !slices.Contains(c.Design.Failed, "supply") {
		t.Errorf("cq4-lv fails %v, want supply among them", c.Design.Failed)
	}
	if c.Design.Result == nil || c.Design.Result.Part != c.Part {
		t.Error("Fit.Result does not carry the filter result")
	}
}

// TestOverTemperatureFromPlan: a design range that leaves 25 °C compares
// the over-temperature limits where both parts give them.
func TestOverTemperatureFromPlan(t *testing.T) {
	parts, by := loadQuads(t)
	res := Find(by["cq4-cmos"], parts, Options{Plan: loadPlan(t, "split5.toml")})
	f := field(t, byID(res, "cq2-cmos").Fields, "vos")
	if f.Original.Limit != LimitMaxOT || f.Candidate.Limit != LimitMaxOT {
		t.Errorf("vos limits %s/%s, want max_ot on both", f.Original.Limit, f.Candidate.Limit)
	}
}

// TestBasisMatchesFilter: the basis a field reports for a part's own best
// figure is the basis filter.Figures gives the same figure at 25 °C, so the
// finder and the ranking never disagree about what a figure rests on.
func TestBasisMatchesFilter(t *testing.T) {
	parts, _ := loadQuads(t)
	room := &filter.Plan{TempLow: 25, TempHigh: 25}
	for _, p := range parts {
		t.Run(p.ID, func(t *testing.T) {
			fig := filter.Figures(p, room)
			want := map[string]filter.Figure{
				"gbw": fig.GBW, "slew": fig.Slew, "aol": fig.Aol, "iout": fig.Iout,
				"vos": fig.Vos, "ib": fig.Ib, "ios": fig.Ios, "en": fig.En, "in": fig.In, "iq": fig.Iq,
			}
			blank := &catalog.Part{ID: "blank"}
			for _, f := range Compare(p, blank, false) {
				w, ok := want[f.Key]
				if !ok {
					continue
				}
				if f.Original.Set != w.Known {
					t.Errorf("%s: set %v, filter known %v", f.Key, f.Original.Set, w.Known)
					continue
				}
				if f.Original.Set && string(f.Original.Basis) != w.Basis.String() {
					t.Errorf("%s: basis %s, filter %s", f.Key, f.Original.Basis, w.Basis)
				}
			}
			for key, win := range map[string]filter.Window{"input_cm_low": fig.Input, "output_high": fig.Output} {
				f := field(t, Compare(p, blank, false), key)
				if f.Original.Set && string(f.Original.Basis) != win.Basis.String() {
					t.Errorf("%s: basis %s, filter %s", key, f.Original.Basis, win.Basis)
				}
			}
		})
	}
}
