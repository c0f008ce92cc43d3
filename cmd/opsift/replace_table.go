package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
	"github.com/opsift/opsift/filter/replace"
)

// ANSI styles of the replace table, used only on a terminal without NO_COLOR.
// Every coloured word is also written out ("worse", "better"), so nothing
// relies on colour alone.
const (
	replaceRed   = "\x1b[31m"
	replaceGreen = "\x1b[32m"
	replaceBold  = "\x1b[1m"
	replaceReset = "\x1b[0m"
)

func (v *replaceView) paint(style, s string) string {
	if !v.color || s == "" {
		return s
	}
	return style + s + replaceReset
}

// writeTable writes the human table: a summary line per candidate, then
// each candidate's footprint, design fit, regressions and improvements.
func (v *replaceView) writeTable(w io.Writer) error {
	o := v.res.Original
	var b strings.Builder
	fmt.Fprintf(&b, "%s %s — %s\n", v.paint(replaceBold, "Replacing"), v.paint(replaceBold, o.ID), safe.Text(o.Name))
	fmt.Fprintf(&b, "  %s\n", replacePartLine(o))
	if v.res.Designed {
		fmt.Fprintf(&b, "  design: %s (%s)\n", safe.Text(v.designTitle), safe.Text(v.designFile))
	}
	b.WriteString("  " + replaceBasisNote + "\n\n")

	if len(v.list) == 0 {
		b.WriteString("No candidates.\n")
	} else {
		rows := [][]string{{"#", "PART", "FIT", "STRICT"}}
		if v.res.Designed {
			rows[0] = append(rows[0], "DESIGN")
		}
		rows[0] = append(rows[0], "REGRESSIONS")
		for i, c := range v.list {
			row := []string{fmt.Sprint(i + 1), c.Part.ID, replaceFitWord(c), replaceYesNo(c.Strict)}
			if v.res.Designed {
				row = append(row, replaceDesignCell(c))
			}
			rows = append(rows, append(row, replaceRegressionSummary(c)))
		}
		widths := replaceColumnWidths(rows)
		for r, row := range rows {
			var line strings.Builder
			for i, cell := range row {
				pad := cell
				if i < len(row)-1 {
					pad += strings.Repeat(" ", widths[i]-present.Width(cell)+2)
				}
				if r > 0 && i == len(row)-1 && len(v.list[r-1].Regressions) > 0 {
					pad = v.paint(replaceRed, pad)
				}
				line.WriteString(pad)
			}
			text := strings.TrimRight(line.String(), " ")
			if r == 0 {
				text = v.paint(replaceBold, text)
			}
			b.WriteString(text + "\n")
		}
	}
	for i, c := range v.list {
		fmt.Fprintf(&b, "\n%d. %s — %s\n", i+1, v.paint(replaceBold, c.Part.ID), safe.Text(c.Part.Name))
		fmt.Fprintf(&b, "   %s\n", replacePartLine(c.Part))
		fmt.Fprintf(&b, "   %s\n", c.Footprint)
		if c.Design != nil {
			fmt.Fprintf(&b, "   design: %s\n", replaceDesignLine(c.Design))
		}
		worse := "worse  "
		if v.res.Designed {
			worse = "warning"
		}
		for _, r := range c.Regressions {
			fmt.Fprintf(&b, "   %s %s\n", v.paint(replaceRed, worse), r.Reason())
		}
		for _, m := range c.Missing {
			fmt.Fprintf(&b, "   %s %s\n", "missing", replaceMissingReason(c, m))
		}
		var also []string
		for _, r := range c.Improvements {
			if r.Class >= replaceMinorClass {
				also = append(also, r.Field.Label)
				continue
			}
			fmt.Fprintf(&b, "   %s  %s\n", v.paint(replaceGreen, "better"), r.Reason())
		}
		for i, line := range present.Wrap("also "+strings.Join(also, ", "), replaceWrapWidth, "") {
			word := v.paint(replaceGreen, "better")
			if i > 0 {
				word = "      "
			}
			fmt.Fprintf(&b, "   %s  %s\n", word, line)
		}
	}
	b.WriteString("\n")
	for _, n := range v.leftOutNotes() {
		b.WriteString(n + "\n")
	}
	b.WriteString("Caution: " + caution + "\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// replaceBasisNote says once how figures are compared.
const replaceBasisNote = "figures compared: guaranteed limits where both parts give them, else typical;\n" +
	"  within 2 % (5 mV, 0.5 °C, 0.2 dB) counts as the same; \"X against Y\" is candidate against original"

// replaceMinorClass is the class of the changes the table folds into one
// "also better" line (replace.Change.Class 7: everything but the six kinds
// that most often decide whether a circuit works).
const replaceMinorClass = 7

// leftOutNotes say what the listing does not show and how to see it.
func (v *replaceView) leftOutNotes() []string {
	var out []string
	if n := v.topHidden; n > 0 {
		out = append(out, fmt.Sprintf("%d more candidate%s not listed (--top 0 lists all).", n, replacePlural(n)))
	}
	if n := v.failHidden; n > 0 {
		out = append(out, fmt.Sprintf("%d candidate%s fail%s the design and %s not listed (--all lists them).", n, replacePlural(n), replaceVerbS(n), replaceIsAre(n)))
	}
	if n := v.res.ObsoleteLeftOut; n > 0 {
		out = append(out, fmt.Sprintf("%d obsolete part%s left out (--obsolete lists them).", n, replacePlural(n)))
	}
	return out
}

// replaceWrapWidth is the width, in characters, the folded "also better"
// line is wrapped to after its 11-character indent: 100 columns in all.
const replaceWrapWidth = 89

func replaceVerbS(n int) string {
	if n == 1 {
		return "s"
	}
	return ""
}

func replaceIsAre(n int) string {
	if n == 1 {
		return "is"
	}
	return "are"
}

func replaceColumnWidths(rows [][]string) []int {
	w := make([]int, len(rows[0]))
	for _, row := range rows {
		for i, c := range row {
			w[i] = max(w[i], present.Width(c))
		}
	}
	return w
}

func replaceFitWord(c replace.Candidate) string {
	if c.DropIn {
		return "drop-in"
	}
	return "new footprint"
}

func replaceYesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// replaceDesignCell is the summary column of a design fit: "pass +31 % gain/slew".
func replaceDesignCell(c replace.Candidate) string {
	if c.Design == nil {
		return ""
	}
	d := c.Design
	word := "pass"
	if !d.Pass {
		word = "FAIL"
	}
	if !d.WorstMargin.Known() {
		if len(d.Failed) > 0 {
			return word + " " + d.Failed[0]
		}
		return word
	}
	return fmt.Sprintf("%s %s %s", word, present.Margin(d.WorstMargin.V()), replaceBindingText(d.Binding))
}

// replaceDesignLine is the detail line of a design fit.
func replaceDesignLine(d *replace.Fit) string {
	var b strings.Builder
	if d.Pass {
		b.WriteString("pass")
	} else {
		b.WriteString("FAIL")
	}
	if d.WorstMargin.Known() {
		what := "worst margin"
		if !d.Pass {
			what = "worst miss"
		}
		fmt.Fprintf(&b, ", %s %s at %s", what, present.Margin(d.WorstMargin.V()), replaceBindingText(d.Binding))
	}
	if len(d.Failed) > 0 {
		fmt.Fprintf(&b, "; fails %s", strings.Join(d.Failed, ", "))
	}
	return b.String()
}

func replaceBindingText(b replace.Binding) string {
	return present.CheckName(b.Stage, filter.Key(b.Key))
}

func replaceRegressionSummary(c replace.Candidate) string {
	n := len(c.Regressions)
	switch {
	case n == 0 && len(c.Missing) == 0:
		return "none"
	case n == 0:
		return fmt.Sprintf("none; %d figure%s not given", len(c.Missing), replacePlural(len(c.Missing)))
	}
	first := c.Regressions[0].Reason()
	if i := strings.Index(first, ":"); i > 0 {
		first = first[:i]
	}
	if n == 1 {
		return first
	}
	return fmt.Sprintf("%s (+%d more)", first, n-1)
}

// replaceMissingReason says which figure of the original the candidate lacks.
func replaceMissingReason(c replace.Candidate, key string) string {
	for _, f := range c.Fields {
		if f.Key == key {
			return fmt.Sprintf("%s not given (original: %s)", f.Label, f.Format(f.Original))
		}
	}
	return key + " not given"
}
