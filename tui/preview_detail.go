package tui

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
	"github.com/opsift/opsift/filter/preview"
	"github.com/opsift/opsift/filter/sim"
	"github.com/opsift/opsift/tui/plot"
)

// previewPane is the waveform detail: the selected part (or, in compare
// mode, the two shortlisted parts) run in one stage of the design by
// filter/preview, drawn with the braille plotter, with the metrics beside.
//
//	cursor moves, design edit, stage key ─► followPreview: want ≠ asked?
//	      ─► previewJob{gen} (tea.Cmd: preview.Run per part, off the UI path)
//	      ─► previewMsg{gen} ─► dropped unless gen is the newest ─► shown
type previewPane struct {
	u *ui
	// stage is the stage the user picked with [ and ]; "" or a stage the
	// design no longer has means its first stage with a waveform.
	stage string
	// compare overlays the two shortlisted parts instead of the selection.
	compare bool
	gen     uint64     // generation of the newest previewJob
	asked   previewFor // what the newest job was started for
	shown   previewFor // what res and err are for
	res     []*preview.Result
	err     error
	// fails is, per previewed part, what it fails (stageFailures), set by
	// settle from the ranking so the pane never draws a clean trace of a
	// failing part without saying so.
	fails []stageFail
}

// stageFail is what one previewed part fails: the checks of the previewed
// stage ("input_range -7.8 %"), worst first, and the failing checks
// elsewhere in the design (stage/key), which the trace does not show.
type stageFail struct {
	id          string
	here, other []string
}

// previewFor is what a preview shows: the plan it runs in, the stage and
// the parts, in order. Two equal values need no new run.
type previewFor struct {
	plan  *filter.Plan
	stage string
	ids   string // part ids joined by spaces
}

// previewJob runs the preview of parts in one stage of a plan. The plan
// and parts are never written after the job is made (an edit derives a
// new plan from a clone of the design), so the job shares them safely.
type previewJob struct {
	gen    uint64
	target previewFor
	plan   *filter.Plan
	stage  string
	parts  []*catalog.Part
}

// previewMsg carries a finished previewJob back to Update.
type previewMsg struct {
	gen    uint64
	target previewFor
	res    []*preview.Result
	err    error
}

// run simulates each part in the stage, worst case (the figures the
// margins use), with the model's default grid and window.
func (j previewJob) run() tea.Msg {
	msg := previewMsg{gen: j.gen, target: j.target}
	for _, p := range j.parts {
		r, err := preview.Run(j.plan, j.stage, p, preview.Options{})
		if err != nil {
			msg.err = err
			return msg
		}
		msg.res = append(msg.res, r)
	}
	return msg
}

// previewStage resolves the stage to preview in plan: the one picked if
// the plan has it with a waveform, else the first with one. ok is false
// when no stage has a waveform.
func previewStage(plan *filter.Plan, picked string) (name string, ok bool) {
	if plan == nil {
		return "", false
	}
	stages := preview.Stages(plan)
	if slices.Contains(stages, picked) {
		return picked, true
	}
	return preview.FirstStage(plan)
}

// previewParts are the parts the preview shows: the two shortlisted parts
// in rank order in compare mode, else the selected part.
func (m *Model) previewParts() []*catalog.Part {
	if m.prev.compare {
		var out []*catalog.Part
		for _, r := range m.marks.results(m.rank.results) {
			out = append(out, r.Part)
		}
		if len(out) == 2 {
			return out
		}
		return nil
	}
	if r := m.list.selected(m.rank.results); r != nil {
		return []*catalog.Part{r.Part}
	}
	return nil
}

// followPreview keeps the preview on what the screen asks for: when the
// preview shows and the plan, stage or parts differ from the newest job's,
// it starts a new job under a new generation, batched with cmd.
func (m *Model) followPreview(cmd tea.Cmd) tea.Cmd {
	if m.detail != detailPreview {
		return cmd
	}
	if m.prev.compare && m.marks.len() != 2 {
		m.prev.compare = false
		m.setMessage("compare needs exactly two marked parts; previewing the selection")
	}
	stage, ok := previewStage(m.rank.plan, m.prev.stage)
	parts := m.previewParts()
	if !ok || len(parts) == 0 {
		return cmd
	}
	ids := make([]string, len(parts))
	for i, p := range parts {
		ids[i] = p.ID
	}
	want := previewFor{plan: m.rank.plan, stage: stage, ids: strings.Join(ids, " ")}
	if want == m.prev.asked {
		return cmd
	}
	m.prev.gen++
	m.prev.asked = want
	job := previewJob{gen: m.prev.gen, target: want, plan: m.rank.plan, stage: stage, parts: parts}
	if cmd == nil {
		return job.run
	}
	return tea.Batch(cmd, job.run)
}

// adopt takes a finished preview unless a newer one was started.
func (p *previewPane) adopt(msg previewMsg) {
	if msg.gen != p.gen {
		return // stale: the cursor moved on before this job finished
	}
	p.shown, p.res, p.err = msg.target, msg.res, msg.err
}

// cycleStage picks the next (or previous) stage with a waveform in plan
// and returns it, its number and the count; ok is false when none has one.
func (p *previewPane) cycleStage(plan *filter.Plan, next bool) (stage string, i, n int, ok bool) {
	stages := preview.Stages(plan)
	cur, ok := previewStage(plan, p.stage)
	if !ok {
		return "", 0, 0, false
	}
	i = slices.Index(stages, cur)
	if next {
		i = (i + 1) % len(stages)
	} else {
		i = (i + len(stages) - 1) % len(stages)
	}
	p.stage = stages[i]
	return p.stage, i + 1, len(stages), true
}

// previewKey handles the preview keys while browsing: v toggles the
// detail area, V compares the two shortlisted parts, [ and ] pick the
// stage.
func (m *Model) previewKey(k tea.KeyMsg) {
	keys := &m.ui.keys
	switch {
	case key.Matches(k, keys.Preview):
		if m.detail == detailPreview && !m.prev.compare {
			m.detail = detailChecks
			m.setMessage("detail: checks")
			return
		}
		m.prev.compare = false
		m.showPreview()
	case key.Matches(k, keys.Compare):
		if m.marks.len() != 2 {
			m.setMessage("mark exactly two parts with space to compare their waveforms (%d marked)", m.marks.len())
			return
		}
		if m.detail == detailPreview && m.prev.compare {
			m.prev.compare = false
			m.setMessage("preview: the selected part")
			return
		}
		m.prev.compare = true
		m.showPreview()
	case key.Matches(k, keys.StagePrev), key.Matches(k, keys.StageNext):
		if m.detail != detailPreview {
			m.setMessage("v shows the waveform preview; [ and ] then pick the stage")
			return
		}
		if stage, i, n, ok := m.prev.cycleStage(m.rank.plan, key.Matches(k, keys.StageNext)); ok {
			m.setMessage("preview: stage %s, %d of %d", stage, i, n)
		}
	}
}

// showPreview switches the detail area to the preview, focusing it when
// the layout shows one lower pane at a time.
func (m *Model) showPreview() {
	m.detail = detailPreview
	if m.ui.layout().stacked && m.focus == paneDesign {
		m.focus = paneList
	}
	if _, ok := previewStage(m.rank.plan, m.prev.stage); !ok {
		m.setMessage("no stage of this design has a waveform to preview")
		return
	}
	m.setMessage("preview: worst-case figures; [ ] stage · v back to checks")
}

// settleFails finds what each previewed part fails (its result's checks,
// explained here) for the stage the preview shows.
func (p *previewPane) settleFails(rs *ranking, parts []*catalog.Part) {
	p.fails = p.fails[:0]
	stage, ok := previewStage(rs.plan, p.stage)
	if !ok {
		return
	}
	for _, part := range parts {
		for i := range rs.results {
			if rs.results[i].Part != part {
				continue
			}
			rs.explain(i)
			if f := stageFailures(&rs.results[i], stage); len(f.here)+len(f.other) > 0 {
				p.fails = append(p.fails, f)
			}
			break
		}
	}
}

// stageFailures sorts r's failing checks, worst miss first
// (present.FailingFirst), into those of stage (key and margin) and the
// rest (check name and margin, or the hard filter's reason).
func stageFailures(r *filter.Result, stage string) stageFail {
	f := stageFail{id: r.Part.ID}
	for _, c := range present.FailingFirst(r) {
		if c.Status != filter.StatusFail {
			break
		}
		margin := ""
		if c.HasMargin() {
			margin = " " + present.Margin(c.Margin)
		}
		switch {
		case c.Req.Stage == stage:
			f.here = append(f.here, string(c.Req.Key)+margin)
		case c.Req.Stage == "":
			f.other = append(f.other, present.Reason(c)+margin)
		default:
			f.other = append(f.other, present.CheckName(c.Req.Stage, c.Req.Key)+margin)
		}
	}
	return f
}

// failBanner is the text above the plot for one failing part: the checks
// of the stage it fails, or, when it passes this stage, what it fails
// elsewhere. named puts the part's id first (a comparison).
func failBanner(f stageFail, stage string, named bool) string {
	who := ""
	if named {
		who = f.id + " "
	}
	if len(f.here) > 0 {
		s := "✗ " + who + "FAILS stage " + stage + ": " + strings.Join(f.here, ", ")
		if len(f.other) > 0 {
			s += fmt.Sprintf(" (+%d failing elsewhere)", len(f.other))
		}
		return s
	}
	return "✗ " + who + "passes stage " + stage + " but fails the design: " + strings.Join(f.other, ", ")
}

// cleanTraceNote closes the banner of a part that fails the previewed
// stage: the model has no phase reversal or other failure the check
// stands for, so its trace can look clean.
const cleanTraceNote = "a clean trace here is no pass: the model may not show the failure"

// draw draws the preview into h lines of w cells: a heading, a banner
// naming what the part fails, the metrics, the plot with its legend, and
// the first note, wrapped.
// parts are the parts it is to show (previewParts).
func (p *previewPane) draw(rs *ranking, parts []*catalog.Part, focused bool, w, h int) []string {
	st := &p.u.st
	stage, ok := previewStage(rs.plan, p.stage)
	out := []string{}
	say := func(title, text string) []string {
		out = append(out, paneHeading(st, title, focused, w), st.Muted.Render(fit(text, w)))
		return append(out, blank(w, h-len(out))...)[:h]
	}
	switch {
	case rs.plan == nil:
		return say("PREVIEW", "no preview: the design cannot be derived")
	case !ok:
		return say("PREVIEW", "no stage of this design has a waveform (direct and rail-splitter stages have none)")
	case len(parts) == 0:
		return say("PREVIEW", "no candidate selected")
	}
	res := p.res
	title := "PREVIEW · " + stage
	if len(res) > 0 {
		title += " (" + res[0].Kind + ") · " + previewIDs(res) + " · worst case"
	}
	if p.asked != p.shown {
		title += " · simulating…"
	}
	out = append(out, paneHeading(st, title, focused, w))
	if p.err != nil {
		for _, l := range wrap("! "+p.err.Error(), w) {
			out = append(out, st.Error.Render(fit(l, w)))
		}
		if len(out) > h {
			out = out[:h]
		}
		return append(out, blank(w, h-len(out))...)
	}
	if len(res) == 0 {
		out = append(out, st.Muted.Render(fit("simulating…", w)))
		return append(out, blank(w, h-len(out))...)
	}
	// What goes above and below the plot, in full and then tighter until
	// the plot keeps roomyPlot lines: the banner without its closing
	// remark, then the metrics cut to a line each. The banner's failing
	// checks and the whole note always show; the plot takes what is left,
	// and is left out when that is under minPlotLines.
	var top []string
	noteLines := noteText(res, w)
	for tight := 0; tight <= 2; tight++ {
		top = append(p.bannerLines(stage, len(res) > 1, tight < 1, w), p.metricsLines(res, tight < 2, w)...)
		if h-len(out)-len(top)-len(noteLines) >= roomyPlot {
			break
		}
	}
	out = append(out, top...)
	const minPlotLines = 3
	if plotH := h - len(out) - len(noteLines); plotH >= minPlotLines {
		for _, l := range strings.Split(plot.Render(w, plotH, p.traces(res), plot.Options{XDim: catalog.Second, YDim: catalog.Volt}), "\n") {
			out = append(out, fit(l, w))
		}
	}
	for _, l := range noteLines {
		if len(out) < h {
			out = append(out, st.Why.Render(fit(l, w)))
		}
	}
	if len(out) > h {
		out = out[:h]
	}
	return append(out, blank(w, h-len(out))...)
}

// roomyPlot is the plot height (axis, labels and legend included: three
// lines of trace) the pane shortens its banner, metrics and note for.
const roomyPlot = 6

// bannerLines are the failing-check banners of the previewed parts,
// wrapped to w; full closes the last with cleanTraceNote.
func (p *previewPane) bannerLines(stage string, named, full bool, w int) []string {
	st := &p.u.st
	var out []string
	for i, f := range p.fails {
		style, text := st.Fail, failBanner(f, stage, named)
		if len(f.here) == 0 {
			style = st.Warning
		}
		if full && i == len(p.fails)-1 && slices.ContainsFunc(p.fails, func(f stageFail) bool { return len(f.here) > 0 }) {
			text += " · " + cleanTraceNote
		}
		for _, l := range wrap(safe.Text(text), w) {
			out = append(out, style.Render(fit(l, w)))
		}
	}
	return out
}

// metricsLines are each previewed part's metrics, wrapped to w, or one
// line each (cut) unless full.
func (p *previewPane) metricsLines(res []*preview.Result, full bool, w int) []string {
	var out []string
	for i, r := range res {
		head := ""
		if len(res) > 1 {
			head = safe.Text(r.Part.ID) + " (" + traceNames[i] + "): "
		}
		text := head + metricsText(&r.Metrics)
		if !full {
			out = append(out, fit(text, w))
			continue
		}
		for _, l := range wrap(text, w) {
			out = append(out, fit(l, w))
		}
	}
	return out
}

// noteText is the first of the previewed parts' notes, with how many more
// there are, wrapped to w.
func noteText(res []*preview.Result, w int) []string {
	var notes []string
	for _, r := range res {
		notes = append(notes, r.Notes...)
	}
	if len(notes) == 0 {
		return nil
	}
	more := ""
	if len(notes) > 1 {
		more = fmt.Sprintf(" (+%d more notes: opsift preview)", len(notes)-1)
	}
	return wrap("note: "+safe.Text(notes[0])+more, w)
}

// previewIDs names the previewed parts: "a" or "a vs b".
func previewIDs(res []*preview.Result) string {
	ids := make([]string, len(res))
	for i, r := range res {
		ids[i] = safe.Text(r.Part.ID)
	}
	return strings.Join(ids, " vs ")
}

// traceNames say how each part's output is drawn, for the metrics lines
// of a comparison: the first part as a solid line, the second as × marks;
// the ideal is always a dotted line. Shape tells them apart without colour.
var traceNames = [...]string{"line", "×"}

// traces are the plot's series: the ideal first (dotted, muted) so the
// outputs draw over it, then each part's output (solid, then × marks).
func (p *previewPane) traces(res []*preview.Result) []plot.Series {
	st := &p.u.st
	style := func(ls lipgloss.Style) func(string) string {
		return func(s string) string { return ls.Render(s) }
	}
	w0 := res[0].Waveform
	out := []plot.Series{{Name: "ideal", X: w0.T, Y: w0.Ideal, Mark: plot.Dotted, Style: style(st.Muted)}}
	for i, r := range res {
		s := plot.Series{Name: r.Part.ID + " output", X: r.Waveform.T, Y: r.Waveform.Out, Mark: plot.Solid, Style: style(st.Mark)}
		if i > 0 {
			s.Mark, s.Glyph, s.Style = plot.Marker, '×', style(st.Unknown)
		}
		out = append(out, s)
	}
	return out
}

// metricsText is a preview's metrics in one line, with units: the output
// against the ideal, the time spent slewing, THD and peak error for
// amplifiers and filters, frequency and duty against the ideal for
// oscillators, the edge time for comparators.
func metricsText(mt *sim.Metrics) string {
	var b []string
	b = append(b, fmt.Sprintf("out %s pp (ideal %s)", catalog.Format(mt.OutputPP, catalog.Volt), catalog.Format(mt.IdealPP, catalog.Volt)))
	if mt.Frequency != nil {
		f := "f " + catalog.Format(*mt.Frequency, catalog.Hertz)
		if mt.IdealFrequency != nil && *mt.IdealFrequency > 0 {
			f += fmt.Sprintf(" (ideal %s, %s)", catalog.Format(*mt.IdealFrequency, catalog.Hertz), signedPercent(*mt.Frequency / *mt.IdealFrequency - 1))
		}
		b = append(b, f)
	}
	if mt.Duty != nil {
		b = append(b, "duty "+percent(*mt.Duty))
	}
	b = append(b, "slewing "+percent(mt.SlewingFraction))
	if mt.THD != nil {
		b = append(b, "THD "+percent(*mt.THD))
	}
	if mt.PeakError != nil {
		b = append(b, "peak error "+catalog.Format(*mt.PeakError, catalog.Volt))
	}
	if mt.TransitionTime != nil {
		b = append(b, "edge "+catalog.Format(*mt.TransitionTime, catalog.Second))
	}
	if mt.Clipped {
		b = append(b, "CLIPS")
	}
	if mt.CMExceeded {
		b = append(b, "CM RANGE EXCEEDED")
	}
	return strings.Join(b, " · ")
}

// percent shows a fraction as a percentage with sensible digits.
func percent(f float64) string {
	switch a := math.Abs(f); {
	case math.IsNaN(f):
		return "—"
	case a == 0:
		return "0 %"
	case a < 0.0001:
		return "< 0.01 %"
	case a < 0.1:
		return fmt.Sprintf("%.2f %%", 100*f)
	}
	return fmt.Sprintf("%.0f %%", 100*f)
}

// signedPercent is percent with a sign, for a deviation from an ideal.
func signedPercent(f float64) string {
	if f >= 0 {
		return "+" + percent(f)
	}
	return "−" + percent(-f)
}
