package filter

import (
	"strings"
	"unicode"

	"github.com/opsift/opsift/catalog"
)

// Value is one input of a design as the user wrote it and as opsift reads
// it. Raw keeps the text (so an editor can show and change it in place);
// V is the parsed value in SI units for quantities. Set is false when the
// design does not give the input; a template default then applies.
type Value struct {
	Raw  string  // as written: "20 kHz", "sine", "soic8, msop8"; "" when not given
	V    float64 // SI value of a quantity (unused for choices and lists)
	Set  bool    // the design gives this input
	Line int     // line in the design file, 0 when unknown or edited
}

// List splits a list value into its items, at commas and spaces alike:
// "soic8, msop8" and "soic8 msop8" are the same two items (no package,
// technology or lifecycle name holds a space).
func (v Value) List() []string {
	if !v.Set {
		return nil
	}
	return strings.FieldsFunc(v.Raw, func(r rune) bool { return r == ',' || unicode.IsSpace(r) })
}

// ParamKind says how a parameter is written and parsed.
type ParamKind int

// The kinds of parameter a design or a stage template may take.
const (
	Quantity ParamKind = iota // a number with a unit of the param's Dim
	Choice                    // one word out of Choices
	List                      // a list of words (TOML array; "a, b" when edited)
	Pair                      // two quantities [low, high]; edited as path.low / path.high
)

// Param describes one input a template (or the design itself) accepts.
type Param struct {
	Key     string      // TOML key inside the stage: "gain", "signal.freq", "input"
	Label   string      // short label for forms: "signal frequency"
	Kind    ParamKind   // how it is written
	Dim     catalog.Dim // for Quantity and Pair
	Choices []string    // for Choice (and allowed items of List when non-nil)
	Default string      // raw text used when the design leaves it out; "" = none
	// Required is true when the stage cannot be derived without it.
	Required bool
	Help     string // one line for the user
}

// Field is one editable input of a design, in the order a form shows them.
// Path names it for (*Design).Set: "supply.pos", "environment.temp.low",
// "choose.packages", "stage.gain.signal.freq", "stage.gain.input.high".
type Field struct {
	Path    string
	Label   string
	Kind    ParamKind // Quantity, Choice or List (a Pair shows as two Quantity fields)
	Dim     catalog.Dim
	Choices []string
	Raw     string // current text; "" when not given
	Set     bool
	Default string // what applies when not given, "" none
	Help    string
}
