package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strings"
	"time"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/replace"
	"github.com/opsift/opsift/filter/report"
)

// pathList is a repeatable --catalog flag: each use adds one file or
// directory, later ones overriding earlier ones part by part.
type pathList []string

// String shows the paths given so far.
func (l *pathList) String() string { return strings.Join(*l, ", ") }

// Set adds one path.
func (l *pathList) Set(s string) error {
	if strings.TrimSpace(s) == "" {
		return errors.New("empty path, want a catalog file or directory")
	}
	*l = append(*l, s)
	return nil
}

// noCacheHelp is the --no-cache flag's help, the same for every command.
const noCacheHelp = "read every catalog file afresh, neither using nor updating the parsed-catalog cache ($XDG_CACHE_HOME/opsift, else ~/.cache/opsift)"

// catalogFlags registers a command's catalog flags: --catalog into paths
// and --no-cache into e.
func catalogFlags(fset *flag.FlagSet, e *env, paths *pathList) {
	fset.Var(paths, "catalog", catalogHelp)
	fset.BoolVar(&e.noCache, "no-cache", false, noCacheHelp)
}

// loader is the catalog loader of a command: with the parsed-catalog cache
// in the user's cache directory unless --no-cache was given or there is no
// such directory.
func (e *env) loader() catalog.Loader {
	if e.noCache {
		return catalog.Loader{}
	}
	dir := catalog.CacheDir(e.getenv)
	if dir == "" {
		return catalog.Loader{}
	}
	return catalog.Loader{Cache: &catalog.Cache{Dir: dir}}
}

// readCatalog loads layers with e's loader; when stderr is a terminal and
// the read takes longer than progressDelay, it shows how far it has got
// there on one line, cleared when done.
func (e *env) readCatalog(layers []catalog.Layer) (*catalog.Catalog, error) {
	return e.readCatalogOnly(layers, nil)
}

// readCatalogOnly is readCatalog keeping only the parts only accepts
// (catalog.Loader.Only; nil keeps every part).
func (e *env) readCatalogOnly(layers []catalog.Layer, only func(id string) bool) (*catalog.Catalog, error) {
	ld := e.loader()
	ld.Only = only
	var pr *stderrProgress
	if e.errTTY {
		pr = &stderrProgress{w: e.stderr, start: time.Now()}
		ld.Progress = pr.report
	}
	c, err := ld.Load(layers...)
	if pr != nil {
		pr.done()
	}
	return c, err
}

// progressDelay is how long a catalog read runs before its progress is shown.
const progressDelay = 500 * time.Millisecond

// stderrProgress draws the progress of a catalog read on a terminal.
type stderrProgress struct {
	w     io.Writer
	start time.Time
	shown bool
}

func (s *stderrProgress) report(p catalog.Progress) {
	if time.Since(s.start) < progressDelay || p.TotalFiles == 0 {
		return
	}
	s.shown = true
	fmt.Fprintf(s.w, "\r\x1b[Kopsift: reading the catalog: %d of %d files, %d parts", p.Files, p.TotalFiles, p.Parts)
}

// done clears the progress line, if one was drawn.
func (s *stderrProgress) done() {
	if s.shown {
		fmt.Fprint(s.w, "\r\x1b[K")
	}
}

// catalogLayers turns --catalog paths into layers; with none, the user's
// catalog directory if it exists, else the embedded demo catalog.
func catalogLayers(e *env, paths []string) []catalog.Layer {
	if len(paths) == 0 {
		return catalog.DefaultSources(e.getenv, data.Catalog)
	}
	layers := make([]catalog.Layer, len(paths))
	for i, p := range paths {
		layers[i] = catalog.PathLayer(p)
	}
	return layers
}

// strictCatalogHelp is the --strict-catalog flag's help, the same for
// every command that reads parts.
const strictCatalogHelp = "refuse the whole catalog when any part or file has a problem (default: set those aside and use the rest)"

// loadCatalog loads the catalog a command reads parts from. Parts and
// files with problems are set aside and the rest is used, the set-aside
// ones listed on stderr as a warning (see warnSetAside); the catalog is
// refused — an input error, exit status 2, one problem per line — when
// strict is set and anything has a problem, when a source cannot be read
// at all, or when no valid part is left. The catalog's notes (a part
// overriding one of an earlier source, a source without files) go to
// stderr as "opsift: note: …", at most maxShown of them, so that stdout
// stays the document.
func loadCatalog(e *env, paths []string, strict bool) (*catalog.Catalog, error) {
	c, err := openCatalog(e, paths, strict)
	if err != nil {
		return nil, err
	}
	return c, tellNotes(e, c, paths)
}

// loadPart is loadCatalog for a command about the one part id: the whole
// catalog is read and layered (through the cache when it exists) but only
// that part is kept. When the catalog has any problem or lacks the part,
// it is read again whole, so that what is said (set-aside counts, ids
// near a mistyped one) is exactly what loadCatalog says.
func loadPart(e *env, paths []string, strict bool, id string) (*catalog.Catalog, error) {
	c, err := e.readCatalogOnly(catalogLayers(e, paths), func(s string) bool { return s == id })
	if err != nil || len(c.Parts) != 1 {
		return loadCatalog(e, paths, strict)
	}
	return c, tellNotes(e, c, paths)
}

// tellNotes writes the catalog's notes and what it set aside to stderr
// (see loadCatalog); it returns nil.
func tellNotes(e *env, c *catalog.Catalog, paths []string) error {
	for i, n := range c.Notes {
		if i == maxShown {
			fmt.Fprintf(e.stderr, "opsift: note: … and %d more notes (see %s)\n", len(c.Notes)-maxShown, checkHint(paths))
			break
		}
		fmt.Fprintf(e.stderr, "opsift: note: %s\n", n)
	}
	warnSetAside(e.stderr, c, paths)
	return nil
}

// openCatalog is loadCatalog without the notes and the warning, for the
// selector, which shows the catalog itself.
func openCatalog(e *env, paths []string, strict bool) (*catalog.Catalog, error) {
	c, err := e.readCatalog(catalogLayers(e, paths))
	if err := acceptCatalog(c, err, strict); err != nil {
		return nil, inputError(newCatalogError(err, paths))
	}
	return c, nil
}

// acceptCatalog is the error a load's result is refused with, or nil:
// with strict any problem refuses it, else catalog.Partial decides.
func acceptCatalog(c *catalog.Catalog, err error, strict bool) error {
	if strict {
		return err
	}
	return catalog.Partial(c, err)
}

// warnSetAside tells on w what the load set aside: a summary line, then
// each problem as "opsift: FILE:LINE: …" (at most maxShown, then a
// pointer to check), and for a set-aside part whose id an earlier source
// gives validly, which one is used instead.
func warnSetAside(w io.Writer, c *catalog.Catalog, paths []string) {
	if len(c.SetAside) == 0 {
		return
	}
	fmt.Fprintf(w, "opsift: warning: %s; %s in use (--strict-catalog refuses the catalog instead)\n",
		c.SetAsideSummary(), plural(len(c.Parts), "valid part"))
	shown, total := 0, 0
	for _, s := range c.SetAside {
		total += s.Problems.Count()
		for _, p := range s.Problems {
			if shown < maxShown {
				fmt.Fprintf(w, "opsift: %s\n", safe.Text(p.Error()))
			}
			shown++
		}
	}
	if total > maxShown {
		fmt.Fprintf(w, "opsift: … and %d more catalog problems (see %s)\n", total-maxShown, checkHint(paths))
	}
	for _, s := range c.SetAside {
		if s.InUse != "" {
			fmt.Fprintf(w, "opsift: warning: %s is set aside; the one from %s is used instead\n", s.Subject(), safe.Text(s.InUse))
		}
	}
}

// maxShown is how many catalog problems a command other than check prints
// before pointing at opsift check for the rest.
const maxShown = 10

// catalogError presents a catalog's problems to main, which prints an
// error once as "opsift: …": each problem gets a line of its own with the
// same prefix, so editors and grep see FILE:LINE at the start of each.
type catalogError struct {
	err   error
	paths []string
}

func newCatalogError(err error, paths []string) error { return &catalogError{err, paths} }

func (c *catalogError) Error() string {
	var ps catalog.Problems
	if !errors.As(c.err, &ps) {
		return c.err.Error()
	}
	lines := make([]string, 0, maxShown+1)
	for i, p := range ps {
		if i == maxShown {
			lines = append(lines, fmt.Sprintf("… and %d more catalog problems (see %s)", ps.Count()-maxShown, checkHint(c.paths)))
			break
		}
		lines = append(lines, p.Error())
	}
	return strings.Join(lines, "\nopsift: ")
}

// Unwrap returns the catalog's Problems, for errors.As.
func (c *catalogError) Unwrap() error { return c.err }

// lookupPart finds the part id names in the catalog, as replace.Lookup
// does; a part that was set aside for problems is named as such, with its
// first problem, rather than as unknown.
func lookupPart(c *catalog.Catalog, id string) (*catalog.Part, error) {
	p, err := replace.Lookup(id, c.Parts)
	if err == nil {
		return p, nil
	}
	for _, s := range c.SetAside {
		if s.ID == id && len(s.Problems) > 0 {
			return nil, inputError(fmt.Errorf("part %q is set aside for problems: %w", id, s.Problems[0]))
		}
	}
	return nil, err
}

// meta says what an output is made from: this program's version, the
// time, the design file (the embedded demo design named as such) and the
// catalog files read with their hashes; cat may be nil (derive).
func meta(e *env, designPath string, d *filter.Design, cat *catalog.Catalog, strict bool) *report.Meta {
	m := &report.Meta{Version: version, Generated: e.now(), File: designPath, Strict: strict}
	if designPath == "" && d != nil {
		m.File = "embedded demo design " + d.Name
	}
	if cat != nil {
		m.Sources = cat.FileSums
	}
	return m
}
