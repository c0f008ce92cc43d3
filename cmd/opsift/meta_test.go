package main

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"os"
	"testing"
	"time"
)

// Every JSON output says what it was made from: version, date (RFC 3339),
// the design evaluated with its file and inputs, and each catalog file
// with the SHA-256 of its bytes. The hash is recomputed here with
// crypto/sha256 (FIPS 180-4) from the file itself; for rank-parts.toml it
// also matched `sha256sum` from coreutils when the test was written.
func TestJSONOutputsCarryMeta(t *testing.T) {
	raw, err := os.ReadFile(rankCat)
	if err != nil {
		t.Fatal(err)
	}
	sum := sha256.Sum256(raw)
	wantSum := hex.EncodeToString(sum[:])
	tests := []struct {
		name       string
		args       []string
		file       string
		catalog    bool
		withDesign bool
	}{
		{"rank", []string{"rank", "--design", rankDesign, "--catalog", rankCat, "--format", "json"}, rankDesign, true, true},
		{"derive", []string{"derive", "--design", rankDesign, "--format", "json"}, rankDesign, false, true},
		{"replace", []string{"replace", "tb-fet-fast", "--design", rankDesign, "--catalog", rankCat, "--format", "json"}, rankDesign, true, true},
		{"replace without design", []string{"replace", "tb-fet-fast", "--catalog", rankCat, "--format", "json"}, "", true, false},
		{"preview", []string{"preview", "tb-fet-fast", "--design", rankDesign, "--catalog", rankCat, "--format", "json", "--points", "4"}, rankDesign, true, true},
		{"list", []string{"list", "--design", rankDesign, "--catalog", rankCat, "--format", "json"}, rankDesign, true, true},
		{"list without design", []string{"list", "--catalog", rankCat, "--format", "json"}, "", true, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := runOpsift(t, nil, tc.args...)
			if r.code != 0 {
				t.Fatalf("exit %d: %s", r.code, r.stderr)
			}
			var doc struct {
				Version   string `json:"version"`
				Generated string `json:"generated"`
				Design    *struct {
					File     string `json:"file"`
					Modified *bool  `json:"modified"`
					Inputs   []struct {
						Path  string   `json:"path"`
						Text  string   `json:"text"`
						Value *float64 `json:"value"`
					} `json:"inputs"`
				} `json:"design"`
				Catalog struct {
					Sources []struct {
						Path   string `json:"path"`
						SHA256 string `json:"sha256"`
						Parts  int    `json:"parts"`
					} `json:"sources"`
				} `json:"catalog"`
				Policy *struct {
					DerateTyp *float64 `json:"derate_typ"`
				} `json:"policy"`
			}
			if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
				t.Fatal(err)
			}
			if doc.Version != version {
				t.Errorf("version %q, want %q", doc.Version, version)
			}
			if g, err := time.Parse(time.RFC3339, doc.Generated); err != nil || !g.Equal(testNow) {
				t.Errorf("generated %q (%v), want %s", doc.Generated, err, testNow.Format(time.RFC3339))
			}
			if !tc.withDesign {
				if doc.Design != nil || doc.Policy != nil {
					t.Errorf("design %+v, policy %+v without a design", doc.Design, doc.Policy)
				}
			} else {
				if doc.Design == nil || doc.Design.File != tc.file || doc.Design.Modified == nil || *doc.Design.Modified {
					t.Fatalf("design %+v, want file %q, modified false", doc.Design, tc.file)
				}
				found := false
				for _, in := range doc.Design.Inputs {
					// audio-split.toml: pos = "12 V".
					if in.Path == "supply.pos" && in.Text == "12 V" && in.Value != nil && *in.Value == 12 {
						found = true
					}
				}
				if !found {
					t.Errorf("inputs lack supply.pos = 12 V: %+v", doc.Design.Inputs)
				}
				if doc.Policy == nil || doc.Policy.DerateTyp == nil || *doc.Policy.DerateTyp != 0.7 {
					t.Errorf("policy %+v, want derate_typ 0.7 (the default)", doc.Policy)
				}
			}
			if !tc.catalog {
				if len(doc.Catalog.Sources) != 0 {
					t.Errorf("derive reads no catalog, got sources %+v", doc.Catalog.Sources)
				}
				return
			}
			if len(doc.Catalog.Sources) != 1 || doc.Catalog.Sources[0].SHA256 != wantSum || doc.Catalog.Sources[0].Parts != 5 {
				t.Errorf("sources %+v, want one with sha256 %s and 5 parts", doc.Catalog.Sources, wantSum)
			}
		})
	}
}
