package report_test

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/report"
	"github.com/opsift/opsift/internal/golden"
)

// checkGolden compares got with testdata/name; go test -update rewrites it.
func checkGolden(t *testing.T, name string, got []byte) {
	t.Helper()
	golden.Check(t, filepath.Join("testdata", name), got)
}

// fixture ranks the test catalog on a test design.
func fixture(t *testing.T, design string, strict bool) (*filter.Plan, []filter.Result) {
	t.Helper()
	path := filepath.Join("..", "..", "testdata", "designs", design)
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	d, err := filter.DecodeDesign(design, b)
	if err != nil {
		t.Fatal(err)
	}
	p, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	cb, err := os.ReadFile("testdata/parts.toml")
	if err != nil {
		t.Fatal(err)
	}
	parts, err := catalog.Decode("parts.toml", cb)
	if err != nil {
		t.Fatal(err)
	}
	rs := filter.Evaluate(p, parts, filter.Options{Strict: strict})
	filter.Rank(rs, filter.SortMargin)
	return p, rs
}

// Golden files for every format of rank, on a two-stage design with all
// candidates listed, and for derive's text and JSON.
func TestGolden(t *testing.T) {
	tests := []struct {
		name   string
		design string
		format report.Format
		all    bool
		strict bool
		width  int
		color  bool
		top    int
	}{
		{"rank_table.golden", "audio-split.toml", report.Table, true, false, 100, false, 0},
		{"rank_table_narrow.golden", "audio-split.toml", report.Table, true, false, 60, false, 0},
		{"rank_table_color.golden", "audio-split.toml", report.Table, false, false, 100, true, 0},
		{"rank_table_strict.golden", "audio-split.toml", report.Table, false, true, 100, false, 0},
		{"rank_table_top1.golden", "audio-split.toml", report.Table, false, false, 100, false, 1},
		{"rank_table_none.golden", "probe-3v3.toml", report.Table, false, false, 100, false, 0},
		{"rank.csv.golden", "audio-split.toml", report.CSV, true, false, 0, false, 0},
		{"rank.json.golden", "audio-split.toml", report.JSON, true, false, 0, false, 0},
		{"rank.md.golden", "audio-split.toml", report.Markdown, true, false, 0, false, 0},
		{"rank.toml.golden", "audio-split.toml", report.TOML, false, false, 0, false, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p, rs := fixture(t, tc.design, tc.strict)
			doc := &report.Doc{Plan: p, Results: rs, Sort: filter.SortMargin, All: tc.all, Strict: tc.strict,
				Width: tc.width, Color: tc.color, Top: tc.top, Sources: []string{"parts.toml"}, Meta: testMeta(tc.design)}
			var b bytes.Buffer
			if err := report.Write(&b, tc.format, doc); err != nil {
				t.Fatal(err)
			}
			checkGolden(t, tc.name, b.Bytes())
		})
	}
	for _, f := range []string{"text", "json"} {
		for _, design := range []string{"audio-split.toml", "direct-5v.toml", "square-5v.toml", "probe-3v3.toml"} {
			name := "derive_" + strings.TrimSuffix(design, ".toml") + "." + f + ".golden"
			t.Run(name, func(t *testing.T) {
				p, _ := fixture(t, design, false)
				var b bytes.Buffer
				if err := report.WriteDerive(&b, f, p, testMeta(design)); err != nil {
					t.Fatal(err)
				}
				checkGolden(t, name, b.Bytes())
			})
		}
	}
}

// The table fits the width it is given, and colour appears only when asked.
func TestTableWidth(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	for _, w := range []int{40, 60, 80, 100, 160} {
		doc := &report.Doc{Plan: p, Results: rs, All: true, Width: w}
		var b bytes.Buffer
		if err := report.WriteTable(&b, doc); err != nil {
			t.Fatal(err)
		}
		for _, line := range strings.Split(b.String(), "\n") {
			if n := len([]rune(line)); n > w {
				t.Errorf("width %d: line of %d runes: %q", w, n, line)
			}
		}
		if strings.Contains(b.String(), "\x1b[") {
			t.Errorf("width %d: colour without Color", w)
		}
	}
}

// JSON carries the contract fields with SI numbers; a margin that does not
// exist is null; pass ⇔ margin ≥ 0 on every numeric check.
func TestJSONContract(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	var b bytes.Buffer
	if err := report.WriteJSON(&b, &report.Doc{Plan: p, Results: rs, All: true}); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Title        string
		Requirements []map[string]any
		Candidates   []struct {
			ID          string   `json:"id"`
			Pass        bool     `json:"pass"`
			WorstMargin *float64 `json:"worst_margin"`
			Binding     *struct{ Stage, Key string }
			Packages    int
			Cost        *float64
			Checks      []struct {
				Stage    *string  `json:"stage"`
				Key      string   `json:"key"`
				Required *float64 `json:"required"`
				Margin   *float64 `json:"margin"`
				Pass     bool     `json:"pass"`
				Status   string   `json:"status"`
				Basis    string   `json:"basis"`
				Unit     string   `json:"unit"`
			}
		}
	}
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Candidates) != 5 || len(doc.Requirements) == 0 {
		t.Fatalf("%d candidates, %d requirements", len(doc.Candidates), len(doc.Requirements))
	}
	for _, c := range doc.Candidates {
		for _, ch := range c.Checks {
			if ch.Margin != nil && ch.Status != "unknown" && (*ch.Margin >= 0) != ch.Pass {
				t.Errorf("%s %s: margin %g, pass %v", c.ID, ch.Key, *ch.Margin, ch.Pass)
			}
			if ch.Key == "slew" && (ch.Unit != "V/s" || *ch.Required < 6e5 || *ch.Required > 6.5e5) {
				t.Errorf("%s slew: required %v %s, want ≈ 6.28e5 V/s", c.ID, *ch.Required, ch.Unit)
			}
			if ch.Status == "unknown" && ch.Margin != nil {
				t.Errorf("%s %s: unknown check with a margin", c.ID, ch.Key)
			}
		}
	}
}

// CSV is RFC 4180: every row has the header's field count.
func TestCSVShape(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	rows := csvRows(t, &report.Doc{Plan: p, Results: rs, All: true})
	if len(rows) != 6 {
		t.Errorf("%d rows, want header + 5", len(rows))
	}
}

// TestCautionInEveryFormat fails when any output of rank or derive loses
// the caution. Line-wrapped formats are compared with their comment marks,
// quote marks and line breaks folded into single spaces.
func TestCautionInEveryFormat(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	for _, f := range report.Formats() {
		t.Run(string(f), func(t *testing.T) {
			var b bytes.Buffer
			doc := &report.Doc{Plan: p, Results: rs, All: true, Width: 100}
			if err := report.Write(&b, f, doc); err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(folded(b.String()), report.Caution) {
				t.Errorf("%s output lacks the caution:\n%s", f, b.String())
			}
		})
	}
	for _, f := range []string{"text", "json"} {
		t.Run("derive "+f, func(t *testing.T) {
			var b bytes.Buffer
			if err := report.WriteDerive(&b, f, p, nil); err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(folded(b.String()), report.Caution) {
				t.Errorf("derive %s lacks the caution:\n%s", f, b.String())
			}
		})
	}
}

// folded joins wrapped lines: "# " and "> " marks and line breaks become
// single spaces, "**Caution.**"-style emphasis is kept as text.
func folded(s string) string {
	var words []string
	for _, l := range strings.Split(s, "\n") {
		l = strings.TrimLeft(l, "#> ")
		words = append(words, strings.Fields(l)...)
	}
	return strings.Join(words, " ")
}

// TestCSVCautionColumn: the CSV carries the caution as its last column, on
// the header row and on every data row, so a spreadsheet import keeps the
// header in row 1 (RFC 4180 has no comment lines; common practice, no
// source) and every row keeps the caution however it is sorted or cut.
func TestCSVCautionColumn(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	// csvRows reads with FieldsPerRecord 0: every row must match the header's count.
	rows := csvRows(t, &report.Doc{Plan: p, Results: rs, All: true})
	if rows[0][0] != "rank" {
		t.Errorf("first header cell %q, want rank (no line before the header)", rows[0][0])
	}
	last := len(rows[0]) - 1
	if rows[0][last] != report.CautionColumn {
		t.Errorf("last header cell %q, want %q", rows[0][last], report.CautionColumn)
	}
	for i, row := range rows[1:] {
		if row[last] != report.Caution {
			t.Errorf("row %d: caution cell %q, want the caution", i+1, row[last])
		}
	}
}

// The TOML export is a valid catalog: decoding it and ranking again gives
// the same parts in the same order.
func TestTOMLRoundTrip(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	var b bytes.Buffer
	doc := &report.Doc{Plan: p, Results: rs, All: true}
	if err := report.WriteTOML(&b, doc); err != nil {
		t.Fatal(err)
	}
	parts, err := catalog.Decode("export.toml", b.Bytes()) // Decode validates every part
	if err != nil {
		t.Fatalf("export does not decode to valid parts: %v", err)
	}
	again := filter.Evaluate(p, parts, filter.Options{})
	filter.Rank(again, filter.SortMargin)
	var want, got []string
	for _, r := range doc.Listed() {
		want = append(want, r.Part.ID)
	}
	for _, r := range again {
		got = append(got, r.Part.ID)
	}
	if !slices.Equal(got, want) {
		t.Errorf("order after round trip %v, want %v", got, want)
	}
}

// testMeta is a fixed Meta, so the JSON and Markdown goldens stay put.
func testMeta(design string) *report.Meta {
	return &report.Meta{Version: "test", Generated: time.Date(2026, 3, 4, 5, 6, 7, 0, time.UTC), File: design,
		Sources: []catalog.FileSum{{Path: "parts.toml", SHA256: strings.Repeat("0", 64), Parts: 5}}}
}

// The FMAX column: a frequency where a stage has a sine signal, "?" where
// a figure it needs is unknown, and "—" (not applicable) for every part
// when no stage has fmax (the square-signal design), so the column does
// not read as a row of unknowns.
func TestFMaxColumn(t *testing.T) {
	cell := func(t *testing.T, p *filter.Plan, rs []filter.Result) []string {
		t.Helper()
		var b bytes.Buffer
		if err := report.WriteMarkdown(&b, &report.Doc{Plan: p, Results: rs, All: true}); err != nil {
			t.Fatal(err)
		}
		var out []string
		for _, line := range strings.Split(b.String(), "\n") {
			f := strings.Split(line, "|")
			if len(f) == 12 && strings.HasPrefix(strings.TrimSpace(f[2]), "`") {
				out = append(out, strings.TrimSpace(f[9]))
			}
		}
		if len(out) != len(rs) {
			t.Fatalf("%d ranking rows, want %d:\n%s", len(out), len(rs), b.String())
		}
		return out
	}
	t.Run("no stage has fmax", func(t *testing.T) {
		p, rs := fixture(t, "square-5v.toml", false)
		if p.HasFMax() {
			t.Fatal("square design reports fmax")
		}
		for i, c := range cell(t, p, rs) {
			if c != "—" {
				t.Errorf("%s: fmax %q, want —", rs[i].Part.ID, c)
			}
		}
	})
	t.Run("sine stages", func(t *testing.T) {
		p, rs := fixture(t, "audio-split.toml", false)
		parts := make([]*catalog.Part, len(rs))
		for i := range rs {
			part := *rs[i].Part
			if i == 0 {
				part.Slew = catalog.Spec{} // unknown slew: fmax unknown
			}
			parts[i] = &part
		}
		rs = filter.Evaluate(p, parts, filter.Options{})
		unknownID := parts[0].ID
		for i, c := range cell(t, p, rs) {
			want := catalog.Format(rs[i].MinFMax(), catalog.Hertz)
			if rs[i].Part.ID == unknownID {
				want = "?"
			}
			if c != want || c == "—" {
				t.Errorf("%s: fmax %q, want %q", rs[i].Part.ID, c, want)
			}
		}
	})
}

// A failing cost check says "per unit": the COST column beside it is
// packages × unit cost, so a part in 2 packages at 0.92 shows 1.84 there
// while its check compares 0.92 with the limit.
func TestCostMissPerUnit(t *testing.T) {
	p, rs := fixture(t, "probe-3v3.toml", false)
	var limit float64
	for _, q := range p.Global {
		if q.Key == filter.KeyCost {
			limit = q.Value
		}
	}
	if limit == 0 {
		t.Fatal("probe-3v3.toml sets no max_unit_cost")
	}
	part := *rs[0].Part
	part.UnitCost = catalog.Some(2 * limit)
	r := filter.Evaluate(p, []*catalog.Part{&part}, filter.Options{})
	var b bytes.Buffer
	if err := report.WriteTable(&b, &report.Doc{Plan: p, Results: r, All: true}); err != nil {
		t.Fatal(err)
	}
	// The failing filter is named by its reason (filter/present).
	want := "over cost limit: needs ≤ " + catalog.Format(limit, catalog.Dimensionless) + " per unit, has " +
		catalog.Format(2*limit, catalog.Dimensionless) + " per unit"
	if !strings.Contains(b.String(), want) {
		t.Errorf("table lacks %q:\n%s", want, b.String())
	}
}
