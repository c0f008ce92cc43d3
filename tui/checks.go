package tui

import (
	"fmt"
	"math"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
)

// checksPane shows every check of the selected candidate, grouped by stage
// (design-level first), each with what was required, what the part offers
// at worst case, the margin, the basis and the outcome in words.
type checksPane struct {
	u      *ui
	offset int    // first body line on screen
	partID string // the part the offset belongs to; another part starts at the top

	hr *headroomState // the selected part's headroom, lent read-only
}

// checkColumns are the checks pane's columns.
func checkColumns() []column {
	return []column{
		{title: "result", width: 9, prio: 100},
		{title: "check", width: 16, prio: 99},
		{title: "required", width: 14, prio: 90, right: true},
		{title: "available", width: 14, prio: 89, right: true},
		{title: "margin", width: 6, prio: 95, right: true},
		{title: "basis", width: 11, prio: 50}, // "s simulated"
		{title: "note", width: 7, prio: 1, flex: true},
	}
}

// noteIndent is where a check's note starts on its detail lines: under
// the check's key.
const noteIndent = 12

// outcome is a check's result in words, with a symbol, never colour alone.
func outcome(c *filter.Check) string {
	switch c.Status {
	case filter.StatusPass:
		return "✓ pass"
	case filter.StatusFail:
		return "✗ FAIL"
	}
	return "? unknown"
}

// required and available are a check's two figures as text.
func required(c *filter.Check) string {
	q := c.Req
	switch q.Bound {
	case filter.BoundMin:
		return "≥ " + quantity(c.Required, q.Dim)
	case filter.BoundMax:
		return "≤ " + quantity(c.Required, q.Dim)
	case filter.BoundRange:
		return span(q.Low, q.High, q.Dim)
	}
	switch {
	case len(q.Allowed) > 0:
		return safe.Text(strings.Join(q.Allowed, " "))
	case q.Key == filter.KeyTemperature:
		return span(q.Low, q.High, catalog.Celsius)
	case q.Key == filter.KeyCost:
		return "≤ " + trimFloat(q.Value)
	}
	return ""
}

func available(c *filter.Check, p *catalog.Part) string {
	q := c.Req
	switch q.Bound {
	case filter.BoundMin, filter.BoundMax:
		return quantity(c.Available, q.Dim)
	case filter.BoundRange:
		return span(c.AvailLow, c.AvailHigh, q.Dim)
	}
	switch q.Key {
	case filter.KeyPackage:
		return safe.Text(strings.Join(p.Packages, " "))
	case filter.KeyTech:
		return string(p.Tech)
	case filter.KeyLifecycle:
		return string(p.Lifecycle)
	case filter.KeyCost:
		if p.UnitCost.Known() {
			return trimFloat(p.UnitCost.V())
		}
	case filter.KeyTemperature:
		if p.Temp[0].Known() && p.Temp[1].Known() {
			return span(p.Temp[0].V(), p.Temp[1].V(), catalog.Celsius)
		}
	}
	return "?"
}

// lines lays out the body of the pane for result r at width w.
func (p *checksPane) lines(r *filter.Result, w int) []string {
	st := &p.u.st
	cols := checkColumns()
	widths := fitColumns(cols, w)
	out := []string{st.Header.Render(fit(header(cols, widths), w))}
	var groups []string // stage names in check order, "" first
	seen := map[string]bool{}
	for i := range r.Checks {
		s := r.Checks[i].Req.Stage
		if !seen[s] {
			seen[s] = true
			groups = append(groups, s)
		}
	}
	for _, g := range groups {
		out = append(out, p.groupLine(r, g, w))
		for i := range r.Checks {
			c := &r.Checks[i]
			if c.Req.Stage != g {
				continue
			}
			res := outcome(c)
			switch c.Status {
			case filter.StatusPass:
				res = st.Pass.Render(res)
			case filter.StatusFail:
				res = st.Fail.Render(res)
			default:
				res = st.Unknown.Render(res)
			}
			basis := c.Basis.String()
			if mk := basisMark(c.Basis); mk != "" {
				basis = mk + " " + basis
			}
			if basis == "" {
				basis = "—"
			}
			note := safe.Text(c.Note)
			if note == "" {
				note = safe.Text(c.Req.Why)
			}
			if a := c.Aside.Text(); a != "" {
				note = safe.Text(a) + " · " + note
			}
			// A note longer than its column is read in full on detail lines
			// under the row, wrapped, rather than cut; so are the figures
			// when a narrow pane would cut them (the value that decides).
			var detail []string
			req, avail := required(c), available(c, r.Part)
			if present.Width(req) > widths[2] || present.Width(avail) > widths[3] {
				detail = wrap("required "+req+" · available "+avail, max(10, w-noteIndent))
			}
			if nw := widths[len(widths)-1]; present.Width(note) > nw {
				detail = append(detail, wrap(note, max(10, w-noteIndent))...)
				note = ""
			}
			margin := present.Margin(c.Margin)
			if c.Status == filter.StatusFail {
				margin = st.Fail.Render(margin)
			}
			cells := []string{res, "  " + string(c.Req.Key), req, avail, margin, basis, st.Why.Render(note)}
			out = append(out, fit(row(cols, widths, cells), w))
			for _, l := range detail {
				out = append(out, st.Why.Render(fit(strings.Repeat(" ", noteIndent)+l, w)))
			}
		}
	}
	return append(out, p.headroomLines(r, w)...)
}

// groupLine heads one stage's checks with its own pass/fail verdict.
func (p *checksPane) groupLine(r *filter.Result, stage string, w int) string {
	st := &p.u.st
	name := "design"
	if stage != "" {
		name = "stage " + stage
	}
	var fails []string
	unknown := 0
	for i := range r.Checks {
		c := &r.Checks[i]
		if c.Req.Stage != stage {
			continue
		}
		switch c.Status {
		case filter.StatusFail:
			f := string(c.Req.Key)
			if c.HasMargin() {
				f += " " + present.Margin(c.Margin)
			}
			fails = append(fails, f)
		case filter.StatusUnknown:
			if !c.NotRun {
				unknown++
			}
		}
	}
	verdict := st.Pass.Render("✓ pass")
	if len(fails) > 0 {
		verdict = st.Fail.Render("✗ FAIL: " + strings.Join(fails, ", "))
	}
	if unknown > 0 {
		verdict += st.Unknown.Render(fmt.Sprintf(" · %d unknown", unknown))
	}
	return fit(st.Section.Render(name)+" "+verdict, w)
}

// detailView draws the right-hand detail area.
func (m *Model) detailView(w, h int) []string {
	focused := m.focus == paneDetail
	switch m.detail {
	case detailChecks:
		return m.checks.draw(m.list.selected(m.rank.results), focused, w, h)
	case detailPreview:
		return m.prev.draw(&m.rank, m.previewParts(), focused, w, h)
	case detailCompare:
		return m.cmp.draw(focused, w, h)
	}
	return blank(w, h)
}

// checksBodyRows is how many body lines a checks pane of h lines shows
// under its title, summary and column header.
func checksBodyRows(h int) int { return max(0, h-3) }

// follow keeps the offset on the selected result r: another part starts
// at the top, and the offset stays inside its lines for a pane of w×h.
// r's checks must be explained.
func (p *checksPane) follow(r *filter.Result, w, h int) {
	if r == nil {
		return
	}
	if p.partID != r.Part.ID {
		p.partID, p.offset = r.Part.ID, 0
	}
	body := p.lines(r, w)
	p.offset = max(0, min(p.offset, len(body)-1-checksBodyRows(h)))
}

// scroll moves the view by n lines; follow applies the lower end.
func (p *checksPane) scroll(n int) { p.offset = max(0, p.offset+max(-1<<20, min(1<<20, n))) }

// draw draws the checks pane for the selected result r (nil: none) into
// h lines of w cells. r's checks are explained and the offset settled in
// Update (follow).
func (p *checksPane) draw(r *filter.Result, focused bool, w, h int) []string {
	st := &p.u.st
	if r == nil {
		out := []string{paneHeading(st, "CHECKS", focused, w), st.Muted.Render(fit("no candidate selected", w))}
		return append(out, blank(w, h-2)...)
	}
	out := []string{paneHeading(st, "CHECKS · "+safe.Text(r.Part.ID+" — "+r.Part.Name), focused, w), fit(p.summary(r), w)}
	body := p.lines(r, w)
	out = append(out, body[0])
	for i := 1 + p.offset; i < len(body) && len(out) < h; i++ {
		out = append(out, body[i])
	}
	return append(out, blank(w, h-len(out))...)
}

// summary is one line about the selected part: verdict, cost, current.
func (p *checksPane) summary(r *filter.Result) string {
	st := &p.u.st
	var b strings.Builder
	if r.Pass {
		b.WriteString(st.Pass.Render("✓ passes"))
		if !math.IsNaN(r.WorstMargin) {
			fmt.Fprintf(&b, " · worst %s at %s", present.Margin(r.WorstMargin), present.CheckName(r.Binding.Stage, r.Binding.Key))
		}
	} else {
		b.WriteString(st.Fail.Render("✗ fails: " + failingText(r)))
	}
	if r.Unknown > 0 {
		fmt.Fprintf(&b, " · %d unknown", r.Unknown)
	}
	fmt.Fprintf(&b, " · %d pkg", r.Packages)
	if !math.IsNaN(r.Cost) {
		fmt.Fprintf(&b, " = %s", trimFloat(r.Cost))
	}
	if !math.IsNaN(r.SupplyCurrent) {
		fmt.Fprintf(&b, " · Iq %s", catalog.Format(r.SupplyCurrent, catalog.Ampere))
	}
	fmt.Fprintf(&b, " · %s · %s", safe.Text(strings.Join(r.Part.Packages, " ")), safe.Text(string(r.Part.Lifecycle)))
	return b.String()
}

// failingText names a failing part's failing checks, worst miss first
// (present.FailingFirst), each by its reason and margin: "gain/gbw -23 %,
// package not offered".
func failingText(r *filter.Result) string {
	var out []string
	for _, c := range present.FailingFirst(r) {
		if c.Status != filter.StatusFail {
			break
		}
		t := present.Reason(c)
		if c.HasMargin() {
			t += " " + present.Margin(c.Margin)
		}
		out = append(out, t)
	}
	if len(out) == 0 {
		return fmt.Sprintf("%d unknown", r.Unknown) // strict: unknown figures only
	}
	return strings.Join(out, ", ")
}

// blank is n empty lines of w cells.
func blank(w, n int) []string {
	out := make([]string, max(0, n))
	for i := range out {
		out[i] = strings.Repeat(" ", w)
	}
	return out
}
