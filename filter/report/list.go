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
	"github.com/opsift/opsift/filter/listing"
	"github.com/opsift/opsift/filter/present"
)

// ListDoc is what `opsift list` writes: every part of the catalog with
// chosen columns (filter/listing), sorted, and its verdict when a design
// was evaluated.
type ListDoc struct {
	Plan    *filter.Plan // nil: no design, figures at 25 °C and no verdicts
	Rows    []listing.Row
	Columns []listing.Column
	Sort    listing.SortKey
	Typical bool     // typical figures instead of the worst case
	Sources []string // the catalog sources, for the header
	Width   int      // table: clip the name to fit this width; 0 = never clip
	// Meta says what the listing was made from; the JSON carries it as
	// every JSON output does (version, generated, design, catalog).
	Meta *Meta
}

// ListFormats are the formats WriteList renders, in help order.
func ListFormats() []Format { return []Format{Table, CSV, JSON, Markdown} }

// WriteList renders doc in format f (table, csv, json or md).
func WriteList(w io.Writer, f Format, doc *ListDoc) error {
	switch f {
	case Table:
		return writeListTable(w, doc)
	case CSV:
		return writeListCSV(w, doc)
	case JSON:
		return writeListJSON(w, doc)
	case Markdown:
		var buf bytes.Buffer
		if err := writeListMarkdown(&buf, doc); err != nil {
			return err
		}
		_, err := io.WriteString(w, safe.Lines(buf.String()))
		return err
	}
	return fmt.Errorf("list: format %q is not one of table, csv, json, md", f)
}

// BasisMark is the one mark every output (tables, md, the selector) puts
// after a figure to say what it rests on: "" a guaranteed limit (or not a
// datasheet figure), "~" a typical figure, "g" a typical read off a graph,
// "s" a check measured by simulation (the thd check; never a catalog figure).
// BasisLegend explains the marks.
func BasisMark(b filter.Basis) string {
	switch b {
	case filter.BasisTypical:
		return "~"
	case filter.BasisGraph:
		return "g"
	case filter.BasisSimulated:
		return "s"
	}
	return ""
}

// WithBasis puts a figure's basis mark after its text, a space between
// so the mark never reads as part of the unit: "0.273 V/µs g".
func WithBasis(text string, b filter.Basis) string {
	if m := BasisMark(b); m != "" {
		return text + " " + m
	}
	return text
}

// BasisLegend is the line under a listing that explains BasisMark.
func BasisLegend(typical bool) string {
	if typical {
		return "Figures as the catalog gives them: ~ typical, g typical read off a graph; unmarked: a stated limit (no typical exists for it); — the catalog does not give it."
	}
	return "Figures at worst case: unmarked guaranteed limits; ~ typical × derate_typ or × inflate_typ; g the same, read off a graph; — the catalog does not give it."
}

// ListCell renders one cell for people: the value with its unit and basis
// mark, "—" when unknown.
func ListCell(c listing.Column, v listing.Cell) string {
	if !v.Known() {
		return "—"
	}
	if c.Text {
		return safe.Text(v.Text)
	}
	switch c.Key {
	case "margin":
		return present.Margin(v.V)
	case "channels":
		return fmt.Sprintf("%.0f", v.V)
	case "unit_cost":
		return cost(v.V)
	}
	return WithBasis(catalog.Format(v.V, c.Dim), v.Basis)
}

// Verdict is a row's verdict in words: "pass", "fails 2 check(s)", "" when
// no design was evaluated.
func Verdict(r *listing.Row) string {
	pass, known := r.Pass()
	switch {
	case !known:
		return ""
	case pass:
		return "pass"
	}
	return fmt.Sprintf("fails %d check(s)", r.Result.Failed)
}

// listHeader is the listing's first lines: what was listed and how.
func listHeader(doc *ListDoc) []string {
	var out []string
	what := "figures at worst case"
	if doc.Typical {
		what = "typical figures"
	}
	if p := doc.Plan; p != nil {
		out = append(out, oneLine(p.Title))
		if !doc.Typical {
			what += fmt.Sprintf(" over %s … %s", catalog.Format(p.TempLow, catalog.Celsius), catalog.Format(p.TempHigh, catalog.Celsius))
		}
		pass := 0
		for i := range doc.Rows {
			if ok, _ := doc.Rows[i].Pass(); ok {
				pass++
			}
		}
		out = append(out, fmt.Sprintf("%d parts, %d pass the design · %s · sorted by %s", len(doc.Rows), pass, what, doc.Sort))
	} else {
		if !doc.Typical {
			what += ", 25 °C (no design: --design FILE for its conditions and verdicts)"
		}
		out = append(out, fmt.Sprintf("%d parts · %s · sorted by %s", len(doc.Rows), what, doc.Sort))
	}
	return out
}

func writeListTable(w io.Writer, doc *ListDoc) error {
	b := bufio.NewWriter(w)
	for _, l := range listHeader(doc) {
		fmt.Fprintln(b, l)
	}
	heads := []string{"PART"}
	right := []bool{false}
	if doc.Plan != nil {
		heads, right = append(heads, "VERDICT"), append(right, false)
	}
	for _, c := range doc.Columns {
		heads, right = append(heads, c.Head), append(right, !c.Text)
	}
	heads, right = append(heads, "NAME"), append(right, false)
	rows := make([][]string, len(doc.Rows))
	for i := range doc.Rows {
		r := &doc.Rows[i]
		row := []string{safe.Text(r.Part.ID)}
		if doc.Plan != nil {
			row = append(row, Verdict(r))
		}
		for j, c := range doc.Columns {
			row = append(row, ListCell(c, r.Cells[j]))
		}
		rows[i] = append(row, safe.Text(r.Part.Name))
	}
	widths := make([]int, len(heads))
	for j, h := range heads {
		widths[j] = present.Width(h)
		for _, row := range rows {
			widths[j] = max(widths[j], present.Width(row[j]))
		}
	}
	if doc.Width > 0 {
		used := 0
		for _, wd := range widths[:len(widths)-1] {
			used += wd + 2
		}
		widths[len(widths)-1] = min(widths[len(widths)-1], max(8, doc.Width-used))
	}
	b.WriteByte('\n')
	writeCells(b, heads, widths, right)
	for _, row := range rows {
		writeCells(b, row, widths, right)
	}
	b.WriteByte('\n')
	wrap(b, BasisLegend(doc.Typical), max(doc.Width, DefaultWidth))
	wrap(b, "Caution: "+Caution, max(doc.Width, DefaultWidth))
	return b.Flush()
}

// writeCells writes one aligned row, trailing spaces trimmed.
func writeCells(b *bufio.Writer, cells []string, widths []int, right []bool) {
	var line strings.Builder
	for i, c := range cells {
		if i > 0 {
			line.WriteString("  ")
		}
		c = present.Clip(c, widths[i])
		pad := strings.Repeat(" ", widths[i]-present.Width(c))
		if right[i] {
			line.WriteString(pad + c)
		} else {
			line.WriteString(c + pad)
		}
	}
	b.WriteString(strings.TrimRight(line.String(), " "))
	b.WriteByte('\n')
}

// writeListCSV writes one row per part: id, name, pass (with a design),
// then per column its value (SI, plain number) and basis, or the words of
// a word column, and last the caution.
func writeListCSV(w io.Writer, doc *ListDoc) error {
	cw := csv.NewWriter(w)
	head := []string{"id", "name"}
	if doc.Plan != nil {
		head = append(head, "pass")
	}
	for _, c := range doc.Columns {
		if c.Text {
			head = append(head, c.Key)
			continue
		}
		head = append(head, c.Key+"_"+unitSlug(c.Dim.Unit()))
		if !c.Plain {
			head = append(head, c.Key+"_basis")
		}
	}
	head = append(head, CautionColumn)
	if err := cw.Write(head); err != nil {
		return err
	}
	for i := range doc.Rows {
		r := &doc.Rows[i]
		row := []string{csvText(r.Part.ID), csvText(r.Part.Name)}
		if doc.Plan != nil {
			row = append(row, fmt.Sprint(r.Result.Pass))
		}
		for j, c := range doc.Columns {
			v := r.Cells[j]
			if c.Text {
				row = append(row, csvText(v.Text))
				continue
			}
			row = append(row, csvNum(v.V))
			if !c.Plain {
				row = append(row, v.Basis.String())
			}
		}
		if err := cw.Write(append(row, Caution)); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// The JSON listing follows DESIGN.md "Contract additions" (Listing):
// {"parts": [{"id", "name", "pass", "figures": {KEY: {"value", "unit",
// "basis"}}}]}, with the header fields beside parts.
type jsonList struct {
	JSONMeta
	Title       string          `json:"title,omitempty"`
	Caution     string          `json:"caution"`
	Figures     string          `json:"figures"`
	Temperature *jsonRange      `json:"temperature,omitempty"`
	Columns     []string        `json:"columns"`
	Sort        string          `json:"sort"`
	Sources     []string        `json:"sources,omitempty"`
	Count       int             `json:"count"`
	Parts       []jsonListEntry `json:"parts"`
}

type jsonRange struct {
	Low  num `json:"low"`
	High num `json:"high"`
}

type jsonListEntry struct {
	ID        string                    `json:"id"`
	Name      string                    `json:"name"`
	Pass      *bool                     `json:"pass"`
	Datasheet string                    `json:"datasheet,omitempty"`
	Figures   map[string]jsonListFigure `json:"figures"`
}

type jsonListFigure struct {
	Value any     `json:"value"`
	Unit  string  `json:"unit"`
	Basis *string `json:"basis"`
}

func writeListJSON(w io.Writer, doc *ListDoc) error {
	out := jsonList{JSONMeta: NewJSONMeta(doc.Meta, doc.Plan), Caution: Caution, Figures: "worst_case", Sort: doc.Sort.String(), Sources: doc.Sources,
		Count: len(doc.Rows), Parts: []jsonListEntry{}}
	if doc.Typical {
		out.Figures = "typical"
	}
	if p := doc.Plan; p != nil {
		out.Title = p.Title
	}
	if !doc.Typical {
		lo, hi := filter.RoomTemp, filter.RoomTemp
		if p := doc.Plan; p != nil {
			lo, hi = p.TempLow, p.TempHigh
		}
		out.Temperature = &jsonRange{Low: num(lo), High: num(hi)}
	}
	for _, c := range doc.Columns {
		out.Columns = append(out.Columns, c.Key)
	}
	for i := range doc.Rows {
		r := &doc.Rows[i]
		e := jsonListEntry{ID: r.Part.ID, Name: r.Part.Name, Datasheet: r.Part.Datasheet, Figures: map[string]jsonListFigure{}}
		if pass, known := r.Pass(); known {
			e.Pass = &pass
		}
		for j, c := range doc.Columns {
			v := r.Cells[j]
			f := jsonListFigure{Unit: c.Dim.Unit()}
			switch {
			case c.Text:
				f.Unit = ""
				if v.Text != "" {
					f.Value = v.Text
				}
			case !math.IsNaN(v.V):
				f.Value = num(v.V)
			}
			if s := v.Basis.String(); s != "" && v.Known() {
				f.Basis = &s
			}
			e.Figures[c.Key] = f
		}
		out.Parts = append(out.Parts, e)
	}
	return encodeJSON(w, out)
}

func writeListMarkdown(w io.Writer, doc *ListDoc) error {
	b := bufio.NewWriter(w)
	head := listHeader(doc)
	title := "Catalog listing"
	if doc.Plan != nil {
		title += ": " + head[0]
		head = head[1:]
	}
	fmt.Fprintf(b, "# %s\n\n> **Caution.** %s\n\n", mdText(title), Caution)
	for _, l := range head {
		fmt.Fprintf(b, "%s.\n\n", mdText(l))
	}
	if len(doc.Sources) > 0 {
		fmt.Fprintf(b, "Catalog: %s.\n\n", mdText(strings.Join(doc.Sources, ", ")))
	}
	b.WriteString("| Part |")
	sep := "|---|"
	if doc.Plan != nil {
		b.WriteString(" Verdict |")
		sep += "---|"
	}
	for _, c := range doc.Columns {
		fmt.Fprintf(b, " %s |", mdText(c.Key))
		if c.Text {
			sep += "---|"
		} else {
			sep += "---:|"
		}
	}
	fmt.Fprintf(b, " Name |\n%s---|\n", sep)
	for i := range doc.Rows {
		r := &doc.Rows[i]
		fmt.Fprintf(b, "| `%s` |", r.Part.ID)
		if doc.Plan != nil {
			fmt.Fprintf(b, " %s |", Verdict(r))
		}
		for j, c := range doc.Columns {
			fmt.Fprintf(b, " %s |", mdText(ListCell(c, r.Cells[j])))
		}
		fmt.Fprintf(b, " %s |\n", mdText(r.Part.Name))
	}
	fmt.Fprintf(b, "\n%s\n", mdText(BasisLegend(doc.Typical)))
	return b.Flush()
}
