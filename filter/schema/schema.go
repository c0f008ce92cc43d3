// Package schema builds JSON Schemas (draft 2020-12) of opsift's two file
// formats, the catalog and the design, for editors: a TOML language
// server given the schema (a `#:schema FILE` comment on the first line)
// validates and completes keys while the user types.
//
// The schemas are built from the decoders' own tables — catalog.PartKeys,
// SubKeys and KeyDim for the catalog, filter.DesignParams and the stage
// templates' Params for the design — and every quantity carries the
// pattern of its units (catalog.Dim.Pattern). A schema checks form: keys,
// types, enums and unit spellings. Ranges, min ≤ typ ≤ max and the other
// rules of `opsift check` stay with the decoders.
package schema

import (
	"bytes"
	"encoding/json"
	"fmt"
	"slices"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// Draft is the JSON Schema dialect of the schemas.
const Draft = "https://json-schema.org/draft/2020-12/schema"

// Names lists the schemas by name, as `opsift schema NAME` takes them.
func Names() []string { return []string{"catalog", "design"} }

// FileName is the name `opsift init` writes a schema under.
func FileName(name string) string { return "opsift-" + name + ".schema.json" }

// ByName returns the schema called name ("catalog" or "design").
func ByName(name string) (map[string]any, error) {
	switch name {
	case "catalog":
		return Catalog(), nil
	case "design":
		return Design(), nil
	}
	return nil, fmt.Errorf("unknown schema %q, want one of %s", name, strings.Join(Names(), ", "))
}

// Marshal renders a schema as indented JSON ending in a newline.
func Marshal(s map[string]any) ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(s); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// obj is a JSON object under construction.
type obj = map[string]any

// quantity is the schema of a quantity string of dimension d.
func quantity(d catalog.Dim, desc string) obj {
	s := obj{"type": "string", "pattern": d.Pattern(), "examples": []string{d.Example()}}
	example := fmt.Sprintf("%s such as %q", d, d.Example())
	if desc == "" {
		s["description"] = example
	} else {
		s["description"] = desc + "; " + example
	}
	return s
}

// enum is the schema of one word out of vals.
func enum(vals []string, desc string) obj {
	return obj{"type": "string", "enum": vals, "description": desc}
}

// closed is an object schema with the given properties and no others.
func closed(props obj, desc string) obj {
	s := obj{"type": "object", "properties": props, "additionalProperties": false}
	if desc != "" {
		s["description"] = desc
	}
	return s
}

// sortedKeys returns the keys of m in order.
func sortedKeys(m obj) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	slices.Sort(ks)
	return ks
}

// Properties returns the property names of an object schema s at the
// dotted path ("" is s itself, "part" the [[part]] items), following
// arrays to their items and $refs into s's $defs; nil when there is no
// object there. Tests compare them with the decoders' keys.
func Properties(s map[string]any, path string) []string {
	cur := s
	if path != "" {
		for _, k := range strings.Split(path, ".") {
			cur = resolve(s, items(cur))
			props, _ := cur["properties"].(obj)
			next, ok := props[k].(obj)
			if !ok {
				return nil
			}
			cur = next
		}
	}
	cur = resolve(s, items(cur))
	props, _ := cur["properties"].(obj)
	return sortedKeys(props)
}

// resolve follows a "#/$defs/NAME" reference of sub into root's $defs.
func resolve(root, sub obj) obj {
	ref, ok := sub["$ref"].(string)
	if !ok {
		return sub
	}
	name, ok := strings.CutPrefix(ref, "#/$defs/")
	if !ok {
		return sub
	}
	defs, _ := root["$defs"].(obj)
	if d, ok := defs[name].(obj); ok {
		return d
	}
	return sub
}

// items returns the item schema of an array schema, s itself otherwise.
func items(s obj) obj {
	if it, ok := s["items"].(obj); ok {
		return it
	}
	return s
}
