package report

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/present"
)

// CompareDoc is what opsift compare (and the selector's compare export)
// writes: the comparison and where its parts came from.
type CompareDoc struct {
	Table   *compare.Table
	Sources []string // catalog source names
	// Width is the terminal width the table fits its label column to
	// (0: as wide as the labels); the part columns are never cut.
	Width int
	// Meta says what the comparison was made from: the block every JSON
	// output opens with (meta.go).
	Meta *Meta
}

// compareLabelMin is the narrowest the table's label column gets.
const compareLabelMin = 16

// BestMark follows the best value of a row in every compare format but
// CSV and JSON (which carry a best column or flag): a character, so the
// mark does not rest on colour.
const BestMark = "◆"

// compareLegend explains the mark and the basis letters.
const compareLegend = BestMark + " best in the row. Basis: unmarked guaranteed limit, ~ typical figure × the design's policy, " +
	"g typical read off a graph × the policy; — the catalog does not give it; ? a check its figures cannot decide; s a check measured by simulation (thd). Rows whose differences decide the choice come first: " +
	"checks some parts fail, then checks and figures by how far apart they lie; rows with no difference last."

// compareCell renders one cell for people: a figure with its basis
// mark (BasisMark), a check's margin (or pass/fail for a hard filter), "?" an
// unknown check, "—" a figure the catalog does not give.
func compareCell(r *compare.Row, c compare.Cell) string {
	var s string
	switch {
	case r.Kind == compare.Check && c.Status == filter.StatusUnknown:
		s = "?"
	case r.Kind == compare.Check && math.IsNaN(c.V):
		s = c.Status.String()
	case r.Kind == compare.Check:
		s = present.Margin(c.V)
		if c.Status == filter.StatusFail {
			s += " fail"
		}
		if c.Basis == filter.BasisSimulated {
			s = WithBasis(s, c.Basis)
		}
	case !c.Known:
		s = "—"
	default:
		s = catalog.Format(c.V, r.Dim)
		if r.Key == "cost" {
			s = cost(c.V)
		}
		s = WithBasis(s, c.Basis)
	}
	return s
}

// markCell is a rendered cell and whether it is the row's best.
type markCell struct {
	text string
	best bool
}

// plain is the cell with the mark after it, for the terminal table.
func (c markCell) plain() string {
	if c.best {
		return c.text + " " + BestMark
	}
	return c.text
}

// CompareKey is the one-line key of the compare view's marks, for a pane
// too narrow for the whole legend.
const CompareKey = BestMark + " best · unmarked guaranteed · ~ typical × policy · g read off a graph · s simulated · — not given"

// compareSummary is the head of every compare format: passes, worst
// margin (best marked) and binding check per part.
func compareSummary(t *compare.Table) [][]markCell {
	pass := []markCell{{text: "passes"}}
	worst := []markCell{{text: "worst margin"}}
	bind := []markCell{{text: "binding"}}
	best := math.NaN()
	for i := range t.Results {
		r := &t.Results[i]
		if r.Pass && (math.IsNaN(best) || r.WorstMargin > best) {
			best = r.WorstMargin
		}
	}
	for i := range t.Results {
		r := &t.Results[i]
		p := "yes"
		if !r.Pass {
			p = fmt.Sprintf("no (%d failing)", r.Failed)
		}
		pass = append(pass, markCell{text: p})
		worst = append(worst, markCell{text: present.RowMargin(r), best: r.Pass && r.WorstMargin == best})
		b := "—"
		if !math.IsNaN(r.WorstMargin) {
			b = present.CheckName(r.Binding.Stage, r.Binding.Key)
		}
		bind = append(bind, markCell{text: b})
	}
	return [][]markCell{pass, worst, bind}
}

// compareLines are the table's rows below the header: the summary, then
// each row's label and cells.
func compareLines(t *compare.Table) [][]markCell {
	out := compareSummary(t)
	for i := range t.Rows {
		r := &t.Rows[i]
		line := []markCell{{text: rowLabel(r)}}
		for _, c := range r.Cells {
			line = append(line, markCell{text: compareCell(r, c), best: c.Best})
		}
		out = append(out, line)
	}
	return out
}

// CompareCells returns the comparison as the terminal table shows it: the
// header (the part ids, after an empty label cell) and one line per row —
// the pass, worst-margin and binding head, then the figure and check rows
// in order — each a label and one cell per part, the best marked with
// BestMark. The selector's compare view draws these, so it shows the same
// numbers as opsift compare.
func CompareCells(t *compare.Table) (head []string, lines [][]string) {
	head = append([]string{""}, compareIDs(t)...)
	for _, l := range compareLines(t) {
		line := make([]string, len(l))
		for i, c := range l {
			line[i] = c.plain()
		}
		lines = append(lines, line)
	}
	return head, lines
}

// CompareLegend is the line that explains the mark and the basis letters.
func CompareLegend() string { return compareLegend }

// rowLabel is a row's first cell: "check gain/slew", "slew rate".
func rowLabel(r *compare.Row) string {
	if r.Kind == compare.Check {
		return "check " + r.Label
	}
	return r.Label
}

// WriteCompare renders doc as table, md, json or csv.
func WriteCompare(w io.Writer, f Format, doc *CompareDoc) error {
	switch f {
	case Table:
		return writeCompareTable(w, doc)
	case Markdown:
		return writeCompareMarkdown(w, doc)
	case JSON:
		return writeCompareJSON(w, doc)
	case CSV:
		return writeCompareCSV(w, doc)
	}
	return fmt.Errorf("compare: unknown format %q, want table, md, json or csv", f)
}

func compareIDs(t *compare.Table) []string {
	ids := make([]string, len(t.Results))
	for i := range t.Results {
		ids[i] = safe.Text(t.Results[i].Part.ID)
	}
	return ids
}

func writeCompareTable(w io.Writer, doc *CompareDoc) error {
	t := doc.Table
	head, rows := CompareCells(t)
	head[0] = "compare: " + oneLine(t.Plan.Title)
	lines := append([][]string{head}, rows...)
	widths := make([]int, len(lines[0]))
	for _, l := range lines[1:] {
		for i, c := range l {
			widths[i] = max(widths[i], present.Width(c))
		}
	}
	widths[0] = max(widths[0], 12)
	for i := 1; i < len(widths); i++ {
		widths[i] = max(widths[i], present.Width(lines[0][i]))
	}
	if doc.Width > 0 {
		// Narrow the label column (down to compareLabelMin) before the
		// table runs past the terminal; the values stay whole.
		rest := 2 * (len(widths) - 1)
		for _, x := range widths[1:] {
			rest += x
		}
		widths[0] = max(min(widths[0], doc.Width-rest), compareLabelMin)
		for _, l := range lines[1:] {
			l[0] = present.Clip(l[0], widths[0])
		}
	}
	b := bufio.NewWriter(w)
	title := lines[0][0]
	if doc.Width > 0 {
		title = present.Clip(title, doc.Width)
	}
	fmt.Fprintf(b, "%s\n\n", title)
	lines[0][0] = ""
	for li, l := range lines {
		for i, c := range l {
			if i > 0 {
				b.WriteString("  ")
			}
			pad := widths[i] - present.Width(c)
			if i == 0 {
				b.WriteString(c + strings.Repeat(" ", pad))
			} else {
				b.WriteString(strings.Repeat(" ", pad) + c)
			}
		}
		b.WriteByte('\n')
		if li == 0 || li == 3 {
			total := len(widths) * 2
			for _, x := range widths {
				total += x
			}
			b.WriteString(strings.Repeat("─", total-2) + "\n")
		}
	}
	b.WriteByte('\n')
	textW := DefaultWidth
	if doc.Width > 0 {
		textW = min(textW, doc.Width)
	}
	wrap(b, compareLegend, textW)
	wrap(b, "Caution: "+Caution, textW)
	return b.Flush()
}

func writeCompareMarkdown(w io.Writer, doc *CompareDoc) error {
	var buf bytes.Buffer
	writeCompareSection(&buf, doc.Table, "#")
	fmt.Fprintf(&buf, "\n> **Caution.** %s\n", Caution)
	_, err := io.WriteString(w, safe.Lines(buf.String()))
	return err
}

// writeCompareSection writes the comparison as a Markdown section whose
// heading is at level h ("#", "##"), for opsift compare and for the
// selector's shortlist document.
func writeCompareSection(b io.Writer, t *compare.Table, h string) {
	fmt.Fprintf(b, "%s Compared: %s\n\n", h, mdText(oneLine(t.Plan.Title)))
	ids := compareIDs(t)
	io.WriteString(b, "| Row |")
	for _, id := range ids {
		fmt.Fprintf(b, " `%s` |", id)
	}
	io.WriteString(b, "\n|---|"+strings.Repeat("---:|", len(ids))+"\n")
	for _, l := range compareLines(t) {
		io.WriteString(b, "|")
		for _, c := range l {
			if c.best {
				fmt.Fprintf(b, " **%s** %s |", mdText(c.text), BestMark)
				continue
			}
			fmt.Fprintf(b, " %s |", mdText(c.text))
		}
		io.WriteString(b, "\n")
	}
	fmt.Fprintf(b, "\n%s\n", mdText(compareLegend))
}

type jsonCompare struct {
	JSONMeta
	Title   string            `json:"title"`
	Caution string            `json:"caution"`
	Parts   []jsonComparePart `json:"parts"`
	Rows    []jsonCompareRow  `json:"rows"`
}

type jsonComparePart struct {
	ID          string       `json:"id"`
	Name        string       `json:"name"`
	Pass        bool         `json:"pass"`
	WorstMargin *num         `json:"worst_margin"`
	Binding     *jsonBinding `json:"binding"`
	FailReason  string       `json:"fail_reason,omitempty"`
}

type jsonCompareRow struct {
	Kind    string             `json:"kind"`
	Stage   *string            `json:"stage,omitempty"`
	Key     string             `json:"key"`
	Label   string             `json:"label"`
	Unit    string             `json:"unit"`
	Better  string             `json:"better"`
	Decides bool               `json:"decides"`
	Values  []jsonCompareValue `json:"values"`
}

type jsonCompareValue struct {
	ID     string `json:"id"`
	Value  *num   `json:"value"`
	Basis  string `json:"basis,omitempty"`
	Status string `json:"status,omitempty"`
	Best   bool   `json:"best"`
}

func writeCompareJSON(w io.Writer, doc *CompareDoc) error {
	t := doc.Table
	out := jsonCompare{JSONMeta: NewJSONMeta(doc.Meta, t.Plan), Title: t.Plan.Title, Caution: Caution}
	for i := range t.Results {
		r := &t.Results[i]
		p := jsonComparePart{ID: r.Part.ID, Name: r.Part.Name, Pass: r.Pass, WorstMargin: opt(present.ShownMargin(r))}
		switch w := present.Worst(r); {
		case w != nil:
			p.Binding = &jsonBinding{Stage: stagePtr(w.Req.Stage), Key: string(w.Req.Key)}
			p.FailReason = present.Reason(w)
		case r.Pass && !math.IsNaN(r.WorstMargin):
			p.Binding = &jsonBinding{Stage: stagePtr(r.Binding.Stage), Key: string(r.Binding.Key)}
		}
		out.Parts = append(out.Parts, p)
	}
	for i := range t.Rows {
		r := &t.Rows[i]
		unit := r.Dim.Unit()
		if r.Kind == compare.Check {
			unit = ""
		}
		jr := jsonCompareRow{Kind: r.Kind.String(), Stage: stagePtr(r.Stage), Key: r.Key, Label: r.Label,
			Unit: unit, Better: r.Better.String(), Decides: r.Decides()}
		for j, c := range r.Cells {
			v := jsonCompareValue{ID: t.Results[j].Part.ID, Value: opt(c.V), Basis: c.Basis.String(), Best: c.Best}
			if r.Kind == compare.Check {
				v.Status = c.Status.String()
			}
			jr.Values = append(jr.Values, v)
		}
		out.Rows = append(out.Rows, jr)
	}
	return encodeJSON(w, out)
}

// writeCompareCSV writes one row per figure and check: kind, stage, key,
// label, unit, better, then for each part its value (SI; a check's
// margin) and basis (a check's status), the ids of the best parts, and
// the caution column.
func writeCompareCSV(w io.Writer, doc *CompareDoc) error {
	t := doc.Table
	cw := csv.NewWriter(w)
	head := []string{"kind", "stage", "key", "label", "unit", "better"}
	for _, id := range compareIDs(t) {
		head = append(head, csvText(id), csvText(id+" basis"))
	}
	head = append(head, "best", CautionColumn)
	if err := cw.Write(head); err != nil {
		return err
	}
	for i := range t.Rows {
		r := &t.Rows[i]
		unit := unitSlug(r.Dim.Unit())
		if r.Kind == compare.Check {
			unit = "margin"
		}
		row := []string{r.Kind.String(), csvText(r.Stage), csvText(r.Key), csvText(r.Label), unit, r.Better.String()}
		var best []string
		for j, c := range r.Cells {
			second := c.Basis.String()
			if r.Kind == compare.Check {
				second = c.Status.String()
			}
			row = append(row, csvNum(c.V), second)
			if c.Best {
				best = append(best, t.Results[j].Part.ID)
			}
		}
		row = append(row, csvText(strings.Join(best, ";")), Caution)
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
