package tui

import (
	"fmt"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"

	tea "github.com/charmbracelet/bubbletea"
)

// endsOptions reports whether an editor takes "--" to end its options, so
// that nothing after it is read as an option or a "+command" (vi and its
// kin, nano: getopt-style command lines).
func endsOptions(editor string) bool {
	switch editor {
	case "vi", "vim", "nvim", "view", "nano":
		return true
	}
	return false
}

// takesLine reports whether an editor takes "+LINE FILE" to open a file
// at a line (vi and its kin, nano, emacs, micro, kakoune, joe, mg, ne).
func takesLine(editor string) bool {
	switch editor {
	case "vi", "vim", "nvim", "view", "nano", "emacs", "emacsclient", "micro", "kak", "joe", "mg", "ne":
		return true
	}
	return false
}

// openEditor opens the selected part's catalog file in $VISUAL or $EDITOR
// at the part's line, and reloads when the editor exits. Parts of the
// embedded demo catalog have no file to edit.
func (m *Model) openEditor() tea.Cmd {
	r := m.list.selected(m.rank.results)
	if r == nil {
		m.setMessage("no candidate selected")
		return nil
	}
	file := r.Part.Pos.File
	if !m.onDisk(file) {
		m.setMessage("%s is in the read-only %s; run `opsift init` for a catalog of your own to edit",
			r.Part.ID, sourceName(m.cat.Sources))
		return nil
	}
	cmd, err := editorCommand(m.cfg.Getenv, file, r.Part.Pos.Line)
	if err != nil {
		m.setError(err)
		return nil
	}
	return tea.ExecProcess(cmd, func(err error) tea.Msg { return editorDoneMsg{err: err} })
}

// editorCommand builds the command that opens file at line. The file is
// passed as an absolute path (so a catalog file named "+cmd.toml" or
// "-x.toml" is never read as an editor command or option), after "--"
// where the editor takes it; no shell is involved.
func editorCommand(getenv func(string) string, file string, line int) (*exec.Cmd, error) {
	abs, err := filepath.Abs(file)
	if err != nil {
		return nil, fmt.Errorf("editor: %w", err)
	}
	ed := strings.TrimSpace(getenv("VISUAL"))
	if ed == "" {
		ed = strings.TrimSpace(getenv("EDITOR"))
	}
	if ed == "" {
		ed = "vi"
	}
	args := strings.Fields(ed)
	if _, err := exec.LookPath(args[0]); err != nil {
		return nil, fmt.Errorf("editor %q not found: set $EDITOR", args[0])
	}
	name := filepath.Base(args[0])
	if line > 0 && takesLine(name) {
		args = append(args, "+"+strconv.Itoa(line))
	}
	if endsOptions(name) {
		args = append(args, "--")
	}
	args = append(args, abs)
	return exec.Command(args[0], args[1:]...), nil
}

// onDisk reports whether file belongs to an on-disk catalog source.
func (m *Model) onDisk(file string) bool {
	if file == "" {
		return false
	}
	abs, err := filepath.Abs(file)
	if err != nil {
		return false
	}
	for _, p := range m.cfg.OnDisk {
		src, err := filepath.Abs(p)
		if err != nil {
			continue
		}
		if abs == src || filepath.Dir(abs) == src {
			return true
		}
	}
	return false
}

// sourceName is a short name of the catalog sources for messages.
func sourceName(sources []string) string {
	if len(sources) == 0 {
		return "catalog"
	}
	return strings.Join(sources, ", ")
}
