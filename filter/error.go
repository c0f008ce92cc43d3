package filter

import (
	"errors"
	"fmt"

	"github.com/opsift/opsift/catalog"
)

// Error is one thing wrong with a design: where it is, which stage and
// field, and what is wrong. It renders as
//
//	probe.toml:14: stage "gain": field "signal.freq": "20 kHz/s" is a slew rate, want a frequency such as "1 MHz"
//
// leaving out whatever is not known. DecodeDesign, Derive and Design.Set
// return their errors as an *Error, so a front end shows Err beside the
// field it names instead of taking the message apart.
type Error struct {
	File  string // the design file; "" when not known
	Line  int    // 1-based line; 0 when not known
	Stage string // the stage's name; "" for design-level fields (see Index)
	Index int    // 1-based number of the [[stage]] when it has no name; else 0
	Field string // the field: the path inside the stage ("signal.freq"), else the dotted key ("supply.pos")
	Err   error  // what is wrong, without the position
}

// Error renders the error on one line, as catalog problems are.
func (e *Error) Error() string {
	subject := ""
	switch {
	case e.Stage != "":
		subject = fmt.Sprintf("stage %q", e.Stage)
	case e.Index > 0:
		subject = fmt.Sprintf("stage %d", e.Index)
	}
	return catalog.Located(catalog.Pos{File: e.File, Line: e.Line}, subject, e.Field, e.Err)
}

// Unwrap returns what is wrong, so errors.As finds a *catalog.UnitError.
func (e *Error) Unwrap() error { return e.Err }

// fieldErrorf is an error about one field of a stage or design; Derive and
// Set add the file, line and stage.
func fieldErrorf(field, format string, a ...any) error {
	return &Error{Field: field, Err: fmt.Errorf(format, a...)}
}

// noted adds a note in brackets to what is wrong, keeping the field.
func noted(err error, note string) error {
	var e *Error
	if errors.As(err, &e) {
		c := *e
		c.Err = fmt.Errorf("%w (%s)", e.Err, note)
		return &c
	}
	return fmt.Errorf("%w (%s)", err, note)
}

// inStage places err, returned by a stage's template or by an edit of it,
// in stage s of design file: on the line of the field it names when that
// was written, else on the stage's header.
func inStage(file string, s *Stage, err error) *Error {
	out := &Error{File: file, Line: s.Line, Stage: s.Name, Err: err}
	var e *Error
	if errors.As(err, &e) {
		out.Field, out.Err = e.Field, e.Err
		if v, ok := s.Values[e.Field]; ok && v.Line > 0 {
			out.Line = v.Line
		}
	}
	return out
}
