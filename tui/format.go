package tui

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/charmbracelet/x/ansi"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
	"github.com/opsift/opsift/filter/report"
)

// fit truncates s to w cells (with an ellipsis) and pads it with spaces
// to exactly w cells. s may hold escape codes.
func fit(s string, w int) string {
	if w <= 0 {
		return ""
	}
	n := ansi.StringWidth(s)
	if n > w {
		s = ansi.Truncate(s, w, "…")
		n = ansi.StringWidth(s)
	}
	return s + strings.Repeat(" ", w-n)
}

// fitID fits a part id into w cells like fit, but cuts it in the middle,
// keeping its head and its longer tail ("lownois…l-rev-a"), so ids that
// differ at the end (revisions, grades) stay told apart.
func fitID(id string, w int) string {
	n := ansi.StringWidth(id)
	if n <= w || w < 5 {
		return fit(id, w)
	}
	head := (w - 1) / 2
	tail := w - 1 - head
	return ansi.Truncate(id, head, "") + "…" + ansi.TruncateLeft(id, n-tail, "")
}

// fitRight is fit aligned to the right.
func fitRight(s string, w int) string {
	if w <= 0 {
		return ""
	}
	n := ansi.StringWidth(s)
	if n > w {
		return ansi.Truncate(s, w, "…")
	}
	return strings.Repeat(" ", w-n) + s
}

// wrap breaks s into lines of at most w cells, at spaces where it can
// (present.Wrap: a number stays with its unit).
func wrap(s string, w int) []string {
	if w <= 0 {
		return nil
	}
	return present.Wrap(s, w, "")
}

// eighths are the block characters of a partial bar cell, 1/8 … 8/8.
var eighths = [...]string{"▏", "▎", "▍", "▌", "▋", "▊", "▉", "█"}

// bar draws a margin as cells of block characters: 0 is empty, barFull and
// more is full. A negative margin is drawn as a row of ✗ marks' worth of
// dots so a failing part is told by shape as well as colour.
func bar(m float64, cells int) string {
	if cells <= 0 {
		return ""
	}
	if math.IsNaN(m) {
		return strings.Repeat(" ", cells)
	}
	if m < 0 {
		return strings.Repeat("·", cells)
	}
	steps := int(math.Round(math.Min(m, barFull) / barFull * float64(cells*8)))
	var b strings.Builder
	full := steps / 8
	b.WriteString(strings.Repeat(eighths[7], full))
	n := full
	if r := steps % 8; r > 0 {
		b.WriteString(eighths[r-1])
		n++
	}
	b.WriteString(strings.Repeat(" ", cells-n))
	return b.String()
}

// basisMark is the marker beside a figure that did not come from a
// guaranteed limit, the same in every output (report.BasisMark).
func basisMark(b filter.Basis) string { return report.BasisMark(b) }

// markedCell is a right-aligned column's figure with its basis mark after
// a space (report.WithBasis), and an unmarked figure padded by as much, so
// the figures of a column line up whether marked or not: "-35 % g" over
// "+3.8 %  ".
func markedCell(text string, b filter.Basis) string {
	if basisMark(b) == "" {
		return text + "  "
	}
	return report.WithBasis(text, b)
}

// bindingCheck returns the check that sets a result's worst margin, or nil.
func bindingCheck(r *filter.Result) *filter.Check {
	for i := range r.Checks {
		c := &r.Checks[i]
		if c.Req.Stage == r.Binding.Stage && c.Req.Key == r.Binding.Key && c.HasMargin() && c.Margin == r.WorstMargin {
			return c
		}
	}
	return nil
}

// fmaxBasis is the weakest basis of the slew and gbw checks fmax rests on.
func fmaxBasis(r *filter.Result) filter.Basis {
	b := filter.BasisGuaranteed
	for i := range r.Checks {
		c := &r.Checks[i]
		if (c.Req.Key == filter.KeySlew || c.Req.Key == filter.KeyGBW) && c.Basis > b {
			b = c.Basis
		}
	}
	return b
}

// quantity formats an SI value of dimension d for display; NaN is "?".
func quantity(v float64, d catalog.Dim) string {
	if math.IsNaN(v) {
		return "?"
	}
	return catalog.Format(v, d)
}

// span formats a window lo … hi of dimension d, the unit written once
// when both ends share it: "-2.79…2.79 V", "-450 mV…1.2 V".
func span(lo, hi float64, d catalog.Dim) string {
	a, b := quantity(lo, d), quantity(hi, d)
	if i := strings.LastIndexByte(a, ' '); i >= 0 && strings.HasSuffix(b, a[i:]) && strings.Contains(b, " ") {
		a = a[:i]
	}
	return a + "…" + b
}

// costText shows packages × unit cost, e.g. "2×0.12", or "2×?".
func costText(r *filter.Result) string {
	if !r.Part.UnitCost.Known() {
		return fmt.Sprintf("%d×?", r.Packages)
	}
	return fmt.Sprintf("%d×%s", r.Packages, trimFloat(r.Part.UnitCost.V()))
}

// trimFloat prints a plain number with up to 3 decimals and no trailing zeros.
func trimFloat(v float64) string {
	s := fmt.Sprintf("%.3f", v)
	s = strings.TrimRight(s, "0")
	return strings.TrimSuffix(s, ".")
}

// fieldErrText is what an error from Set or Derive says about the field
// being edited, without the file, line, stage and field the inline
// position already shows.
func fieldErrText(err error) string {
	var e *filter.Error
	if errors.As(err, &e) && e.Err != nil {
		return e.Err.Error()
	}
	return err.Error()
}
