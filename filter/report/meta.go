package report

import (
	"fmt"
	"io"
	"strings"
	"time"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// Meta says what an output was made from, so a saved export can be traced
// back: the program version, when it was made, the design file and
// whether it had unsaved edits, and every catalog file read with the hash
// of its content. The design's inputs themselves come from the plan.
type Meta struct {
	Version   string
	Generated time.Time
	File      string // the design file as given; "" for none (replace without --design)
	Modified  bool   // the design was edited since it was read (the selector)
	Sources   []catalog.FileSum
	Strict    bool
	// Warnings found against the catalog (filter.FilterWarnings); the
	// plan's own warnings are added to them by every writer.
	Warnings []filter.Warning
}

// Warnings lists what a document warns about: the plan's warnings, then
// those of m (either may be nil).
func Warnings(m *Meta, plan *filter.Plan) []filter.Warning {
	var out []filter.Warning
	if plan != nil {
		out = append(out, plan.Warnings...)
	}
	if m != nil {
		out = append(out, m.Warnings...)
	}
	return out
}

// JSONMeta is the block every JSON output opens with (DESIGN.md "Contract
// additions"): version, generated (RFC 3339), design (the resolved inputs
// that were evaluated, with file and modified), catalog sources with their
// SHA-256 and part counts, and the worst-case policy in force.
type JSONMeta struct {
	Version   string          `json:"version"`
	Generated string          `json:"generated"`
	Design    *JSONDesign     `json:"design"`
	Catalog   JSONCatalogInfo `json:"catalog"`
	Policy    *JSONPolicy     `json:"policy"`
	Warnings  []JSONWarning   `json:"warnings"`
}

// JSONWarning is one filter.Warning.
type JSONWarning struct {
	Stage *string `json:"stage"`
	Field string  `json:"field,omitempty"`
	Text  string  `json:"text"`
}

// JSONDesign is the evaluated design: its file, whether it was modified
// since it was read, its title and every input in form order.
type JSONDesign struct {
	File     string      `json:"file"`
	Modified bool        `json:"modified"`
	Title    string      `json:"title"`
	Inputs   []JSONInput `json:"inputs"`
}

// JSONInput is one design input as evaluated: its path (filter.Field.Path),
// the text in force (as written, or the default), the SI value of a
// quantity, its unit, and whether the design gives it (false: the default
// applied).
type JSONInput struct {
	Path  string `json:"path"`
	Text  string `json:"text"`
	Value *num   `json:"value,omitempty"`
	Unit  string `json:"unit,omitempty"`
	Given bool   `json:"given"`
	dim   catalog.Dim
}

// JSONCatalogInfo lists the catalog files read.
type JSONCatalogInfo struct {
	Sources []JSONSource `json:"sources"`
}

// JSONSource is one catalog file: path, SHA-256 of its bytes, valid parts.
type JSONSource struct {
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
	Parts  int    `json:"parts"`
}

// JSONPolicy is the worst-case policy of the evaluation.
type JSONPolicy struct {
	DerateTyp  num  `json:"derate_typ"`
	InflateTyp num  `json:"inflate_typ"`
	Strict     bool `json:"strict"`
}

// NewJSONMeta builds the block for an output made from plan (nil: no
// design was evaluated) under m.
func NewJSONMeta(m *Meta, plan *filter.Plan) JSONMeta {
	out := JSONMeta{Catalog: JSONCatalogInfo{Sources: []JSONSource{}}, Warnings: []JSONWarning{}}
	for _, w := range Warnings(m, plan) {
		out.Warnings = append(out.Warnings, JSONWarning{Stage: stagePtr(w.Stage), Field: w.Field, Text: w.Text})
	}
	if m == nil {
		m = &Meta{}
	}
	out.Version = m.Version
	if !m.Generated.IsZero() {
		out.Generated = m.Generated.UTC().Format(time.RFC3339)
	}
	for _, s := range m.Sources {
		out.Catalog.Sources = append(out.Catalog.Sources, JSONSource{Path: s.Path, SHA256: s.SHA256, Parts: s.Parts})
	}
	if plan == nil {
		return out
	}
	out.Policy = &JSONPolicy{DerateTyp: num(plan.DerateTyp), InflateTyp: num(plan.InflateTyp), Strict: m.Strict}
	if plan.Design != nil {
		out.Design = &JSONDesign{File: m.File, Modified: m.Modified, Title: plan.Title, Inputs: Inputs(plan.Design)}
	}
	return out
}

// Inputs lists every input of d as evaluated, in form order; an input the
// design leaves out shows the default that applied (Given false).
func Inputs(d *filter.Design) []JSONInput {
	fields := d.Fields()
	out := make([]JSONInput, 0, len(fields))
	for _, f := range fields {
		in := JSONInput{Path: f.Path, Text: f.Raw, Given: f.Set}
		if !f.Set {
			in.Text = f.Default
		}
		if f.Kind == filter.Quantity && in.Text != "" {
			if v, err := catalog.Parse(in.Text, f.Dim); err == nil {
				in.Value, in.Unit, in.dim = val(v), f.Dim.Unit(), f.Dim
				if f.Dim == catalog.Ratio {
					in.Unit = "" // held and written as a fraction, like every JSON figure
				}
			}
		}
		out = append(out, in)
	}
	return out
}

// writeMarkdownMeta writes the "Made from" block at the top of the review
// document: the same facts the JSON outputs carry.
func writeMarkdownMeta(b io.Writer, m *Meta, plan *filter.Plan) {
	if m == nil {
		return
	}
	j := NewJSONMeta(m, plan)
	fmt.Fprintf(b, "## Made from\n\n")
	fmt.Fprintf(b, "- opsift %s, generated %s\n", mdText(j.Version), mdText(j.Generated))
	if j.Design != nil {
		state := "as saved"
		if j.Design.Modified {
			state = "**with unsaved edits** (the inputs below are the ones evaluated)"
		}
		fmt.Fprintf(b, "- Design: `%s`, %s\n", mdCode(orDash(j.Design.File)), state)
	}
	if j.Policy != nil {
		fmt.Fprintf(b, "- Policy: derate_typ %s, inflate_typ %s, strict %t\n",
			catalog.Format(float64(j.Policy.DerateTyp), catalog.Dimensionless),
			catalog.Format(float64(j.Policy.InflateTyp), catalog.Dimensionless), j.Policy.Strict)
	}
	for _, s := range j.Catalog.Sources {
		fmt.Fprintf(b, "- Catalog `%s`: %d part(s), sha256 `%s`\n", mdCode(s.Path), s.Parts, s.SHA256)
	}
	if ws := Warnings(m, plan); len(ws) > 0 {
		b.Write([]byte("\n**Warnings**\n\n"))
		for _, w := range ws {
			fmt.Fprintf(b, "- ⚠ %s\n", mdText(w.String()))
		}
	}
	if j.Design != nil && len(j.Design.Inputs) > 0 {
		b.Write([]byte("\n| Input | Value | Given |\n|---|---|---|\n"))
		for _, in := range j.Design.Inputs {
			if !in.Given && in.Text == "" {
				continue // nothing in force (an unset figure bound); the JSON lists it
			}
			given := "yes"
			if !in.Given {
				given = "default"
			}
			text := in.Text
			if in.Value != nil {
				text = catalog.Format(float64(*in.Value), in.dim)
			}
			fmt.Fprintf(b, "| %s | %s | %s |\n", mdText(in.Path), mdText(orDash(text)), given)
		}
	}
	b.Write([]byte("\n"))
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

// mdCode keeps text inside a code span: a backquote cannot be escaped there.
func mdCode(s string) string { return strings.ReplaceAll(s, "`", "'") }
