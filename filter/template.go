package filter

import (
	"fmt"
	"slices"
	"sort"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// Template is a stage kind: the inputs it takes and how it turns them into
// requirements. A kind lives in one file, filter/stage_<kind>.go: the type
// implementing Template, its waveform-preview circuit when it has one
// (previewer), and an init function that registers it.
type Template interface {
	// Kind is the value of the stage's kind key: "noninverting".
	Kind() string
	// Summary is one line for help and forms.
	Summary() string
	// Params lists the stage keys the kind accepts, in form order. The keys
	// name, kind are implied and not listed.
	Params() []Param
	// Derive computes the stage's circuit quantities and requirements. in
	// reads the stage's values with defaults applied; p has the rails and
	// temperatures already filled in. The StagePlan it returns carries the
	// resolved circuit (Ref, Values, Texts) its previewer builds from.
	Derive(in *StageInput, p *Plan) (StagePlan, error)
}

// registry holds the stage kinds, sorted by kind. Each stage_<kind>.go
// adds its template from an init function (register); it is not written
// after package initialisation.
var registry []Template

// register adds a stage kind to the registry. A second template of the
// same kind is a programming error, caught when the package initialises.
func register(t Template) {
	i, found := slices.BinarySearchFunc(registry, t.Kind(), func(e Template, k string) int {
		return strings.Compare(e.Kind(), k)
	})
	if found {
		panic("filter: stage kind " + t.Kind() + " registered twice")
	}
	registry = slices.Insert(registry, i, t)
}

// TemplateFor returns the template of a stage kind.
func TemplateFor(kind string) (Template, bool) {
	for _, t := range registry {
		if t.Kind() == kind {
			return t, true
		}
	}
	return nil, false
}

// KnownKinds lists the stage kinds that have a template, in alphabetical
// order.
func KnownKinds() []string {
	out := make([]string, len(registry))
	for i, t := range registry {
		out[i] = t.Kind()
	}
	return out
}

// unknownKind explains a kind that has no template.
func unknownKind(kind string) error {
	known := strings.Join(KnownKinds(), ", ")
	if kind == "" {
		return fmt.Errorf("no kind given, want one of %s", known)
	}
	if s := nearest(kind, KnownKinds()); s != "" {
		return fmt.Errorf("unknown kind %q (did you mean %q?), want one of %s", kind, s, known)
	}
	return fmt.Errorf("unknown kind %q, want one of %s", kind, known)
}

// StageInput reads a stage's values with its template's defaults applied.
type StageInput struct {
	Stage    *Stage
	Template Template
	params   map[string]Param
}

// NewStageInput prepares s for reading with the params of t.
func NewStageInput(s *Stage, t Template) *StageInput {
	m := make(map[string]Param)
	for _, p := range t.Params() {
		if p.Kind == Pair {
			q := p
			q.Kind = Quantity
			m[p.Key+".low"], m[p.Key+".high"] = q, q
			continue
		}
		m[p.Key] = p
	}
	return &StageInput{Stage: s, Template: t, params: m}
}

// Has reports whether the stage gives key or the template has a default for it.
func (in *StageInput) Has(key string) bool {
	return in.Stage.Values[key].Set || in.params[key].Default != ""
}

// Given reports whether the stage itself gives key.
func (in *StageInput) Given(key string) bool { return in.Stage.Values[key].Set }

// Num returns the quantity under key, or its default; ok is false when
// neither is there.
func (in *StageInput) Num(key string) (v float64, ok bool) {
	if x := in.Stage.Values[key]; x.Set {
		return x.V, true
	}
	p, found := in.params[key]
	if !found || p.Default == "" {
		return 0, false
	}
	d, err := parseParam(p, p.Default)
	if err != nil {
		return 0, false
	}
	return d.V, true
}

// Text returns a Choice value under key, or its default.
func (in *StageInput) Text(key string) string {
	if x := in.Stage.Values[key]; x.Set {
		return x.Raw
	}
	return in.params[key].Default
}

// Raw returns the text to show for key in formulas: as written, else the default.
func (in *StageInput) Raw(key string) string {
	if x := in.Stage.Values[key]; x.Set {
		return x.Raw
	}
	return in.params[key].Default
}

// Need returns the quantity under key or an error naming the field.
func (in *StageInput) Need(key string) (float64, error) {
	v, ok := in.Num(key)
	if !ok {
		p := in.params[key]
		return 0, fieldErrorf(key, "missing, want %s such as %q", p.Dim, p.Dim.Example())
	}
	return v, nil
}

// nearest returns the candidate closest to s by edit distance when it is
// close enough to be a likely typo, else "".
func nearest(s string, candidates []string) string {
	best, bestD := "", 1<<30
	sorted := append([]string(nil), candidates...)
	sort.Strings(sorted)
	for _, c := range sorted {
		if d := catalog.EditDistance(s, c); d < bestD {
			best, bestD = c, d
		}
	}
	if bestD <= 2 || (bestD <= len(s)/3 && bestD < len(s)) {
		return best
	}
	return ""
}
