package tui

import (
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter/report"
)

// promptKind says what a prompt's path is for.
type promptKind int

const (
	promptExport promptKind = iota // the shortlist, in one of exportFormats
	promptSave                     // the edited design, as design TOML
)

// exportFormats are the formats a shortlist can be exported in: those of
// opsift rank except the terminal table.
func exportFormats() []report.Format {
	return []report.Format{report.Markdown, report.CSV, report.JSON, report.TOML}
}

// prompt asks for a path (and for an export, a format) on the bottom two
// lines, then for a yes/no before it overwrites an existing file.
type prompt struct {
	kind    promptKind
	input   textinput.Model
	format  report.Format
	confirm bool // waiting for y/n: the file exists
	// onDisk: the confirm is about the design file having changed on disk
	// since it was read, not merely existing.
	onDisk  bool
	writing bool   // a write is running; keys wait for its writtenMsg
	err     string // why the last try failed, shown in the prompt until the next key
}

// openPrompt starts a prompt of kind with the path suggested.
func (m *Model) openPrompt(kind promptKind, suggest string) tea.Cmd {
	in := newInput(m.ui, suggest, 512)
	m.prompt = prompt{kind: kind, input: in, format: report.Markdown}
	if kind == promptExport {
		m.prompt.format = formatOf(suggest, report.Markdown)
	}
	m.mode = modePrompt
	return m.prompt.input.Focus()
}

// formatOf is the export format a path's extension names, else def.
func formatOf(path string, def report.Format) report.Format {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".md", ".markdown":
		return report.Markdown
	case ".csv":
		return report.CSV
	case ".json":
		return report.JSON
	case ".toml":
		return report.TOML
	}
	return def
}

// withExt replaces a path's extension by the format's.
func withExt(path string, f report.Format) string {
	ext := filepath.Ext(path)
	if formatOf(path, "") == "" {
		ext = ""
	}
	return strings.TrimSuffix(path, ext) + "." + string(f)
}

// updatePrompt handles a key while a prompt is open.
func (m *Model) updatePrompt(k tea.KeyMsg) tea.Cmd {
	p := &m.prompt
	keys := &m.ui.keys
	if p.writing {
		return nil
	}
	if k.String() == "ctrl+c" {
		m.mode, m.quitAfterSave = modeBrowse, false
		return m.requestQuit()
	}
	p.err = ""
	if p.confirm {
		switch k.String() {
		case "y", "Y":
			p.confirm = false
			return m.finishPrompt(true)
		case "n", "N", "esc":
			p.confirm = false // back to the path
		}
		return nil
	}
	switch {
	case key.Matches(k, keys.Cancel):
		m.mode = modeBrowse
		m.setMessage("nothing written")
		if m.quitAfterSave {
			m.quitAfterSave = false
			m.setMessage("nothing written; not quitting")
		}
		return nil
	case key.Matches(k, keys.Accept):
		return m.finishPrompt(false)
	case k.String() == "tab" && p.kind == promptExport:
		fs := exportFormats()
		p.format = fs[(slices.Index(fs, p.format)+1)%len(fs)]
		if v := strings.TrimSpace(p.input.Value()); v != "" {
			p.input.SetValue(withExt(v, p.format))
			p.input.CursorEnd()
		}
		return nil
	}
	var cmd tea.Cmd
	p.input, cmd = p.input.Update(k)
	if p.kind == promptExport {
		p.format = formatOf(p.input.Value(), p.format)
	}
	return cmd
}

// finishPrompt starts writing the file, asking first when it exists
// (unless overwrite is already confirmed); the prompt closes when the
// write reports success (adoptWritten).
func (m *Model) finishPrompt(overwrite bool) tea.Cmd {
	p := &m.prompt
	path := strings.TrimSpace(p.input.Value())
	if path == "" {
		m.setMessage("give a file name, or esc to cancel")
		return nil
	}
	if strings.HasPrefix(path, "~/") {
		if home, err := os.UserHomeDir(); err == nil {
			path = filepath.Join(home, path[2:])
		}
	}
	if st, err := os.Stat(path); err == nil && !overwrite {
		if st.IsDir() {
			p.err = path + " is a directory: give a file name"
			return nil
		}
		// The design file itself is saved without asking, unless it
		// changed on disk since it was read.
		p.onDisk = p.kind == promptSave && m.changedOnDisk(path)
		if p.kind != promptSave || p.onDisk || !samePath(path, m.saved.path) {
			p.confirm = true
			return nil
		}
	}
	var cmd tea.Cmd
	var err error
	switch p.kind {
	case promptExport:
		cmd, err = m.exportShortlist(path, p.format)
	case promptSave:
		cmd, err = m.saveDesign(path)
	}
	if err != nil {
		p.err = err.Error()
		return nil // the prompt stays open to try another path
	}
	p.writing = true
	return cmd
}

// draw draws an open prompt on the bottom lines: two, or three when the
// error of the last try needs them (it wraps rather than being cut);
// marked is the number of marked parts an export writes.
func (p *prompt) draw(u *ui, marked, w int) []string {
	st := &u.st
	path := strings.TrimSpace(p.input.Value())
	if p.confirm {
		q := path + " exists: replace it?"
		if p.onDisk {
			q = path + " changed on disk since it was read: write your version over it?"
		}
		return []string{fit(st.Prompt.Render(safe.Text(q))+" y/n", w), fit(st.HelpKey.Render("y")+" write  "+st.HelpKey.Render("n")+" back", w)}
	}
	label := p.label(marked)
	hint := st.HelpKey.Render("enter") + " save  " + st.HelpKey.Render("esc") + " cancel"
	if p.kind == promptExport {
		hint = st.HelpKey.Render("enter") + " write  " + st.HelpKey.Render("tab") + " format (md csv json toml)  " +
			st.HelpKey.Render("esc") + " cancel"
	}
	out := []string{fit(st.Prompt.Render(label)+p.input.View(), w)}
	if p.err == "" {
		return append(out, fit(hint, w))
	}
	// The path is on the line above: the error names it by base name.
	msg := p.err
	if path != "" && filepath.Base(path) != path {
		msg = strings.ReplaceAll(msg, path, filepath.Base(path))
	}
	errLines := wrap("! "+safe.Text(msg)+" · edit the path, esc cancels", w)
	if len(errLines) > maxPromptErrLines {
		errLines = errLines[:maxPromptErrLines]
	}
	for _, l := range errLines {
		out = append(out, st.Error.Render(fit(l, w)))
	}
	return out
}

// label is the text before the path: what is written; marked is the
// number of marked parts an export writes.
func (p *prompt) label(marked int) string {
	if p.kind == promptExport {
		return "export " + plural(marked, "marked part") + " as " + string(p.format) + " to "
	}
	return "save design to "
}

// settle sizes the path input to the room the label leaves in w cells.
func (p *prompt) settle(marked, w int) {
	p.input.Width = max(10, w-len([]rune(p.label(marked)))-2)
}

// plural is "1 part" or "3 parts".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return strconv.Itoa(n) + " " + noun + "s"
}
