package report_test

import (
	"bytes"
	"encoding/json"
	"math"
	"slices"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/headroom"
	"github.com/opsift/opsift/filter/report"
)

// TestJSONHeadroom: every passing candidate of rank's JSON carries
// "headroom" in the shape of DESIGN.md "Contract additions" ({stage,
// input, limit, unit, breaks {stage, key}, method}), holding what
// filter/headroom finds for it; a failing candidate carries an empty list,
// and NoHeadroom leaves every list empty.
func TestJSONHeadroom(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	for _, off := range []bool{false, true} {
		doc := &report.Doc{Plan: p, Results: rs, All: true, NoHeadroom: off}
		var b bytes.Buffer
		if err := report.WriteJSON(&b, doc); err != nil {
			t.Fatal(err)
		}
		var out struct {
			Candidates []struct {
				ID       string           `json:"id"`
				Pass     bool             `json:"pass"`
				Headroom []map[string]any `json:"headroom"`
			} `json:"candidates"`
		}
		if err := json.Unmarshal(b.Bytes(), &out); err != nil {
			t.Fatal(err)
		}
		withLimits := 0
		for i, c := range out.Candidates {
			if c.Headroom == nil {
				t.Fatalf("%s: headroom missing or null", c.ID)
			}
			if !c.Pass || off {
				if len(c.Headroom) != 0 {
					t.Errorf("%s (pass %v, off %v): headroom %v, want none", c.ID, c.Pass, off, c.Headroom)
				}
				continue
			}
			want := headroom.Find(p.Design, p, rs[i].Part, filter.Options{})
			if len(c.Headroom) != len(want) {
				t.Fatalf("%s: %d limits, want %d", c.ID, len(c.Headroom), len(want))
			}
			withLimits++
			for j, h := range c.Headroom {
				for _, k := range []string{"stage", "input", "limit", "unit", "breaks", "method"} {
					if _, ok := h[k]; !ok {
						t.Errorf("%s: headroom[%d] lacks %q", c.ID, j, k)
					}
				}
				br, _ := h["breaks"].(map[string]any)
				if _, ok := br["stage"]; !ok || br["key"] != string(want[j].Breaks.Key) {
					t.Errorf("%s: headroom[%d].breaks %v, want key %s", c.ID, j, br, want[j].Breaks.Key)
				}
				if m := h["method"]; !slices.Contains([]any{"closed_form", "bisection"}, m) || m != want[j].Method.String() {
					t.Errorf("%s: headroom[%d].method %v", c.ID, j, m)
				}
				if l, _ := h["limit"].(float64); math.Abs(l-want[j].Limit) > 1e-9*math.Abs(want[j].Limit) || h["input"] != want[j].Input {
					t.Errorf("%s: headroom[%d] %v %v, want %s %g", c.ID, j, h["input"], h["limit"], want[j].Input, want[j].Limit)
				}
			}
		}
		if !off && withLimits == 0 {
			t.Fatal("no passing candidate with headroom: the test checks nothing")
		}
	}
}

// TestMarkdownHeadroom: the review document has a headroom table under
// each passing candidate, and none under a failing one.
func TestMarkdownHeadroom(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	doc := &report.Doc{Plan: p, Results: rs, All: true}
	var b bytes.Buffer
	if err := report.WriteMarkdown(&b, doc); err != nil {
		t.Fatal(err)
	}
	sections := strings.Split(b.String(), "\n### ")[1:]
	for i, s := range sections {
		has := strings.Contains(s, "| Stage | Input | Design | Limit | Breaks | Method |")
		if has != rs[i].Pass {
			t.Errorf("%s: pass %v, headroom table %v", rs[i].Part.ID, rs[i].Pass, has)
		}
	}
}

// TestCompareWidth: the compare table fits the terminal width it is given
// by narrowing its label column; the values are never cut.
func TestCompareWidth(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	parts := []*catalog.Part{rs[0].Part, rs[1].Part}
	tab, err := compare.Build(p, parts, filter.Options{})
	if err != nil {
		t.Fatal(err)
	}
	_, lines := report.CompareCells(tab)
	for _, w := range []int{60, 80, 120} {
		var b bytes.Buffer
		if err := report.WriteCompare(&b, report.Table, &report.CompareDoc{Table: tab, Width: w}); err != nil {
			t.Fatal(err)
		}
		out := b.String()
		for _, l := range strings.Split(out, "\n") {
			if n := utf8.RuneCountInString(l); n > w {
				t.Errorf("width %d: line of %d: %q", w, n, l)
			}
		}
		for _, l := range lines {
			for _, cell := range l[1:] {
				if !strings.Contains(out, cell) {
					t.Errorf("width %d: value %q cut", w, cell)
				}
			}
		}
	}
}
