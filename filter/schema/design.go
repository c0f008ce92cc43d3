package schema

import (
	"fmt"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// tableDocs describes the design's top-level tables.
var tableDocs = map[string]string{
	"title":       "what the circuit is; shown in every output",
	"supply":      "the rails: pos and neg nominal against 0 V, and their tolerance",
	"environment": "ambient temperature range (default 25 °C … 25 °C)",
	"choose":      "hard filters, all optional",
	"policy":      "worst-case rules, all optional",
	"stage":       "the circuit stages; they share one part type, so n stages need ⌈n / channels⌉ packages",
}

// Design returns the JSON Schema of a design file.
func Design() map[string]any {
	top := obj{"title": obj{"type": "string", "description": tableDocs["title"]}}
	tables := map[string]obj{}
	for _, p := range filter.DesignParams() {
		table, key, _ := strings.Cut(p.Key, ".")
		if tables[table] == nil {
			tables[table] = obj{}
		}
		if table == "environment" && strings.HasPrefix(key, "temp.") {
			if key == "temp.low" {
				q := p
				q.Label, q.Help = "ambient range", "lowest and highest ambient temperature"
				tables[table]["temp"] = pair(q)
			}
			continue
		}
		tables[table][key] = param(p)
	}
	tables["choose"]["limit"] = limits()
	for name, props := range tables {
		t := closed(props, tableDocs[name])
		if name == "supply" {
			t["required"] = []string{"pos"}
		}
		top[name] = t
	}
	top["stage"] = obj{"type": "array", "items": obj{"$ref": "#/$defs/stage"}, "description": tableDocs["stage"]}
	return obj{
		"$schema": Draft,
		"title":   "opsift design file",
		"description": "A circuit for opsift: the rails, the environment, hard filters, worst-case policy " +
			"and the stages whose needs are derived. Values are strings with a unit and an optional SI prefix; " +
			"gains and policy factors are plain numbers.",
		"type":                 "object",
		"properties":           top,
		"required":             []string{"supply", "stage"},
		"additionalProperties": false,
		"$defs":                obj{"stage": stage()},
	}
}

// limits is the schema of [choose.limit]: for any catalog figure, a
// { min, max } bound on its worst-case value.
func limits() obj {
	props := obj{}
	for _, fk := range catalog.FigureKeys() {
		props[fk.Key] = closed(obj{
			"min": quantity(fk.Dim, "the worst-case figure must reach at least this"),
			"max": quantity(fk.Dim, "the worst-case figure must stay at or under this"),
		}, "bounds on "+fk.Key+" at worst case")
	}
	return closed(props, "bounds on any catalog figure, checked at worst case (requirement limit.<figure>)")
}

// stage is the schema of one [[stage]] table: name and kind, then the
// keys of the kind's template.
func stage() obj {
	kinds := filter.KnownKinds()
	var summaries []string
	var branches []any
	for _, k := range kinds {
		t, _ := filter.TemplateFor(k)
		summaries = append(summaries, k+": "+t.Summary())
		// name and kind again, so that additionalProperties inside the
		// branch (which sees only the branch's own properties) leaves them
		// alone: this closes the stage without unevaluatedProperties,
		// which language servers on older drafts ignore.
		props := obj{"name": obj{}, "kind": obj{}}
		for _, p := range t.Params() {
			put(props, strings.Split(p.Key, "."), p)
		}
		branches = append(branches, obj{
			"if":   obj{"properties": obj{"kind": obj{"const": k}}, "required": []string{"kind"}},
			"then": obj{"properties": props, "additionalProperties": false},
		})
	}
	return obj{
		"type": "object",
		"properties": obj{
			"name": obj{"type": "string", "pattern": "^[A-Za-z0-9_-]+$", "description": "the stage's name: letters, digits, _ or -"},
			"kind": enum(kinds, "the stage template: "+strings.Join(summaries, "; ")),
		},
		"required":    []string{"name", "kind"},
		"allOf":       branches,
		"description": "one circuit stage",
	}
}

// put sets the schema of p at the dotted path inside props, making the
// intermediate inline tables (signal = { shape, peak, freq }).
func put(props obj, path []string, p filter.Param) {
	if len(path) == 1 {
		props[path[0]] = param(p)
		return
	}
	sub, ok := props[path[0]].(obj)
	if !ok {
		sub = closed(obj{}, "")
		props[path[0]] = sub
	}
	put(sub["properties"].(obj), path[1:], p)
}

// param is the schema of one design input.
func param(p filter.Param) obj {
	doc := p.Label
	if p.Help != "" {
		doc += ": " + p.Help
	}
	if p.Default != "" {
		doc += fmt.Sprintf(" (default %s)", p.Default)
	}
	switch p.Kind {
	case filter.Choice:
		return enum(p.Choices, doc)
	case filter.List:
		item := obj{"type": "string"}
		if p.Choices != nil {
			item["enum"] = p.Choices
		}
		return obj{"type": "array", "items": item, "description": doc}
	case filter.Pair:
		return pair(p)
	}
	q := quantity(p.Dim, doc)
	if p.Dim == catalog.Dimensionless || p.Dim == catalog.Ratio {
		// A plain number may be written bare (gain = 11, derate_typ = 0.7).
		return obj{"anyOf": []any{obj{"type": "number"}, obj{"type": "string", "pattern": q["pattern"]}},
			"description": q["description"], "examples": q["examples"]}
	}
	return q
}

// pair is the schema of [low, high] quantities.
func pair(p filter.Param) obj {
	q := p
	q.Kind, q.Default = filter.Quantity, ""
	item := param(q)
	delete(item, "description")
	doc := p.Label
	if p.Help != "" {
		doc += ": " + p.Help
	}
	return obj{"type": "array", "items": item, "minItems": 2, "maxItems": 2,
		"description": fmt.Sprintf("%s; two values [low, high] such as [%q, %q]", doc, p.Dim.Example(), p.Dim.Example())}
}
