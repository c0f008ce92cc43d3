package tui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"

	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter/report"
)

// View draws the whole screen: exactly height lines of width cells, so
// nothing wraps or scrolls whatever the panes hold.
func (m *Model) View() string {
	if m.quitting {
		return ""
	}
	u := m.ui
	if u.tooSmall() {
		return m.tooSmallView()
	}
	l := u.layout()
	st := &u.st
	lines := make([]string, 0, u.height)
	lines = append(lines, m.titleView(l.title.w))

	body := m.list.draw(&m.rank, &m.narrow, &m.marks, m.cat.idW, m.focus == paneList, l.list.w, l.list.h)
	designView := func() []string {
		return m.form.draw(m.rank.plan, m.design, m.focus == paneDesign, l.design.w, l.design.h)
	}
	switch {
	case l.stacked && m.focus == paneDesign:
		body = append(body, designView()...)
	case l.stacked:
		body = append(body, m.detailView(l.detail.w, l.detail.h)...)
	default:
		left, right := designView(), m.detailView(l.detail.w, l.detail.h)
		sep := st.Sep.Render("│")
		for i := range left {
			body = append(body, left[i]+sep+right[i])
		}
	}
	switch m.mode {
	case modeHelp:
		body = m.helpOverlay(u.width, len(body))
	case modeReplace:
		body = m.repl.draw(u.width, len(body), m.marks.has)
	}
	lines = append(lines, body...)

	switch m.mode {
	case modePrompt:
		a, b := m.prompt.draw(u, m.marks.len(), u.width)
		lines = append(lines, a, b)
	case modeFind:
		in := m.prompt.input
		in.Width = max(10, u.width-8)
		lines = append(lines, fit(st.Prompt.Render("find: ")+in.View(), u.width),
			fit(m.help.ShortHelpView(u.keys.editKeys()), u.width))
	default:
		lines = append(lines, m.statusView(u.width), fit(m.helpLine(), u.width))
	}
	// Data strings are escaped where they are drawn; safe.Styled is the
	// net under that: nothing but the program's own styling reaches the
	// terminal.
	return safe.Styled(strings.Join(lines, "\n"))
}

// titleView is the top line: the program, the design file and the sources.
func (m *Model) titleView(w int) string {
	st := &m.ui.st
	design := safe.Text(m.cfg.DesignFile)
	if design == "" {
		design = safe.Text(m.design.Name) + " (demo design)"
	}
	right := " ? keys "
	left := st.Title.Render(" opsift") + st.Muted.Render(" · design "+design+" · catalog "+sourceName(m.cat.Sources))
	return fit(left, w-len(right)) + st.Muted.Render(right)
}

// statusView is the status line: parts passing of total, ranking state
// and the last message.
func (m *Model) statusView(w int) string {
	st := &m.ui.st
	var b strings.Builder
	fmt.Fprintf(&b, " %d of %s pass", m.rank.nPass, plural(len(m.cat.Parts), "part"))
	if m.marks.len() > 0 {
		fmt.Fprintf(&b, " · %d marked", m.marks.len())
	}
	if m.rank.running {
		b.WriteString(" · ranking…")
	}
	left := st.Status.Render(b.String())
	if banner := setAsideBanner(m.cat.Catalog); banner != "" {
		left += st.Error.Render(" · " + banner)
	}
	if m.message != "" {
		msg := st.Message.Render(m.message)
		if m.msgErr {
			msg = st.Error.Render("! " + m.message)
		}
		left += st.Muted.Render(" │ ") + msg
	}
	// The caution stays on every result screen: the long form when it fits
	// beside the counts and the message, else the short one, which the
	// message gives way to.
	note := cautionStatus
	if ansi.StringWidth(left)+1+len([]rune(note))+1 > w {
		note = cautionStatusShort
	}
	right := " " + st.Caution.Render(note) + " "
	return fit(left, max(0, w-ansi.StringWidth(right))) + right
}

// cautionStatus and cautionStatusShort are the status line's reminder;
// the ? overlay shows the full caution (report.Caution).
const (
	cautionStatus      = "advisory: verify every figure against the current datasheet"
	cautionStatusShort = "advisory: verify datasheets"
)

// helpLine is the short key help of the current mode.
func (m *Model) helpLine() string {
	if m.mode == modeReplace {
		return " " + m.help.ShortHelpView(m.ui.keys.replaceKeys())
	}
	if m.mode == modeEdit {
		return " " + m.help.ShortHelpView(m.ui.keys.editKeys()) +
			m.ui.st.Muted.Render("  · ↑/↓ next field · units: 20 kHz, 4.7 kOhm, 0.5 V/us")
	}
	return " " + m.help.ShortHelpView(m.ui.keys.ShortHelp())
}

// paneHeading draws a pane's heading across w cells: a light rule for a
// pane, a heavy one for the focused pane, so focus shows without colour.
func paneHeading(st *Styles, text string, focused bool, w int) string {
	rule, style := "─", st.PaneTitle
	if focused {
		rule, style = "━", st.PaneFocus
	}
	head := fit(rule+" "+text+" ", w-2)
	n := ansi.StringWidth(strings.TrimRight(head, " ")) + 1
	return style.Render(fit(strings.TrimRight(head, " ")+" "+strings.Repeat(rule, max(0, w-n)), w))
}

// helpOverlay is the full key help with the meaning of the markers,
// centred in the body.
func (m *Model) helpOverlay(w, h int) []string {
	st := &m.ui.st
	legend := strings.Join([]string{
		"▸ cursor  ● marked  ✓ pass  ✗ FAIL  ? unknown: the catalog lacks the figure",
		"~ typical figure, derated or inflated by the design's policy",
		"g typical figure read off a datasheet graph",
		"margin: spare at worst case, ≥ 0 passes; fmax: highest sine frequency at",
		"the stage's amplitude at which slew and gbw still pass",
	}, "\n")
	legend += "\n" + strings.Join(wrap("Caution: "+report.Caution, 76), "\n")
	full := m.help.FullHelpView(m.ui.keys.FullHelp())
	content := st.Section.Render("Keys") + st.Muted.Render("  (any key closes this)") + "\n" + full + "\n" +
		st.Section.Render("Markers") + "\n" + legend
	inner := min(w-4, lipgloss.Width(content))
	boxed := st.Overlay.Width(inner + 2).Render(content)
	placed := lipgloss.PlaceHorizontal(w, lipgloss.Center, boxed)
	out := strings.Split(placed, "\n")
	top := max(0, (h-len(out))/2)
	lines := blank(w, top)
	for _, l := range out {
		lines = append(lines, fit(l, w))
	}
	if len(lines) > h {
		lines = lines[:h]
	}
	return append(lines, blank(w, h-len(lines))...)
}

// tooSmallView fills the screen with a note asking for a bigger terminal.
func (m *Model) tooSmallView() string {
	u := m.ui
	msg := fmt.Sprintf("terminal %d×%d is too small: opsift needs at least %d×%d (q quits)", u.width, u.height, minWidth, minHeight)
	lines := blank(u.width, u.height)
	if u.height > 0 {
		lines[0] = fit(msg, u.width)
	}
	return strings.Join(lines, "\n")
}
