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
func Load(srcs ...Layer) (*Catalog, error) {
	c := &Catalog{byID: map[string]*Part{}}
	var probs Problems
	where := map[string]string{} // id → "file:line" of the part in use
	for _, src := range srcs {
		c.Sources = append(c.Sources, safe.Text(src.Name))
		files, err := src.files()
		if err != nil {
			probs = append(probs, Problem{Pos: Pos{File: src.display("")}, Err: err})
			continue
		}
		if len(files) == 0 {
			c.Notes = append(c.Notes, fmt.Sprintf("%s holds no *.toml files", safe.Text(src.Name)))
		}
		seen := map[string]*Part{}
		for _, f := range files {
			data, err := src.read(f)
			if err != nil {
				probs = append(probs, Problem{Pos: Pos{File: src.display(f)}, Err: err})
				continue
			}
			c.Files++
			parts, fp, invalid := decodeFile(src.display(f), data)
			c.Invalid += invalid
			parts, dups := dropDuplicates(parts, seen)
			c.Invalid += len(dups)
			sum := sha256.Sum256(data)
			c.FileSums = append(c.FileSums, FileSum{Path: src.display(f), SHA256: hex.EncodeToString(sum[:]), Parts: len(parts)})
			fp = append(fp, dups...)
			sortProblems(fp)
			probs = append(probs, fp...)
			for _, p := range parts {
				at := fmt.Sprintf("%s:%d", p.Pos.File, p.Pos.Line)
				if old, ok := c.byID[p.ID]; ok {
					c.Overrides++
					c.Notes = append(c.Notes, fmt.Sprintf("part %q from %s overrides %s", p.ID, safe.Text(at), safe.Text(where[p.ID])))
					*old = *p // keep the part's place in Parts
					where[p.ID] = at
					continue
				}
				c.byID[p.ID] = p
				where[p.ID] = at
				c.Parts = append(c.Parts, p)
			}
		}
	}
	c.count()
	c.SetAside = c.setAside(probs)
	return c, probs.AsError()
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
			if !s.Min.Set && !s.Max.Set && !s.MinOT.Set && !s.MaxOT.Set {
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
