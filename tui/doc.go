// Package tui is opsift's interactive selector: a bubbletea program in
// which the design's inputs, the derived requirements, the ranking and each
// candidate's margins move together.
//
//	key in a design field ─► Design.Clone + Set ─► Derive (at once, in Update)
//	      │ parse or derive error: shown inline, the design in force stays
//	      ▼
//	plan in force ─► rankJob{gen} (tea.Cmd off the UI path: the passing parts
//	      ranked first, then every part in a second job) ─► rankedMsg{gen}
//	      ─► dropped unless gen is the newest; the passing parts alone are
//	      shown only while nothing on screen needs a failing one
//	      ─► results ─► narrowing (failing, find, tech, package, shortlist)
//	      ─► list rows (only visible ones drawn), selection kept by part id
//	      ─► checks pane for the selected part
//
//	catalog file changed (fsnotify, debounced) or r ─► Config.Load ─► reloadedMsg
//	      ─► new catalog, selection and shortlist kept ─► rankJob
//
//	v / cursor move ─► previewJob{gen} (filter/preview, off the UI path) ─► previewMsg
//	      ─► dropped unless gen is the newest ─► previewPane ─► tui/plot
//	R ─► replace.Find with the plan in force ─► replacer (its own mode)
//	selected passing part changed ─► findHeadroom (filter/headroom, a tea.Cmd)
//	      ─► headroomMsg ─► dropped unless still the selected part and plan
//	      ─► headroomState ─► the checks pane's headroom section
//	= with 2–6 marked ─► comparePane (filter/compare, built in settle)
//
//	edit ─► undo stack, edits against the saved design ─► header "modified"
//	w ─► filter.UpdateDesignText(saved text, design) ─► report.WriteFile ─► new saved base
//	design file changed (fsnotify, debounced) ─► no edits: taken │ edits: ask reload / keep mine
//	q ─► no edits: quit │ edits: ask save / discard / cancel (keep.go)
//
// The root Model holds routing (the mode with the keyboard, the focused
// pane, the detail shown), the state the panes share — the design in
// force, the catalog (catalogState), the ranking (ranking: plan, results,
// generation) and the status line — and the panes' sub-models: form
// (design), list (candidates), checksPane, previewPane, replacer, prompt,
// shortlist, narrowing. Each pane draws itself from the shared state it is
// lent read-only, with one read-only ui context (size, styles, keys).
// Update routes each message to what it concerns, then settles the panes
// (settle.go: the checks of the rows on screen are filled in, scroll
// offsets kept in range, inputs sized), so View is a pure function of the
// model. File writes (export, save) run as tea.Cmds whose result comes
// back as a writtenMsg. Each mode (browse, edit, find, prompt, help,
// replace, ask) has its own update function; the right-hand detail area
// switches on a detail kind: the checks pane, the waveform preview or the
// compare view.
// Styles come from a Theme of ANSI colours 0–15 and a lipgloss renderer
// chosen by the caller (no colour for NO_COLOR and tests).
package tui
