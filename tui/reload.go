package tui

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/fsnotify/fsnotify"

	"github.com/opsift/opsift/catalog"
)

// reloadedMsg carries a re-read catalog; why says what caused the reload,
// gen which read it was (Model.loadGen when it started).
type reloadedMsg struct {
	cat *catalog.Catalog
	err error
	why string
	gen int
}

// fileChangedMsg says a watched catalog file changed on disk.
type fileChangedMsg struct{ name string }

// watchErrMsg is an error from the file watcher.
type watchErrMsg struct{ err error }

// reloadTickMsg ends a debounce wait; only the newest (seq) reloads.
type reloadTickMsg struct{ seq int }

// editorDoneMsg says the editor opened on a part has exited.
type editorDoneMsg struct{ err error }

// watcher follows the on-disk catalog sources. fsnotify watches
// directories (editors replace files by renaming, which a watch on the
// file itself would lose), so for a source that is a file the events of
// its directory are filtered down to that file.
//
// A source directory's parent is watched too, so that when the directory
// is moved away or deleted and made again, the new one is watched and
// read: the watch survives the directory being replaced.
type watcher struct {
	w     *fsnotify.Watcher
	dirs  map[string]bool // source directories: any *.toml inside counts
	files map[string]bool // source files
}

// startWatcher watches paths; it returns nil when watching is impossible
// (the selector then only reloads on the key).
func startWatcher(paths []string) *watcher {
	fw, err := fsnotify.NewWatcher()
	if err != nil {
		return nil
	}
	w := &watcher{w: fw, dirs: map[string]bool{}, files: map[string]bool{}}
	for _, p := range paths {
		abs, err := filepath.Abs(p)
		if err != nil {
			continue
		}
		st, err := os.Stat(abs)
		switch {
		case err != nil:
			continue
		case st.IsDir():
			w.dirs[abs] = true
			_ = fw.Add(abs)
			_ = fw.Add(filepath.Dir(abs))
		default:
			w.files[abs] = true
			_ = fw.Add(filepath.Dir(abs))
		}
	}
	return w
}

// Close stops watching.
func (w *watcher) Close() error { return w.w.Close() }

// relevant reports whether an event touches a catalog file: a *.toml file
// in a watched directory or a watched file, not a hidden or temporary one
// (editor swap files, the temporary file of an atomic write).
func (w *watcher) relevant(ev fsnotify.Event) bool {
	if !ev.Has(fsnotify.Write) && !ev.Has(fsnotify.Create) && !ev.Has(fsnotify.Remove) && !ev.Has(fsnotify.Rename) {
		return false
	}
	name := filepath.Clean(ev.Name)
	if w.dirs[name] {
		return true // the source directory itself came, went or moved
	}
	base := filepath.Base(name)
	if strings.HasPrefix(base, ".") || !catalog.IsCatalogName(base) {
		return w.files[name]
	}
	return w.files[name] || w.dirs[filepath.Dir(name)]
}

// rewatch watches a source directory again when ev says it was made
// anew (after being moved away or deleted): the old watch followed the
// old directory or died with it.
func (w *watcher) rewatch(ev fsnotify.Event) {
	name := filepath.Clean(ev.Name)
	if w.dirs[name] && ev.Has(fsnotify.Create) {
		_ = w.w.Remove(name)
		_ = w.w.Add(name)
	}
}

// waitForChange waits for the next relevant event of w.
func waitForChange(w *watcher) tea.Cmd {
	return func() tea.Msg {
		for {
			select {
			case ev, ok := <-w.w.Events:
				if !ok {
					return nil
				}
				if w.relevant(ev) {
					w.rewatch(ev)
					return fileChangedMsg{name: ev.Name}
				}
			case err, ok := <-w.w.Errors:
				if !ok {
					return nil
				}
				return watchErrMsg{err: err}
			}
		}
	}
}

// updateJobs handles the messages of background work: reloads, the file
// watcher and the editor.
func (m *Model) updateJobs(msg tea.Msg) tea.Cmd {
	switch msg := msg.(type) {
	case fileChangedMsg:
		m.reloadSeq++
		seq := m.reloadSeq
		return tea.Batch(waitForChange(m.watcher), tea.Tick(reloadDebounce, func(time.Time) tea.Msg {
			return reloadTickMsg{seq: seq}
		}))
	case watchErrMsg:
		m.setError(fmt.Errorf("watching the catalog: %w", msg.err))
		return waitForChange(m.watcher)
	case reloadTickMsg:
		if msg.seq != m.reloadSeq {
			return nil // more changes came; a later tick reloads
		}
		return m.reload("catalog changed on disk; reloaded")
	case reloadedMsg:
		return m.adoptCatalog(msg)
	case firstLoadMsg, loadTickMsg:
		return m.updateLoad(msg)
	case editorDoneMsg:
		if msg.err != nil {
			m.setError(fmt.Errorf("editor: %w", msg.err))
		}
		return m.reload("back from the editor; reloaded")
	}
	return nil
}

// reload reads the catalog sources again in the background.
func (m *Model) reload(why string) tea.Cmd {
	if m.cfg.Load == nil {
		m.setMessage("this catalog cannot be reloaded")
		return nil
	}
	load := m.cfg.Load
	m.loadGen++
	gen := m.loadGen
	return func() tea.Msg {
		c, err := load()
		return reloadedMsg{cat: c, err: err, why: why, gen: gen}
	}
}

// adoptCatalog installs a reloaded catalog, keeping the selection and the
// shortlist (marks of parts that are gone are dropped and counted). A
// catalog the loader refused (Config.Load applies the strict or partial
// rule: a source gone, no valid part left, any problem under
// --strict-catalog) is not taken: the one in force stays, so a file
// being rewritten does not empty the list.
//
// Reads can overlap (a slow file system, a key pressed during a watched
// reload): the newest read wins, and the result of one older than the
// catalog on screen is dropped.
func (m *Model) adoptCatalog(r reloadedMsg) tea.Cmd {
	if r.gen < m.loadShown {
		return nil
	}
	m.loadShown = r.gen
	if r.err != nil {
		m.setError(fmt.Errorf("kept the previous catalog: %w", firstProblem(r.err)))
		return nil
	}
	m.setCatalog(r.cat)
	ids := make(map[string]bool, len(r.cat.Parts))
	for _, p := range r.cat.Parts {
		ids[p.ID] = true
	}
	gone := m.marks.prune(func(id string) bool { return ids[id] })
	why := r.why
	if m.partNote != "" {
		why = m.partNote // the watcher's reload of the entry form's own write
	}
	msg := fmt.Sprintf("%s: %s", why, plural(len(r.cat.Parts), "part"))
	if b := setAsideBanner(r.cat); b != "" {
		msg += fmt.Sprintf(" (%s for problems; see opsift check)", b)
	}
	if gone > 0 {
		msg += fmt.Sprintf("; %s left the shortlist (no longer in the catalog)", plural(gone, "part"))
	}
	m.setMessage("%s", msg)
	return m.rerank()
}
