package report

import (
	"encoding/csv"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
)

// CautionColumn is the header of the last column of every CSV opsift
// writes; each data row carries Caution in it. A column rather than a
// leading "# ..." line: CSV has no comment syntax, and spreadsheet importers
// read such a line as the first row (taking it for the header), while a
// column keeps the header in row 1 and the caution on every row that is
// filtered, sorted or pasted elsewhere.
const CautionColumn = "caution"

// BOM is the UTF-8 byte-order mark `--bom` puts before CSV: without it
// common spreadsheet programs read a CSV file in a legacy 8-bit code page
// and show µ, ° and √ as two odd characters each (common practice, no
// source); with it they read UTF-8.
const BOM = "\uFEFF"

// WriteCSV writes one RFC 4180 row per listed candidate: rank, the key
// figures (SI units, plain numbers; empty when unknown), then for every
// numeric requirement the part's worst-case figure and the margin, and last
// the caution. The failing column lists "check:margin" pairs separated by
// ";".
func WriteCSV(w io.Writer, doc *Doc) error {
	cw := csv.NewWriter(w)
	reqs := doc.Plan.Requirements()
	head := []string{"rank", "id", "name", "pass", "worst_margin", "margin_shown", "binding", "fail_reason", "packages", "cost",
		"supply_current_a", "fmax_hz", "failed", "unknown", "failing"}
	for i := range reqs {
		q := &reqs[i]
		name := present.CheckName(q.Stage, q.Key)
		switch q.Bound {
		case filter.BoundMin, filter.BoundMax:
			head = append(head, name+" available_"+unitSlug(q.Unit), name+" margin")
		case filter.BoundRange:
			head = append(head, name+" margin")
		}
	}
	for i := range head {
		head[i] = csvText(head[i])
	}
	head = append(head, CautionColumn)
	if err := cw.Write(head); err != nil {
		return err
	}
	for i, r := range doc.Listed() {
		rank := ""
		if r.Pass {
			rank = strconv.Itoa(i + 1)
		}
		binding := ""
		if r.Pass && !math.IsNaN(r.WorstMargin) {
			binding = present.CheckName(r.Binding.Stage, r.Binding.Key)
		}
		var failing []string
		for _, c := range failingOrUnknown(r, doc.Strict) {
			failing = append(failing, present.CheckName(c.Req.Stage, c.Req.Key)+":"+csvNum(c.Margin))
		}
		reason := ""
		if w := present.Worst(r); w != nil {
			reason = present.Reason(w)
		}
		row := []string{rank, csvText(r.Part.ID), csvText(r.Part.Name), strconv.FormatBool(r.Pass), csvNum(present.ShownMargin(r)),
			csvMargin(present.RowMargin(r)), csvText(binding), csvText(reason),
			strconv.Itoa(r.Packages), csvNum(r.Cost), csvNum(r.SupplyCurrent), csvNum(r.MinFMax()),
			strconv.Itoa(r.Failed), strconv.Itoa(r.Unknown), csvText(strings.Join(failing, ";"))}
		for j := range r.Checks {
			c := &r.Checks[j]
			switch c.Req.Bound {
			case filter.BoundMin, filter.BoundMax:
				row = append(row, csvNum(c.Available), csvNum(c.Margin))
			case filter.BoundRange:
				row = append(row, csvNum(c.Margin))
			}
		}
		row = append(row, Caution)
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// csvText makes a text cell safe to open in a spreadsheet: unsafe runes
// are escaped (safe.Text), and a cell a spreadsheet would read as a
// formula (starting with =, +, -, @, tab or CR) gets a leading apostrophe,
// the usual neutralisation. Only text cells pass through here: numeric
// cells (csvNum) are numbers, so -0.5 stays -0.5.
func csvText(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		s = "'" + s
	}
	return safe.Text(s)
}

// shownMargin is the grammar of a percentage present.Margin writes
// ("+3.2 %", "-44 %"); the ratio ("×17") and None start with no formula
// character.
var shownMargin = regexp.MustCompile(`^[+-][0-9]+(\.[0-9])? %$`)

// csvMargin writes the margin_shown cell. A signed percentage of
// present.Margin starts with + or -, which csvText would take for a
// formula; it is the program's own figure and a spreadsheet reads it as
// that percentage, so it is written as it is. Anything else goes through
// csvText.
func csvMargin(s string) string {
	if shownMargin.MatchString(s) {
		return s
	}
	return csvText(s)
}

// csvNum writes a number with 12 significant digits, "" for NaN.
func csvNum(v float64) string {
	if math.IsNaN(v) {
		return ""
	}
	if math.IsInf(v, 0) {
		return strconv.FormatFloat(math.Copysign(math.MaxFloat64, v), 'g', 12, 64)
	}
	return strconv.FormatFloat(v, 'g', 12, 64)
}

// unitSlug turns a unit into a header-safe ASCII word: "V/s" → "v_per_s".
func unitSlug(u string) string {
	if u == "" {
		return "ratio"
	}
	r := strings.NewReplacer("/", "_per_", "Ω", "ohm", "√", "rt", "°", "")
	return strings.ToLower(r.Replace(u))
}
