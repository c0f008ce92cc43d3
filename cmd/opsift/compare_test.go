package main

import (
	"encoding/csv"
	"encoding/json"
	"strings"
	"testing"
	"time"

	"github.com/opsift/opsift/filter/report"
)

var compareArgs = []string{"compare", "tc-rr-quad", "tb-fet-fast", "ta-slow-bip", "--design", rankDesign, "--catalog", rankCat}

// Every format of compare: table and md pinned as goldens; json carries the
// meta fields of DESIGN.md "Contract additions" and one row per figure and
// check with a value per part; csv has the caution column on every row.
func TestCompareFormats(t *testing.T) {
	for _, f := range []string{"table", "md"} {
		r := runCLI(t, false, nil, append(compareArgs, "--format", f)...)
		if r.code != 0 || r.stderr != "" {
			t.Fatalf("%s: exit %d, stderr %q", f, r.code, r.stderr)
		}
		assertGolden(t, "compare_"+f+".golden", r.stdout)
	}

	r := runCLI(t, false, nil, append(compareArgs, "--format", "json")...)
	if r.code != 0 {
		t.Fatalf("json: exit %d: %s", r.code, r.stderr)
	}
	var doc struct {
		Version   string `json:"version"`
		Generated string `json:"generated"`
		Design    *struct {
			File     string `json:"file"`
			Modified bool   `json:"modified"`
		} `json:"design"`
		Catalog *struct {
			Sources []struct {
				Path   string `json:"path"`
				SHA256 string `json:"sha256"`
			} `json:"sources"`
		} `json:"catalog"`
		Caution string `json:"caution"`
		Parts   []struct{ ID string }
		Rows    []struct {
			Kind   string
			Key    string
			Values []struct {
				ID   string
				Best bool
			}
		}
	}
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Version != version || doc.Design == nil || doc.Design.File != rankDesign || doc.Catalog == nil ||
		len(doc.Catalog.Sources) != 1 || len(doc.Catalog.Sources[0].SHA256) != 64 || doc.Caution != report.Caution {
		t.Errorf("meta: %+v", doc)
	}
	if _, err := time.Parse(time.RFC3339, doc.Generated); err != nil {
		t.Errorf("generated %q: %v", doc.Generated, err)
	}
	if len(doc.Parts) != 3 || doc.Parts[0].ID != "tc-rr-quad" {
		t.Errorf("parts %+v", doc.Parts)
	}
	kinds := map[string]int{}
	for _, row := range doc.Rows {
		kinds[row.Kind]++
		if len(row.Values) != 3 {
			t.Errorf("row %s: %d values", row.Key, len(row.Values))
		}
	}
	if kinds["figure"] == 0 || kinds["check"] == 0 {
		t.Errorf("row kinds %v", kinds)
	}

	r = runCLI(t, false, nil, append(compareArgs, "--format", "csv")...)
	if r.code != 0 {
		t.Fatalf("csv: exit %d: %s", r.code, r.stderr)
	}
	recs, err := csv.NewReader(strings.NewReader(r.stdout)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != len(doc.Rows)+1 {
		t.Errorf("csv: %d records, json %d rows", len(recs), len(doc.Rows))
	}
	for i, rec := range recs {
		last := rec[len(rec)-1]
		if i == 0 && last != report.CautionColumn || i > 0 && last != report.Caution {
			t.Errorf("csv row %d: last cell %q", i, last)
		}
	}
}

// Bad compare calls exit 2 naming what is wrong.
func TestCompareErrors(t *testing.T) {
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"one id", []string{"compare", "tc-rr-quad"}, "want 2 to 6 PART-IDs, got 1"},
		{"seven ids", []string{"compare", "a", "b", "c", "d", "e", "f", "g"}, "want 2 to 6 PART-IDs, got 7"},
		{"unknown id", []string{"compare", "tc-rr-quad", "tb-fet-fas", "--catalog", rankCat}, `no part with id "tb-fet-fas" in the catalog; did you mean "tb-fet-fast"?`},
		{"far id", []string{"compare", "tc-rr-quad", "zzzzzzzz", "--catalog", rankCat}, `no part with id "zzzzzzzz" in the catalog (opsift list shows every part id)`},
		{"twice", []string{"compare", "tc-rr-quad", "tc-rr-quad", "--catalog", rankCat}, `part "tc-rr-quad" given twice`},
		{"format", []string{"compare", "tc-rr-quad", "tb-fet-fast", "--format", "toml", "--catalog", rankCat}, `--format "toml": want one of table, md, json, csv`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runCLI(t, false, nil, tc.args...)
			if r.code != 2 || !strings.Contains(r.stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want 2 and %q", r.code, r.stderr, tc.want)
			}
		})
	}
}
