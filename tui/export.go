package tui

import (
	"bytes"
	"fmt"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/report"
)

// writtenMsg carries the end of a file write started from the prompt:
// done is the status message on success, err why it failed.
type writtenMsg struct {
	done string
	err  error
}

// writeFile writes data to path off the UI path, through the one atomic
// writer; what names the action in an error.
func writeFile(path string, data []byte, done, what string) tea.Cmd {
	return func() tea.Msg {
		if err := report.WriteFile(path, data); err != nil {
			return writtenMsg{err: fmt.Errorf("%s: %w", what, err)}
		}
		return writtenMsg{done: done}
	}
}

// exportShortlist renders the marked parts, in rank order, in format f
// with the same writers as opsift rank (the design, its requirements with
// their formulas, every candidate's margins and checks, and the caution)
// and returns the command that writes them to path.
func (m *Model) exportShortlist(path string, f report.Format) (tea.Cmd, error) {
	if m.rank.resPlan == nil {
		return nil, fmt.Errorf("export: the design cannot be derived, nothing to export")
	}
	res := m.marks.results(m.rank.results)
	if len(res) == 0 {
		return nil, fmt.Errorf("export: no marked part is in the current ranking")
	}
	for i := range res {
		explain(m.rank.resPlan, &res[i], m.rank.strict) // copies: the ranking is not written
	}
	doc := &report.Doc{Plan: m.rank.resPlan, Results: res, Sort: m.narrow.sortKey(), All: true,
		Strict: m.rank.strict, Sources: m.cat.Sources}
	if f == report.Markdown && len(res) >= compare.MinParts && len(res) <= compare.MaxParts {
		// the same side-by-side section as the compare view and opsift compare
		doc.Compare = m.cmpTable(res)
	}
	var buf bytes.Buffer
	if err := report.Write(&buf, f, doc); err != nil {
		return nil, fmt.Errorf("export %s: %w", path, err)
	}
	done := fmt.Sprintf("exported %s as %s to %s", plural(len(res), "part"), f, path)
	return writeFile(path, buf.Bytes(), done, "export"), nil
}

// saveDesign encodes the design in force as design TOML and returns the
// command that writes it to path.
func (m *Model) saveDesign(path string) (tea.Cmd, error) {
	var buf bytes.Buffer
	if err := filter.EncodeDesign(&buf, m.design); err != nil {
		return nil, fmt.Errorf("save design: %w", err)
	}
	return writeFile(path, buf.Bytes(), "saved the design to "+path, "save design"), nil
}

// adoptWritten reports a finished write. On success the prompt closes; on
// failure it stays open to try another path.
func (m *Model) adoptWritten(msg writtenMsg) {
	m.prompt.writing = false
	if msg.err != nil {
		m.setError(msg.err)
		return
	}
	if m.mode == modePrompt {
		m.mode = modeBrowse
	}
	m.setMessage("%s", msg.done)
}
