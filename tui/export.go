package tui

import (
	"bytes"
	"fmt"
	"path/filepath"
	"strings"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/report"
)

// writtenMsg carries the end of a file write started from the prompt:
// done is the status message on success, err why it failed.
type writtenMsg struct {
	path  string
	done  string
	err   error
	saved *savedState // a design save: the new base (keep.go)
}

// writeFile writes data to path off the UI path, through the one atomic
// writer; what names the action in an error.
func writeFile(path string, data []byte, done, what string) tea.Cmd {
	return func() tea.Msg {
		if err := report.WriteFile(path, data); err != nil {
			return writtenMsg{path: path, err: fmt.Errorf("%s: %w", what, err)}
		}
		return writtenMsg{path: path, done: done}
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
	doc := &report.Doc{Plan: m.exportPlan(), Results: res, Sort: m.narrow.sortKey(), All: true,
		Strict: m.rank.strict, Sources: m.cat.Sources, Meta: m.exportMeta()}
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

// exportMeta says what an export was made from, like every JSON output of
// the command line: version, date, the design file and whether it has
// unsaved edits (the inputs themselves come from the plan), the catalog
// files with their hashes, and the warnings about the filters.
func (m *Model) exportMeta() *report.Meta {
	file := m.saved.path
	if file == "" {
		file = "embedded demo design " + m.design.Name
	}
	meta := &report.Meta{Version: m.cfg.Version, Generated: time.Now(), File: file, Modified: m.modified(),
		Sources: m.cat.FileSums, Strict: m.rank.strict}
	if m.rank.resPlan != nil {
		meta.Warnings = filter.FilterWarnings(m.rank.resPlan, m.cat.Parts)
	}
	return meta
}

// exportPlan is the plan an export is written from. With unsaved edits its
// title says what was edited: the title is the user's own text and may
// name a value the edit changed ("±12 V" after V+ became 24 V).
func (m *Model) exportPlan() *filter.Plan {
	if !m.modified() {
		return m.rank.resPlan
	}
	p := *m.rank.resPlan
	p.Title = editedTitle(p.Title, m.design, m.edits)
	return &p
}

// editedTitle is title followed by the edited inputs with their text in
// force: "Line driver — edited: supply.pos = 24 V, stage.gain.gain = 20".
func editedTitle(title string, d *filter.Design, edits []string) string {
	raw := map[string]string{}
	for _, f := range d.Fields() {
		switch {
		case f.Set:
			raw[f.Path] = f.Raw
		case f.Default != "":
			raw[f.Path] = "(default " + f.Default + ")"
		default:
			raw[f.Path] = "(not given)"
		}
	}
	var parts []string
	for i, path := range edits {
		if i == maxTitleEdits {
			parts = append(parts, fmt.Sprintf("%d more", len(edits)-i))
			break
		}
		v, ok := raw[path]
		if !ok {
			v = "(removed)"
		}
		parts = append(parts, path+" = "+v)
	}
	if title == "" {
		return "edited: " + strings.Join(parts, ", ")
	}
	return title + " — edited: " + strings.Join(parts, ", ")
}

// maxTitleEdits is how many edited inputs an export's title names; the
// "Made from" block and the JSON design inputs list every one.
const maxTitleEdits = 6

// adoptWritten reports a finished write. On success the prompt closes
// and its directory is remembered; on failure the prompt stays open with
// the error in it, to try another path.
func (m *Model) adoptWritten(msg writtenMsg) tea.Cmd {
	m.prompt.writing = false
	if msg.err != nil {
		m.prompt.err = msg.err.Error()
		if m.mode != modePrompt {
			m.setError(msg.err)
		}
		return nil
	}
	if m.mode == modePrompt {
		m.mode = modeBrowse
	}
	m.lastDir = filepath.Dir(msg.path)
	m.setMessage("%s", msg.done)
	if msg.saved != nil {
		return m.adoptSaved(msg.saved)
	}
	return nil
}
