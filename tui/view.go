package tui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
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

	body := m.list.draw(&m.rank, &m.narrow, &m.marks, m.cat.idW, m.cat.idMax, m.focus == paneList, l.list.w, l.list.h)
	designView := func() []string {
		return m.form.draw(m.rank.plan, m.rank.warnings, m.design, len(m.edits), m.focus == paneDesign, l.design.w, l.design.h)
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
	case modeExplore:
		body = m.expl.draw(m.rank.resPlan, explorerIDW(&m.cat, u.width), u.width, len(body), m.marks.has)
	case modeEntry:
		body = m.entry.draw(u.width, len(body))
	}
	var bottom []string
	switch m.mode {
	case modePrompt:
		bottom = m.prompt.draw(u, m.marks.len(), u.width)
	case modeAsk:
		a, b := m.drawAsk(u.width)
		bottom = []string{a, b}
	}
	if bottom != nil {
		room := max(1, u.statusH) + max(1, u.footH) // the status lines and the key help
		if extra := len(bottom) - room; extra > 0 {
			body = body[:max(0, len(body)-extra)] // a wrapped prompt error takes body lines
		}
		for len(bottom) < room {
			bottom = append(blank(u.width, 1), bottom...)
		}
	}
	lines = append(lines, body...)

	switch m.mode {
	case modePrompt, modeAsk:
		lines = append(lines, bottom...)
	case modeFind:
		in := m.prompt.input
		in.Width = max(10, u.width-8)
		lines = append(lines, fit(st.Prompt.Render("find: ")+in.View(), u.width))
		lines = append(lines, m.footLines()...)
	default:
		lines = append(lines, m.statusLines(u.width)...)
		lines = append(lines, m.footLines()...)
	}
	// Data strings are escaped where they are drawn; safe.Styled is the
	// net under that: nothing but the program's own styling reaches the
	// terminal.
	return safe.Styled(strings.Join(lines, "\n"))
}

// titleView is the top line: the program, whether the design has unsaved
// edits (first, so a narrow screen keeps it), the design file and the
// sources.
func (m *Model) titleView(w int) string {
	st := &m.ui.st
	design := safe.Text(m.saved.path)
	if design == "" {
		design = safe.Text(m.design.Name) + " (demo design)"
	}
	right := " ? keys "
	left := st.Title.Render(" opsift")
	if m.modified() {
		left += " " + st.Modified.Render(fmt.Sprintf("● modified (%s, w saves)", plural(len(m.edits), "input")))
	}
	left += st.Muted.Render(" · design " + design + " · catalog " + sourceName(m.cat.Sources))
	return fit(left, w-len(right)) + st.Muted.Render(right)
}

// statusView is the status line: parts passing of total, ranking state
// and the last message; statusLines gives its lines.
func (m *Model) statusView(w int) string { return strings.Join(m.statusLines(w), "\n") }

// statusLines is the status line, and a second when the message needs it:
// the counts, the catalog's set-aside banner, the message, and the caution
// at the right. A message too long for what is left wraps onto a second
// line at full width rather than lose its end (at 80 columns the first
// line leaves it about 30 cells).
func (m *Model) statusLines(w int) []string {
	st := &m.ui.st
	var b strings.Builder
	fmt.Fprintf(&b, " %d of %s pass", m.rank.nPass, plural(len(m.cat.Parts), "part"))
	if m.marks.len() > 0 {
		fmt.Fprintf(&b, " · %d marked", m.marks.len())
	}
	counts := b.String()
	b.Reset()
	if m.rank.loading != "" {
		b.WriteString(" · reading the catalog…")
	} else if m.rank.running {
		b.WriteString(" · ranking…")
	}
	if n := len(m.rank.warnings); n > 0 {
		b.WriteString(" · " + st.Warning.Render("⚠ "+plural(n, "warning")))
	}
	state := b.String()
	if banner := setAsideBanner(m.cat.Catalog); banner != "" {
		state += st.Error.Render(" · " + banner)
	}
	msg := ""
	if m.message != "" {
		msg = st.Message.Render(m.message)
		if m.msgErr {
			msg = st.Error.Render("! " + m.message)
		}
	}
	// The caution stays on every result screen: the long form when it fits
	// beside the counts and the message, else the short one, which the
	// message gives way to.
	left := st.Status.Render(counts) + state
	note := cautionStatus
	msgW := ansi.StringWidth(msg)
	if msgW > 0 {
		msgW += 3 // " │ "
	}
	if ansi.StringWidth(left)+msgW+1+len([]rune(note))+1 > w {
		note = cautionStatusShort
	}
	right := " " + st.Caution.Render(note) + " "
	room := max(0, w-ansi.StringWidth(right))
	if msg == "" {
		return []string{fit(left, room) + right}
	}
	first := left + st.Muted.Render(" │ ")
	if ansi.StringWidth(first)+ansi.StringWidth(msg) <= room {
		return []string{fit(first+msg, room) + right}
	}
	// Wrapped: the message's words over two lines, the second at full width.
	style := st.Message
	text := m.message
	if m.msgErr {
		style, text = st.Error, "! "+m.message
	}
	firstW := max(1, room-ansi.StringWidth(first))
	parts := wrap(text, firstW)
	if len(parts) == 0 {
		return []string{fit(first, room) + right}
	}
	rest := strings.Join(parts[1:], " ")
	out := []string{fit(first+style.Render(parts[0]), room) + right}
	if rest != "" {
		out = append(out, fit(" "+style.Render(rest), w))
	}
	return out
}

// cautionStatus and cautionStatusShort are the status line's reminder;
// the ? overlay shows the full caution (report.Caution).
const (
	cautionStatus      = "advisory: verify every figure against the current datasheet"
	cautionStatusShort = "advisory: verify datasheets"
)

// footLines are the key help of the current mode on the bottom: every key
// whole, wrapped onto a second line when one does not hold them (none is
// cut; "?" shows them all).
func (m *Model) footLines() []string {
	k := &m.ui.keys
	var bs []key.Binding
	tail := ""
	mode := m.mode
	if mode == modeHelp {
		mode = m.helpFrom // the keys the overlay goes back to
	}
	switch mode {
	case modeReplace:
		bs = append(k.replaceKeys(), k.Quit)
	case modeExplore:
		bs = k.explorerKeys()
	case modeEntry:
		bs = k.entryKeys()
	case modeEdit:
		bs = k.editKeys()
		tail = "↑/↓ next field · units: 20 kHz, 4.7 kOhm, 0.5 V/us"
	case modeFind:
		bs = k.editKeys()
	default:
		bs = k.ShortHelp()
	}
	return keyLines(&m.ui.st, bs, tail, m.ui.width, maxFootLines)
}

// keyLines lays bindings out as "key desc" items, then tail, into at most
// n lines of w cells, each item whole: what does not fit in n lines is
// left to the ? overlay rather than cut. Items are parted by " • ", or by
// two spaces when that keeps them on one line.
func keyLines(st *Styles, bs []key.Binding, tail string, w, n int) []string {
	var items []string
	for _, b := range bs {
		h := b.Help()
		items = append(items, st.HelpKey.Render(h.Key)+" "+st.HelpDesc.Render(h.Desc))
	}
	if tail != "" {
		items = append(items, st.Muted.Render(tail))
	}
	out := packItems(items, st.HelpSep.Render(" • "), w, n)
	if len(out) > 1 {
		if tight := packItems(items, "  ", w, n); len(tight) == 1 {
			out = tight
		}
	}
	for i := range out {
		out[i] = fit(out[i], w)
	}
	return out
}

// packItems fills lines of w cells (each starting with a space) with
// items parted by sep, at most n lines; the items left over are dropped.
func packItems(items []string, sep string, w, n int) []string {
	sepW := ansi.StringWidth(sep)
	var out []string
	line := ""
	for _, it := range items {
		switch {
		case line == "":
			line = " " + it
		case ansi.StringWidth(line)+sepW+ansi.StringWidth(it) <= w:
			line += sep + it
		default:
			out = append(out, line)
			line = " " + it
		}
		if len(out) == n {
			return out
		}
	}
	if line != "" {
		out = append(out, line)
	}
	return out
}

// bodyH is the height of the screen between the title and the status line.
func (m *Model) bodyH() int { return m.ui.height - 1 - max(1, m.ui.statusH) - max(1, m.ui.footH) }

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
// centred in the body. Its key columns sit side by side as far as the
// width allows and go under each other beyond; when the whole does not fit
// the height it is shown a page at a time (pgdn/pgup), so every key can be
// read at 80×24 and none is cut.
func (m *Model) helpOverlay(w, h int) []string {
	st := &m.ui.st
	pages := m.helpPages(w, h)
	page := max(0, min(m.helpPage, len(pages)-1))
	content := strings.Join(pages[page], "\n")
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

// helpPages lays the overlay's content out for a body of w×h and splits it
// into pages that fit inside the frame (two border lines), each but a
// single one ending with where it is and how to go on.
func (m *Model) helpPages(w, h int) [][]string {
	st := &m.ui.st
	inner := max(20, w-6) // frame and padding
	cols, markers, title := m.ui.keys.FullHelp(), browseMarkers, "Keys"
	if m.helpFrom == modeExplore {
		cols, markers, title = m.ui.keys.explorerHelp(), explorerMarkers, "Explorer keys"
	}
	body := []string{st.Section.Render(title) + st.Muted.Render("  (any other key closes this)")}
	body = append(body, keyGrid(st, cols, inner)...)
	body = append(body, st.Section.Render("Markers"))
	for _, l := range markers {
		body = append(body, wrap(l, inner)...)
	}
	body = append(body, wrap("Caution: "+report.Caution, inner)...)
	room := max(3, h-2)
	if len(body) <= room {
		return [][]string{body}
	}
	per := room - 1 // the page line
	n := (len(body) + per - 1) / per
	var pages [][]string
	for i := 0; i < n; i++ {
		pg := append([]string(nil), body[i*per:min(len(body), (i+1)*per)]...)
		note := fmt.Sprintf("page %d/%d · pgdn next", i+1, n)
		if i == n-1 {
			note = fmt.Sprintf("page %d/%d · pgup back", i+1, n)
		} else if i > 0 {
			note = fmt.Sprintf("page %d/%d · pgdn next · pgup back", i+1, n)
		}
		pages = append(pages, append(pg, st.Muted.Render(note)))
	}
	return pages
}

// browseMarkers and explorerMarkers are what the help overlay says the
// marks of the main screen and of explorer mode mean.
var (
	browseMarkers = []string{
		"▸ cursor  ● marked  ✓ pass  ✗ FAIL  ? unknown: the catalog lacks the figure",
		"~ typical figure, derated or inflated by the design's policy",
		"g typical figure read off a datasheet graph",
		"s check measured by simulation at worst case (thd); not simulated for a part that fails another check",
		"margin: spare at worst case, ≥ 0 passes; from ×10 the figure over the need",
		"s sort: orders the passing parts; with f the failing ones follow, fewest failing checks first, then the nearest miss, whatever the sort",
		"fmax: highest sine frequency at the stage's amplitude at which slew and gbw still pass",
		"wave preview (v, V): ✗ above the plot names the checks of the stage the part fails; peak error is the largest instantaneous difference from the ideal output over the window, phase lag included (the gain_error check is a magnitude error only, so peak error can be larger)",
		"● modified: the design has edits not saved (w saves in place, u undoes)",
		"entry form (a, A): ! marks a field with a problem; every printable key is text there, ctrl+s saves",
	}
	explorerMarkers = []string{
		"▸ cursor  ● marked  ✓ pass  ✗ N: fails N checks of the design (shown dim)",
		"▲ ▼ the sort column, ascending or descending; [·col] the column cursor s sorts on",
		"worst case: figures at the design's temperature range; ~ typical × derate_typ or × inflate_typ, g the same read off a graph, — not given",
		"T typical: figures as the catalog gives them (~ typical, g read off a graph; unmarked: a stated limit)",
	}
)

// keyGrid draws the key columns of the full help side by side while they
// fit in w cells, starting a new row of columns beyond.
func keyGrid(st *Styles, cols [][]key.Binding, w int) []string {
	const gap = 3
	var blocks [][]string
	for _, col := range cols {
		kw := 0
		for _, b := range col {
			kw = max(kw, ansi.StringWidth(b.Help().Key))
		}
		var lines []string
		for _, b := range col {
			h := b.Help()
			lines = append(lines, st.HelpKey.Render(h.Key)+strings.Repeat(" ", kw-ansi.StringWidth(h.Key)+1)+st.HelpDesc.Render(h.Desc))
		}
		blocks = append(blocks, lines)
	}
	width := func(b []string) int {
		n := 0
		for _, l := range b {
			n = max(n, ansi.StringWidth(l))
		}
		return n
	}
	var out []string
	for i := 0; i < len(blocks); {
		row := []int{i}
		used := width(blocks[i])
		for j := i + 1; j < len(blocks) && used+gap+width(blocks[j]) <= w; j++ {
			row = append(row, j)
			used += gap + width(blocks[j])
		}
		height := 0
		for _, j := range row {
			height = max(height, len(blocks[j]))
		}
		for r := 0; r < height; r++ {
			var b strings.Builder
			for k, j := range row {
				cell := ""
				if r < len(blocks[j]) {
					cell = blocks[j][r]
				}
				if k < len(row)-1 {
					cell = fit(cell, width(blocks[j])+gap)
				}
				b.WriteString(cell)
			}
			out = append(out, strings.TrimRight(b.String(), " "))
		}
		i += len(row)
	}
	return out
}

// tooSmallView fills the screen with a note asking for a bigger terminal,
// wrapped to its width.
func (m *Model) tooSmallView() string {
	u := m.ui
	msg := fmt.Sprintf("terminal %d×%d is too small: opsift needs at least %d×%d (q quits)", u.width, u.height, minWidth, minHeight)
	var lines []string
	for _, l := range wrap(msg, u.width) {
		lines = append(lines, fit(l, u.width))
	}
	lines = lines[:min(len(lines), max(0, u.height))]
	return strings.Join(append(lines, blank(u.width, u.height-len(lines))...), "\n")
}
