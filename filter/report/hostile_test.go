package report_test

import (
	"bytes"
	"encoding/csv"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/report"
)

// hostile carries OSC 52, OSC 0, CSI 2J, CR LF, a C1 CSI, DEL, a bidi
// override and a zero-width space (ECMA-48; Unicode Standard Annex #9;
// from memory).
const hostile = "x\x1b]52;c;aGk=\x07\x1b]0;t\x07\x1b[2J\r\n\u009b2J\x7f\u202e\u200b"

// TestEveryFormatIsClean gives every data string of a document hostile
// content (as parts built in code can have, bypassing catalog checks) and
// scans each format, the coloured table too, for control bytes that are
// not the program's own styling.
func TestEveryFormatIsClean(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	p.Title = hostile
	editParts(rs, func(_ int, part *catalog.Part) {
		part.Name, part.Notes, part.Datasheet, part.Pinout = hostile, hostile, hostile, hostile
		part.Packages = append([]string{hostile}, part.Packages...)
	})
	meta := &report.Meta{Version: hostile, File: hostile, Sources: []catalog.FileSum{{Path: hostile, SHA256: hostile, Parts: 1}},
		Warnings: []filter.Warning{{Stage: hostile, Field: hostile, Text: hostile}}}
	for _, f := range report.Formats() {
		for _, color := range []bool{false, true} {
			doc := &report.Doc{Plan: p, Results: rs, All: true, Sources: []string{hostile}, Color: color, Meta: meta}
			var b bytes.Buffer
			if err := report.Write(&b, f, doc); err != nil {
				t.Fatalf("%s: %v", f, err)
			}
			if err := safe.CheckOutput(b.String()); err != nil {
				t.Errorf("%s (colour %v): %v", f, color, err)
			}
		}
	}
	for _, format := range []string{"text", "json"} {
		var b bytes.Buffer
		if err := report.WriteDerive(&b, format, p, meta); err != nil {
			t.Fatal(err)
		}
		if err := safe.CheckOutput(b.String()); err != nil {
			t.Errorf("derive %s: %v", format, err)
		}
	}
}

// TestCSVNeutralisesFormulas: a text cell starting with =, +, -, @, tab
// or CR gets a leading apostrophe (the neutralisation OWASP describes for
// CSV injection; from memory); numeric cells such as -0.5 stay numbers.
func TestCSVNeutralisesFormulas(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	starts := []string{"=1+2", "+1", "-cmd", "@SUM(A1)", "\tx", "\rx", "plain"}
	editParts(rs, func(i int, part *catalog.Part) { part.Name = starts[i%len(starts)] })
	rows := csvRows(t, &report.Doc{Plan: p, Results: rs, All: true})
	negative := false
	for _, row := range rows[1:] {
		name := row[2]
		if name != "plain" && !strings.HasPrefix(name, "'") {
			t.Errorf("name cell %q not neutralised", name)
		}
		if strings.HasPrefix(row[4], "-") {
			negative = true // worst_margin of a failing part: a number, as written
		}
		// margin_shown is the program's own percentage ("+3.5 %", "-97 %",
		// "—"): written as it is, not taken for a formula.
		if shown := row[5]; strings.HasPrefix(shown, "'") || shown == "" {
			t.Errorf("margin_shown cell %q: want the margin text as written", shown)
		}
	}
	if !negative {
		t.Error("no negative margin in the fixture; the test does not cover numbers")
	}
}

// TestMarkdownLinks: only http(s) datasheet links are written, and HTML
// in a name is escaped.
func TestMarkdownLinks(t *testing.T) {
	p, rs := fixture(t, "audio-split.toml", false)
	links := []string{"javascript:alert(1)", "data:text/html,<b>x</b>", "file:///etc/passwd", "https://example.invalid/a.pdf"}
	editParts(rs, func(i int, part *catalog.Part) {
		part.Datasheet = links[i%len(links)]
		part.Name = "<img src=x onerror=alert(1)>"
	})
	var b bytes.Buffer
	if err := report.WriteMarkdown(&b, &report.Doc{Plan: p, Results: rs, All: true}); err != nil {
		t.Fatal(err)
	}
	md := b.String()
	for _, bad := range []string{"javascript:", "data:", "file:", "<img"} {
		if strings.Contains(md, bad) {
			t.Errorf("markdown holds %q", bad)
		}
	}
	for _, good := range []string{"datasheet https://example.invalid/a.pdf", "&lt;img src=x onerror=alert(1)&gt;"} {
		if !strings.Contains(md, good) {
			t.Errorf("markdown lacks %q", good)
		}
	}
}

// editParts gives every result a copy of its part changed by edit.
func editParts(rs []filter.Result, edit func(i int, p *catalog.Part)) {
	for i := range rs {
		part := *rs[i].Part
		edit(i, &part)
		rs[i].Part = &part
	}
}

// csvRows renders doc as CSV and reads it back.
func csvRows(t *testing.T, doc *report.Doc) [][]string {
	t.Helper()
	var b bytes.Buffer
	if err := report.WriteCSV(&b, doc); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}
