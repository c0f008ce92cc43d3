package tui

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/filter"
)

// Keeping the user's work: the design as it is on disk (savedState), the
// inputs edited since (Model.edits, shown as "modified" in the header),
// q asking before unsaved edits are dropped, w saving in place in the
// user's own text (filter.UpdateDesignText keeps comments and layout), the
// design file watched so that a change on disk is never silently lost in
// either direction, and u undoing the last edits field by field.
//
//	edit ─► applyField ─► undo stack, edits ─► header "modified"
//	w ─► prompt ─► UpdateDesignText(saved.text, design) ─► WriteFile ─► saved
//	disk change ─► designReadMsg ─► no edits: reload │ edits: ask reload / keep mine
//	q ─► no edits: quit │ edits: ask save / discard / cancel

// savedState is the design as it last was on disk: the base every save in
// place edits and every "modified" is measured against.
type savedState struct {
	path   string         // the file; "" for the embedded demo, not yet saved
	text   []byte         // its text as last read or written
	design *filter.Design // what text decodes to
}

// undoStep is one edit to take back: the field's text before it.
type undoStep struct{ path, raw string }

// askKind is what an open question (modeAsk) is about.
type askKind int

const (
	askQuit askKind = iota // unsaved edits at q: save / discard / cancel
	askDisk                // the design file changed on disk under unsaved edits
)

// ask is a one-key question on the bottom two lines.
type ask struct {
	kind askKind
	// disk is the design file's new text and what it decodes to (askDisk).
	diskText   []byte
	diskDesign *filter.Design
}

// designChangedMsg says the watched design file changed on disk.
type designChangedMsg struct{}

// designTickMsg ends the debounce of a design file change.
type designTickMsg struct{ seq int }

// designReadMsg carries the design file as read after a change.
type designReadMsg struct {
	path string
	text []byte
	err  error
}

// changedInputs lists the paths of the inputs of d that differ from base
// (given in one and not the other, or given with other text), in form
// order, the inputs base has that d lacks (a changed stage kind) last.
func changedInputs(base, d *filter.Design) []string {
	if base == nil || d == nil {
		return nil
	}
	type in struct {
		raw string
		set bool
	}
	was := map[string]in{}
	for _, f := range base.Fields() {
		was[f.Path] = in{f.Raw, f.Set}
	}
	var out []string
	seen := map[string]bool{}
	for _, f := range d.Fields() {
		seen[f.Path] = true
		w := was[f.Path]
		if w.set != f.Set || (f.Set && w.raw != f.Raw) {
			out = append(out, f.Path)
		}
	}
	for _, f := range base.Fields() {
		if !seen[f.Path] && f.Set {
			out = append(out, f.Path)
		}
	}
	return out
}

// modified reports whether the design in force has edits not on disk.
func (m *Model) modified() bool { return len(m.edits) > 0 }

// refreshEdits measures the design in force against the saved one.
func (m *Model) refreshEdits() { m.edits = changedInputs(m.saved.design, m.design) }

// noteEdit records the field's text before an edit that changed it, for u.
func (m *Model) noteEdit(path, before string) {
	m.undo = append(m.undo, undoStep{path, before})
	if len(m.undo) > undoDepth {
		m.undo = m.undo[len(m.undo)-undoDepth:]
	}
}

// undoLast takes back the newest edit: its field gets its text back and
// the design pane's cursor goes to it.
func (m *Model) undoLast() tea.Cmd {
	if len(m.undo) == 0 {
		m.setMessage("nothing to undo")
		return nil
	}
	s := m.undo[len(m.undo)-1]
	m.undo = m.undo[:len(m.undo)-1]
	cmd := m.applyField(s.path, s.raw)
	if m.form.editErr != "" {
		m.setError(fmt.Errorf("undo %s: %s", s.path, m.form.editErr))
		m.form.editErr = ""
		return nil
	}
	for i, f := range m.form.fields {
		if f.Path == s.path {
			m.form.cursor, m.form.follow = i, true
		}
	}
	shown := s.raw
	if shown == "" {
		shown = "(default)"
	}
	m.setMessage("undone: %s is %s again (%d more to undo)", s.path, shown, len(m.undo))
	return cmd
}

// requestQuit quits at once without unsaved edits; with them it asks.
func (m *Model) requestQuit() tea.Cmd {
	if !m.modified() {
		m.quitting = true
		return tea.Quit
	}
	if m.mode == modeEdit {
		m.endEdit()
	}
	m.ask = ask{kind: askQuit}
	m.mode = modeAsk
	return nil
}

// updateAsk handles a key while a question is open.
func (m *Model) updateAsk(k tea.KeyMsg) tea.Cmd {
	switch m.ask.kind {
	case askQuit:
		switch k.String() {
		case "s", "w":
			m.quitAfterSave = true
			return m.openSave()
		case "d", "ctrl+c":
			m.quitting = true
			return tea.Quit
		case "esc", "c", "n":
			m.mode = modeBrowse
			m.setMessage("not quitting; the edits are still unsaved (w saves)")
		}
	case askDisk:
		switch k.String() {
		case "r":
			m.adoptDiskDesign(m.ask.diskText, m.ask.diskDesign)
			m.mode = modeBrowse
			m.setMessage("reloaded the design from disk; your edits were dropped")
			return m.rerank()
		case "k", "esc":
			// The disk version becomes the base: the edits are laid over it
			// (inputs edited here keep their text here, the others take the
			// disk's), w writes them into its text, and "modified" is
			// measured against it.
			m.keepEdits(m.ask.diskText, m.ask.diskDesign)
			m.mode = modeBrowse
			return m.rerank()
		}
	}
	return nil
}

// drawAsk draws the open question on the two bottom lines.
func (m *Model) drawAsk(w int) (line1, line2 string) {
	st := &m.ui.st
	k := st.HelpKey.Render
	switch m.ask.kind {
	case askDisk:
		return fit(st.Prompt.Render(m.designName()+" changed on disk while you have unsaved edits"), w),
			fit(k("r")+" reload it (drop your edits)  "+k("k")+" keep mine (w writes them over it)", w)
	}
	q := fmt.Sprintf("%s has %s not saved", m.designName(), plural(len(m.edits), "edited input"))
	return fit(st.Prompt.Render(q), w),
		fit(k("s")+" save, then quit  "+k("d")+" discard and quit  "+k("esc")+" cancel", w)
}

// designName is the design file's base name, or the demo's.
func (m *Model) designName() string {
	if m.saved.path != "" {
		return filepath.Base(m.saved.path)
	}
	return m.design.Name + " (demo design)"
}

// openSave opens the save prompt on the design's file (design.toml for
// the demo), in the last directory used.
func (m *Model) openSave() tea.Cmd {
	path := m.saved.path
	if path == "" {
		path = m.inLastDir("design.toml")
	}
	return m.openPrompt(promptSave, path)
}

// saveDesign writes the edited inputs into the saved text in place (every
// comment and the layout kept) and returns the command that writes the
// result to path.
func (m *Model) saveDesign(path string) (tea.Cmd, error) {
	text, err := filter.UpdateDesignText(m.saved.text, m.design)
	if err != nil {
		return nil, fmt.Errorf("save design: %w", err)
	}
	d := m.design.Clone()
	write := writeFile(path, text, "saved the design to "+path, "save design")
	return func() tea.Msg {
		msg := write().(writtenMsg)
		if msg.err == nil {
			msg.saved = &savedState{path: path, text: text, design: d}
		}
		return msg
	}, nil
}

// changedOnDisk reports whether the file at path is the design file and
// its text is no longer what the selector read or wrote.
func (m *Model) changedOnDisk(path string) bool {
	if m.saved.path == "" || !samePath(path, m.saved.path) {
		return false
	}
	b, err := os.ReadFile(path)
	return err == nil && !bytes.Equal(b, m.saved.text)
}

// samePath reports whether a and b name the same file.
func samePath(a, b string) bool {
	aa, err1 := filepath.Abs(a)
	bb, err2 := filepath.Abs(b)
	return err1 == nil && err2 == nil && aa == bb
}

// adoptSaved takes a finished save: the file written is the new base, it
// is watched, and a save asked for at q ends the program.
func (m *Model) adoptSaved(s *savedState) tea.Cmd {
	moved := !samePath(s.path, m.saved.path) || m.saved.path == ""
	m.saved = *s
	m.refreshEdits()
	var cmds []tea.Cmd
	if moved && m.cfg.Watch {
		cmds = append(cmds, m.watchDesign())
	}
	if m.quitAfterSave {
		m.quitting = true
		cmds = append(cmds, tea.Quit)
	}
	return tea.Batch(cmds...)
}

// watchDesign (re)starts watching the design file.
func (m *Model) watchDesign() tea.Cmd {
	if m.designWatch != nil {
		_ = m.designWatch.Close()
		m.designWatch = nil
	}
	if m.saved.path == "" {
		return nil
	}
	m.designWatch = startWatcher([]string{m.saved.path})
	if m.designWatch == nil {
		return nil
	}
	return waitForDesign(m.designWatch)
}

// waitForDesign waits for the next change of the watched design file.
func waitForDesign(w *watcher) tea.Cmd {
	wait := waitForChange(w)
	return func() tea.Msg {
		switch msg := wait().(type) {
		case fileChangedMsg:
			return designChangedMsg{}
		case nil:
			return nil
		default:
			return msg
		}
	}
}

// updateDesignJobs handles the design file's watch: a change is read after
// a debounce (editors write in several steps).
func (m *Model) updateDesignJobs(msg tea.Msg) (tea.Cmd, bool) {
	switch msg := msg.(type) {
	case designChangedMsg:
		m.designSeq++
		seq := m.designSeq
		var next tea.Cmd
		if m.designWatch != nil {
			next = waitForDesign(m.designWatch)
		}
		return tea.Batch(next, tea.Tick(reloadDebounce, func(time.Time) tea.Msg { return designTickMsg{seq} })), true
	case designTickMsg:
		if msg.seq != m.designSeq || m.saved.path == "" {
			return nil, true
		}
		path := m.saved.path
		return func() tea.Msg {
			b, err := os.ReadFile(path)
			return designReadMsg{path: path, text: b, err: err}
		}, true
	case designReadMsg:
		return m.designRead(msg), true
	}
	return nil, false
}

// designRead takes the design file as read after a change on disk. Its own
// saves come back here too and change nothing. Without unsaved edits the
// new version is taken (and ranked); with them the user chooses.
func (m *Model) designRead(r designReadMsg) tea.Cmd {
	if !samePath(r.path, m.saved.path) {
		return nil // saved elsewhere meanwhile
	}
	if r.err != nil {
		m.setError(fmt.Errorf("design file: %w (the selector keeps its design; w writes it back)", r.err))
		return nil
	}
	if bytes.Equal(r.text, m.saved.text) {
		return nil
	}
	d, err := filter.DecodeDesign(r.path, r.text)
	if err != nil {
		m.setError(fmt.Errorf("the design file changed on disk and does not read, kept the design in the selector: %w", err))
		return nil
	}
	if !m.modified() {
		m.adoptDiskDesign(r.text, d)
		m.setMessage("%s changed on disk; reloaded", filepath.Base(r.path))
		return m.rerank()
	}
	switch m.mode {
	case modeEdit:
		m.endEdit()
	case modePrompt:
		if m.prompt.writing {
			return nil // the save being written answers it
		}
	}
	m.ask = ask{kind: askDisk, diskText: r.text, diskDesign: d}
	m.mode = modeAsk
	return nil
}

// keepEdits makes the disk version the base and lays the edits in force
// over it. When an edit no longer applies (the disk version changed the
// stages), the design in force stays whole.
func (m *Model) keepEdits(text []byte, disk *filter.Design) {
	merged := disk.Clone()
	mine := map[string]string{}
	for _, f := range m.design.Fields() {
		if f.Set {
			mine[f.Path] = f.Raw
		}
	}
	ok := true
	for _, path := range m.edits {
		if err := merged.Set(path, mine[path]); err != nil {
			ok = false
			break
		}
	}
	plan, err := filter.Derive(merged)
	m.saved.text, m.saved.design = text, disk
	if ok && err == nil {
		n := len(m.edits)
		m.design, m.rank.plan, m.planErr = merged, plan, nil
		m.form.refresh(m.design)
		m.setMessage("kept %s over the disk version", plural(n, "edit"))
	} else {
		m.setMessage("kept your design whole: the disk version changed its stages")
	}
	m.refreshEdits()
}

// adoptDiskDesign puts the design read from disk in force, dropping edits
// and their undo.
func (m *Model) adoptDiskDesign(text []byte, d *filter.Design) {
	m.saved.text, m.saved.design = text, d
	m.design = d.Clone()
	m.rank.plan, m.planErr = filter.Derive(m.design)
	if m.planErr != nil {
		m.setError(m.planErr)
	}
	m.undo = nil
	m.form.refresh(m.design)
	m.refreshEdits()
}

// inLastDir puts a file name in the directory the last write went to.
func (m *Model) inLastDir(name string) string {
	if m.lastDir == "" {
		return name
	}
	return filepath.Join(m.lastDir, filepath.Base(name))
}
