package tui

import "github.com/charmbracelet/bubbles/key"

// KeyMap is every key the selector answers to. It feeds the key help: the
// short line at the bottom and the full overlay behind "?".
type KeyMap struct {
	Up, Down       key.Binding
	PageUp, PageDn key.Binding
	Top, Bottom    key.Binding
	Focus          key.Binding // next pane
	FocusBack      key.Binding // previous pane
	Edit           key.Binding // edit the field under the cursor
	Accept         key.Binding // leave a field / confirm a prompt
	Cancel         key.Binding // leave a field restoring it / close a prompt
	Failing        key.Binding // show failing parts too
	Sort           key.Binding
	Find           key.Binding // text filter on id, name, notes
	Tech           key.Binding // cycle the technology quick filter
	Package        key.Binding // cycle the package quick filter
	Clear          key.Binding // clear every narrowing
	Mark           key.Binding
	Shortlist      key.Binding // show only the shortlist
	Export         key.Binding
	Save           key.Binding // save the design
	Undo           key.Binding // take back the last edit of the design
	Reload         key.Binding
	Open           key.Binding // open the part in $EDITOR
	Replace        key.Binding // replacement mode for the selected part
	Preview        key.Binding // detail area: checks or waveform preview
	Compare        key.Binding // preview the two shortlisted parts together
	Versus         key.Binding // detail area: the marked parts side by side
	VersusScroll   key.Binding // side by side: the part columns left or right
	StagePrev      key.Binding // preview: previous stage with a waveform
	StageNext      key.Binding // preview: next stage with a waveform
	Explore        key.Binding // explorer mode: every part, any figure as a column
	ColumnLeft     key.Binding // explorer: column cursor left
	ColumnRight    key.Binding // explorer: column cursor right
	ExploreColumns key.Binding // explorer: choose the columns
	Typical        key.Binding // explorer: typical figures instead of the worst case
	ExploreBack    key.Binding // explorer: back to the list (its help line; esc, q and E do it)
	AddPart        key.Binding // the entry form, for a new part
	EditPart       key.Binding // the entry form on the selected part's figures
	SavePart       key.Binding // entry form: save the part into its catalog file
	Help           key.Binding
	Quit           key.Binding
}

// DefaultKeyMap returns opsift's keys.
func DefaultKeyMap() KeyMap {
	b := func(keys []string, help, desc string) key.Binding {
		return key.NewBinding(key.WithKeys(keys...), key.WithHelp(help, desc))
	}
	return withEntryKeys(withExplorerKeys(KeyMap{
		Up:           b([]string{"up", "k"}, "↑/k", "up"),
		Down:         b([]string{"down", "j"}, "↓/j", "down"),
		PageUp:       b([]string{"pgup", "ctrl+b"}, "pgup", "page up"),
		PageDn:       b([]string{"pgdown", "ctrl+f"}, "pgdn", "page down"),
		Top:          b([]string{"home", "g"}, "g/home", "first"),
		Bottom:       b([]string{"end", "G"}, "G/end", "last"),
		Focus:        b([]string{"tab"}, "tab", "pane"),
		FocusBack:    b([]string{"shift+tab"}, "shift+tab", "previous pane"),
		Edit:         b([]string{"enter", "e"}, "enter", "edit"),
		Accept:       b([]string{"enter"}, "enter", "done"),
		Cancel:       b([]string{"esc"}, "esc", "cancel"),
		Failing:      b([]string{"f"}, "f", "+failing"),
		Sort:         b([]string{"s"}, "s", "sort"),
		Find:         b([]string{"/"}, "/", "find"),
		Tech:         b([]string{"t"}, "t", "tech filter"),
		Package:      b([]string{"p"}, "p", "package filter"),
		Clear:        b([]string{"c"}, "c", "clear filters"),
		Mark:         b([]string{" ", "m"}, "space", "mark"),
		Shortlist:    b([]string{"l"}, "l", "shortlist"),
		Export:       b([]string{"x"}, "x", "export"),
		Save:         b([]string{"w", "ctrl+s"}, "w", "save design"),
		Undo:         b([]string{"u"}, "u", "undo edit"),
		Reload:       b([]string{"r"}, "r", "reload catalog"),
		Open:         b([]string{"o"}, "o", "edit part file"),
		Replace:      b([]string{"R"}, "R", "replace"),
		Preview:      b([]string{"v"}, "v", "wave"),
		Compare:      b([]string{"V"}, "V", "compare 2 marked"),
		Versus:       b([]string{"="}, "=", "marked side by side"),
		VersusScroll: b([]string{"left", "right"}, "←/→", "side by side: more parts"),
		StagePrev:    b([]string{"["}, "[", "previous stage"),
		StageNext:    b([]string{"]"}, "]", "next stage"),
		Help:         b([]string{"?"}, "?", "keys"),
		Quit:         b([]string{"q", "ctrl+c"}, "q", "quit"),
	}))
}

// withEntryKeys adds the entry form's keys to k: a opens it for a new
// part, A on the selected part's figures; inside it ctrl+s saves (every
// printable key is text there).
func withEntryKeys(k KeyMap) KeyMap {
	b := func(keys []string, help, desc string) key.Binding {
		return key.NewBinding(key.WithKeys(keys...), key.WithHelp(help, desc))
	}
	k.AddPart = b([]string{"a"}, "a", "add part")
	k.EditPart = b([]string{"A"}, "A", "edit part figures")
	k.SavePart = b([]string{"ctrl+s"}, "ctrl+s", "save part")
	return k
}

// withExplorerKeys adds explorer mode's keys to k: E opens it; inside it
// ←/→ move the column cursor, c picks the columns, T switches typical.
func withExplorerKeys(k KeyMap) KeyMap {
	b := func(keys []string, help, desc string) key.Binding {
		return key.NewBinding(key.WithKeys(keys...), key.WithHelp(help, desc))
	}
	k.Explore = b([]string{"E"}, "E", "explore all parts")
	k.ColumnLeft = b([]string{"left"}, "←", "column left")
	k.ColumnRight = b([]string{"right"}, "→", "column right")
	k.ExploreColumns = b([]string{"c"}, "c", "columns")
	k.Typical = b([]string{"T"}, "T", "typical/worst")
	k.ExploreBack = b([]string{"esc", "q", "E"}, "esc/q/E", "back")
	return k
}

// ShortHelp is the bottom line while browsing; "?" and "q" come early so
// they stay visible at 80 columns.
func (k KeyMap) ShortHelp() []key.Binding {
	return []key.Binding{k.Focus, k.Edit, k.Mark, k.Failing, k.Export, k.Help, k.Quit, k.Replace, k.Preview, k.Sort, k.Find, k.Shortlist}
}

// FullHelp is the overlay: moving, narrowing, shortlist, keeping the work.
func (k KeyMap) FullHelp() [][]key.Binding {
	return [][]key.Binding{
		{k.Up, k.Down, k.PageUp, k.PageDn, k.Top, k.Bottom, k.Focus, k.FocusBack},
		{k.Edit, k.Failing, k.Sort, k.Find, k.Tech, k.Package, k.Clear},
		{k.Mark, k.Shortlist, k.Export, k.Save, k.Undo, k.Reload, k.Open, k.AddPart, k.EditPart, k.Help, k.Quit},
		{k.Replace, k.Preview, k.StagePrev, k.StageNext, k.Compare, k.Explore, k.Versus, k.VersusScroll},
	}
}

// explorerKeys are the bottom line in explorer mode.
func (k *KeyMap) explorerKeys() []key.Binding {
	return []key.Binding{k.ColumnLeft, k.ColumnRight, k.Sort, k.ExploreColumns, k.Typical, k.Find, k.Mark, k.Help, k.ExploreBack}
}

// explorerHelp is the help overlay's key columns in explorer mode.
func (k *KeyMap) explorerHelp() [][]key.Binding {
	quit := key.NewBinding(key.WithKeys("ctrl+c"), key.WithHelp("ctrl+c", "quit"))
	return [][]key.Binding{
		{k.Up, k.Down, k.PageUp, k.PageDn, k.Top, k.Bottom},
		{k.ColumnLeft, k.ColumnRight, k.Sort, k.ExploreColumns, k.Typical},
		{k.Find, k.Mark, k.Help, k.ExploreBack, quit},
	}
}

// editKeys are the bottom line while a field or prompt has the keyboard.
func (k *KeyMap) editKeys() []key.Binding { return []key.Binding{k.Accept, k.Cancel} }
