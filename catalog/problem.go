package catalog

import (
	"cmp"
	"fmt"
	"slices"
	"strings"

	"github.com/opsift/opsift/catalog/safe"
)

// Problem is one thing wrong with a catalog: where it is, which part and
// field, and what is wrong. It renders as
//
//	FILE:LINE: part "ID": field "slew": typ = "1 MHz" is a frequency, want a slew rate such as "0.5 V/us"
//
// leaving out whatever is not known.
type Problem struct {
	Pos  Pos
	Part string // the part's id; "" when the part has none (see Index)
	// Index is the 1-based number of the [[part]] table in its file; 0 when
	// not about one part, -1 for the UnlistedError that ends a long list.
	Index int
	Field string // top-level key of the part, e.g. "slew"; "" for the part or file as a whole
	Err   error
}

// Error renders the problem on one line.
func (p Problem) Error() string {
	subject := ""
	switch {
	case p.Part != "":
		subject = fmt.Sprintf("part %q", p.Part)
	case p.Index > 0:
		subject = fmt.Sprintf("part #%d", p.Index)
	}
	return Located(p.Pos, subject, p.Field, p.Err)
}

// Located renders an error at a place as opsift writes every input error:
//
//	FILE:LINE: SUBJECT: field "FIELD": what is wrong
//
// leaving out what is empty (a nil err reads "invalid"). Catalog problems
// and design errors (subject `stage "gain"`) both render through it.
func Located(pos Pos, subject, field string, err error) string {
	var b strings.Builder
	if pos.File != "" {
		b.WriteString(safe.Text(pos.File))
		if pos.Line > 0 {
			fmt.Fprintf(&b, ":%d", pos.Line)
		}
		b.WriteString(": ")
	}
	if subject != "" {
		b.WriteString(subject + ": ")
	}
	if field != "" {
		fmt.Fprintf(&b, "field %q: ", field)
	}
	if err != nil {
		b.WriteString(err.Error())
	} else {
		b.WriteString("invalid")
	}
	return b.String()
}

// Unwrap returns the underlying error, so errors.As finds a *UnitError.
func (p Problem) Unwrap() error { return p.Err }

// Problems is every problem found in one or more catalog files, in file
// and line order. A non-empty Problems is an error; Load and Decode never
// return an empty one as an error.
type Problems []Problem

// Error renders one problem per line.
func (ps Problems) Error() string {
	lines := make([]string, len(ps))
	for i, p := range ps {
		lines[i] = p.Error()
	}
	return strings.Join(lines, "\n")
}

// Unwrap returns the problems as errors, so errors.As and errors.Is look
// into each of them.
func (ps Problems) Unwrap() []error {
	errs := make([]error, len(ps))
	for i, p := range ps {
		errs[i] = p
	}
	return errs
}

// summaryIndex marks the problem that counts those left unlisted; it
// sorts last.
const summaryIndex = -1

// sortProblems orders the problems of one file by line and part number,
// keeping the order they were found in otherwise.
func sortProblems(ps Problems) {
	last := func(p Problem) int {
		if p.Index == summaryIndex {
			return 1
		}
		return 0
	}
	slices.SortStableFunc(ps, func(a, b Problem) int {
		return cmp.Or(
			cmp.Compare(last(a), last(b)),
			cmp.Compare(a.Pos.Line, b.Pos.Line),
			cmp.Compare(a.Index, b.Index),
		)
	})
}

// AsError returns ps as an error, or nil when it is empty.
func (ps Problems) AsError() error {
	if len(ps) == 0 {
		return nil
	}
	return ps
}
