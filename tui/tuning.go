package tui

import "time"

// Tuning constants of the selector, each with its unit and the reason for
// its value.
const (
	// wideWidth is the terminal width, in cells, from which the design
	// pane and the checks pane sit side by side. Below it they share the
	// lower area at full width (the focused one shows) and low-priority
	// columns drop out.
	wideWidth = 100
	// designWidth is the design pane's width in cells beside the checks
	// pane: room for an 18-cell label and a 14-cell value, leaving the
	// checks pane 83 cells at 120 columns.
	designWidth = 36
	// minWidth, minHeight are the smallest terminal, in cells, the layout
	// is drawn for; below it the screen says so instead of wrapping.
	minWidth, minHeight = 60, 16
	// barCells is the width of a margin bar. Eight cells of eighth blocks
	// give 64 steps over 0 … +100 %, finer than the margins are known.
	barCells = 8
	// barFull is the margin, a fraction, drawn as a full bar: +100 %
	// (twice what is needed) is already ample headroom.
	barFull = 1.0
	// reloadDebounce is how long, after the last change event on a
	// catalog file, the selector waits before reloading: editors write a
	// file in several steps (truncate, write, rename) within a few ms.
	reloadDebounce = 250 * time.Millisecond
	// wheelRows is how many rows one mouse-wheel notch scrolls: three, as
	// most terminals scroll text.
	wheelRows = 3
	// listShare is the part of the body's height, in percent, given to
	// the candidate list; the design and checks panes share the rest, which
	// at 40 rows holds every check of a two-stage design.
	listShare = 40
	// minListRows is the least number of candidate rows shown.
	minListRows = 4
	// undoDepth is how many edits u can take back: far more than a
	// session of edits to one design, few enough to be nothing in memory.
	undoDepth = 200
	// maxPromptErrLines is how many lines a save or export error may take
	// under the prompt: an OS error with a long path wraps to three at 80
	// columns.
	maxPromptErrLines = 3
	// maxFootLines is how many lines the key help at the bottom may wrap
	// to: two hold every browsing key at 80 columns.
	maxFootLines = 2
)
