package tui

import (
	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/filter"
)

// startEdit gives the field under the design pane's cursor the keyboard.
func (m *Model) startEdit() tea.Cmd {
	help, cmd, ok := m.form.begin()
	if !ok {
		return nil
	}
	m.mode = modeEdit
	m.setMessage("%s", help)
	return cmd
}

// updateEdit handles a key while a design field is being edited. Every
// change of the text is applied at once; moving away or enter ends the
// edit, esc puts back the text the field had before.
func (m *Model) updateEdit(k tea.KeyMsg) tea.Cmd {
	keys := &m.ui.keys
	switch {
	case k.String() == "ctrl+c":
		return m.requestQuit()
	case key.Matches(k, keys.Cancel):
		cmd := m.applyField(m.form.path(), m.form.before)
		m.endEdit()
		return cmd
	case key.Matches(k, keys.Accept):
		m.endEdit()
		return nil
	case k.String() == "up", k.String() == "shift+tab":
		m.endEdit()
		m.form.move(-1)
		return nil
	case k.String() == "down", k.String() == "tab":
		m.endEdit()
		m.form.move(1)
		return nil
	}
	old := m.form.input.Value()
	var cmd tea.Cmd
	m.form.input, cmd = m.form.input.Update(k)
	if v := m.form.input.Value(); v != old {
		return tea.Batch(cmd, m.applyField(m.form.path(), v))
	}
	return cmd
}

// endEdit leaves the field. Text that is not in force (it did not parse or
// derive) is dropped: the field shows the value in force again.
func (m *Model) endEdit() {
	if fl, ok := m.form.current(); ok && fl.Raw != m.form.before {
		m.noteEdit(fl.Path, m.form.before)
	}
	if kept := m.form.end(); kept != "" {
		m.setMessage("%s", kept)
	}
	m.mode = modeBrowse
}

// applyField sets the design input at path to raw on a clone of the design
// in force. When it parses and the design still derives, the clone is put
// in force and re-ranked; otherwise the error shows inline and the last
// valid value stays in force.
func (m *Model) applyField(path, raw string) tea.Cmd {
	c := m.design.Clone()
	if err := c.Set(path, raw); err != nil {
		m.form.editErr = fieldErrText(err)
		return nil
	}
	plan, err := filter.Derive(c)
	if err != nil {
		m.form.editErr = fieldErrText(err)
		return nil
	}
	m.form.editErr = ""
	m.design, m.rank.plan, m.planErr = c, plan, nil
	m.form.refresh(c)
	m.refreshEdits()
	return m.rerank()
}

// startFind opens the text filter on the status line.
func (m *Model) startFind() tea.Cmd {
	m.mode = modeFind
	m.form.input.Blur()
	in := &m.prompt.input
	*in = newFindInput(m.ui, m.narrow.find)
	return in.Focus()
}

// updateFind handles a key while the text filter is being typed: the list
// narrows with every key; enter keeps the filter, esc drops it.
func (m *Model) updateFind(k tea.KeyMsg) tea.Cmd {
	switch k.String() {
	case "ctrl+c":
		return m.requestQuit()
	case "esc":
		m.narrow.find = ""
		m.mode = modeBrowse
		m.applyNarrowing()
		return nil
	case "enter":
		m.mode = modeBrowse
		m.focus = paneList
		return nil
	case "up", "down":
		m.list.move(map[string]int{"up": -1, "down": 1}[k.String()], m.rank.results, m.listRows())
		return nil
	}
	var cmd tea.Cmd
	m.prompt.input, cmd = m.prompt.input.Update(k)
	if v := m.prompt.input.Value(); v != m.narrow.find {
		m.narrow.find = v
		m.applyNarrowing()
	}
	return cmd
}
