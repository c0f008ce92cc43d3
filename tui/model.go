package tui

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"sync/atomic"

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
	// It is the default path when saving, and watched for changes.
	DesignFile string
	// DesignText is the text Design was decoded from: a save edits it in
	// place, keeping the user's comments and layout. Nil: the design's
	// encoding (filter.EncodeDesign) is the base.
	DesignText []byte
	// Version is the program version exports record.
	Version string
	// Catalog is the loaded catalog; CatalogErr the problems loading it
	// reported (parts with problems are left out), shown on the status line.
	Catalog    *catalog.Catalog
	CatalogErr error
	// Load reads the same catalog sources again (the reload key, a catalog
	// file changed on disk, after editing a part). Nil disables reloading.
	Load func() (*catalog.Catalog, error)
	// LoadFirst has Init read the catalog with Load while the first frame
	// is already up (Catalog, when given, stands in until then: an empty
	// one naming the sources), showing LoadProgress (when set) as it goes; the
	// ranking fills in when it arrives. A read that fails ends the
	// selector with the error in Fatal.
	LoadFirst    bool
	LoadProgress func() catalog.Progress
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
	// StartEntry opens the entry form for a new part at once (opsift add).
	// SaveTo is the catalog file the form offers to save a new part into
	// (opsift add --to); "" lets the selector suggest one.
	StartEntry bool
	SaveTo     string
	// AddSource makes a catalog file the entry form saved into, which is
	// not among the sources, one of those Load reads; nil: such a file is
	// written but not read until the next start with --catalog.
	AddSource func(path string)
	// Settings are the remembered choices (the explorer's columns), read
	// from SettingsFile, where changes are written back; "" keeps them for
	// the session. SettingsErr is why the file could not be read.
	Settings     Settings
	SettingsFile string
	SettingsErr  error
}

// Model is the selector's root bubbletea model. It holds only routing
// (the mode with the keyboard, the focused pane, the detail shown), the
// state the panes share (the design in force, the catalog, the ranking,
// the status line) and the panes' sub-models; see doc.go for the flow.
// Panes read the shared state and never write it: Update changes it, then
// settles the panes (settle.go), and View only draws.
type Model struct {
	ui   *ui
	cfg  Config
	mode mode
	// focus is the pane the movement keys act on.
	focus  pane
	detail detail

	// design is the design in force: every edit that parses and derives
	// replaces it with an edited clone, so a running rankJob's plan is
	// never written to. planErr is why it cannot be derived (rank.plan
	// is then nil).
	design  *filter.Design
	planErr error
	cat     catalogState
	rank    ranking

	form   form
	list   list
	checks checksPane
	narrow narrowing
	marks  shortlist
	prompt prompt
	repl   replacer    // replacement mode (replace_mode.go)
	prev   previewPane // waveform preview detail (preview_detail.go)
	expl   explorer    // explorer mode (explorer.go)
	cmp    comparePane // compare detail (compare_view.go)
	entry  entryForm   // the entry form of a new or edited part (entry.go)

	helpPage int // the help overlay's page
	// helpFrom is the mode the help overlay was opened from and goes back
	// to when it closes: browsing, or explorer mode with its own keys.
	helpFrom mode

	hr    headroomState  // the selected part's headroom, searched lazily (headroom.go)
	hrGen *atomic.Uint64 // numbers headroom requests; a waiting job searches only if still the newest

	message string // last message for the status line
	msgErr  bool   // message is an error

	watcher   *watcher
	reloadSeq int // debounce: only the newest pending reload runs
	// loadGen numbers catalog reads as they start; loadShown is the newest
	// whose result was taken, so a slow older read never replaces it.
	loadGen, loadShown int
	quitting           bool
	// fatal is the error of a first catalog read that failed (see Fatal).
	fatal error

	// Keeping the user's work (keep.go).
	saved         savedState // the design as on disk: base of saves and of edits
	edits         []string   // inputs edited since saved, in form order
	undo          []undoStep // newest last
	ask           ask        // the open question (modeAsk)
	quitAfterSave bool       // the save was asked for at q
	lastDir       string     // directory of the last file written
	lastPartFile  string     // catalog file the entry form last saved into
	// partNote says what the entry form saved; it stands for the reason
	// of the reloads until the next key, so the reload the file watcher
	// makes of the same write does not replace it.
	partNote    string
	designWatch *watcher // follows the design file
	designSeq   int      // debounce of design file changes
}

// ranking is the shared state of the evaluation: the plan in force and the
// newest ranking adopted. Panes draw from it by pointer and never write it;
// only the root model's Update replaces its fields.
type ranking struct {
	plan    *filter.Plan    // derived from the design in force; nil when it cannot be
	resPlan *filter.Plan    // the plan results were ranked with
	results []filter.Result // in rank order; checks filled in for drawn rows by settle
	// warnings about the design and its filters, from the ranking's plan.
	warnings []filter.Warning
	nPass    int    // passing results
	gen      uint64 // generation of the newest rankJob
	running  bool   // a rankJob is running
	strict   bool   // unknown checks fail
	// cancel stops the newest rankJob; a new edit calls it before starting
	// the next, so a typing burst does not queue evaluations.
	cancel context.CancelFunc
	// job is the newest rankJob, whose second step (every part) Update
	// starts when its first (the passing parts) arrives.
	job rankJob
	// parts is the number of parts the results were ranked from (results
	// may hold only the passing ones).
	parts int
	// loading is the progress line of the first catalog read, shown in
	// place of the candidates; "" once the catalog is in.
	loading string
}

// explain fills in the checks of result i (see explain in engine.go).
func (rs *ranking) explain(i int) { explain(rs.resPlan, &rs.results[i], rs.strict) }

// catalogState is the catalog in force and what the panes look up in it,
// computed once per load.
type catalogState struct {
	*catalog.Catalog
	techs  []string // technologies present, sorted
	pkgs   []string // packages present, sorted
	search map[*catalog.Part]string
	idW    int // id column width: least (idWidths)
	idMax  int // and most, when the pane has room
	// eval evaluates the catalog's parts plan after plan, keeping what an
	// edit leaves unchanged (filter.Incremental).
	eval *filter.Incremental
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
	m := &Model{ui: u, cfg: cfg, focus: paneDesign, marks: newShortlist(), rank: ranking{strict: cfg.Strict},
		hrGen: newHeadroomGen()}
	m.form = newForm(u)
	m.list, m.checks, m.prev, m.cmp = list{u: u}, checksPane{u: u, hr: &m.hr}, previewPane{u: u}, comparePane{u: u}
	m.expl = newExplorer(u, cfg.Settings.ExplorerColumns)
	m.design = cfg.Design.Clone()
	m.saved = savedState{path: cfg.DesignFile, text: cfg.DesignText, design: cfg.Design.Clone()}
	if m.saved.text == nil {
		var b bytes.Buffer
		if err := filter.EncodeDesign(&b, cfg.Design); err == nil {
			m.saved.text = b.Bytes()
		}
	}
	m.rank.plan, m.planErr = filter.Derive(m.design)
	m.setCatalog(cfg.Catalog)
	m.form.refresh(m.design)
	if cfg.StartEntry {
		m.openEntry(false)
	}
	if cfg.CatalogErr != nil {
		m.setError(fmt.Errorf("catalog: %w (parts with problems are set aside; see opsift check)", firstProblem(cfg.CatalogErr)))
	} else if m.planErr != nil {
		m.setError(m.planErr)
	} else if cfg.SettingsErr != nil {
		m.setError(cfg.SettingsErr)
	}
	if cfg.Watch && len(cfg.OnDisk) > 0 {
		m.watcher = startWatcher(cfg.OnDisk)
	}
	m.settle()
	return m
}

// Init starts the first ranking and, when watching, the file watcher.
func (m *Model) Init() tea.Cmd {
	cmds := []tea.Cmd{m.rerank()}
	if m.cfg.LoadFirst && m.cfg.Load != nil {
		cmds[0] = m.firstLoad()
	}
	if m.watcher != nil {
		cmds = append(cmds, waitForChange(m.watcher))
	}
	if m.cfg.Watch {
		cmds = append(cmds, m.watchDesign())
	}
	return tea.Batch(cmds...)
}

// Close releases the file watchers. Call it after the program ends.
func (m *Model) Close() error {
	if m.rank.cancel != nil {
		m.rank.cancel()
	}
	if m.designWatch != nil {
		_ = m.designWatch.Close()
	}
	if m.watcher != nil {
		return m.watcher.Close()
	}
	return nil
}

// Update handles one message, then settles the panes for the next View.
func (m *Model) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	cmd := m.route(msg)
	if hc := m.requestHeadroom(); hc != nil {
		cmd = tea.Batch(cmd, hc)
	}
	m.settle()
	return m, cmd
}

// route hands a message to what it concerns: a key to the mode that has
// the keyboard, the window size to the shared context, the mouse to the
// pane under it, the result of a background job to its adopter.
func (m *Model) route(msg tea.Msg) tea.Cmd {
	switch msg := msg.(type) {
	case tea.WindowSizeMsg:
		m.ui.width, m.ui.height = msg.Width, msg.Height
		m.list.scrollTo(m.listRows())
		return nil
	case tea.KeyMsg:
		m.partNote = ""
		return m.followPreview(m.updateKey(msg))
	case tea.MouseMsg:
		return m.followPreview(m.updateMouse(msg))
	case rankedMsg:
		return m.followPreview(m.adoptRanking(msg))
	case previewMsg:
		m.prev.adopt(msg)
		return nil
	case headroomMsg:
		m.adoptHeadroom(msg)
		return nil
	case writtenMsg:
		return m.adoptWritten(msg)
	case partSavedMsg:
		return m.adoptPartSaved(msg)
	}
	if cmd, ok := m.updateDesignJobs(msg); ok {
		return cmd
	}
	return m.updateJobs(msg)
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
	case modeExplore:
		return m.updateExplore(k)
	case modeAsk:
		return m.updateAsk(k)
	case modeEntry:
		return m.updateEntry(k)
	}
	return m.updateBrowse(k)
}

// rerank starts a rankJob for the plan in force, under a new generation.
func (m *Model) rerank() tea.Cmd {
	m.rank.gen++
	if m.rank.plan == nil || m.cat.Catalog == nil {
		m.rank.results, m.rank.resPlan, m.rank.running, m.rank.warnings = nil, nil, false, nil
		m.applyNarrowing()
		return nil
	}
	m.rank.running = true
	if m.rank.cancel != nil {
		m.rank.cancel() // the job it belongs to is stale now
	}
	var ctx context.Context
	ctx, m.rank.cancel = context.WithCancel(context.Background())
	m.rank.job = rankJob{gen: m.rank.gen, ctx: ctx, plan: m.rank.plan, eval: m.cat.eval, sort: m.narrow.sortKey()}
	return m.rank.job.run
}

// adoptRanking takes a finished ranking unless a newer one was started.
// A ranking of the passing parts only is shown at once when nothing on
// screen needs a failing part (see passingSuffice); the job for every
// part is started either way and its ranking replaces it.
func (m *Model) adoptRanking(r rankedMsg) tea.Cmd {
	if r.gen != m.rank.gen {
		return nil // stale: an edit came after this job started
	}
	var next tea.Cmd
	if r.rest != nil {
		next = m.rank.job.rest(r)
		if !m.passingSuffice(r.results) {
			return next
		}
	}
	m.rank.running = false
	m.rank.results, m.rank.resPlan, m.rank.warnings = r.results, r.plan, r.warnings
	m.rank.parts = len(m.cat.Parts)
	m.rank.nPass = 0
	for i := range m.rank.results {
		if m.rank.results[i].Pass {
			m.rank.nPass++
		}
	}
	m.applyNarrowing()
	if m.exploring() {
		m.expl.refresh(&m.rank, m.cat.Parts)
	}
	if m.mode == modeEntry {
		m.checkEntry()
	}
	return next
}

// exploring reports whether explorer mode is open, on screen or under the
// help overlay it was opened from.
func (m *Model) exploring() bool {
	return m.mode == modeExplore || m.mode == modeHelp && m.helpFrom == modeExplore
}

// passingSuffice reports whether a ranking of the passing parts alone
// draws the same screen as one of every part: failing parts are hidden,
// no shortlist, explorer or entry form (which places a failing part among
// every part) is shown, and the selected and marked parts
// are all among the passing (else the list would explain a vanished
// selection or export a shortlist without its failing parts).
func (m *Model) passingSuffice(passing []filter.Result) bool {
	if m.narrow.failing || m.narrow.shortlist || m.exploring() || m.mode == modeEntry {
		return false
	}
	sel, marked := m.list.selID == "", 0
	for i := range passing {
		id := passing[i].Part.ID
		if id == m.list.selID {
			sel = true
		}
		if m.marks.has(id) {
			marked++
		}
	}
	return sel && marked == m.marks.len()
}

// setCatalog installs a (re)loaded catalog and the values the quick
// filters cycle through.
func (m *Model) setCatalog(c *catalog.Catalog) {
	if c == nil {
		c = &catalog.Catalog{}
	}
	cs := catalogState{Catalog: c, search: make(map[*catalog.Part]string, len(c.Parts)),
		eval: filter.NewIncremental(c.Parts, filter.Options{Strict: m.cfg.Strict})}
	cs.techs, cs.pkgs = catalogValues(c.Parts)
	cs.idW, cs.idMax = idWidths(c.Parts)
	for _, p := range c.Parts {
		cs.search[p] = searchText(p)
	}
	m.cat = cs
	m.narrow.keepValid(m.cat.techs, m.cat.pkgs)
}

// setAsideBanner is the status line's count of what the catalog load set
// aside for problems ("1 set aside", "2 set aside, 1 file not read"), or
// "" when nothing was.
func setAsideBanner(c *catalog.Catalog) string {
	if c == nil || len(c.SetAside) == 0 {
		return ""
	}
	var out []string
	if n := c.PartsSetAside(); n > 0 {
		out = append(out, fmt.Sprintf("%d set aside", n))
	}
	if n := c.FilesSetAside(); n > 0 {
		out = append(out, plural(n, "file")+" not read")
	}
	if len(out) == 0 {
		out = append(out, plural(len(c.SetAside), "catalog problem"))
	}
	return strings.Join(out, ", ")
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
