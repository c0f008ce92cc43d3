package main

import (
	"fmt"
	"io"
	"log"
	"os"
	"path/filepath"
	"slices"
	"sync"
	"sync/atomic"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/tui"
)

const selectorUsage = `Usage: opsift [--catalog PATH]... [--design FILE] [--strict] [--strict-catalog] [--no-cache]

The interactive selector: edit the design's inputs and watch the derived
requirements, the ranking and every candidate's margins follow at once.
Mark parts for a shortlist and export it (md, csv, json, toml); w saves
the edited design in place, keeping its comments; q asks before unsaved
edits are lost, and a change to the design file on disk is offered, never
overwritten unasked. R finds replacements for a part, v shows its
waveform; a enters a new part into a catalog file (as opsift add does), A
edits the selected part's figures in place. Press ? inside for every key.

Parts with problems are set aside (the status line counts them; opsift
check lists them) and the rest is ranked; --strict-catalog refuses the
whole catalog instead, at start and on every reload.

Set NO_COLOR for a screen without colour, OPSIFT_LOG=FILE to log to FILE.

Options:
`

const addUsage = `Usage: opsift add [--to FILE] [--catalog PATH]... [--design FILE] [--strict] [--strict-catalog] [--no-cache]

The interactive selector, opened at once in its entry form for a new part
(the a key inside the selector opens the same form; A edits the selected
part's figures). Every catalog key is a field with its unit hint; each is
checked as you type, with the messages of opsift check; the part is
evaluated in the design as you go, with the place it would take in the
ranking and its margins. ctrl+s saves it: appended to the catalog file,
whose comments and layout are kept, written atomically; the catalog is read
again and the part is ranked. The embedded demo catalog is never written.

--to FILE is the catalog file offered to save into (it need not exist
yet); when it is not among the catalog sources it joins them for the
session, so the new part is ranked with the rest.

Options:
`

// runSelector starts the interactive selector on the catalog and design.
func runSelector(e *env, args []string) error { return selector(e, args, false) }

// runAdd starts the selector in its entry form for a new part (opsift add).
func runAdd(e *env, args []string) error { return selector(e, args, true) }

// selector runs the interactive selector; add opens it in the entry form
// and takes --to.
func selector(e *env, args []string, add bool) error {
	var (
		catalogs pathList
		design   string
		strict   bool
		// strictCatalog refuses the catalog on any problem.
		strictCatalog bool
		to            string
	)
	name, usage := "opsift", selectorUsage
	if add {
		name, usage = "opsift add", addUsage
	}
	fset := newFlagSet(e, name, usage)
	if add {
		fset.StringVar(&to, "to", "", "catalog file to save the new part into (default: one the selector suggests)")
	}
	catalogFlags(fset, e, &catalogs)
	fset.StringVar(&design, "design", "", "design TOML file (default: the embedded demo design)")
	fset.BoolVar(&strict, "strict", false, "a check whose figure the catalog lacks fails")
	fset.BoolVar(&strictCatalog, "strict-catalog", false, strictCatalogHelp)
	if helped, err := parseFlags(e, fset, args); helped || err != nil {
		return err
	}
	if fset.NArg() > 0 {
		return usageError("unexpected argument %q (see opsift --help)", fset.Arg(0))
	}
	d, text, err := readDesign(design)
	if err == nil {
		_, err = filter.Derive(d)
	}
	if err != nil {
		return inputError(err)
	}
	layers := catalogLayers(e, catalogs)
	if to != "" {
		if st, err := os.Stat(to); err == nil && !st.IsDir() && !coveredBy(layers, to) {
			layers = append(layers, catalog.PathLayer(to))
		}
	}
	if !e.isTTY {
		if _, err := openCatalog(e, catalogs, strictCatalog); err != nil {
			return err // a bad catalog is named first, as with a terminal
		}
		return usageError("the interactive selector needs a terminal; for scripts use opsift rank")
	}
	if path := e.getenv("OPSIFT_LOG"); path != "" {
		f, err := tea.LogToFile(path, "opsift")
		if err != nil {
			return inputError(fmt.Errorf("OPSIFT_LOG: %w", err))
		}
		defer f.Close()
	} else {
		log.SetOutput(io.Discard) // stdout and stderr belong to the screen
	}
	var onDisk []string
	for _, l := range layers {
		if l.FS == nil {
			onDisk = append(onDisk, l.Path)
		}
	}
	r := lipgloss.NewRenderer(e.stdout)
	if e.getenv("NO_COLOR") != "" {
		r.SetColorProfile(termenv.Ascii)
	}
	// The catalog is read after the first frame; the selector shows how far
	// the read has got, and a catalog that cannot be read ends it with the
	// error (exit status 2) as before it started.
	var progress atomic.Pointer[catalog.Progress]
	loader := e.loader()
	loader.Progress = func(p catalog.Progress) { progress.Store(&p) }
	empty := &catalog.Catalog{} // stands in until the read ends, naming the sources
	for _, l := range layers {
		empty.Sources = append(empty.Sources, safe.Text(l.Name))
	}
	var mu sync.Mutex // guards layers: the entry form may add a file to them
	settingsFile := tui.SettingsPath(e.getenv)
	settings, settingsErr := tui.LoadSettings(settingsFile)
	m := tui.New(tui.Config{
		Design:     d,
		DesignFile: design,
		DesignText: text,
		Version:    version,
		Catalog:    empty,
		LoadFirst:  true,
		LoadProgress: func() catalog.Progress {
			if p := progress.Load(); p != nil {
				return *p
			}
			return catalog.Progress{}
		},
		Load: func() (*catalog.Catalog, error) {
			mu.Lock()
			ls := slices.Clone(layers)
			mu.Unlock()
			c, err := loader.Load(ls...)
			return c, acceptCatalog(c, err, strictCatalog)
		},
		StartEntry: add,
		SaveTo:     to,
		AddSource: func(path string) {
			mu.Lock()
			defer mu.Unlock()
			if !coveredBy(layers, path) {
				layers = append(layers, catalog.PathLayer(path))
			}
		},
		OnDisk:   onDisk,
		Watch:    true,
		Strict:   strict,
		Renderer: r,
		Getenv:   e.getenv,

		Settings:     settings,
		SettingsFile: settingsFile,
		SettingsErr:  settingsErr,
	})
	defer m.Close()
	p := tea.NewProgram(m, tea.WithAltScreen(), tea.WithMouseCellMotion(),
		tea.WithInput(e.stdin), tea.WithOutput(e.stdout))
	if _, err := p.Run(); err != nil {
		return fmt.Errorf("selector: %w", err)
	}
	if err := m.Fatal(); err != nil {
		return inputError(newCatalogError(err, catalogs))
	}
	return nil
}

// coveredBy reports whether the catalog file path is read by one of the
// on-disk layers: it is a layer's file, or a *.toml file directly in a
// layer's directory.
func coveredBy(layers []catalog.Layer, path string) bool {
	abs, err := filepath.Abs(path)
	if err != nil {
		return false
	}
	for _, l := range layers {
		if l.FS != nil {
			continue
		}
		src, err := filepath.Abs(l.Path)
		if err != nil {
			continue
		}
		if abs == src || (filepath.Dir(abs) == src && catalog.IsCatalogName(filepath.Base(abs))) {
			return true
		}
	}
	return false
}
