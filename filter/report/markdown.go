package report

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"net/url"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/headroom"
	"github.com/opsift/opsift/filter/present"
)

// WriteMarkdown writes a shortlist document for design review: the design
// summary, every requirement with its formula, the ranked table, one check
// table per listed candidate and the caution.
//
// The document is safe to render: every data string is HTML-escaped and
// stripped of Markdown markup, unsafe runes are escaped (safe.Lines), and
// a datasheet link is written only when it is http or https.
func WriteMarkdown(w io.Writer, doc *Doc) error {
	var buf bytes.Buffer
	if err := writeMarkdown(&buf, doc); err != nil {
		return err
	}
	_, err := io.WriteString(w, safe.Lines(buf.String()))
	return err
}

func writeMarkdown(w io.Writer, doc *Doc) error {
	b := bufio.NewWriter(w)
	p := doc.Plan
	fmt.Fprintf(b, "# Op-amp shortlist: %s\n\n", mdText(oneLine(p.Title)))
	fmt.Fprintf(b, "> **Caution.** %s\n\n", Caution)
	writeMarkdownMeta(b, doc.Meta, p)
	b.WriteString("## Design\n\n")
	for _, line := range summaryLines(p) {
		fmt.Fprintf(b, "- %s\n", mdText(line))
	}
	if len(doc.Sources) > 0 {
		fmt.Fprintf(b, "- Catalog: %s\n", mdText(strings.Join(doc.Sources, ", ")))
	}
	writeSetAsideMD(b, doc.SetAside)
	b.WriteString("\n## Requirements\n\n| Stage | Requirement | Need | Formula |\n|---|---|---|---|\n")
	reqs := p.Requirements()
	for i := range reqs {
		q := &reqs[i]
		fmt.Fprintf(b, "| %s | %s | %s | %s |\n", mdText(stageOrDesign(q.Stage)), q.Key, mdText(Need(q)), mdText(q.Why))
	}
	listed := doc.Listed()
	fmt.Fprintf(b, "\n## Ranking\n\n%d of %d parts pass; sorted by %s%s.\n\n", doc.Passing(), len(doc.Results),
		sortName(doc.Sort), strictText(doc.Strict))
	if len(listed) == 0 {
		b.WriteString("No candidate passes.\n")
		return b.Flush()
	}
	b.WriteString("| # | Part | Pass | Worst margin | Binding | Packages | Cost | Supply current | fmax | Unknown |\n")
	b.WriteString("|---:|---|---|---:|---|---:|---:|---:|---:|---:|\n")
	for i, r := range listed {
		rank, pass := fmt.Sprint(i+1), "yes"
		if !r.Pass {
			rank, pass = "–", "**no**"
		}
		binding := mdText(present.RowBinding(r, doc.Strict))
		fmt.Fprintf(b, "| %s | `%s` | %s | %s | %s | %d | %s | %s | %s | %d |\n", rank, r.Part.ID, pass,
			present.RowMargin(r), binding, r.Packages, cost(r.Cost), quantity(r.SupplyCurrent, catalog.Ampere),
			fmaxText(doc.Plan, r), r.Unknown)
	}
	if doc.Compare != nil {
		b.WriteByte('\n')
		writeCompareSection(b, doc.Compare, "##")
	}
	b.WriteString("\n## Candidates\n")
	doc.prepareHeadroom()
	for _, r := range listed {
		fmt.Fprintf(b, "\n### `%s` — %s\n\n", r.Part.ID, mdText(r.Part.Name))
		facts := []string{"tech " + orUnknown(string(r.Part.Tech)), fmt.Sprintf("%d channel(s)", r.Part.Channels),
			"packages " + strings.Join(r.Part.Packages, ", "), "lifecycle " + orUnknown(string(r.Part.Lifecycle))}
		if ds := r.Part.Datasheet; ds != "" {
			if webLink(ds) {
				facts = append(facts, "datasheet "+ds)
			} else {
				facts = append(facts, "datasheet link left out (not http or https)")
			}
		}
		fmt.Fprintf(b, "%s.\n\n", mdText(strings.Join(facts, "; ")))
		if !r.Pass {
			for _, c := range failingOrUnknown(r, doc.Strict) {
				fmt.Fprintf(b, "- **fails** %s\n", mdText(missText(c, r.Part)))
			}
			b.WriteByte('\n')
		}
		b.WriteString("| Stage | Check | Need | Has | Margin | Status | Basis | Note |\n|---|---|---|---|---:|---|---|---|\n")
		for _, c := range present.FailingFirst(r) {
			fmt.Fprintf(b, "| %s | %s | %s | %s | %s | %s | %s | %s |\n", mdText(stageOrDesign(c.Req.Stage)), c.Req.Key,
				mdText(CheckNeed(c)), mdText(Has(c, r.Part)), present.Margin(c.Margin), c.Status, c.Basis, mdText(c.Note))
		}
		if doc.HeadroomLeftOut(r) {
			fmt.Fprintf(b, "\nHeadroom not searched: only the first %d passing candidates are (rank --headroom N; 0 searches all).\n", doc.HeadroomTop)
			continue
		}
		writeMarkdownHeadroom(b, doc.Headroom(r))
	}
	return b.Flush()
}

// writeMarkdownHeadroom writes a candidate's headroom table: how far each
// input can move, the rest held, and what breaks there.
func writeMarkdownHeadroom(b *bufio.Writer, ls []headroom.Limit) {
	if len(ls) == 0 {
		return
	}
	b.WriteString("\nHeadroom: each input moved alone, the rest held, until the part fails.\n\n")
	b.WriteString("| Stage | Input | Design | Limit | Breaks | Method |\n|---|---|---:|---:|---|---|\n")
	for _, l := range ls {
		word := "up to "
		if l.Dir == headroom.Down {
			word = "down to "
		}
		fmt.Fprintf(b, "| %s | %s | %s | %s | %s | %s |\n", mdText(stageOrDesign(l.Stage)), mdText(l.Input),
			mdText(catalog.Format(l.Value, l.Dim)), mdText(word+catalog.Format(l.Limit, l.Dim)),
			mdText(present.CheckName(l.Breaks.Stage, l.Breaks.Key)), l.Method)
	}
}

func stageOrDesign(s string) string {
	if s == "" {
		return "(design)"
	}
	return s
}

// mdText escapes the characters that would break a Markdown table cell
// or be read as HTML, and every unsafe rune (CR and LF included).
func mdText(s string) string {
	r := strings.NewReplacer("|", `\|`, "\n", " ", "*", `\*`, "_", `\_`, "`", "'",
		"&", "&amp;", "<", "&lt;", ">", "&gt;", "[", `\[`, "]", `\]`)
	return safe.Text(r.Replace(s))
}

// webLink reports whether s is an absolute http or https URL, the only
// links a shortlist carries (no javascript:, data: or file: links).
func webLink(s string) bool {
	u, err := url.Parse(s)
	return err == nil && (u.Scheme == "http" || u.Scheme == "https") && u.Host != "" && safe.Clean(s)
}

// summaryLines describes the design in a few lines: supply, ambient,
// policy, filters and stages.
func summaryLines(p *filter.Plan) []string {
	r := p.Rails
	posOut, negOut := filter.RailsOutward(r.Pos, r.Neg, r.Tol)
	V := func(x float64) string { return catalog.Format(x, catalog.Volt) }
	out := []string{
		fmt.Sprintf("Supply: V+ %s, V− %s, tolerance %s: span %s … %s; rails at worst case %s / %s (inward), %s / %s (outward)",
			V(r.Pos), V(r.Neg), catalog.Format(r.Tol, catalog.Ratio), V(r.SpanMin), V(r.SpanMax), V(r.PosWorst), V(r.NegWorst), V(posOut), V(negOut)),
		fmt.Sprintf("Ambient: %s … %s", catalog.Format(p.TempLow, catalog.Celsius), catalog.Format(p.TempHigh, catalog.Celsius)),
		fmt.Sprintf("Policy: typical figures × %s (bigger is better) or × %s (smaller is better)",
			catalog.Format(p.DerateTyp, catalog.Dimensionless), catalog.Format(p.InflateTyp, catalog.Dimensionless)),
	}
	for _, s := range p.Stages {
		line := fmt.Sprintf("Stage %s (%s)", s.Name, s.Kind)
		var parts []string
		if s.Gain > 0 {
			parts = append(parts, "G = "+catalog.Format(s.Gain, catalog.Dimensionless))
		}
		if s.NoiseGain > 0 {
			parts = append(parts, "NG = "+catalog.Format(s.NoiseGain, catalog.Dimensionless))
		}
		if s.Shape != "" {
			sig := s.Shape + " " + V(s.Peak) + " peak in, " + V(s.Vo) + " peak out"
			if s.Shape == "sine" {
				sig += " at " + catalog.Format(s.Freq, catalog.Hertz)
			} else {
				sig += ", rise " + catalog.Format(s.Rise, catalog.Second)
			}
			parts = append(parts, sig)
		}
		if s.LoadR > 0 {
			parts = append(parts, "load "+catalog.Format(s.LoadR, catalog.Ohm))
		}
		if len(parts) > 0 {
			line += ": " + strings.Join(parts, ", ")
		}
		out = append(out, line)
	}
	return out
}

// writeSetAsideMD lists the parts and files the catalog load left out,
// so a review sees what the ranking did not consider.
func writeSetAsideMD(b *bufio.Writer, ss []catalog.SetAside) {
	if len(ss) == 0 {
		return
	}
	fmt.Fprintf(b, "\n## Set aside\n\nThese catalog entries have problems and were left out of the ranking (`opsift check` lists them):\n\n")
	for _, s := range ss {
		for _, p := range s.Problems {
			fmt.Fprintf(b, "- %s\n", mdText(p.Error()))
		}
		if s.InUse != "" {
			fmt.Fprintf(b, "- %s: the one from %s is used instead\n", mdText(s.Subject()), mdText(s.InUse))
		}
	}
}
