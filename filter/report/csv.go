package report

import (
	"encoding/csv"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
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
	head := []string{"rank", "id", "name", "pass", "worst_margin", "binding", "packages", "cost",
		"supply_current_a", "fmax_hz", "failed", "unknown", "failing"}
	for i := range reqs {
		q := &reqs[i]
		name := CheckName(q.Stage, q.Key)
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
		if !math.IsNaN(r.WorstMargin) {
			binding = CheckName(r.Binding.Stage, r.Binding.Key)
		}
		var failing []string
		for _, c := range failingOrUnknown(r, doc.Strict) {
			failing = append(failing, CheckName(c.Req.Stage, c.Req.Key)+":"+csvNum(c.Margin))
		}
		row := []string{rank, csvText(r.Part.ID), csvText(r.Part.Name), strconv.FormatBool(r.Pass), csvNum(r.WorstMargin),
			csvText(binding), strconv.Itoa(r.Packages), csvNum(r.Cost), csvNum(r.SupplyCurrent), csvNum(r.MinFMax()),
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
