package report_test

import (
	"bytes"
	"encoding/csv"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter/listing"
	"github.com/opsift/opsift/filter/report"
)

// listFixture is the listing of the report fixture's parts with every
// column.
func listFixture(t *testing.T, edit func(i int, p *catalog.Part)) *report.ListDoc {
	t.Helper()
	p, rs := fixture(t, "audio-split.toml", false)
	editParts(rs, edit)
	cols := listing.Columns()
	return &report.ListDoc{Plan: p, Rows: listing.Build(p, rs, nil, cols, false), Columns: cols,
		Sort: listing.SortKey{Key: "id"}, Sources: []string{"test"}}
}

// The listing's CSV goes through the same neutralisation as rank's (OWASP
// CSV injection; from memory): a text cell starting with =, +, -, @, tab or
// CR gets an apostrophe, numbers stay numbers, and every row carries the
// caution in its last column.
func TestListCSVNeutralisesFormulas(t *testing.T) {
	starts := []string{"=1+2", "+1", "-cmd", "@SUM(A1)", "\tx", "\rx", "plain"}
	doc := listFixture(t, func(i int, part *catalog.Part) { part.Name, part.Pinout = starts[i%len(starts)], "=HYPERLINK(1)" })
	var b bytes.Buffer
	if err := report.WriteList(&b, report.CSV, doc); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	head := rows[0]
	if head[len(head)-1] != report.CautionColumn {
		t.Errorf("last column %q, want %q", head[len(head)-1], report.CautionColumn)
	}
	pinout := -1
	for i, h := range head {
		if h == "pinout" {
			pinout = i
		}
	}
	for _, row := range rows[1:] {
		if name := row[1]; name != "plain" && !strings.HasPrefix(name, "'") {
			t.Errorf("name cell %q not neutralised", name)
		}
		if row[pinout] != "'=HYPERLINK(1)" {
			t.Errorf("pinout cell %q not neutralised", row[pinout])
		}
		if row[len(row)-1] != report.Caution {
			t.Errorf("row %s lacks the caution", row[0])
		}
	}
}

// Every listing format stays clean of control bytes with hostile strings
// in every text field.
func TestListFormatsAreClean(t *testing.T) {
	doc := listFixture(t, func(_ int, part *catalog.Part) {
		part.Name, part.Pinout, part.Datasheet = hostile, hostile, hostile
		part.Packages = append([]string{hostile}, part.Packages...)
	})
	doc.Plan.Title = hostile
	for _, f := range report.ListFormats() {
		var b bytes.Buffer
		if err := report.WriteList(&b, f, doc); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		if err := safe.CheckOutput(b.String()); err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
	if err := report.WriteList(&bytes.Buffer{}, report.TOML, doc); err == nil {
		t.Error("toml listing was accepted")
	}
}
