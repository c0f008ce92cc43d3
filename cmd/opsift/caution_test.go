package main

import (
	"encoding/csv"
	"strings"
	"testing"

	"github.com/opsift/opsift/filter/report"
)

// TestCautionInEveryOutput runs each command in each of its formats and
// fails when the output lacks the caution. Wrapped text is compared with
// its comment and quote marks and line breaks folded into single spaces.
func TestCautionInEveryOutput(t *testing.T) {
	var runs [][]string
	for _, f := range []string{"table", "csv", "json", "md", "toml"} {
		runs = append(runs, []string{"rank", "--format", f})
	}
	for _, f := range []string{"text", "json"} {
		runs = append(runs, []string{"derive", "--format", f})
		runs = append(runs, []string{"preview", "gp4-bip", "--format", f, "--points", "6"})
	}
	for _, f := range []string{"table", "json", "md", "csv"} {
		runs = append(runs, []string{"replace", "bq4-old", "--catalog", replaceCat, "--format", f})
		runs = append(runs, []string{"replace", "bq4-old", "--catalog", replaceCat, "--design", replaceDesign, "--format", f})
	}
	for _, args := range runs {
		t.Run(strings.Join(args, " "), func(t *testing.T) {
			r := runCLI(t, false, nil, args...)
			if r.code != 0 {
				t.Fatalf("exit %d, stderr %q", r.code, r.stderr)
			}
			if !strings.Contains(foldText(r.stdout), caution) {
				t.Errorf("output lacks the caution:\n%s", r.stdout)
			}
		})
	}
}

// TestCSVOutputsImportCleanly: both CSV outputs parse as RFC 4180 with the
// header in row 1 and the caution column last on every row.
func TestCSVOutputsImportCleanly(t *testing.T) {
	for _, args := range [][]string{
		{"rank", "--format", "csv", "--all"},
		{"replace", "bq4-old", "--catalog", replaceCat, "--design", replaceDesign, "--format", "csv"},
	} {
		t.Run(args[0], func(t *testing.T) {
			r := runCLI(t, false, nil, args...)
			rows, err := csv.NewReader(strings.NewReader(r.stdout)).ReadAll()
			if err != nil {
				t.Fatalf("does not parse: %v", err)
			}
			if len(rows) < 2 || rows[0][0] != "rank" {
				t.Fatalf("%d rows, header %q: want the header first and data rows", len(rows), rows[0])
			}
			last := len(rows[0]) - 1
			if rows[0][last] != report.CautionColumn {
				t.Errorf("last header cell %q, want %q", rows[0][last], report.CautionColumn)
			}
			for i, row := range rows[1:] {
				if row[last] != caution {
					t.Errorf("row %d: last cell %q, want the caution", i+1, row[last])
				}
			}
		})
	}
}

// foldText joins wrapped lines into single-spaced text, dropping "# " and
// "> " line marks and JSON string quotes around the caution.
func foldText(s string) string {
	var words []string
	for _, l := range strings.Split(s, "\n") {
		words = append(words, strings.Fields(strings.TrimLeft(l, "#> "))...)
	}
	return strings.Join(words, " ")
}
