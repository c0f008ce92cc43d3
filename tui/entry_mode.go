package tui

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/report"
)

// partSavedMsg carries the end of a part's write from the entry form.
type partSavedMsg struct {
	path, id string
	adding   bool
	pass     bool // the part passed the design in force when saved
	err      error
}

// openEntry opens the entry form: for a new part, or (edit) on the
// selected part's figures. A part of the read-only embedded catalog opens
// as a copy to save as a new part into a file of the user's.
func (m *Model) openEntry(edit bool) tea.Cmd {
	var f entryForm
	switch {
	case !edit:
		f = newEntryForm(m.ui, nil, "", "")
		m.setMessage("new part: every field is checked as you type; ctrl+s saves, esc leaves")
	default:
		r := m.list.selected(m.rank.results)
		if r == nil {
			m.setMessage("no candidate selected; a adds a new part")
			return nil
		}
		if !m.onDisk(r.Part.Pos.File) {
			f = newEntryForm(m.ui, r.Part, "", "")
			f.clearID()
			f.start = "" // a copy is new work: leaving asks
			m.setMessage("%s is in the read-only %s: this is a copy, to save under an id of your own into a file of yours",
				r.Part.ID, sourceName(m.cat.Sources))
		} else {
			f = newEntryForm(m.ui, r.Part, r.Part.ID, r.Part.Pos.File)
			m.setMessage("editing %s: ctrl+s writes it back into %s, esc leaves", r.Part.ID, filepath.Base(r.Part.Pos.File))
		}
	}
	f.setPath(m.saveToSuggestion())
	m.entry = f
	m.mode = modeEntry
	m.checkEntry()
	return nil
}

// saveToSuggestion is the file a new part is offered to go into: the
// file given with opsift add --to, else the last catalog file saved into,
// else the file of the selected part when it is on disk, else the first
// catalog file or directory on disk (a new parts.toml in it); "" when the
// catalog is only the embedded demo.
func (m *Model) saveToSuggestion() string {
	if m.cfg.SaveTo != "" {
		return m.cfg.SaveTo
	}
	if m.lastPartFile != "" {
		return m.lastPartFile
	}
	if r := m.list.selected(m.rank.results); r != nil && m.onDisk(r.Part.Pos.File) {
		return r.Part.Pos.File
	}
	for _, p := range m.cfg.OnDisk {
		if st, err := os.Stat(p); err == nil {
			if st.IsDir() {
				return filepath.Join(p, "parts.toml")
			}
			return p
		}
	}
	return ""
}

// checkEntry checks the form's fields again in the ranking in force.
func (m *Model) checkEntry() {
	m.entry.check(entryContext{plan: m.rank.resPlan, results: m.rank.results, cat: m.cat.Catalog,
		sort: m.narrow.sortKey(), strict: m.rank.strict})
}

// updateEntry hands a key to the form and does what it asks.
func (m *Model) updateEntry(k tea.KeyMsg) tea.Cmd {
	f, act, cmd := m.entry.update(k, entryLayoutFor(m.ui.width, m.bodyH()).gridH)
	m.entry = f
	switch act {
	case entryChanged:
		m.checkEntry()
	case entryClose:
		m.mode = modeBrowse
		m.setMessage("left the entry form; nothing saved")
	case entrySave:
		return m.savePart()
	}
	return cmd
}

// savePart starts writing the form's part: a new part appended to the
// file asked for, an edited one over its table in its own file.
func (m *Model) savePart() tea.Cmd {
	f := &m.entry
	p := f.part
	if p == nil {
		return nil
	}
	path, adding := f.file, f.editing == ""
	if adding {
		var err error
		if path, err = m.checkSaveTo(strings.TrimSpace(f.path.Value())); err != nil {
			f.err = err.Error()
			return nil
		}
	}
	f.saving, f.ask = true, askNone
	editing, pass := f.editing, f.result != nil && f.result.Pass
	return func() tea.Msg {
		msg := partSavedMsg{path: path, id: p.ID, adding: adding, pass: pass}
		msg.err = writePart(path, editing, p)
		return msg
	}
}

// checkSaveTo is the file a new part may be saved into, from what was
// typed: a *.toml file, not a directory, never the embedded demo catalog.
func (m *Model) checkSaveTo(path string) (string, error) {
	if path == "" {
		where := "a catalog file of your own, such as my-parts.toml"
		if len(m.cfg.OnDisk) == 0 {
			return "", fmt.Errorf("the embedded demo catalog is read-only: give %s (it joins this session's catalog; use it with --catalog later)", where)
		}
		return "", fmt.Errorf("give %s", where)
	}
	if strings.HasPrefix(path, "~/") {
		if home, err := os.UserHomeDir(); err == nil {
			path = filepath.Join(home, path[2:])
		}
	}
	if st, err := os.Stat(path); err == nil && st.IsDir() {
		return "", fmt.Errorf("%s is a directory: give a file in it, such as %s", path, filepath.Join(path, "parts.toml"))
	}
	if !catalog.IsCatalogName(filepath.Base(path)) {
		return "", fmt.Errorf("%s: a catalog file's name ends in .toml", path)
	}
	return path, nil
}

// writePart writes p into the catalog file path through the one atomic
// writer: appended after the file's text when editing is "" (the file may
// not exist yet), else over the table of the part editing. The file is
// read at the moment of writing, so a change made meanwhile is kept.
func writePart(path, editing string, p *catalog.Part) error {
	data, err := os.ReadFile(path)
	if err != nil && !(editing == "" && errors.Is(err, fs.ErrNotExist)) {
		return fmt.Errorf("save part: %w", err)
	}
	var out []byte
	if editing == "" {
		if parts, derr := catalog.Decode(path, data); derr != nil && len(parts) == 0 && len(data) > 0 {
			var se *catalog.SyntaxError
			if errors.As(derr, &se) {
				return fmt.Errorf("save part: %s is not a catalog file that reads (%w); nothing written (opsift check %s)", path, firstProblem(derr), path)
			}
		} else {
			for _, q := range parts {
				if q.ID == p.ID {
					return fmt.Errorf("save part: %s already holds a part %q; nothing written", path, p.ID)
				}
			}
		}
		out, err = catalog.AppendPart(data, p)
	} else {
		out, err = catalog.ReplacePart(data, editing, p)
	}
	if err != nil {
		return fmt.Errorf("save part: %s: %w", path, err)
	}
	if err := report.WriteFile(path, out); err != nil {
		return fmt.Errorf("save part: %w", err)
	}
	return nil
}

// adoptPartSaved ends a save: on success the form closes, a file that was
// not among the catalog sources joins them (Config.AddSource), the
// catalog is read again and the part selected in the ranking; on failure
// the form stays open with the error.
func (m *Model) adoptPartSaved(msg partSavedMsg) tea.Cmd {
	m.entry.saving = false
	if msg.err != nil {
		m.entry.err = msg.err.Error()
		if m.mode != modeEntry {
			m.setError(msg.err)
		}
		return nil
	}
	if m.mode == modeEntry {
		m.mode = modeBrowse
	}
	m.lastPartFile = msg.path
	why := fmt.Sprintf("saved %s into %s", msg.id, filepath.Base(msg.path))
	if !msg.adding {
		why = fmt.Sprintf("saved %s in %s", msg.id, filepath.Base(msg.path))
	}
	if !m.onDisk(msg.path) {
		if m.cfg.AddSource != nil {
			m.cfg.AddSource(msg.path)
			m.cfg.OnDisk = append(m.cfg.OnDisk, msg.path)
			why += " (now one of this session's catalog sources; --catalog " + filepath.Base(msg.path) + " next time)"
		} else {
			why += " (not one of the catalog sources: start with --catalog to rank it)"
		}
	}
	m.list.selID = msg.id
	if !msg.pass {
		m.list.gone = msg.id // no note that it left the list: the message says
		why += "; it does not pass the design (f shows failing parts)"
	}
	m.partNote = why + "; reloaded"
	return m.reload(m.partNote)
}
