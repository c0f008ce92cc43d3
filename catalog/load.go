package catalog

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"runtime"
	"strings"

	"github.com/opsift/opsift/catalog/safe"
)

// Layer is one source of parts in a layered catalog: an OS path (a *.toml file, or a
// directory whose *.toml files are read in name order), or the *.toml
// files at the root of an fs.FS such as the embedded demo catalog.
type Layer struct {
	// Name is shown in summaries and notes. For an FS source it also
	// prefixes the file names in positions ("demo catalog/general.toml").
	Name string
	Path string // OS file or directory; used when FS is nil
	FS   fs.FS  // when non-nil, read the *.toml files at its root
}

// PathLayer is the Layer for an OS file or directory.
func PathLayer(p string) Layer { return Layer{Name: p, Path: p} }

// FSLayer is the Layer for the *.toml files at the root of fsys, shown
// as name.
func FSLayer(name string, fsys fs.FS) Layer { return Layer{Name: name, FS: fsys} }

// Catalog is the parts of all layers after layering: a part from a later
// source replaces the part with the same id from an earlier one.
type Catalog struct {
	Parts   []*Part  // final parts, in order of first appearance
	Sources []string // source names, in load order
	Files   int      // catalog files read
	Notes   []string // remarks that are not problems: overrides, empty sources
	// Overrides counts parts replaced by a later source.
	Overrides int
	// Invalid counts parts left out because they have a problem.
	Invalid int
	// SetAside lists the parts and files left out, each with its
	// problems (the same problems Load returns as its error).
	SetAside []SetAside
	// FileSums lists every catalog file read, in load order, with the hash of
	// its content, so an export can say exactly which catalog it ranked.
	FileSums []FileSum
	// Figures counts the datasheet figures (gbw, slew, …) the final parts
	// give; TypicalOnly those known only as a typical value, FromGraph
	// those read off a graph, Estimated those marked as estimates.
	Figures, TypicalOnly, FromGraph, Estimated int

	byID map[string]*Part
}

// FileSum identifies one catalog file read: its name as shown in
// positions, the SHA-256 of its bytes (lower-case hex) and how many valid
// parts it gave.
type FileSum struct {
	Path   string
	SHA256 string
	Parts  int
}

// ByID returns the part with the given id, or nil.
func (c *Catalog) ByID(id string) *Part {
	if c.byID != nil {
		return c.byID[id]
	}
	for _, p := range c.Parts {
		if p.ID == id {
			return p
		}
	}
	return nil
}

// Load reads every source in order and layers them: a later source
// overrides an earlier one part by part, by id (noted in Notes), while a
// duplicate id within one source is a problem. It always returns a
// Catalog, holding the parts without problems and, in SetAside, the parts
// and files left out with their problems; when any file cannot be read or
// has a problem, the error is a Problems holding all of them. Refusing
// the catalog on any problem is the strict reading (check,
// --strict-catalog); Partial says whether the valid parts may be used.
// Files are decoded on several cores at once; the result is the same as
// reading them one by one. Load uses no cache; see Loader.
func Load(srcs ...Layer) (*Catalog, error) { return Loader{}.Load(srcs...) }

// Loader loads layered catalogs with the optional parsed-catalog cache and
// progress reports. The zero Loader is Load.
type Loader struct {
	// Cache, when non-nil, keeps each clean catalog file on disk parsed
	// (see Cache); a file with problems is always decoded afresh.
	Cache *Cache
	// Progress, when non-nil, is called once before the first file and
	// after each file with the counts so far, from the goroutine that
	// called Load; the last call has Files == TotalFiles.
	Progress func(Progress)
	// Only, when non-nil, keeps in the catalog only the parts whose id it
	// accepts: the others are still read, checked and layered (so
	// problems, duplicates, overrides, notes and file sums are those of
	// the whole catalog) but not kept, so a command about one part does
	// not hold the whole catalog in memory. Parts and the figure counts
	// then cover the kept parts only.
	Only func(id string) bool
}

// Progress is how far a Load has got.
type Progress struct {
	Files, TotalFiles int // files read so far, and in all
	Parts             int // parts read so far
}

// Load is the package-level Load with the loader's cache and progress.
func (ld Loader) Load(srcs ...Layer) (*Catalog, error) {
	c := &Catalog{byID: map[string]*Part{}}
	var probs Problems
	where := map[string]string{} // id → "file:line" of the part in use
	var jobs []fileJob
	first := make([]int, len(srcs)+1) // jobs of source i: first[i] … first[i+1]
	for i, src := range srcs {
		first[i] = len(jobs)
		c.Sources = append(c.Sources, safe.Text(src.Name))
		files, err := src.files()
		if err != nil {
			jobs = append(jobs, fileJob{src: i, err: Problem{Pos: Pos{File: src.display("")}, Err: err}})
			continue
		}
		if len(files) == 0 {
			c.Notes = append(c.Notes, fmt.Sprintf("%s holds no *.toml files", safe.Text(src.Name)))
		}
		for _, f := range files {
			jobs = append(jobs, fileJob{src: i, name: f})
		}
	}
	first[len(srcs)] = len(jobs)
	total := 0
	for _, j := range jobs {
		if j.err.Err == nil {
			total++
		}
	}
	progress := Progress{TotalFiles: total}
	if ld.Progress != nil {
		ld.Progress(progress)
	}
	seen := map[string]Pos{}
	ld.decodeAll(srcs, jobs, func(k int, r fileResult) {
		j := jobs[k]
		if k == first[j.src] {
			seen = map[string]Pos{} // duplicate ids are per source
		}
		if j.err.Err != nil {
			probs = append(probs, j.err)
			return
		}
		progress.Files++
		progress.Parts += len(r.parts)
		if ld.Progress != nil {
			ld.Progress(progress)
		}
		if r.readErr != nil {
			probs = append(probs, Problem{Pos: Pos{File: srcs[j.src].display(j.name)}, Err: r.readErr})
			return
		}
		c.Files++
		c.Invalid += r.invalid
		parts, dups := dropDuplicates(r.parts, seen, r.data)
		c.Invalid += len(dups)
		c.FileSums = append(c.FileSums, FileSum{Path: srcs[j.src].display(j.name), SHA256: hex.EncodeToString(r.sum[:]), Parts: len(parts)})
		fp := append(r.probs, dups...)
		sortProblems(fp)
		probs = append(probs, fp...)
		for _, p := range parts {
			at := fmt.Sprintf("%s:%d", p.Pos.File, p.Pos.Line)
			if old, ok := c.byID[p.ID]; ok {
				c.Overrides++
				c.Notes = append(c.Notes, fmt.Sprintf("part %q from %s overrides %s", p.ID, safe.Text(at), safe.Text(where[p.ID])))
				if old != nil {
					*old = *p // keep the part's place in Parts
				}
				where[p.ID] = at
				continue
			}
			if ld.Only != nil && !ld.Only(p.ID) {
				c.byID[p.ID], where[p.ID] = nil, at // layered, not kept
				continue
			}
			c.byID[p.ID] = p
			where[p.ID] = at
			c.Parts = append(c.Parts, p)
		}
	})
	c.count()
	c.SetAside = c.setAside(probs)
	return c, probs.AsError()
}

// fileJob is one catalog file to read, or a source that could not be listed.
type fileJob struct {
	src  int     // index of the source
	name string  // the file within the source ("" for the source's own path)
	err  Problem // set when the source itself could not be read
}

// fileResult is one file read and decoded.
type fileResult struct {
	parts   []*Part
	probs   Problems
	invalid int
	data    []byte            // the file, for the positions of duplicate ids
	sum     [sha256.Size]byte // SHA-256 of data, for FileSums and the cache key
	readErr error
}

// decodeAll reads and decodes the jobs' files on up to GOMAXPROCS cores,
// a few files ahead of the consumer, and hands each result to use in job
// order, on the calling goroutine. At most window results wait at once, so
// memory stays bounded however many files there are.
func (ld Loader) decodeAll(srcs []Layer, jobs []fileJob, use func(int, fileResult)) {
	procs := runtime.GOMAXPROCS(0)
	// Every file is decoded in pieces on up to procs goroutines, and at
	// most procs pieces of all the files in flight work at once: a core
	// that finishes one file's pieces helps with the next file's.
	sem := make(chan struct{}, procs)
	window := procs + 1
	results := make([]chan fileResult, len(jobs))
	start := func(k int) {
		results[k] = make(chan fileResult, 1)
		go func() { results[k] <- ld.decodeJob(srcs, jobs[k], procs, sem) }()
	}
	for k := 0; k < min(window, len(jobs)); k++ {
		start(k)
	}
	for k := range jobs {
		r := <-results[k]
		results[k] = nil
		if next := k + window; next < len(jobs) {
			start(next)
		}
		use(k, r)
	}
}

// decodeJob reads and decodes one file, through the cache when there is one.
func (ld Loader) decodeJob(srcs []Layer, j fileJob, workers int, sem chan struct{}) fileResult {
	if j.err.Err != nil {
		return fileResult{}
	}
	src := srcs[j.src]
	data, err := src.read(j.name)
	if err != nil {
		return fileResult{readErr: err}
	}
	file := src.display(j.name)
	sum := sha256.Sum256(data)
	if ld.Cache != nil && src.FS == nil {
		path := src.Path
		if j.name != "" {
			path = filepath.Join(src.Path, j.name)
		}
		if parts, ok := ld.Cache.get(path, file, data, sum); ok {
			return fileResult{parts: parts, data: data, sum: sum}
		}
		parts, probs, invalid := decodeFile(file, data, workers, sem)
		if len(probs) == 0 {
			ld.Cache.put(path, data, sum, parts)
		}
		return fileResult{parts: parts, probs: probs, invalid: invalid, data: data, sum: sum}
	}
	parts, probs, invalid := decodeFile(file, data, workers, sem)
	return fileResult{parts: parts, probs: probs, invalid: invalid, data: data, sum: sum}
}

// count fills the figure counts from the final parts.
func (c *Catalog) count() {
	for _, p := range c.Parts {
		for _, f := range figures {
			s := f.spec(p)
			if !s.Known() {
				continue
			}
			c.Figures++
			if !s.Min.Known() && !s.Max.Known() && !s.MinOT.Known() && !s.MaxOT.Known() {
				c.TypicalOnly++
			}
			switch s.Source {
			case SourceGraph:
				c.FromGraph++
			case SourceEstimate:
				c.Estimated++
			}
		}
	}
}

// files lists the catalog files of the source, sorted by name: every
// entry but a directory whose name ends in ".toml" in any case (a FIFO or
// device so named is listed, and read refuses it with a problem). Names
// starting with "." (editor backups, hidden files) are skipped.
func (s Layer) files() ([]string, error) {
	var entries []fs.DirEntry
	var err error
	if s.FS != nil {
		entries, err = fs.ReadDir(s.FS, ".")
	} else {
		var st os.FileInfo
		st, err = os.Stat(s.Path)
		if err == nil && !st.IsDir() {
			return []string{""}, nil // the path is the file
		}
		if err == nil {
			entries, err = os.ReadDir(s.Path)
		}
	}
	if err != nil {
		return nil, &SourceError{Err: plainErr(err)}
	}
	var names []string
	for _, e := range entries {
		n := e.Name()
		if e.IsDir() || strings.HasPrefix(n, ".") || !IsCatalogName(n) {
			continue
		}
		names = append(names, n)
	}
	return names, nil // ReadDir sorts by name
}

// IsCatalogName reports whether a directory entry named n is read as a
// catalog file: its name ends in ".toml", in any case ("A.TOML" too).
func IsCatalogName(n string) bool {
	return len(n) > len(".toml") && strings.EqualFold(n[len(n)-len(".toml"):], ".toml")
}

// read returns the contents of one of the source's files ("" is the
// source's own path when it is a file).
func (s Layer) read(name string) ([]byte, error) {
	var data []byte
	var err error
	switch {
	case s.FS != nil:
		data, err = readFS(s.FS, name)
	case name == "":
		data, err = ReadFile(s.Path)
	default:
		data, err = ReadFile(filepath.Join(s.Path, name))
	}
	if err != nil {
		return nil, fmt.Errorf("cannot read catalog file: %w", err)
	}
	return data, nil
}

// display is the name a file of the source has in positions.
func (s Layer) display(name string) string {
	switch {
	case s.FS != nil && name == "":
		return s.Name
	case s.FS != nil:
		return path.Join(s.Name, name)
	case name == "":
		return s.Path
	}
	return filepath.Join(s.Path, name)
}

// plainErr strips the path from an *fs.PathError: the problem already
// shows the file.
func plainErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// UserDir returns the user's catalog directory:
// $XDG_CONFIG_HOME/opsift/catalog.d, else $HOME/.config/opsift/catalog.d,
// or "" when neither variable gives an absolute path. (The XDG Base
// Directory Specification says a relative $XDG_CONFIG_HOME is to be ignored.)
func UserDir(getenv func(string) string) string {
	if x := getenv("XDG_CONFIG_HOME"); x != "" && filepath.IsAbs(x) {
		return filepath.Join(x, "opsift", "catalog.d")
	}
	if h := getenv("HOME"); h != "" && filepath.IsAbs(h) {
		return filepath.Join(h, ".config", "opsift", "catalog.d")
	}
	return ""
}

// DemoName is the name the embedded demo catalog is shown by.
const DemoName = "embedded demo catalog"

// DefaultSources returns the sources used when no --catalog is given: the
// user's catalog directory (see UserDir) when it exists, else demo (the
// embedded demo catalog).
func DefaultSources(getenv func(string) string, demo fs.FS) []Layer {
	if dir := UserDir(getenv); dir != "" {
		if st, err := os.Stat(dir); err == nil && st.IsDir() {
			return []Layer{PathLayer(dir)}
		}
	}
	return []Layer{FSLayer(DemoName, demo)}
}
