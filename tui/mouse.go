package tui

import tea "github.com/charmbracelet/bubbletea"

// updateMouse scrolls the pane under the pointer with the wheel; a click
// focuses a pane and, in the candidate list, selects the row.
func (m *Model) updateMouse(msg tea.MouseMsg) tea.Cmd {
	if m.mode != modeBrowse {
		return nil
	}
	l := m.ui.layout()
	at := func(b box) bool { return msg.X >= b.x && msg.X < b.x+b.w && msg.Y >= b.y && msg.Y < b.y+b.h }
	var p pane
	switch {
	case at(l.design) && l.stacked && m.focus != paneDesign:
		p = paneDetail
	case at(l.design):
		p = paneDesign
	case at(l.list):
		p = paneList
	case at(l.detail):
		p = paneDetail
	default:
		return nil
	}
	switch msg.Button {
	case tea.MouseButtonWheelUp, tea.MouseButtonWheelDown:
		n := wheelRows
		if msg.Button == tea.MouseButtonWheelUp {
			n = -n
		}
		switch p {
		case paneDesign:
			m.form.scroll(n)
		case paneList:
			m.list.move(n, m.rank.results, m.listRows())
		case paneDetail:
			m.checks.scroll(n)
		}
	case tea.MouseButtonLeft:
		if msg.Action != tea.MouseActionPress {
			return nil
		}
		m.focus = p
		if p == paneList {
			if i := m.list.offset + msg.Y - l.list.y - 2; msg.Y-l.list.y >= 2 && i < len(m.list.view) {
				m.list.move(i-m.list.cursor, m.rank.results, m.listRows())
			}
		}
	}
	return nil
}
