package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/opsift/opsift/filter/replace"
)

// writeMarkdown writes a review document: the original, the summary of
// candidates, then per candidate its footprint, design fit, regressions,
// improvements and the full field comparison. Worse figures are marked in
// words and bold, not by colour.
func (v *replaceView) writeMarkdown(w io.Writer) error {
	o := v.res.Original
	var b strings.Builder
	fmt.Fprintf(&b, "# Replacement review: %s\n\n", replaceMD(o.ID))
	fmt.Fprintf(&b, "> **Caution.** %s\n\n", caution)
	fmt.Fprintf(&b, "**Original:** `%s` — %s (%s).\n\n", o.ID, replaceMD(o.Name), replaceMD(replacePartLine(o)))
	if v.res.Designed {
		fmt.Fprintf(&b, "**Design:** %s (`%s`). Candidates are evaluated in this circuit at worst case and the passing ones ranked by their smallest margin; regressions against the original are warnings.\n\n",
			replaceMD(v.designTitle), v.designFile)
	} else {
		b.WriteString("**No design given:** candidates are compared on catalog figures only. *Strict* means no figure the original gives is worse or missing.\n\n")
	}
	fmt.Fprintf(&b, "Figures compared: %s.\n\n", strings.ReplaceAll(replaceBasisNote[len("figures compared: "):], "\n  ", " "))

	b.WriteString("## Candidates\n\n")
	if len(v.list) == 0 {
		b.WriteString("No candidates.\n\n")
	} else {
		head := "| # | Part | Fit | Strict |"
		rule := "|---|---|---|---|"
		if v.res.Designed {
			head += " Design |"
			rule += "---|"
		}
		b.WriteString(head + " Regressions |\n" + rule + "---|\n")
		for i, c := range v.list {
			fmt.Fprintf(&b, "| %d | `%s` | %s | %s |", i+1, c.Part.ID, replaceFitWord(c), replaceYesNo(c.Strict))
			if v.res.Designed {
				fmt.Fprintf(&b, " %s |", replaceMD(replaceDesignCell(c)))
			}
			fmt.Fprintf(&b, " %s |\n", replaceMD(replaceRegressionSummary(c)))
		}
		b.WriteString("\n")
	}
	for _, n := range v.leftOutNotes() {
		b.WriteString(n + "\n\n")
	}

	for i, c := range v.list {
		fmt.Fprintf(&b, "## %d. `%s` — %s\n\n", i+1, c.Part.ID, replaceMD(c.Part.Name))
		fmt.Fprintf(&b, "- Part: %s\n", replaceMD(replacePartLine(c.Part)))
		fmt.Fprintf(&b, "- Footprint: %s\n", replaceMD(c.Footprint))
		if c.Design != nil {
			fmt.Fprintf(&b, "- Design: %s\n", replaceMD(replaceDesignLine(c.Design)))
		}
		b.WriteString("\n")
		if len(c.Regressions) > 0 {
			title := "Regressions"
			if v.res.Designed {
				title = "Warnings (regressions against the original)"
			}
			fmt.Fprintf(&b, "**%s**, most likely to break a circuit first:\n\n", title)
			for j, r := range c.Regressions {
				fmt.Fprintf(&b, "%d. %s\n", j+1, replaceMD(r.Reason()))
			}
			b.WriteString("\n")
		}
		if len(c.Missing) > 0 {
			b.WriteString("**Not given** for the candidate (cannot be shown to be no worse):\n\n")
			for _, m := range c.Missing {
				fmt.Fprintf(&b, "- %s\n", replaceMD(replaceMissingReason(c, m)))
			}
			b.WriteString("\n")
		}
		if len(c.Improvements) > 0 {
			b.WriteString("**Improvements:**\n\n")
			for _, r := range c.Improvements {
				fmt.Fprintf(&b, "- %s\n", replaceMD(r.Reason()))
			}
			b.WriteString("\n")
		}
		b.WriteString("| Figure | Original | Basis | Candidate | Basis | Verdict |\n|---|---|---|---|---|---|\n")
		for _, f := range c.Fields {
			fmt.Fprintf(&b, "| %s (`%s`) | %s | %s | %s | %s | %s |\n", replaceMD(f.Label), f.Key,
				replaceMD(f.Format(f.Original)), replaceBasisText(f.Original), replaceMD(f.Format(f.Candidate)), replaceBasisText(f.Candidate), replaceVerdictCell(f))
		}
		b.WriteString("\n")
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// replaceBasisText names the basis and the limit of a value: "guaranteed (min)".
func replaceBasisText(v replace.Value) string {
	if !v.Set {
		return ""
	}
	if v.Limit == replace.LimitRating || v.Limit == replace.LimitTyp || v.Limit == "" {
		return string(v.Basis)
	}
	return fmt.Sprintf("%s (%s)", v.Basis, v.Limit)
}

// replaceVerdictCell writes a verdict for the review: worse in bold with a cross,
// better with a tick, the note after.
func replaceVerdictCell(f replace.Field) string {
	s := string(f.Verdict)
	switch f.Verdict {
	case replace.Worse:
		s = "**worse** ✗"
	case replace.Better:
		s = "better ✓"
	}
	if f.Note != "" {
		s += " — " + replaceMD(f.Note)
	}
	return s
}

// replaceMD escapes the characters that would break a Markdown table cell.
func replaceMD(s string) string {
	return strings.NewReplacer("|", `\|`, "*", `\*`, "_", `\_`).Replace(s)
}
