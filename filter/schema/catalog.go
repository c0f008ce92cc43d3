package schema

import (
	"fmt"

	"github.com/opsift/opsift/catalog"
)

// catalogDocs describes each part key, from the README's catalog
// reference. Every key of catalog.PartKeys needs one: Catalog panics
// without it, and the tests fail.
var catalogDocs = map[string]string{
	"id":        "unique, stable identifier: lower case a-z, 0-9, '.', '_', '-' (required)",
	"name":      "description (required)",
	"tech":      "input technology (required); cmos and jfet are FET inputs",
	"channels":  "op-amps per package (required)",
	"packages":  "packages the part comes in (required)",
	"pinout":    "pin-compatibility family: equal value = drop-in footprint",
	"lifecycle": "production status (default active); nrnd = not recommended for new designs",
	"unit_cost": "plain number, in the catalog's currency",
	"temp":      "rated ambient range [low, high]",
	"supply":    "total supply span V+ − V− the part is rated for (required)",
	"input_cm":  "common-mode input range: V− + low … V+ + high",
	"output":    "output swing: V− + low … V+ + high at the stated load",
	"gbw":       "gain-bandwidth product (required)",
	"slew":      "slew rate (required)",
	"aol":       "open-loop gain, in dB or as a ratio (\"200 V/mV\")",
	"vos":       "input offset voltage, a magnitude",
	"vos_drift": "offset voltage drift, a magnitude",
	"ib":        "input bias current, a magnitude",
	"ios":       "input offset current, a magnitude",
	"en":        "voltage noise density, flat band",
	"in":        "current noise density, flat band",
	"iq":        "quiescent current per channel",
	"iout":      "output (short-circuit) current",
	"vdiff_max": "largest allowed differential input voltage",
	"cload":     "largest capacitive load the part is stable with",
	"cin":       "input capacitance (common-mode + differential; used by the transimpedance stage)",
	"en_corner": "optional 1/f corner of en: the density² rises as (1 + corner/f) below it",
	"in_corner": "optional 1/f corner of in: the density² rises as (1 + corner/f) below it",
	"datasheet": "where the figures came from (a link or a document name)",
	"notes":     "free text",
}

// subDocs describes the keys inside the table-valued part keys.
var subDocs = map[string]string{
	"typ":    "typical value at 25 °C",
	"min":    "guaranteed minimum at 25 °C",
	"max":    "guaranteed maximum at 25 °C",
	"min_ot": "guaranteed minimum over the rated temperature range",
	"max_ot": "guaranteed maximum over the rated temperature range",
	"source": "where the figure came from: table (default), graph (read off a typical-performance curve) or estimate",
	"low":    "offset from V− (input_cm: may be negative, beyond the rail; output: ≥ 0)",
	"high":   "offset from V+ (usually ≤ 0; positive when the range goes beyond the rail)",
	"load":   "the load resistance the swing is given at",
}

// spanDocs describes supply's min and max, which differ from a figure's.
var spanDocs = map[string]string{
	"min": "smallest total supply span",
	"max": "largest total supply span",
}

// requiredPartKeys are the keys validation insists on (catalog's
// identity and figure checks); the tests check each one is.
var requiredPartKeys = []string{"id", "name", "tech", "channels", "packages", "supply", "gbw", "slew"}

// Catalog returns the JSON Schema of a catalog file: [[part]] tables.
func Catalog() map[string]any {
	props := obj{}
	for _, k := range catalog.PartKeys() {
		props[k] = partKey(k)
	}
	part := closed(props, "one op-amp parameter set")
	part["required"] = requiredPartKeys
	return obj{
		"$schema": Draft,
		"title":   "opsift catalog file",
		"description": "Op-amp parameter sets for opsift, one [[part]] table each. Values are strings with a " +
			"unit and an optional SI prefix (p n u µ m k M G; m is milli, M mega); a bare number where a unit " +
			"belongs is an error. `opsift check` checks what a schema cannot: ranges, min ≤ typ ≤ max, ids " +
			"unique per source.",
		"type":                 "object",
		"properties":           obj{"part": obj{"type": "array", "items": obj{"$ref": "#/$defs/part"}, "description": "the parts, one [[part]] table each"}},
		"additionalProperties": false,
		"$defs":                obj{"part": part},
	}
}

// partKey is the schema of one part key.
func partKey(k string) obj {
	doc, ok := catalogDocs[k]
	if !ok {
		panic(fmt.Sprintf("schema: catalog key %q has no description", k))
	}
	switch k {
	case "id":
		return obj{"type": "string", "pattern": catalog.IDPattern, "description": doc}
	case "name", "pinout", "datasheet", "notes":
		return obj{"type": "string", "description": doc}
	case "tech":
		return enum(catalog.Techs(), doc)
	case "lifecycle":
		return enum(catalog.Lifecycles(), doc)
	case "channels":
		return obj{"type": "integer", "minimum": 1, "description": doc}
	case "unit_cost":
		return obj{"type": "number", "minimum": 0, "description": doc}
	case "packages":
		return obj{"type": "array", "items": obj{"type": "string"}, "description": doc}
	case "temp":
		return obj{"type": "array", "items": quantity(catalog.Celsius, ""), "minItems": 2, "maxItems": 2,
			"description": doc + `, such as ["-40 C", "85 C"]`}
	}
	dim, ok := catalog.KeyDim(k)
	if !ok {
		panic(fmt.Sprintf("schema: catalog key %q has no form", k))
	}
	subs := catalog.SubKeys(k)
	if subs == nil {
		return quantity(dim, doc)
	}
	props := obj{}
	for _, sub := range subs {
		d := subDocs[sub]
		if k == "supply" {
			d = spanDocs[sub]
		}
		switch {
		case sub == "source":
			props[sub] = enum(catalog.Sources(), d)
		case k == "output" && sub == "load":
			props[sub] = quantity(catalog.OutputLoadDim, d)
		default:
			props[sub] = quantity(dim, d)
		}
	}
	if catalog.IsFigure(k) {
		doc += "; a figure: any of typ, min, max, min_ot, max_ot and source"
	}
	return closed(props, doc)
}

// KeyDoc returns the description the catalog schema gives a part key
// (sub "") or a sub-key of a table-valued key ("gbw", "typ"), "" for a
// key it does not know. The selector's entry form shows it beside a field.
func KeyDoc(key, sub string) string {
	if sub == "" {
		return catalogDocs[key]
	}
	if key == "supply" {
		return spanDocs[sub]
	}
	if key == "temp" {
		switch sub {
		case "low":
			return "low end of the rated ambient range"
		case "high":
			return "high end of the rated ambient range"
		}
	}
	return subDocs[sub]
}
