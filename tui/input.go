package tui

import (
	"github.com/charmbracelet/bubbles/cursor"
	"github.com/charmbracelet/bubbles/textinput"
)

// newInput is a one-line text input in the selector's styles holding
// value, with the cursor at its end. The cursor does not blink: a steady
// block is as easy to find and keeps frames (and golden screens) still.
func newInput(u *ui, value string, limit int) textinput.Model {
	in := textinput.New()
	in.Prompt = ""
	in.TextStyle = u.st.InputText
	in.PromptStyle = u.st.InputText
	in.PlaceholderStyle = u.st.Muted
	in.Cursor.Style = u.st.InputCursor
	in.Cursor.TextStyle = u.st.InputText
	in.Cursor.SetMode(cursor.CursorStatic)
	in.CharLimit = limit
	in.SetValue(value)
	in.CursorEnd()
	return in
}

// newFindInput is the text filter's input.
func newFindInput(u *ui, value string) textinput.Model {
	in := newInput(u, value, 64)
	in.Placeholder = "id, name or notes"
	return in
}
