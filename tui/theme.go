package tui

import "github.com/charmbracelet/lipgloss"

// Theme is the small palette the styles are built from. Colours are ANSI
// indices 0–15 only, so the screen reads the same in a 16-colour terminal
// and follows the user's terminal palette; nothing relies on colour alone
// (selection has a ▸, pass/fail are words, basis has a marker letter).
type Theme struct {
	Accent  lipgloss.Color // titles, focused pane, keys in help
	Good    lipgloss.Color // passing checks, margin bars
	Bad     lipgloss.Color // failing checks, parse errors
	Warn    lipgloss.Color // unknown checks, typical/graph markers
	Muted   lipgloss.Color // formulas, separators, secondary text
	Strong  lipgloss.Color // selected row background
	Inverse lipgloss.Color // text on Strong
}

// DefaultTheme returns the palette opsift uses: cyan accents, green and
// red for pass and fail, yellow for caution, bright black for the quiet.
func DefaultTheme() Theme {
	return Theme{
		Accent:  lipgloss.Color("6"),
		Good:    lipgloss.Color("2"),
		Bad:     lipgloss.Color("1"),
		Warn:    lipgloss.Color("3"),
		Muted:   lipgloss.Color("8"),
		Strong:  lipgloss.Color("4"),
		Inverse: lipgloss.Color("15"),
	}
}

// Styles are every lipgloss style the selector draws with, built once from
// a Theme for one renderer (so NO_COLOR and tests get plain text).
type Styles struct {
	Title       lipgloss.Style // top line
	PaneTitle   lipgloss.Style // an unfocused pane's heading
	PaneFocus   lipgloss.Style // the focused pane's heading
	Section     lipgloss.Style // [supply], stage headings in the design pane
	Label       lipgloss.Style
	Value       lipgloss.Style
	Default     lipgloss.Style // a value that is the default, not written
	Error       lipgloss.Style
	Why         lipgloss.Style // derived requirement formulas
	Header      lipgloss.Style // table column headings
	Selected    lipgloss.Style // the row under the cursor
	Pass        lipgloss.Style
	Fail        lipgloss.Style
	Unknown     lipgloss.Style
	Marker      lipgloss.Style // ~ and g basis markers
	Mark        lipgloss.Style // shortlist mark
	Modified    lipgloss.Style // the header's "modified": unsaved edits
	Warning     lipgloss.Style // a warning about the design or its filters
	Muted       lipgloss.Style
	Sep         lipgloss.Style // the line between panes
	Status      lipgloss.Style
	Caution     lipgloss.Style // the advisory note at the right of the status line
	Message     lipgloss.Style
	Prompt      lipgloss.Style
	Overlay     lipgloss.Style // the help overlay's frame
	HelpKey     lipgloss.Style
	HelpDesc    lipgloss.Style
	HelpSep     lipgloss.Style
	InputText   lipgloss.Style
	InputCursor lipgloss.Style
}

// NewStyles builds the styles of theme t for renderer r.
func NewStyles(r *lipgloss.Renderer, t Theme) Styles {
	s := r.NewStyle
	return Styles{
		Title:       s().Bold(true).Foreground(t.Accent),
		PaneTitle:   s().Bold(true),
		PaneFocus:   s().Bold(true).Underline(true).Foreground(t.Accent),
		Section:     s().Bold(true).Foreground(t.Accent),
		Label:       s(),
		Value:       s().Bold(true),
		Default:     s().Foreground(t.Muted),
		Error:       s().Foreground(t.Bad),
		Why:         s().Foreground(t.Muted),
		Header:      s().Bold(true).Underline(true),
		Selected:    s().Background(t.Strong).Foreground(t.Inverse),
		Pass:        s().Foreground(t.Good),
		Fail:        s().Bold(true).Foreground(t.Bad),
		Unknown:     s().Foreground(t.Warn),
		Marker:      s().Foreground(t.Warn),
		Mark:        s().Bold(true).Foreground(t.Accent),
		Modified:    s().Bold(true).Foreground(t.Warn),
		Warning:     s().Foreground(t.Warn),
		Muted:       s().Foreground(t.Muted),
		Sep:         s().Foreground(t.Muted),
		Status:      s(),
		Caution:     s().Foreground(t.Muted).Italic(true),
		Message:     s().Foreground(t.Accent),
		Prompt:      s().Bold(true).Foreground(t.Accent),
		Overlay:     s().Border(lipgloss.RoundedBorder()).BorderForeground(t.Accent).Padding(0, 1),
		HelpKey:     s().Bold(true).Foreground(t.Accent),
		HelpDesc:    s(),
		HelpSep:     s().Foreground(t.Muted),
		InputText:   s(),
		InputCursor: s().Reverse(true),
	}
}
