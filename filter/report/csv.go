package report

import (
	"encoding/csv"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
)

// WriteCSV writes one RFC 4180 row per listed candidate: rank, the key
// figures (SI units, plain numbers; empty when unknown), then for every
// numeric requirement the part's worst-case figure and the margin. The
// failing column lists "check:margin" pairs separated by ";".
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
		row := []string{rank, r.Part.ID, r.Part.Name, strconv.FormatBool(r.Pass), csvNum(present.ShownMargin(r)),
			present.RowMargin(r), binding, reason,
			strconv.Itoa(r.Packages), csvNum(r.Cost), csvNum(r.SupplyCurrent), csvNum(r.MinFMax()),
			strconv.Itoa(r.Failed), strconv.Itoa(r.Unknown), strings.Join(failing, ";")}
		for j := range r.Checks {
			c := &r.Checks[j]
			switch c.Req.Bound {
			case filter.BoundMin, filter.BoundMax:
				row = append(row, csvNum(c.Available), csvNum(c.Margin))
			case filter.BoundRange:
				row = append(row, csvNum(c.Margin))
			}
		}
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
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
