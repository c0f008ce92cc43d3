package main

import (
	"fmt"
	"io"
	"log"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/tui"
)

const selectorUsage = `Usage: opsift [--catalog PATH]... [--design FILE] [--strict] [--strict-catalog]

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
	fset.Var(&catalogs, "catalog", catalogHelp)
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
	cat, err := openCatalog(e, catalogs, strictCatalog)
	if err != nil {
		return err
	}
	if !e.isTTY {
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
	settingsFile := tui.SettingsPath(e.getenv)
	settings, settingsErr := tui.LoadSettings(settingsFile)
	m := tui.New(tui.Config{
		Design:     d,
		DesignFile: design,
		DesignText: text,
		Version:    version,
		Catalog:    cat,
		CatalogErr: cat.Problems().AsError(),
		Load: func() (*catalog.Catalog, error) {
			c, err := catalog.Load(layers...)
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
	return nil
}
