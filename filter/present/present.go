// Package present is the one presentation vocabulary of opsift's front
// ends: the table and Markdown writers, the command line and the selector
// all write margins, check names, failure reasons and temperatures with
// these functions, wrap text with Wrap and fit table columns with Fit, so
// the same figure reads the same everywhere.
//
//	filter.Check / filter.Result ─► Margin, CheckName, Reason, Worst ─► cells
//	text, width ───────────────────► Wrap ─► lines
//	[]Column, width ───────────────► Fit  ─► column widths (0 = dropped)
//
// The conventions, decided once:
//   - A margin is a signed percentage: one decimal below 10 % ("+3.2 %",
//     "-4.2 %"), whole percent from 10 % ("+31 %", "-44 %"). From RatioFrom
//     (+900 %, a figure ten times what is needed) it is written as the
//     ratio of the figure to the need, "×10", "×17", "×50000", because a
//     percentage of that size says nothing a ratio does not say better.
//   - Negative numbers use the ASCII hyphen-minus, like every quantity
//     catalog.Format writes and every value the user types; the sign
//     follows the margin, not the rounding, so a near miss reads "-0.0 %".
//   - A check is named "stage/key" ("gain/slew"), or by its key alone for
//     the design-level checks; "/" because keys hold dots themselves
//     (design inputs such as signal.freq).
//   - Temperatures are written by catalog.Format: "-20 °C".
//   - A failing part never shows a positive margin: its row shows its worst
//     failing check (by how far it misses), and a failing hard filter is
//     named by its reason ("package not offered").
package present

import (
	"fmt"
	"math"
	"strconv"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// RatioFrom is the margin from which Margin writes a ratio instead of a
// percentage: +900 %, the figure is ten times the need.
const RatioFrom = 9

// None is what a missing number reads as.
const None = "—"

// Margin renders a margin (a fraction; ≥ 0 passes) the one way every front
// end writes it; NaN is None.
func Margin(m float64) string {
	switch {
	case math.IsNaN(m):
		return None
	case math.IsInf(m, 1):
		return "×∞"
	case m >= RatioFrom:
		return "×" + strconv.FormatFloat(math.Round(1+m), 'f', 0, 64)
	}
	p := m * 100
	f := "%.1f"
	if math.Abs(p) >= 10 {
		f = "%.0f"
	}
	s := fmt.Sprintf(f, math.Abs(p))
	if p < 0 {
		return "-" + s + " %"
	}
	return "+" + s + " %"
}

// CheckName is "stage/key", or just the key for design-level checks.
func CheckName(stage string, key filter.Key) string {
	if stage == "" {
		return string(key)
	}
	return stage + "/" + string(key)
}

// Temp writes a temperature in °C.
func Temp(c float64) string { return catalog.Format(c, catalog.Celsius) }

// Reason says in a few words why a failing hard filter fails a part
// ("package not offered"); for a numeric check it is the check's name.
func Reason(c *filter.Check) string {
	switch c.Req.Key {
	case filter.KeyPackage:
		return "package not offered"
	case filter.KeyTech:
		return "tech not allowed"
	case filter.KeyLifecycle:
		return "lifecycle not allowed"
	case filter.KeyCost:
		return "over cost limit"
	case filter.KeyTemperature:
		return "temp range not rated"
	}
	return CheckName(c.Req.Stage, c.Req.Key)
}

// Hard reports whether c is a pass/fail filter without a margin.
func Hard(c *filter.Check) bool { return c.Req.Bound == filter.BoundHard }

// Worst returns a failing result's worst failing check: the numeric check
// that misses by most, else the first failing hard filter; nil for a
// passing result, or one failing only on unknown figures (strict).
func Worst(r *filter.Result) *filter.Check {
	var worst *filter.Check
	for _, c := range r.Failing() {
		switch {
		case worst == nil:
			worst = c
		case c.HasMargin() && (!worst.HasMargin() || c.Margin < worst.Margin):
			worst = c
		}
	}
	return worst
}

// FailingFirst returns the checks of r with the failing ones first (worst
// miss first, then hard filters), then the rest in their order.
func FailingFirst(r *filter.Result) []*filter.Check {
	var fail, rest []*filter.Check
	for i := range r.Checks {
		c := &r.Checks[i]
		if c.Status == filter.StatusFail {
			fail = append(fail, c)
		} else {
			rest = append(rest, c)
		}
	}
	sortFailing(fail)
	return append(fail, rest...)
}

// sortFailing orders failing checks: numeric ones by margin (worst first),
// then hard filters, each group keeping check order.
func sortFailing(cs []*filter.Check) {
	rank := func(c *filter.Check) float64 {
		if c.HasMargin() {
			return c.Margin
		}
		return math.Inf(1)
	}
	for i := 1; i < len(cs); i++ {
		for j := i; j > 0 && rank(cs[j]) < rank(cs[j-1]); j-- {
			cs[j], cs[j-1] = cs[j-1], cs[j]
		}
	}
}

// RowMargin is the margin a result's row shows: its worst margin when it
// passes; when it fails, the margin of its worst failing check (never a
// positive figure), or None when only hard filters or unknown figures fail
// it.
func RowMargin(r *filter.Result) string { return Margin(ShownMargin(r)) }

// ShownMargin is the number behind RowMargin, for the machine formats: a
// passing part's worst margin; a failing part's worst failing margin (< 0),
// or NaN when no numeric check fails it.
func ShownMargin(r *filter.Result) float64 {
	if r.Pass {
		return r.WorstMargin
	}
	if w := Worst(r); w != nil && w.HasMargin() {
		return w.Margin
	}
	return math.NaN()
}

// RowBinding is the binding a result's row shows: the check that sets a
// passing part's margin; for a failing part "fails: " and the reason of its
// worst failing check, with how many more fail ("fails: gain/slew +1",
// "fails: package not offered").
func RowBinding(r *filter.Result, strict bool) string {
	if r.Pass {
		if math.IsNaN(r.WorstMargin) {
			return None
		}
		return CheckName(r.Binding.Stage, r.Binding.Key)
	}
	w := Worst(r)
	if w == nil {
		return fmt.Sprintf("fails: %d unknown", r.Unknown)
	}
	more := r.Failed - 1
	if strict {
		more += r.Unknown
	}
	s := "fails: " + Reason(w)
	if more > 0 {
		s += fmt.Sprintf(" +%d", more)
	}
	return s
}
