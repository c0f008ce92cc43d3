package report_test

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/report"
)

// TestSimulatedBasis: the thd check's basis is "simulated" in the JSON
// and md documents, and its margin carries the s mark (BasisMark) in the
// compare cells.
func TestSimulatedBasis(t *testing.T) {
	p, rs := fixture(t, "thd-follower.toml", false)
	doc := &report.Doc{Plan: p, Results: rs, Sort: filter.SortMargin, All: true, NoHeadroom: true,
		Sources: []string{"parts.toml"}, Meta: testMeta("thd-follower.toml")}
	var js bytes.Buffer
	if err := report.Write(&js, report.JSON, doc); err != nil {
		t.Fatal(err)
	}
	var out struct {
		Candidates []struct {
			ID     string `json:"id"`
			Pass   bool   `json:"pass"`
			Checks []struct {
				Key, Basis, Status string
			} `json:"checks"`
		} `json:"candidates"`
	}
	if err := json.Unmarshal(js.Bytes(), &out); err != nil {
		t.Fatal(err)
	}
	var passing []string
	for _, c := range out.Candidates {
		for _, k := range c.Checks {
			if k.Key != "thd" {
				continue
			}
			if c.Pass && (k.Basis != "simulated" || k.Status != "pass") {
				t.Errorf("%s: passing part's thd check has basis %q, status %q", c.ID, k.Basis, k.Status)
			}
			if !c.Pass && k.Status != "unknown" {
				t.Errorf("%s: failing part's thd check has status %q, want unknown (not simulated)", c.ID, k.Status)
			}
			if c.Pass {
				passing = append(passing, c.ID)
			}
		}
	}
	if len(passing) < 2 {
		t.Fatalf("passing parts with a thd check: %v, want at least two", passing)
	}
	var md bytes.Buffer
	if err := report.Write(&md, report.Markdown, doc); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(md.String(), "| simulated |") {
		t.Errorf("md: no thd check with basis simulated")
	}
	tab, err := compare.Build(p, []*catalog.Part{rs[0].Part, rs[1].Part}, filter.Options{})
	if err != nil {
		t.Fatal(err)
	}
	_, lines := report.CompareCells(tab)
	found := false
	for _, l := range lines {
		if strings.Contains(l[0], "thd") {
			found = true
			for _, c := range l[1:] {
				if !strings.Contains(c, " s") {
					t.Errorf("compare thd cell %q has no s mark", c)
				}
			}
		}
	}
	if !found {
		t.Errorf("compare: no thd row in %q", lines)
	}
}
