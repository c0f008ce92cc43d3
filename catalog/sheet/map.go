package sheet

import (
	"fmt"
	"slices"
	"strings"
	"unicode"

	"github.com/BurntSushi/toml"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
)

// Map is a map file: how the columns of a sheet map to catalog keys, and
// the sheet's dialect when sniffing would guess wrong.
//
//	separator = ";"                      # , ; or "\t"; default: the header row's
//	decimal = ","                        # default "," with ";", else "."
//	[columns]
//	"Part number" = "id"
//	"GBW" = { key = "gbw.typ", unit = "MHz" }
//	"Internal code" = "-"                # not imported, not listed as unmapped
type Map struct {
	Separator rune
	Decimal   rune
	// Columns maps a header (matched without case, with or without its
	// unit in brackets) to its target.
	Columns map[string]Target
}

// mapFile is the TOML form of a map file.
type mapFile struct {
	Separator string         `toml:"separator"`
	Decimal   string         `toml:"decimal"`
	Columns   map[string]any `toml:"columns"`
}

// ReadMap decodes a map file named file.
func ReadMap(file string, data []byte) (*Map, error) {
	if err := catalog.Prescan(string(data)); err != nil {
		return nil, fmt.Errorf("%s: %w", safe.Text(file), err)
	}
	var mf mapFile
	md, err := toml.Decode(string(data), &mf)
	if err != nil {
		return nil, fmt.Errorf("%s: not valid TOML: %w", safe.Text(file), err)
	}
	for _, k := range md.Undecoded() {
		if len(k) > 0 && k[0] != "columns" {
			return nil, fmt.Errorf("%s: unknown key %q, want separator, decimal or [columns]", safe.Text(file), k.String())
		}
	}
	m := &Map{Columns: map[string]Target{}}
	switch mf.Separator {
	case "":
	case ",", ";", "\t":
		m.Separator = rune(mf.Separator[0])
	default:
		return nil, fmt.Errorf("%s: separator %q, want \",\", \";\" or \"\\t\"", safe.Text(file), mf.Separator)
	}
	switch mf.Decimal {
	case "":
	case ".", ",":
		m.Decimal = rune(mf.Decimal[0])
	default:
		return nil, fmt.Errorf("%s: decimal %q, want \".\" or \",\"", safe.Text(file), mf.Decimal)
	}
	for header, v := range mf.Columns {
		var key, unit string
		switch v := v.(type) {
		case string:
			key = v
		case map[string]any:
			key, _ = v["key"].(string)
			unit, _ = v["unit"].(string)
			for k := range v {
				if k != "key" && k != "unit" {
					return nil, fmt.Errorf("%s: columns.%q: unknown key %q, want key and unit", safe.Text(file), header, k)
				}
			}
		default:
			return nil, fmt.Errorf("%s: columns.%q: want a key such as \"gbw.typ\" or a table { key, unit }", safe.Text(file), header)
		}
		t := Target{Key: ignore}
		if key != ignore {
			var ok bool
			if t, ok = resolve(normalise(key)); !ok {
				return nil, fmt.Errorf("%s: columns.%q: %q is not a catalog key such as \"gbw.typ\", \"supply.min\" or \"name\" (or \"-\" to skip the column)",
					safe.Text(file), header, key)
			}
		}
		if unit != "" {
			if !isQuantity(t) {
				return nil, fmt.Errorf("%s: columns.%q: %s takes no unit", safe.Text(file), header, t)
			}
			t.Unit = unit
		}
		m.Columns[strings.ToLower(strings.TrimSpace(header))] = t
	}
	return m, nil
}

// target maps a header to a catalog key: by the map file first (the
// header as written, then without its unit), else by the header's own
// name and unit. An ignored column has Key "-" and ok false.
func (m *Map) target(header string) (Target, bool) {
	name, unit := splitHeader(header)
	for _, h := range []string{strings.ToLower(header), strings.ToLower(name)} {
		if t, ok := m.Columns[h]; ok {
			if t.Key == ignore {
				return t, false
			}
			if t.Unit == "" && isQuantity(t) {
				t.Unit = unit
			}
			return t, true
		}
	}
	t, ok := resolve(normalise(name))
	if ok && isQuantity(t) {
		t.Unit = unit
	}
	return t, ok
}

// splitHeader splits "GBW (MHz)" or "GBW [MHz]" into "GBW" and "MHz".
func splitHeader(h string) (name, unit string) {
	h = strings.TrimSpace(h)
	for _, br := range [][2]string{{"(", ")"}, {"[", "]"}} {
		if strings.HasSuffix(h, br[1]) {
			if i := strings.LastIndex(h, br[0]); i > 0 {
				return strings.TrimSpace(h[:i]), strings.TrimSpace(h[i+1 : len(h)-1])
			}
		}
	}
	return h, ""
}

// stripUnit is a header without its unit.
func stripUnit(h string) string {
	name, _ := splitHeader(h)
	return name
}

// normalise lower-cases a name and turns every run of other characters
// than letters and digits into one "_": "Ib max" → "ib_max", "gbw.typ" →
// "gbw_typ", "Min OT" → "min_ot".
func normalise(s string) string {
	var b strings.Builder
	gap := false
	for _, c := range strings.ToLower(s) {
		if unicode.IsLetter(c) || unicode.IsDigit(c) {
			if gap && b.Len() > 0 {
				b.WriteByte('_')
			}
			b.WriteRune(c)
			gap = false
			continue
		}
		gap = true
	}
	return b.String()
}

// aliases are header words of our own choosing for catalog keys.
var aliases = map[string]string{
	"part": "id", "part_id": "id", "part_number": "id", "description": "name", "technology": "tech",
	"slew_rate": "slew", "gain_bandwidth": "gbw", "status": "lifecycle", "price": "unit_cost",
	"cost": "unit_cost", "package": "packages", "channel": "channels", "pins": "pinout", "link": "datasheet",
	"note": "notes", "offset": "vos", "bias": "ib", "quiescent": "iq", "noise": "en",
}

// resolve maps a normalised name ("gbw", "ib_max", "supply_min",
// "temp_low", "gbw_min_ot") to its target.
func resolve(n string) (Target, bool) {
	keys := catalog.PartKeys()
	if a, ok := aliases[n]; ok {
		n = a
	}
	if slices.Contains(keys, n) {
		switch {
		case catalog.IsFigure(n):
			return Target{Key: n, Sub: "typ"}, true // a figure column without a limit: the typical value
		case catalog.SubKeys(n) != nil || n == "temp":
			return Target{}, false // supply, input_cm, output, temp need their end named
		}
		return Target{Key: n}, true
	}
	for _, sub := range []string{"min_ot", "max_ot", "typ", "min", "max", "low", "high", "load", "source"} {
		key, ok := strings.CutSuffix(n, "_"+sub)
		if !ok {
			continue
		}
		if a, ok := aliases[key]; ok {
			key = a
		}
		if key == "temp" {
			switch sub {
			case "low", "min":
				return Target{Key: "temp", Sub: "low"}, true
			case "high", "max":
				return Target{Key: "temp", Sub: "high"}, true
			}
		}
		if slices.Contains(catalog.SubKeys(key), sub) {
			return Target{Key: key, Sub: sub}, true
		}
	}
	return Target{}, false
}
