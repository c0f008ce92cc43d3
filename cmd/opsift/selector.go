package main

import (
	"fmt"
	"io"
	"log"
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
waveform. Press ? inside for every key.

Parts with problems are set aside (the status line counts them; opsift
check lists them) and the rest is ranked; --strict-catalog refuses the
whole catalog instead, at start and on every reload.

Set NO_COLOR for a screen without colour, OPSIFT_LOG=FILE to log to FILE.

Options:
`

// runSelector starts the interactive selector on the catalog and design.
func runSelector(e *env, args []string) error {
	var (
		catalogs pathList
		design   string
		strict   bool
		// strictCatalog refuses the catalog on any problem.
		strictCatalog bool
	)
	fset := newFlagSet(e, "opsift", selectorUsage)
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
			c, err := loader.Load(layers...)
			return c, acceptCatalog(c, err, strictCatalog)
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
