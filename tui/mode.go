package tui

// mode says what has the keyboard. Each mode has its own update function
// (update_<mode> in its file) and may draw over the main screen; a new
// mode (a replacement finder, say) is a new constant, a case in
// Model.updateKey and its own file.
type mode int

const (
	modeBrowse  mode = iota // moving around, single-key commands
	modeEdit                // a design field's text input has the keyboard
	modeFind                // typing the text filter
	modePrompt              // a path/format prompt (export, save) or a yes/no
	modeHelp                // the full key-help overlay
	modeReplace             // replacement finder for the selected part (replace_mode.go)
	modeExplore             // every part with chosen figure columns (explorer.go)
	modeAsk                 // a one-key question: unsaved edits at q, the design changed on disk (keep.go)
	modeEntry               // the entry form of a new or edited part (entry.go, entry_mode.go)
)

// pane names a focusable area of the main screen, in tab order.
type pane int

const (
	paneDesign pane = iota
	paneList
	paneDetail
	paneCount // number of panes; keep last
)

// detail says what the right-hand detail area shows for the selected
// candidate. Later panes (a waveform preview) add a constant and a case in
// Model.detailView.
type detail int

const (
	detailChecks  detail = iota // the selected part's checks, per stage
	detailPreview               // its waveform in a stage of the design (preview_detail.go)
	detailCompare               // the marked parts side by side (compare_view.go)
)
