package tui

// ui is the read-only context every pane draws with: the terminal size,
// the styles and the keys. The root model owns it and changes only the size,
// on a resize; panes get it by pointer and never write to it.
type ui struct {
	width, height int
	// footH is how many lines the key help at the bottom takes (1 or 2:
	// it wraps rather than cut a key); the root sets it before settling.
	footH int
	// statusH is how many lines the status line takes (1, or 2 when its
	// message wraps); the root sets it with footH.
	statusH int
	st      Styles
	keys    KeyMap
}

// box is a rectangle of the screen in cells.
type box struct{ x, y, w, h int }

// layout is where each pane goes for the current size.
type layout struct {
	title  box
	list   box
	design box
	sep    box // the vertical line between the design and detail panes
	detail box
	status box
	help   box
	// stacked is true below wideWidth: the design and detail panes share
	// the lower area at full width, the focused one shown (the design pane
	// while it has focus, else the detail pane).
	stacked bool
}

// layout computes the panes' boxes: one title line, the body, a status
// line and the key help (footH lines). The candidate list spans the top of the body so
// every column fits; below it the design pane takes the left and the
// detail pane (the selected part's checks) the right.
func (u *ui) layout() layout {
	w, h := u.width, u.height
	l := layout{stacked: w < wideWidth}
	l.title = box{0, 0, w, 1}
	foot, status := max(1, u.footH), max(1, u.statusH)
	l.status = box{0, h - status - foot, w, status}
	l.help = box{0, h - foot, w, foot}
	bodyH := h - 1 - status - foot
	listH := max(minListRows+2, bodyH*listShare/100)
	l.list = box{0, 1, w, listH}
	lowH := bodyH - listH
	if l.stacked {
		l.design = box{0, 1 + listH, w, lowH}
		l.detail = l.design
		return l
	}
	dw := min(designWidth, w/2)
	l.design = box{0, 1 + listH, dw, lowH}
	l.sep = box{dw, 1 + listH, 1, lowH}
	l.detail = box{dw + 1, 1 + listH, w - dw - 1, lowH}
	return l
}

// tooSmall reports whether the terminal is below the smallest size the
// layout is drawn for.
func (u *ui) tooSmall() bool { return u.width < minWidth || u.height < minHeight }
