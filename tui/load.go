package tui

import (
	"fmt"
	"strings"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
)

// The first read of the catalog, when Config.LoadFirst is set: the
// selector draws its first frame at once with an empty catalog, the design
// pane already editable, and reads the catalog in a tea.Cmd. A tick shows
// the files and parts read so far in place of the candidate list; the
// ranking fills in when the catalog arrives. A catalog that cannot be read
// ends the selector (Model.Fatal), as it would have before the start.

// firstLoadMsg carries the first read of the catalog.
type firstLoadMsg struct {
	cat *catalog.Catalog
	err error
}

// loadTickMsg asks for the progress of the first read to be shown again.
type loadTickMsg struct{}

// loadTick is how often the progress of the first read is redrawn.
const loadTick = 100 * time.Millisecond

// firstLoad starts the first read of the catalog and its progress ticks.
func (m *Model) firstLoad() tea.Cmd {
	load := m.cfg.Load
	m.rank.loading = loadingText(catalog.Progress{})
	return tea.Batch(func() tea.Msg {
		c, err := load()
		return firstLoadMsg{cat: c, err: err}
	}, tickLoad())
}

func tickLoad() tea.Cmd {
	return tea.Tick(loadTick, func(time.Time) tea.Msg { return loadTickMsg{} })
}

// updateLoad handles the messages of the first read.
func (m *Model) updateLoad(msg tea.Msg) tea.Cmd {
	switch msg := msg.(type) {
	case loadTickMsg:
		if m.rank.loading == "" {
			return nil // the catalog has arrived
		}
		if m.cfg.LoadProgress != nil {
			m.rank.loading = loadingText(m.cfg.LoadProgress())
		}
		return tickLoad()
	case firstLoadMsg:
		m.rank.loading = ""
		if msg.err != nil {
			m.fatal = msg.err
			return tea.Quit
		}
		m.setCatalog(msg.cat)
		m.setMessage("read %s", plural(len(msg.cat.Parts), "part"))
		if ps := msg.cat.Problems(); len(ps) > 0 {
			m.setError(fmt.Errorf("catalog: %w (parts with problems are set aside; see opsift check)", firstProblem(ps)))
		}
		return m.rerank()
	}
	return nil
}

// Fatal returns the error that ended the selector: the catalog could not
// be read on the first load. Nil otherwise.
func (m *Model) Fatal() error { return m.fatal }

// loadingWidth is the width of the progress bar of the first read.
const loadingWidth = 20

// loadingText is the line shown while the catalog is read.
func loadingText(p catalog.Progress) string {
	if p.TotalFiles == 0 {
		return "reading the catalog…"
	}
	done := loadingWidth * p.Files / p.TotalFiles
	return fmt.Sprintf("reading the catalog [%s%s] %d of %s, %s",
		strings.Repeat("#", done), strings.Repeat("·", loadingWidth-done),
		p.Files, plural(p.TotalFiles, "file"), plural(p.Parts, "part"))
}
