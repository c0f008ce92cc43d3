package tui

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"

	"github.com/charmbracelet/bubbles/help"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
)

// Config is what the selector starts from.
type Config struct {
	// Design is the design to edit; the selector edits a clone of it.
	Design *filter.Design
	// DesignFile is the file Design was read from, "" for the embedded demo.
	// It is the default path when saving.
	DesignFile string
	// Catalog is the loaded catalog; CatalogErr the problems loading it
	// reported (parts with problems are left out), shown on the status line.
	Catalog    *catalog.Catalog
	CatalogErr error
	// Load reads the same catalog sources again (the reload key, a catalog
	// file changed on disk, after editing a part). Nil disables reloading.
	Load func() (*catalog.Catalog, error)
	// OnDisk lists the catalog files and directories that are on disk:
	// they are watched for changes, and only their parts can be opened in
	// an editor (the embedded demo catalog is read-only).
	OnDisk []string
	// Watch turns on watching OnDisk with fsnotify.
	Watch bool
	// Strict makes an unknown check a failure.
	Strict bool
	// Renderer draws every style; give it a no-colour profile for NO_COLOR.
	Renderer *lipgloss.Renderer
	// Getenv reads EDITOR and VISUAL.
	Getenv func(string) string
}

// Model is the selector's root bubbletea model. Its fields are the panes'
// sub-models and the state they share; see doc.go for the flow.
type Model struct {
	ui   *ui
	cfg  Config
	mode mode
	// focus is the pane the movement keys act on.
	focus  pane
	detail detail

	// design is the design in force: every edit that parses and derives
	// replaces it with an edited clone, so a running rankJob's plan is
	// never written to. plan is derived from it (nil with planErr when the
	// starting design cannot be derived).
	design  *filter.Design
	plan    *filter.Plan
	planErr error

	cat     *catalog.Catalog
	techs   []string // technologies present in the catalog, sorted
	pkgs    []string // packages present in the catalog, sorted
	search  map[*catalog.Part]string
	gen     uint64 // generation of the newest rankJob
	results []filter.Result
	resPlan *filter.Plan // the plan results were ranked with
	nPass   int          // passing results
	idW     int          // id column width for the catalog
	ranking bool         // a rankJob is running

	form   form
	list   list
	checks checksPane
	narrow narrowing
	marks  shortlist
	prompt prompt
	repl   replacer    // replacement mode (replace_mode.go)
	prev   previewPane // waveform preview detail (preview_detail.go)
	help   help.Model

	message string // last message for the status line
	msgErr  bool   // message is an error

	watcher   *watcher
	reloadSeq int // debounce: only the newest pending reload runs
	// loadGen numbers catalog reads as they start; loadShown is the newest
	// whose result was taken, so a slow older read never replaces it.
	loadGen, loadShown int
	quitting           bool
}

// New builds the selector from cfg. It derives the design at once; the
// first ranking runs from Init.
func New(cfg Config) *Model {
	if cfg.Renderer == nil {
		cfg.Renderer = lipgloss.NewRenderer(io.Discard)
	}
	if cfg.Getenv == nil {
		cfg.Getenv = func(string) string { return "" }
	}
	u := &ui{width: 120, height: 40, st: NewStyles(cfg.Renderer, DefaultTheme()), keys: DefaultKeyMap()}
	m := &Model{ui: u, cfg: cfg, focus: paneDesign, marks: newShortlist()}
	m.help = newHelp(u)
	m.form = newForm(u)
	m.design = cfg.Design.Clone()
	m.plan, m.planErr = filter.Derive(m.design)
	m.setCatalog(cfg.Catalog)
	m.form.refresh(m.design)
	if cfg.CatalogErr != nil {
		m.setError(fmt.Errorf("catalog: %w (parts with problems are left out; see opsift check)", firstProblem(cfg.CatalogErr)))
	} else if m.planErr != nil {
		m.setError(m.planErr)
	}
	if cfg.Watch && len(cfg.OnDisk) > 0 {
		m.watcher = startWatcher(cfg.OnDisk)
	}
	return m
}

// Init starts the first ranking and, when watching, the file watcher.
func (m *Model) Init() tea.Cmd {
	cmds := []tea.Cmd{m.rerank()}
	if m.watcher != nil {
		cmds = append(cmds, waitForChange(m.watcher))
	}
	return tea.Batch(cmds...)
}

// Close releases the file watcher. Call it after the program ends.
func (m *Model) Close() error {
	if m.watcher != nil {
		return m.watcher.Close()
	}
	return nil
}

// Update handles one message: a key (by mode), the window size, the mouse,
// or the result of a background job.
func (m *Model) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	switch msg := msg.(type) {
	case tea.WindowSizeMsg:
		m.ui.width, m.ui.height = msg.Width, msg.Height
		m.help.Width = msg.Width - 1 // the help line starts with a space
		m.list.scrollTo(m.listRows())
		return m, nil
	case tea.KeyMsg:
		return m, m.followPreview(m.updateKey(msg))
	case tea.MouseMsg:
		return m, m.followPreview(m.updateMouse(msg))
	case rankedMsg:
		m.adoptRanking(msg)
		return m, m.followPreview(nil)
	case previewMsg:
		m.adoptPreview(msg)
		return m, nil
	}
	return m, m.updateJobs(msg)
}

// updateKey routes a key to the update function of the current mode.
func (m *Model) updateKey(k tea.KeyMsg) tea.Cmd {
	switch m.mode {
	case modeEdit:
		return m.updateEdit(k)
	case modeFind:
		return m.updateFind(k)
	case modePrompt:
		return m.updatePrompt(k)
	case modeHelp:
		return m.updateHelp(k)
	case modeReplace:
		return m.updateReplace(k)
	}
	return m.updateBrowse(k)
}

// rerank starts a rankJob for the plan in force, under a new generation.
func (m *Model) rerank() tea.Cmd {
	m.gen++
	if m.plan == nil || m.cat == nil {
		m.results, m.resPlan, m.ranking = nil, nil, false
		m.applyNarrowing()
		return nil
	}
	m.ranking = true
	j := rankJob{gen: m.gen, plan: m.plan, parts: m.cat.Parts,
		opts: filter.Options{Strict: m.cfg.Strict, Summary: true}, sort: m.narrow.sortKey()}
	return j.run
}

// adoptRanking takes a finished ranking unless a newer one was started.
func (m *Model) adoptRanking(r rankedMsg) {
	if r.gen != m.gen {
		return // stale: an edit came after this job started
	}
	m.ranking = false
	m.results, m.resPlan = r.results, r.plan
	m.nPass = 0
	for i := range m.results {
		if m.results[i].Pass {
			m.nPass++
		}
	}
	m.applyNarrowing()
}

// setCatalog installs a (re)loaded catalog and the values the quick
// filters cycle through.
func (m *Model) setCatalog(c *catalog.Catalog) {
	if c == nil {
		c = &catalog.Catalog{}
	}
	m.cat = c
	m.techs, m.pkgs = catalogValues(c.Parts)
	m.idW = idWidth(c.Parts)
	m.search = make(map[*catalog.Part]string, len(c.Parts))
	for _, p := range c.Parts {
		m.search[p] = searchText(p)
	}
	m.narrow.keepValid(m.techs, m.pkgs)
}

// setMessage puts a message on the status line.
func (m *Model) setMessage(format string, a ...any) {
	m.message, m.msgErr = safe.Text(fmt.Sprintf(format, a...)), false
}

// setError puts an error on the status line.
func (m *Model) setError(err error) { m.message, m.msgErr = safe.Text(err.Error()), true }

// firstProblem returns the first of a catalog.Problems (the status line
// has room for one), its file shown by base name to leave room for what is
// wrong, or err itself.
func firstProblem(err error) error {
	var ps catalog.Problems
	if errors.As(err, &ps) && len(ps) > 0 {
		p := ps[0]
		p.Pos.File = filepath.Base(p.Pos.File)
		if len(ps) > 1 {
			return fmt.Errorf("%w (and %d more)", p, len(ps)-1)
		}
		return p
	}
	return err
}

// newHelp builds the key-help line with the selector's styles.
func newHelp(u *ui) help.Model {
	h := help.New()
	h.Width = u.width - 1 // the help line starts with a space
	h.Styles = help.Styles{
		Ellipsis:       u.st.HelpSep,
		ShortKey:       u.st.HelpKey,
		ShortDesc:      u.st.HelpDesc,
		ShortSeparator: u.st.HelpSep,
		FullKey:        u.st.HelpKey,
		FullDesc:       u.st.HelpDesc,
		FullSeparator:  u.st.HelpSep,
	}
	return h
}
