package catalog

import (
	"errors"
	"fmt"
	"strings"

	"github.com/opsift/opsift/catalog/safe"
)

// SetAside is what a load left out because of problems: one part (Index
// > 0, or a duplicate id) or a whole file that could not be read or
// decoded (Index 0 and no ID: its parts are unknown), with every problem
// found in it.
type SetAside struct {
	Pos   Pos    // the part's first problem (a duplicate: its id line), or the file
	ID    string // the part's id; "" when it has none or for a file
	Index int    // 1-based number of the [[part]] table in its file; 0 for a file
	// Problems are the part's or file's problems, in line order.
	Problems Problems
	// InUse is where the part with the same id that is used instead was
	// written ("file:line"), when an earlier source gives a valid one.
	InUse string
}

// IsFile reports whether the entry is a file rather than one part.
func (s SetAside) IsFile() bool { return s.ID == "" && s.Index == 0 }

// Subject names the entry for people: `part "ID"`, `part #3 of FILE`, or
// `file FILE`.
func (s SetAside) Subject() string {
	switch {
	case s.ID != "":
		return fmt.Sprintf("part %q", s.ID)
	case s.Index > 0:
		return fmt.Sprintf("part #%d of %s", s.Index, safe.Text(s.Pos.File))
	}
	return "file " + safe.Text(s.Pos.File)
}

// SourceError is a catalog source (a --catalog path) that cannot be read
// at all: no part of it is known, so a partial catalog is not possible.
type SourceError struct{ Err error }

// Error says the catalog cannot be read and why.
func (e *SourceError) Error() string { return "cannot read catalog: " + e.Err.Error() }

// Unwrap returns the file system's error.
func (e *SourceError) Unwrap() error { return e.Err }

// setAside groups the problems of a load by the part or file they are
// about, in the order the problems come.
func (c *Catalog) setAside(probs Problems) []SetAside {
	var out []SetAside
	at := map[string]int{} // group key → index in out
	for _, p := range probs {
		s := SetAside{Pos: Pos{File: p.Pos.File}}
		switch {
		case p.Index > 0:
			s.ID, s.Index = p.Part, p.Index
			s.Pos.Line = 0 // the first problem's line, below
		case p.Part != "": // a duplicate id: its own entry, at the id's line
			s.ID, s.Pos.Line = p.Part, p.Pos.Line
		}
		key := fmt.Sprintf("%s\x00%d\x00%s\x00%d", s.Pos.File, s.Index, s.ID, s.Pos.Line)
		i, ok := at[key]
		if !ok {
			i = len(out)
			at[key] = i
			out = append(out, s)
		}
		g := &out[i]
		if g.Index > 0 && (g.Pos.Line == 0 || (p.Pos.Line > 0 && p.Pos.Line < g.Pos.Line)) {
			g.Pos.Line = p.Pos.Line
		}
		g.Problems = append(g.Problems, p)
	}
	for i := range out {
		if id := out[i].ID; id != "" {
			if q := c.byID[id]; q != nil {
				out[i].InUse = fmt.Sprintf("%s:%d", q.Pos.File, q.Pos.Line)
			}
		}
	}
	return out
}

// PartsSetAside counts the parts left out for problems; files that could
// not be decoded count none, as their parts are unknown (FilesSetAside).
func (c *Catalog) PartsSetAside() int { return c.Invalid }

// FilesSetAside counts the files set aside whole.
func (c *Catalog) FilesSetAside() int {
	n := 0
	for _, s := range c.SetAside {
		if s.IsFile() && !s.Problems.onlyNotes() {
			n++
		}
	}
	return n
}

// onlyNotes reports whether every problem of a file entry leaves its
// parts in use (an unknown key outside any [[part]] table, the count of
// problems not listed).
func (ps Problems) onlyNotes() bool {
	for _, p := range ps {
		var u *UnlistedError
		if !errors.As(p.Err, &u) && !errors.Is(p.Err, errOutsidePart) {
			return false
		}
	}
	return true
}

// errOutsidePart marks a key outside any [[part]] table: a problem of the
// file that costs no part.
var errOutsidePart = errors.New("outside any [[part]] table")

// Partial applies the partial-catalog rule to what Load returned: a
// catalog whose problems are only in parts or files is used with the
// valid parts, its problems listed in SetAside, and Partial returns nil.
// It returns err itself (refusing the catalog) when a source cannot be
// read at all or no valid part is left.
func Partial(c *Catalog, err error) error {
	if err == nil {
		return nil
	}
	var ps Problems
	if c == nil || !errors.As(err, &ps) || len(c.Parts) == 0 {
		return err
	}
	for _, p := range ps {
		var se *SourceError
		if errors.As(p.Err, &se) {
			return err
		}
	}
	return nil
}

// SetAsideSummary is one line saying what was set aside, e.g. "2 of 53
// parts set aside for problems, 1 file not read".
func (c *Catalog) SetAsideSummary() string {
	var parts []string
	if n := c.PartsSetAside(); n > 0 {
		noun := "parts"
		if n+len(c.Parts) == 1 {
			noun = "part"
		}
		parts = append(parts, fmt.Sprintf("%d of %d %s set aside for problems", n, n+len(c.Parts), noun))
	}
	if n := c.FilesSetAside(); n > 0 {
		s := "files"
		if n == 1 {
			s = "file"
		}
		parts = append(parts, fmt.Sprintf("%d %s not read", n, s))
	}
	if len(parts) == 0 && len(c.SetAside) > 0 {
		parts = append(parts, fmt.Sprintf("%d catalog problems", len(c.SetAside)))
	}
	return strings.Join(parts, ", ")
}

// Problems returns the problems of every set-aside entry, in load order.
func (c *Catalog) Problems() Problems {
	var ps Problems
	for _, s := range c.SetAside {
		ps = append(ps, s.Problems...)
	}
	return ps
}
