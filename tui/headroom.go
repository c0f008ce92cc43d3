package tui

import (
	"sync/atomic"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/headroom"
)

// headroomState is the headroom of the selected part (filter/headroom),
// computed lazily: only for the part the checks pane shows, off the UI
// path in a tea.Cmd, once per part and ranked plan. The keystroke path
// never searches.
type headroomState struct {
	plan   *filter.Plan // the ranked plan the limits are for
	partID string
	limits []headroom.Limit
	ready  bool // limits are in; false while the search runs
}

// headroomMsg carries a finished search back to Update.
type headroomMsg struct {
	plan   *filter.Plan
	partID string
	limits []headroom.Limit
}

// requestHeadroom starts the search for the selected part when the checks
// pane shows a passing part whose headroom is neither known nor being
// searched for the plan in force. The plan and part are never written
// after ranking, so the job shares them safely.
func (m *Model) requestHeadroom() tea.Cmd {
	if m.detail != detailChecks || m.rank.resPlan == nil || m.rank.resPlan.Design == nil {
		return nil
	}
	r := m.list.selected(m.rank.results)
	if r == nil || !r.Pass {
		return nil
	}
	h := &m.hr
	if h.plan == m.rank.resPlan && h.partID == r.Part.ID {
		return nil
	}
	*h = headroomState{plan: m.rank.resPlan, partID: r.Part.ID}
	plan, part, strict := m.rank.resPlan, r.Part, m.rank.strict
	gen := m.hrGen
	mine := gen.Add(1)
	return func() tea.Msg {
		// While the user types or moves, newer requests overtake this
		// one: wait a moment and search only if none came.
		time.Sleep(headroomDelay)
		if gen.Load() != mine {
			return nil
		}
		return findHeadroom(plan, part, strict)
	}
}

// headroomDelay is how long a headroom request waits for a newer one
// before it searches, so a burst of keys or cursor moves costs one search.
const headroomDelay = 80 * time.Millisecond

// newHeadroomGen is the request counter the waiting jobs read: the only
// state a job shares with the model, and atomic.
func newHeadroomGen() *atomic.Uint64 { return new(atomic.Uint64) }

// findHeadroom is the job: every input of the design, for one part.
func findHeadroom(plan *filter.Plan, part *catalog.Part, strict bool) headroomMsg {
	return headroomMsg{plan: plan, partID: part.ID,
		limits: headroom.Find(plan.Design, plan, part, filter.Options{Strict: strict})}
}

// adoptHeadroom takes a finished search unless the selection or the plan
// moved on meanwhile.
func (m *Model) adoptHeadroom(msg headroomMsg) {
	if msg.plan == m.hr.plan && msg.partID == m.hr.partID {
		m.hr.limits, m.hr.ready = msg.limits, true
	}
}

// headroomLines is the checks pane's headroom section for result r: how
// far each input can move, the rest held, and what breaks there ("good to
// 192 kHz — gbw"), the input with the least room named first.
func (p *checksPane) headroomLines(r *filter.Result, w int) []string {
	st := &p.u.st
	head := st.Section.Render("headroom") + " " + st.Muted.Render("each input moved alone, the rest held")
	out := []string{fit("", w), fit(head, w)}
	h := p.hr
	switch {
	case !r.Pass:
		return append(out, fit(st.Muted.Render("  only for a part that passes the design"), w))
	case h == nil || h.partID != r.Part.ID || !h.ready:
		return append(out, fit(st.Muted.Render("  searching…"), w))
	case len(h.limits) == 0:
		return append(out, fit(st.Muted.Render("  no input breaks the part within the searched range"), w))
	}
	if first, ok := headroom.First(h.limits); ok {
		out = append(out, fit("  first to break: "+safe.Text(first.Label())+" "+first.Text(), w))
	}
	labelW := 0
	for _, l := range h.limits {
		labelW = max(labelW, len([]rune(l.Label())))
	}
	labelW = min(labelW, w/2)
	for _, l := range h.limits {
		method := "closed form"
		if l.Method == headroom.Bisection {
			method = "bisection"
		}
		line := "  " + fit(safe.Text(l.Label()), labelW) + "  " + l.Text() + "  " + st.Muted.Render(method)
		out = append(out, fit(line, w))
	}
	return out
}
