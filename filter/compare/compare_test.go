package compare

import (
	"math"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// Three invented parts that differ in slew only (quick, sluggish) or in
// offset and cost (trim), on a ±12 V design at 25 °C.
const threeParts = `
[[part]]
id = "cmp-quick"
name = "compare case, quick"
tech = "jfet"
channels = 2
packages = ["soic8"]
unit_cost = 0.8
temp = ["-40 C", "85 C"]
supply = { min = "6 V", max = "36 V" }
input_cm = { low = "3 V", high = "-1 V" }
output = { low = "1.2 V", high = "-1.2 V" }
gbw = { typ = "4 MHz", min = "3 MHz" }
slew = { typ = "13 V/us", min = "9 V/us" }
aol = { typ = "106 dB", min = "94 dB" }
vos = { typ = "1 mV", max = "4 mV" }
iout = { typ = "25 mA", min = "15 mA" }

[[part]]
id = "cmp-sluggish"
name = "compare case, sluggish"
tech = "jfet"
channels = 2
packages = ["soic8"]
unit_cost = 0.8
temp = ["-40 C", "85 C"]
supply = { min = "6 V", max = "36 V" }
input_cm = { low = "3 V", high = "-1 V" }
output = { low = "1.2 V", high = "-1.2 V" }
gbw = { typ = "4 MHz", min = "3 MHz" }
slew = { typ = "0.3 V/us", min = "0.2 V/us" }
aol = { typ = "106 dB", min = "94 dB" }
vos = { typ = "1 mV", max = "4 mV" }
iout = { typ = "25 mA", min = "15 mA" }

[[part]]
id = "cmp-trim"
name = "compare case, trimmed"
tech = "jfet"
channels = 2
packages = ["soic8"]
unit_cost = 1.6
temp = ["-40 C", "85 C"]
supply = { min = "6 V", max = "36 V" }
input_cm = { low = "3 V", high = "-1 V" }
output = { low = "1.2 V", high = "-1.2 V" }
gbw = { typ = "4 MHz", min = "3 MHz" }
slew = { typ = "13 V/us", min = "9 V/us" }
aol = { typ = "106 dB", min = "94 dB" }
vos = { typ = "0.2 mV", max = "0.5 mV" }
iout = { typ = "25 mA", min = "15 mA" }
`

// 5 V peak at 20 kHz needs 2π·20 kHz·5 V = 0.628 V/µs (DESIGN.md baseline):
// the sluggish part's 0.2 V/µs fails, the others' 9 V/µs pass.
const compareDesign = `
title = "compare case"
[supply]
pos = "12 V"
neg = "-12 V"
[[stage]]
name = "amp"
kind = "noninverting"
ref = "0 V"
gain = 5
signal = { shape = "sine", peak = "1 V", freq = "20 kHz" }
load_r = "10 kOhm"
`

func build(t *testing.T, ids ...string) *Table {
	t.Helper()
	all, err := catalog.Decode("cmp.toml", []byte(threeParts))
	if err != nil {
		t.Fatal(err)
	}
	var parts []*catalog.Part
	for _, id := range ids {
		for _, p := range all {
			if p.ID == id {
				parts = append(parts, p)
			}
		}
	}
	d, err := filter.DecodeDesign("cmp-design.toml", []byte(compareDesign))
	if err != nil {
		t.Fatal(err)
	}
	plan, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	tab, err := Build(plan, parts, filter.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return tab
}

func row(t *testing.T, tab *Table, kind Kind, stage, key string) (int, *Row) {
	t.Helper()
	for i := range tab.Rows {
		r := &tab.Rows[i]
		if r.Kind == kind && r.Stage == stage && r.Key == key {
			return i, r
		}
	}
	t.Fatalf("no %s row %s/%s", kind, stage, key)
	return 0, nil
}

func bests(r *Row) []bool {
	var out []bool
	for _, c := range r.Cells {
		out = append(out, c.Best)
	}
	return out
}

// TestOrderAndBest: the slew check the sluggish part fails leads; the
// slew figure, 45× apart, leads the figures; offset (8× apart) and cost
// (2×) follow it; gain-bandwidth, equal on all, is among the rows that do
// not differ, with no cell marked.
func TestOrderAndBest(t *testing.T) {
	tab := build(t, "cmp-quick", "cmp-sluggish", "cmp-trim")
	if r := tab.Rows[0]; r.Kind != Check || r.Key != "slew" || !r.Decides() {
		t.Fatalf("first row %s %s/%s, want the slew check", r.Kind, r.Stage, r.Key)
	}
	_, sc := row(t, tab, Check, "amp", "slew")
	// quick and trim have the same 9 V/µs: their margins tie, both best.
	if got := bests(sc); !(got[0] && !got[1] && got[2]) {
		t.Errorf("slew check best %v, want quick and trim", got)
	}
	iSlew, sf := row(t, tab, Figure, "", "slew")
	iVos, vf := row(t, tab, Figure, "", "vos")
	iCost, cf := row(t, tab, Figure, "", "cost")
	iGBW, gf := row(t, tab, Figure, "", "gbw")
	if !(iSlew < iVos && iVos < iCost && iCost < iGBW) {
		t.Errorf("order slew %d, vos %d, cost %d, gbw %d: want slew < vos < cost < gbw", iSlew, iVos, iCost, iGBW)
	}
	// 9 V/µs and 0.2 V/µs: the quick and trimmed parts are best.
	if got := bests(sf); !(got[0] && !got[1] && got[2]) {
		t.Errorf("slew figure best %v", got)
	}
	if math.Abs(sf.Spread-math.Log(9.0/0.2)) > 1e-12 {
		t.Errorf("slew spread %g, want ln 45", sf.Spread)
	}
	// lower offset is better: 0.5 mV (trim) against 4 mV.
	if got := bests(vf); !(!got[0] && !got[1] && got[2]) {
		t.Errorf("vos best %v, want trim", got)
	}
	// lower cost is better: one dual package each, 0.8 against 1.6.
	if got := bests(cf); !(got[0] && got[1] && !got[2]) {
		t.Errorf("cost best %v, want quick and sluggish", got)
	}
	if got := bests(gf); got[0] || got[1] || got[2] || gf.Group != 3 {
		t.Errorf("gbw: best %v, group %d; want none marked in the last group", got, gf.Group)
	}
}

// TestPartCount: 2 to 6 parts.
func TestPartCount(t *testing.T) {
	d, _ := filter.DecodeDesign("d.toml", []byte(compareDesign))
	plan, _ := filter.Derive(d)
	p := &catalog.Part{ID: "x", Channels: 1}
	for _, n := range []int{0, 1, 7} {
		parts := make([]*catalog.Part, n)
		for i := range parts {
			parts[i] = p
		}
		if _, err := Build(plan, parts, filter.Options{}); err == nil {
			t.Errorf("%d parts: no error", n)
		}
	}
}

// TestBeyondClipStillDiffers: two passing checks at +572 % and +4873 %
// both clip to the +300 % ceiling, yet they differ, so the row ranks with
// the checks that differ (group 1, spread above 0), not with the rows
// where every part agrees (group 3); equal margins stay in group 3.
func TestBeyondClipStillDiffers(t *testing.T) {
	row := func(a, b float64) *Row {
		return &Row{Kind: Check, Cells: []Cell{
			{Known: true, V: a, Status: filter.StatusPass},
			{Known: true, V: b, Status: filter.StatusPass}}}
	}
	r := row(5.72, 48.73)
	rank(r)
	if r.Group != 1 || !(r.Spread > 0) {
		t.Errorf("+572 %% vs +4873 %%: group %d spread %g, want group 1 and a spread above 0", r.Group, r.Spread)
	}
	close := row(0.02, 0.30)
	rank(close)
	if !(close.Spread > r.Spread) {
		t.Errorf("a close call (spread %g) should rank before a difference beyond the clip (%g)", close.Spread, r.Spread)
	}
	eq := row(48.73, 48.73)
	rank(eq)
	if eq.Group != 3 {
		t.Errorf("equal margins: group %d, want 3", eq.Group)
	}
}
