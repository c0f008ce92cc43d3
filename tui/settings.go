package tui

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/listing"
	"github.com/opsift/opsift/filter/report"
)

// Settings are the selector's remembered choices, kept in a small TOML file
// beside the user's catalog directory (SettingsPath):
//
//	[explorer]
//	columns = ["gbw", "slew", "vos"]
type Settings struct {
	// ExplorerColumns are the explorer's column keys (filter/listing); nil
	// for the default columns.
	ExplorerColumns []string
}

// SettingsPath is the settings file: $XDG_CONFIG_HOME/opsift/settings.toml,
// else ~/.config/opsift/settings.toml; "" when neither gives a place.
func SettingsPath(getenv func(string) string) string {
	d := catalog.UserDir(getenv)
	if d == "" {
		return ""
	}
	return filepath.Join(filepath.Dir(d), "settings.toml")
}

// LoadSettings reads the settings file at path. A missing file is the
// default settings; an unreadable or malformed one is an error naming it,
// and unknown column keys are dropped (a newer or older opsift may have
// written them).
func LoadSettings(path string) (Settings, error) {
	if path == "" {
		return Settings{}, nil
	}
	b, err := catalog.ReadFile(path)
	if errors.Is(err, fs.ErrNotExist) {
		return Settings{}, nil
	}
	if err != nil {
		return Settings{}, fmt.Errorf("settings %s: %w", path, err)
	}
	var raw struct {
		Explorer struct {
			Columns []string `toml:"columns"`
		} `toml:"explorer"`
	}
	if err := catalog.Prescan(string(b)); err != nil {
		return Settings{}, fmt.Errorf("settings %s: %w", path, err)
	}
	if _, err := toml.Decode(string(b), &raw); err != nil {
		return Settings{}, fmt.Errorf("settings %s: %w", path, err)
	}
	var s Settings
	for _, k := range raw.Explorer.Columns {
		if _, err := listing.Lookup(k); err == nil {
			s.ExplorerColumns = append(s.ExplorerColumns, k)
		}
	}
	return s, nil
}

// encode writes the settings as TOML.
func (s Settings) encode() []byte {
	var b bytes.Buffer
	b.WriteString("# opsift selector settings, written by opsift; safe to delete.\n[explorer]\n")
	q := make([]string, len(s.ExplorerColumns))
	for i, k := range s.ExplorerColumns {
		q[i] = strconv.Quote(k)
	}
	fmt.Fprintf(&b, "columns = [%s]\n", strings.Join(q, ", "))
	return b.Bytes()
}

// saveSettings writes s to path off the UI path, through the one atomic
// writer, making the directory first; the result comes back as a
// writtenMsg (done empty: nothing to say on success).
func saveSettings(path string, s Settings) tea.Cmd {
	data := s.encode()
	return func() tea.Msg {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			return writtenMsg{err: fmt.Errorf("settings: %w", err)}
		}
		if err := report.WriteFile(path, data); err != nil {
			return writtenMsg{err: fmt.Errorf("settings: %w", err)}
		}
		return writtenMsg{done: "explorer columns saved to " + path}
	}
}
