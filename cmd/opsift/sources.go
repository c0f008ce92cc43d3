package main

import (
	"errors"
	"fmt"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
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

// loadCatalog loads the catalog a command reads parts from. An unreadable
// or invalid catalog is an input error (exit status 2), printed one
// problem per line. The catalog's notes (a part overriding one of an
// earlier source, a source without files) go to stderr as "opsift: note:
// …", at most maxShown of them, so that stdout stays the document.
func loadCatalog(e *env, paths []string) (*catalog.Catalog, error) {
	c, err := openCatalog(e, paths)
	if err != nil {
		return nil, err
	}
	for i, n := range c.Notes {
		if i == maxShown {
			fmt.Fprintf(e.stderr, "opsift: note: … and %d more notes (see %s)\n", len(c.Notes)-maxShown, checkHint(paths))
			break
		}
		fmt.Fprintf(e.stderr, "opsift: note: %s\n", n)
	}
	return c, nil
}

// openCatalog is loadCatalog without the notes, for the selector, which
// shows the catalog itself.
func openCatalog(e *env, paths []string) (*catalog.Catalog, error) {
	c, err := catalog.Load(catalogLayers(e, paths)...)
	if err != nil {
		return nil, inputError(newCatalogError(err, paths))
	}
	return c, nil
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
