package tui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
)

// form is the design pane: every input of the design (Design.Fields) in
// sections, each editable in place, with the derived requirements and
// their formulas under the section they come from.
type form struct {
	u      *ui
	fields []filter.Field
	cursor int // index into fields
	// offset is the first drawn line; follow makes the next draw scroll so
	// the cursor's field is visible (movement keys set it, the wheel not).
	offset int
	follow bool

	// edited holds the paths of the inputs that differ from the file,
	// marked "*" beside their label; the root sets it when it settles.
	edited map[string]bool

	input   textinput.Model
	editing bool
	before  string // the field's text when editing began (esc restores it)
	editErr string // why the text being typed is not in force; "" when it is
}

// newForm returns an empty design pane.
func newForm(u *ui) form {
	return form{u: u, input: newInput(u, "", 64), follow: true}
}

// refresh re-reads the fields of d, keeping the cursor on the same field
// (by path) when it still exists.
func (f *form) refresh(d *filter.Design) {
	path := f.path()
	f.fields = d.Fields()
	for i, fl := range f.fields {
		if fl.Path == path {
			f.cursor = i
			return
		}
	}
	f.cursor = min(f.cursor, max(0, len(f.fields)-1))
}

// path is the path of the field under the cursor, "" when none.
func (f *form) path() string {
	if f.cursor < 0 || f.cursor >= len(f.fields) {
		return ""
	}
	return f.fields[f.cursor].Path
}

// current is the field under the cursor.
func (f *form) current() (filter.Field, bool) {
	if f.cursor < 0 || f.cursor >= len(f.fields) {
		return filter.Field{}, false
	}
	return f.fields[f.cursor], true
}

// move moves the cursor by n fields.
func (f *form) move(n int) {
	f.cursor = max(0, min(len(f.fields)-1, f.cursor+n))
	f.follow = true
}

// begin gives the field under the cursor the text input. It returns the
// field's help for the status line and the input's focus command; ok is
// false when there is no field.
func (f *form) begin() (help string, focus tea.Cmd, ok bool) {
	fl, ok := f.current()
	if !ok {
		return "", nil, false
	}
	f.editing, f.before, f.editErr, f.follow = true, fl.Raw, "", true
	f.input.SetValue(fl.Raw)
	f.input.CursorEnd()
	help = fl.Label + ": " + fl.Help
	if fl.Default != "" {
		help += " (empty: " + fl.Default + ")"
	}
	if len(fl.Choices) > 0 {
		help += "; one of: " + strings.Join(fl.Choices, ", ")
	}
	return help, f.input.Focus(), true
}

// end leaves the field. When the text typed was not in force it returns
// what was kept instead, for the status line.
func (f *form) end() (kept string) {
	if f.editErr != "" {
		fl, _ := f.current()
		shown := fl.Raw
		if shown == "" {
			shown = "(" + fl.Default + ")"
		}
		kept = fmt.Sprintf("%s: kept %s; %q was not accepted: %s", fl.Label, shown, f.input.Value(), f.editErr)
	}
	f.editing, f.editErr = false, ""
	f.input.Blur()
	return kept
}

// scroll moves the view by n lines without moving the cursor.
func (f *form) scroll(n int) {
	f.offset = max(0, f.offset+n)
	f.follow = false
}

// section returns the heading a field path belongs under and, for a stage
// field, the stage name.
func section(path string) (heading, stage string) {
	if rest, ok := strings.CutPrefix(path, "stage."); ok {
		// Stage names have no dots (the decoder checks), so the first
		// segment is the name.
		name, _, _ := strings.Cut(rest, ".")
		return "stage " + name, name
	}
	h, _, _ := strings.Cut(path, ".")
	return h, ""
}

// formWidths are the label and value widths of a design pane w cells wide.
func formWidths(w int) (labelW, valueW int) {
	labelW = max(8, min(22, (w-2)*52/100))
	return labelW, w - 2 - labelW - 1
}

// formLine is one drawn line of the design pane.
type formLine struct {
	text  string
	field int // index of the field it draws, -1 for headings and formulas
}

// lines lays the pane out at width w: section headings, fields, inline
// errors and the requirements with their formulas.
func (f *form) lines(plan *filter.Plan, warns []filter.Warning, w int) []formLine {
	st := &f.u.st
	var out []formLine
	add := func(s string, field int) { out = append(out, formLine{s, field}) }
	// Warnings first: an impossible design or a filter that leaves no part
	// is the first thing to read.
	for _, wn := range warns {
		for i, l := range wrap("⚠ "+safe.Text(wn.String()), w-2) {
			if i > 0 {
				l = "  " + l
			}
			add(st.Warning.Render(fit(l, w)), -1)
		}
	}
	if len(warns) > 0 {
		add(fit("", w), -1)
	}
	labelW, valueW := formWidths(w)
	prev := ""
	globalDone := false
	for i, fl := range f.fields {
		head, stage := section(fl.Path)
		if stage != "" && !globalDone {
			globalDone = true
			f.requirements(&out, plan, "", w)
		}
		if head != prev {
			if prev != "" {
				add(fit("", w), -1)
			}
			title := head
			if stage != "" && plan != nil {
				for _, sp := range plan.Stages {
					if sp.Name == stage {
						title += " · " + sp.Kind
					}
				}
			}
			add(st.Section.Render(fit(title, w)), -1)
			prev = head
		}
		label := fl.Label
		if stage != "" {
			label = strings.TrimPrefix(label, stage+": ")
		}
		mark := "  "
		if i == f.cursor {
			mark = "▸ "
		}
		if f.edited[fl.Path] {
			mark = mark[:len(mark)-1] + "*"
		}
		var value string
		switch {
		case f.editing && i == f.cursor:
			value = f.input.View() // its width is set by settle
		case fl.Set:
			value = st.Value.Render(fit(safe.Text(fl.Raw), valueW))
		case fl.Default != "":
			value = st.Default.Render(fit("("+fl.Default+")", valueW))
		default:
			value = st.Default.Render(fit("—", valueW))
		}
		// A label longer than its column wraps under itself, the value on
		// its first line, so no label is cut ("supply current budget").
		labs := wrap(label, labelW)
		if len(labs) == 0 {
			labs = []string{""}
		}
		for j, l := range labs {
			lab := fit(l, labelW)
			if i == f.cursor {
				lab = st.Value.Render(lab)
			}
			if j == 0 {
				add(fit(mark+lab+" "+value, w), i)
			} else {
				add(fit("  "+lab, w), i)
			}
		}
		if f.editing && i == f.cursor && f.editErr != "" {
			for _, l := range wrap("✗ "+f.editErr, w-4) {
				add("    "+st.Error.Render(fit(l, w-4)), i)
			}
		}
		if next := i + 1; stage != "" && (next == len(f.fields) || !strings.HasPrefix(f.fields[next].Path, "stage."+stage+".")) {
			f.requirements(&out, plan, stage, w)
		}
	}
	if !globalDone {
		f.requirements(&out, plan, "", w)
	}
	return out
}

// requirements adds the derived requirements of a stage ("" for the
// design-level ones) under a "needs" heading, each with its formula.
func (f *form) requirements(out *[]formLine, plan *filter.Plan, stage string, w int) {
	if plan == nil {
		return
	}
	var reqs []filter.Requirement
	if stage == "" {
		reqs = plan.Global
	} else {
		for _, sp := range plan.Stages {
			if sp.Name == stage {
				reqs = sp.Requirements
			}
		}
	}
	if len(reqs) == 0 {
		return
	}
	st := &f.u.st
	*out = append(*out, formLine{st.Muted.Render(fit("  needs", w)), -1})
	for i := range reqs {
		r := &reqs[i]
		*out = append(*out, formLine{fit("  "+requirementText(r), w), -1})
		if r.Why != "" {
			for _, l := range wrap(safe.Text(r.Why), w-6) {
				*out = append(*out, formLine{st.Why.Render(fit("      "+l, w)), -1})
			}
		}
	}
}

// requirementText is a requirement in one short line: "slew ≥ 0.63 V/µs".
func requirementText(r *filter.Requirement) string {
	k := string(r.Key)
	switch r.Bound {
	case filter.BoundMin:
		return k + " ≥ " + quantity(r.Value, r.Dim)
	case filter.BoundMax:
		return k + " ≤ " + quantity(r.Value, r.Dim)
	case filter.BoundRange:
		return k + " covers " + span(r.Low, r.High, r.Dim)
	}
	switch {
	case len(r.Allowed) > 0:
		return k + " ∈ " + safe.Text(strings.Join(r.Allowed, ", "))
	case r.Key == filter.KeyTemperature:
		return k + " covers " + span(r.Low, r.High, catalog.Celsius)
	case r.Key == filter.KeyCost:
		return k + " ≤ " + trimFloat(r.Value)
	}
	return k
}

// formTitle is the pane's heading for design; edited says how many inputs
// differ from the file.
func formTitle(design *filter.Design, edited int) string {
	title := "DESIGN"
	if edited > 0 {
		title += " · modified"
	}
	if design.Title != "" {
		title += " · " + safe.Text(design.Title)
	}
	return title
}

// settle sizes the text input and scrolls so the cursor's field shows
// (while follow is on), keeping the offset inside the lines of a pane of
// w×h.
func (f *form) settle(plan *filter.Plan, warns []filter.Warning, w, h int) {
	_, valueW := formWidths(w)
	f.input.Width = max(1, valueW-1)
	lines := f.lines(plan, warns, w)
	body := max(0, h-1)
	if f.follow {
		first, last := -1, -1
		for i, l := range lines {
			if l.field == f.cursor {
				if first < 0 {
					first = i
				}
				last = i
			}
		}
		if first >= 0 {
			// Show the heading above the first field of a section too.
			if first > 0 && lines[first-1].field < 0 && first-1 < f.offset {
				f.offset = first - 1
			}
			if first < f.offset {
				f.offset = first
			}
			if last >= f.offset+body {
				f.offset = last - body + 1
			}
		}
	}
	f.offset = max(0, min(f.offset, len(lines)-body))
}

// draw draws the pane into h lines of w cells, the first being the title;
// the offset is settled in Update.
func (f *form) draw(plan *filter.Plan, warns []filter.Warning, design *filter.Design, edited int, focused bool, w, h int) []string {
	lines := f.lines(plan, warns, w)
	out := make([]string, 0, h)
	out = append(out, paneHeading(&f.u.st, formTitle(design, edited), focused, w))
	for i := f.offset; i < len(lines) && len(out) < h; i++ {
		out = append(out, lines[i].text)
	}
	for len(out) < h {
		out = append(out, strings.Repeat(" ", w))
	}
	return out
}
