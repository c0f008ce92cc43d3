// Package report renders ranked results and derived requirements for
// people and programs: an aligned table for the terminal, CSV, JSON (the
// contract of DESIGN.md "JSON output of rank", SI units), a Markdown
// shortlist for design review, and the ranked parts as a catalog file. The
// command line and the TUI's shortlist export share it.
//
//	filter.Plan + ranked []filter.Result ─► Doc ─► Write(w, format, doc)
//	filter.Plan ─────────────────────────────────► WriteDerive(w, format, plan, meta)
package report

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/headroom"
	"github.com/opsift/opsift/filter/present"
)

// Caution is carried by every export: opsift's results are advisory.
const Caution = "Results are advisory: verify every figure against the current manufacturer " +
	"datasheet. Mains-powered, medical and safety-critical designs need the applicable " +
	"standards, local codes and qualified review."

// Format names an output format of rank.
type Format string

// The formats Write renders.
const (
	Table    Format = "table"
	CSV      Format = "csv"
	JSON     Format = "json"
	Markdown Format = "md"
	TOML     Format = "toml"
)

// Formats lists the formats of Write in help order.
func Formats() []Format { return []Format{Table, CSV, JSON, Markdown, TOML} }

// ParseFormat reads a format name; "" is Table.
func ParseFormat(s string) (Format, error) {
	if s == "" {
		return Table, nil
	}
	var names []string
	for _, f := range Formats() {
		if string(f) == s {
			return f, nil
		}
		names = append(names, string(f))
	}
	return "", fmt.Errorf("unknown format %q, want one of %s", s, strings.Join(names, ", "))
}

// Doc is what a rank export shows: the plan, the ranked results and how
// to select and lay them out.
type Doc struct {
	Plan    *filter.Plan
	Results []filter.Result // ranked (filter.Rank)
	Sort    filter.SortKey
	All     bool // list failing candidates too (after the passing ones)
	Top     int  // at most this many candidates; 0 = no limit
	Strict  bool // unknown checks counted as failures
	// Sources names the catalog sources, for the document's header.
	Sources []string
	// SetAside lists the catalog's parts and files left out for problems
	// (catalog.Catalog.SetAside), listed by the json and md documents.
	SetAside []catalog.SetAside
	// Meta says what the document was made from (version, date, design
	// file, catalog hashes); the JSON and Markdown writers carry it.
	Meta  *Meta
	Width int  // table: terminal width in columns (0 = 100; Unclipped: no limit)
	Color bool // table: ANSI colour
	// NoHeadroom leaves the candidates' headroom out of the json and md
	// documents (a large shortlist searches every input of every part).
	NoHeadroom bool
	// HeadroomTop, when positive, searches headroom only for the first
	// HeadroomTop passing candidates listed (the search evaluates every
	// design input of a part dozens of times); the rest carry none.
	HeadroomTop int
	// Compare, when set, adds a side-by-side section of the listed parts
	// to the md document (the selector's shortlist export).
	Compare *compare.Table
	// headroom holds each listed candidate's headroom once computed.
	headroom map[*catalog.Part][]headroom.Limit
	// headroomTop holds the candidates within HeadroomTop, once listed.
	headroomTop map[*filter.Result]bool
}

// Listed returns the candidates the document lists: passing ones (all of
// them with All), at most Top.
func (d *Doc) Listed() []*filter.Result {
	var out []*filter.Result
	for i := range d.Results {
		r := &d.Results[i]
		if !r.Pass && !d.All {
			continue
		}
		if d.Top > 0 && len(out) >= d.Top {
			break
		}
		out = append(out, r)
	}
	return out
}

// Passing counts the passing results.
func (d *Doc) Passing() int {
	n := 0
	for i := range d.Results {
		if d.Results[i].Pass {
			n++
		}
	}
	return n
}

// Write renders doc in format f.
func Write(w io.Writer, f Format, doc *Doc) error {
	switch f {
	case Table:
		return WriteTable(w, doc)
	case CSV:
		return WriteCSV(w, doc)
	case JSON:
		return WriteJSON(w, doc)
	case Markdown:
		return WriteMarkdown(w, doc)
	case TOML:
		return WriteTOML(w, doc)
	}
	return fmt.Errorf("unknown format %q", f)
}

// WriteTOML writes the listed parts, in rank order, as a catalog file.
func WriteTOML(w io.Writer, doc *Doc) error {
	var parts []*catalog.Part
	for _, r := range doc.Listed() {
		parts = append(parts, r.Part)
	}
	var head strings.Builder
	fmt.Fprintf(&head, "# opsift rank: %s\n# %d candidate(s), sorted by %s.\n", oneLine(doc.Plan.Title), len(parts), sortName(doc.Sort))
	for _, l := range present.Wrap(Caution, 76, "") {
		head.WriteString("# " + l + "\n")
	}
	head.WriteString("\n")
	if _, err := io.WriteString(w, head.String()); err != nil {
		return err
	}
	return catalog.Encode(w, parts)
}

func sortName(k filter.SortKey) string {
	if k == "" {
		return string(filter.SortMargin)
	}
	return string(k)
}

func oneLine(s string) string { return safe.Text(strings.Join(strings.Fields(s), " ")) }

// Need renders what a requirement asks: "≥ 0.628 V/µs", "≤ 250 mV",
// "1 V … 11 V", or the hard filter's wording.
func Need(q *filter.Requirement) string {
	switch q.Bound {
	case filter.BoundMin:
		return "≥ " + catalog.Format(q.Value, q.Dim)
	case filter.BoundMax:
		return "≤ " + catalog.Format(q.Value, q.Dim)
	case filter.BoundRange:
		if q.Low == q.High {
			return "at " + catalog.Format(q.Low, q.Dim)
		}
		return catalog.Format(q.Low, q.Dim) + " … " + catalog.Format(q.High, q.Dim)
	}
	switch q.Key {
	case filter.KeyTemperature:
		return catalog.Format(q.Low, catalog.Celsius) + " … " + catalog.Format(q.High, catalog.Celsius)
	case filter.KeyCost:
		return "≤ " + catalog.Format(q.Value, catalog.Dimensionless)
	}
	return strings.Join(q.Allowed, " | ")
}

// CheckNeed renders what a check asked of its part: Need, except that a
// requirement computed per part (Requirement.Need: the gbw a sine stage
// needs with the part's own Aol) shows that part's figure, "≥ 585 kHz",
// and an unbounded one reads "more than any finite value".
func CheckNeed(c *filter.Check) string {
	q := c.Req
	if q.Need == nil || (q.Bound != filter.BoundMin && q.Bound != filter.BoundMax) {
		return Need(q)
	}
	if math.IsInf(c.Required, 1) {
		return "more than any finite value"
	}
	if math.IsNaN(c.Required) {
		return "?"
	}
	op := "≥ "
	if q.Bound == filter.BoundMax {
		op = "≤ "
	}
	return op + catalog.Format(c.Required, q.Dim)
}

// Has renders what the part offers for a check, in the requirement's unit.
func Has(c *filter.Check, p *catalog.Part) string {
	q := c.Req
	switch q.Bound {
	case filter.BoundMin, filter.BoundMax:
		if math.IsNaN(c.Available) {
			return "?"
		}
		if c.Aside.Kind != filter.AsideNone {
			return catalog.Format(c.Available, q.Dim) + " (" + c.Aside.Text() + ")"
		}
		return catalog.Format(c.Available, q.Dim)
	case filter.BoundRange:
		lo, hi := "?", "?"
		if !math.IsNaN(c.AvailLow) {
			lo = catalog.Format(c.AvailLow, q.Dim)
		}
		if !math.IsNaN(c.AvailHigh) {
			hi = catalog.Format(c.AvailHigh, q.Dim)
		}
		return lo + " … " + hi
	}
	switch q.Key {
	case filter.KeyTemperature:
		if math.IsNaN(c.AvailLow) {
			return "?"
		}
		return catalog.Format(c.AvailLow, catalog.Celsius) + " … " + catalog.Format(c.AvailHigh, catalog.Celsius)
	case filter.KeyCost:
		if math.IsNaN(c.Available) {
			return "?"
		}
		return catalog.Format(c.Available, catalog.Dimensionless)
	case filter.KeyPackage:
		return strings.Join(p.Packages, ", ")
	case filter.KeyTech:
		return orUnknown(string(p.Tech))
	case filter.KeyLifecycle:
		return orUnknown(string(p.Lifecycle))
	}
	return ""
}

func orUnknown(s string) string {
	if s == "" {
		return "?"
	}
	return s
}

// cost renders a cost, "?" when unknown.
func cost(v float64) string {
	if math.IsNaN(v) {
		return "?"
	}
	return fmt.Sprintf("%.2f", v)
}

// fmaxText is a candidate's smallest stage fmax: "—" when no stage of the
// plan has one (not applicable), "?" when a figure it needs is unknown.
func fmaxText(p *filter.Plan, r *filter.Result) string {
	if !p.HasFMax() {
		return notApplicable
	}
	return quantity(r.MinFMax(), catalog.Hertz)
}

// notApplicable marks a figure that does not apply to the design.
const notApplicable = "—"

// quantity renders an SI value, "?" when unknown (NaN).
func quantity(v float64, d catalog.Dim) string {
	if math.IsNaN(v) {
		return "?"
	}
	return catalog.Format(v, d)
}
