package tui

// settle readies the panes for drawing; the root Update calls it after
// every message, and New once. It fills in the checks of the candidate
// rows on screen and of the selected part (the ranking keeps summaries
// only), keeps every pane's scroll offset inside what it shows, and sizes
// the text inputs. View only reads what settle leaves, so drawing never
// changes the model.
func (m *Model) settle() {
	m.ui.footH = len(m.footLines())
	m.ui.statusH = 1
	if m.mode != modePrompt && m.mode != modeAsk && m.mode != modeFind {
		m.ui.statusH = len(m.statusLines(m.ui.width))
	}
	m.form.edited = make(map[string]bool, len(m.edits))
	for _, p := range m.edits {
		m.form.edited[p] = true
	}
	if m.ui.tooSmall() {
		return
	}
	l := m.ui.layout()
	m.list.explainVisible(&m.rank, listRowsIn(l.list.h))
	m.checks.follow(m.list.selected(m.rank.results), l.detail.w, l.detail.h)
	if !l.stacked || m.focus == paneDesign {
		m.form.settle(m.rank.plan, m.rank.warnings, l.design.w, l.design.h)
	}
	if m.detail == detailPreview {
		m.prev.settleFails(&m.rank, m.previewParts())
	}
	if m.detail == detailCompare {
		m.cmp.settle(m.rank.resPlan, m.marks.results(m.rank.results), m.rank.strict, l.detail.w, l.detail.h)
	}
	switch m.mode {
	case modeReplace:
		m.repl.settle(m.ui.width, m.bodyH())
	case modeExplore:
		m.expl.settle(explorerIDW(&m.cat, m.ui.width), m.ui.width, m.bodyH())
	case modeEntry:
		m.entry.settle(m.ui.width, m.bodyH())
	case modePrompt:
		m.prompt.settle(m.marks.len(), m.ui.width)
	}
}
