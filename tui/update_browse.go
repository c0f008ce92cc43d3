package tui

import (
	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
)

// updateBrowse handles a key while nothing has the keyboard: moving, and
// the single-key commands.
func (m *Model) updateBrowse(k tea.KeyMsg) tea.Cmd {
	keys := &m.ui.keys
	switch {
	case key.Matches(k, keys.Quit):
		return m.requestQuit()
	case key.Matches(k, keys.Help):
		m.openHelp()
	case key.Matches(k, keys.Focus):
		m.focus = (m.focus + 1) % paneCount
	case key.Matches(k, keys.FocusBack):
		m.focus = (m.focus + paneCount - 1) % paneCount
	case key.Matches(k, keys.Up):
		m.moveFocused(-1)
	case key.Matches(k, keys.Down):
		m.moveFocused(1)
	case key.Matches(k, keys.PageUp):
		m.moveFocused(-m.pageRows())
	case key.Matches(k, keys.PageDn):
		m.moveFocused(m.pageRows())
	case key.Matches(k, keys.Top):
		m.moveFocused(-1 << 30)
	case key.Matches(k, keys.Bottom):
		m.moveFocused(1 << 30)
	case key.Matches(k, keys.Edit) && m.focus == paneDesign:
		return m.startEdit()
	case key.Matches(k, keys.Edit) && m.focus == paneList:
		m.focus = paneDetail
	case key.Matches(k, keys.Failing):
		m.narrow.failing = !m.narrow.failing
		m.applyNarrowing()
		if m.narrow.failing {
			m.setMessage("showing failing parts too, after the passing ones, with what they miss")
		} else {
			m.setMessage("showing passing parts only")
		}
	case key.Matches(k, keys.Sort):
		m.narrow.cycleSort()
		m.setMessage("sorted by %s", m.narrow.sortKey())
		if m.narrow.failing {
			m.setMessage("sorted by %s: the passing parts; failing ones follow, fewest failing checks first, then the nearest miss", m.narrow.sortKey())
		}
		return m.rerank()
	case key.Matches(k, keys.Find):
		return m.startFind()
	case key.Matches(k, keys.Tech):
		m.narrow.tech = cycle(m.narrow.tech, m.cat.techs)
		m.applyNarrowing()
		m.setMessage("technology: %s", orAny(m.narrow.tech))
	case key.Matches(k, keys.Package):
		m.narrow.pkg = cycle(m.narrow.pkg, m.cat.pkgs)
		m.applyNarrowing()
		m.setMessage("package: %s", orAny(m.narrow.pkg))
	case key.Matches(k, keys.Clear), key.Matches(k, keys.Cancel) && m.narrow.active():
		m.narrow.clear()
		m.applyNarrowing()
		m.setMessage("filters cleared")
	case key.Matches(k, keys.Mark) && m.focus == paneDesign:
		// j/k move the design field here, so a mark would land on a list
		// row the user is not looking at.
		m.setMessage("space marks the selected candidate from the list or detail pane (tab); here enter edits the field")
	case key.Matches(k, keys.Mark):
		m.toggleMark()
	case key.Matches(k, keys.Shortlist):
		m.narrow.shortlist = !m.narrow.shortlist
		m.applyNarrowing()
		if m.narrow.shortlist {
			m.focus = paneList
		}
	case key.Matches(k, keys.Export):
		if m.marks.len() == 0 {
			m.setMessage("mark parts with space first; x exports the marked ones")
			return nil
		}
		return m.openPrompt(promptExport, m.inLastDir("shortlist.md"))
	case key.Matches(k, keys.Save):
		return m.openSave()
	case key.Matches(k, keys.Undo):
		return m.undoLast()
	case key.Matches(k, keys.Reload):
		return m.reload("reloaded")
	case key.Matches(k, keys.Open):
		return m.openEditor()
	case key.Matches(k, keys.Replace):
		return m.openReplace()
	case key.Matches(k, keys.AddPart):
		return m.openEntry(false)
	case key.Matches(k, keys.EditPart):
		return m.openEntry(true)
	case key.Matches(k, keys.Explore):
		return m.openExplorer()
	case key.Matches(k, keys.Versus):
		m.toggleCompareView()
	case key.Matches(k, keys.VersusScroll):
		if m.detail != detailCompare {
			m.setMessage("← and → scroll the parts of the side-by-side view (=)")
			return nil
		}
		n := 1
		if k.String() == "left" {
			n = -1
		}
		m.cmp.scrollCols(n)
	case key.Matches(k, keys.Preview), key.Matches(k, keys.Compare),
		key.Matches(k, keys.StagePrev), key.Matches(k, keys.StageNext):
		m.previewKey(k)
	}
	return nil
}

// orAny is v, or "any" when empty.
func orAny(v string) string {
	if v == "" {
		return "any"
	}
	return v
}

// moveFocused moves the cursor of the focused pane by n.
func (m *Model) moveFocused(n int) {
	switch m.focus {
	case paneDesign:
		m.form.move(n)
	case paneList:
		m.list.move(n, m.rank.results, m.listRows())
	case paneDetail:
		if m.detail == detailCompare {
			m.cmp.scroll(n)
			return
		}
		m.checks.scroll(n)
	}
}

// toggleMark marks or unmarks the selected candidate.
func (m *Model) toggleMark() {
	r := m.list.selected(m.rank.results)
	if r == nil {
		m.setMessage("no candidate selected")
		return
	}
	m.markPart(r.Part.ID, "; x exports")
}

// markPart marks or unmarks part id in the shortlist, from any mode, and
// says so on the status line (hint follows the count when marking).
func (m *Model) markPart(id, hint string) {
	if m.marks.toggle(id) {
		m.setMessage("marked %s (%s on the shortlist%s)", id, plural(m.marks.len(), "part"), hint)
	} else {
		m.setMessage("unmarked %s (%s on the shortlist)", id, plural(m.marks.len(), "part"))
	}
	if m.narrow.shortlist {
		m.applyNarrowing()
	}
}

// listRows is how many candidate rows fit on screen.
func (m *Model) listRows() int { return max(1, m.ui.layout().list.h-2) }

// pageRows is how far page up/down move in the focused pane.
func (m *Model) pageRows() int {
	l := m.ui.layout()
	switch m.focus {
	case paneDesign:
		return max(1, l.design.h/2)
	case paneDetail:
		return max(1, l.detail.h-3)
	}
	return m.listRows()
}

// updateHelp pages the help overlay with pgdn/pgup (space and the arrows
// too) and closes it on any other key; ctrl+c quits.
func (m *Model) updateHelp(k tea.KeyMsg) tea.Cmd {
	n := len(m.helpPages(m.ui.width, m.bodyH()))
	switch k.String() {
	case "ctrl+c":
		return m.requestQuit()
	case "pgdown", " ", "down", "j":
		if m.helpPage < n-1 {
			m.helpPage++
			return nil
		}
	case "pgup", "up", "k":
		if m.helpPage > 0 {
			m.helpPage--
		}
		return nil
	}
	m.mode, m.helpPage = m.helpFrom, 0
	if m.mode == modeExplore {
		m.setMessage("back in the explorer")
	}
	return nil
}

// openHelp opens the help overlay over the current mode (browsing or the
// explorer), which it shows the keys of and goes back to on closing.
func (m *Model) openHelp() {
	m.helpFrom = modeBrowse
	if m.mode == modeExplore {
		m.helpFrom = modeExplore
	}
	m.mode, m.helpPage = modeHelp, 0
}
