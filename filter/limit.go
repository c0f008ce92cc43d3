package filter

import (
	"fmt"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// LimitPrefix starts the requirement key of a figure bound: a design's
// [choose.limit] vos = { max = "6 mV" } is checked as "limit.vos"
// (DESIGN.md "Contract additions").
const LimitPrefix = "limit."

// LimitKey is the requirement key of a bound on a catalog figure.
func LimitKey(figure string) Key { return Key(LimitPrefix + figure) }

// Limit is one entry of a design's [choose.limit] table: a floor and/or a
// ceiling on a catalog figure, checked at worst case like every other
// requirement (FigureFor).
type Limit struct {
	Min Value // the worst-case figure must reach at least this
	Max Value // the worst-case figure must stay at or under this
}

// limitFigure returns the figure key named key ("vos", "cload", …).
func limitFigure(key string) (catalog.FigureKey, bool) {
	for _, fk := range catalog.FigureKeys() {
		if fk.Key == key {
			return fk, true
		}
	}
	return catalog.FigureKey{}, false
}

// limitKeys lists the figure keys a limit may bound.
func limitKeys() []string {
	var out []string
	for _, fk := range catalog.FigureKeys() {
		out = append(out, fk.Key)
	}
	return out
}

// unknownFigure is the error for a limit on a key that is no figure.
func unknownFigure(key string) error {
	if s := nearest(key, limitKeys()); s != "" {
		return fmt.Errorf("unknown figure %q (did you mean %q?)", key, s)
	}
	return fmt.Errorf("unknown figure %q, want one of %s", key, strings.Join(limitKeys(), ", "))
}

// Text is the limit as the design pane edits it: "max 6 mV",
// "min 1 MHz, max 10 MHz"; "" when neither side is set.
func (l Limit) Text() string {
	var parts []string
	if l.Min.Set {
		parts = append(parts, "min "+l.Min.Raw)
	}
	if l.Max.Set {
		parts = append(parts, "max "+l.Max.Raw)
	}
	return strings.Join(parts, ", ")
}

// parseLimit reads the design pane's text of a limit on a figure of
// dimension dim: "max 6 mV", "min 1 MHz", both joined by a comma, with
// "≤"/"<=" and "≥"/">=" accepted for max and min. Empty text is no limit.
func parseLimit(raw string, dim catalog.Dim) (Limit, error) {
	var l Limit
	raw = strings.TrimSpace(raw)
	if raw == "" {
		return l, nil
	}
	for _, part := range strings.Split(raw, ",") {
		part = strings.TrimSpace(part)
		side, text := (*Value)(nil), ""
		for _, op := range []struct {
			word string
			max  bool
		}{{"max", true}, {"≤", true}, {"<=", true}, {"min", false}, {"≥", false}, {">=", false}} {
			if rest, ok := strings.CutPrefix(part, op.word); ok {
				side, text = &l.Min, strings.TrimSpace(rest)
				if op.max {
					side = &l.Max
				}
				break
			}
		}
		if side == nil {
			return Limit{}, fmt.Errorf("%q: want \"max %s\", \"min %s\" or both, joined by a comma", part, dim.Example(), dim.Example())
		}
		if side.Set {
			return Limit{}, fmt.Errorf("%q gives the same side twice", raw)
		}
		v, err := catalog.Parse(text, dim)
		if err != nil {
			return Limit{}, err
		}
		*side = Value{Raw: text, V: v, Set: true}
	}
	return l, nil
}

// setLimit sets the limit on figure key from the design pane's text; empty
// text removes it.
func (d *Design) setLimit(key, raw string) error {
	path := "choose.limit." + key
	fk, ok := limitFigure(key)
	if !ok {
		return &Error{Field: path, Err: unknownFigure(key)}
	}
	l, err := parseLimit(raw, fk.Dim)
	if err != nil {
		return &Error{Field: path, Err: err}
	}
	if !l.Min.Set && !l.Max.Set {
		delete(d.Choose.Limits, key)
		return nil
	}
	if d.Choose.Limits == nil {
		d.Choose.Limits = map[string]Limit{}
	}
	d.Choose.Limits[key] = l
	return nil
}

// limitFields are the design pane's rows for [choose.limit]: one per
// catalog figure, in catalog order.
func (d *Design) limitFields() []Field {
	var out []Field
	for _, fk := range catalog.FigureKeys() {
		l := d.Choose.Limits[fk.Key]
		text := l.Text()
		out = append(out, Field{Path: "choose.limit." + fk.Key, Label: "limit " + fk.Key, Kind: Quantity, Dim: fk.Dim,
			Raw: text, Set: text != "",
			Help: fmt.Sprintf("bound on the worst-case %s: \"max %s\", \"min %s\" or both, joined by a comma; empty = none",
				fk.Key, fk.Dim.Example(), fk.Dim.Example())})
	}
	return out
}

// limit reads one entry of [choose.limit]: key = { min = "…", max = "…" }.
func (dec *designDecoder) limit(d *Design, key string, v any) {
	path := "choose.limit." + key
	fk, ok := limitFigure(key)
	if !ok {
		dec.unknown("", path, key, limitKeys())
		return
	}
	example := fmt.Sprintf("{ max = %q }", fk.Dim.Example())
	tbl, ok := v.(map[string]any)
	if !ok || len(tbl) == 0 {
		dec.fail(path, "", path, "want a table with min and/or max such as %s", example)
		return
	}
	var l Limit
	p := Param{Key: path, Kind: Quantity, Dim: fk.Dim}
	for _, side := range sortedKeys(tbl) {
		var dst *Value
		switch side {
		case "min":
			dst = &l.Min
		case "max":
			dst = &l.Max
		default:
			dec.unknown("", path+"."+side, side, []string{"min", "max"})
			continue
		}
		if val, ok := dec.value(path+"."+side, "", p, tbl[side]); ok {
			*dst = val
		}
	}
	if d.Choose.Limits == nil {
		d.Choose.Limits = map[string]Limit{}
	}
	d.Choose.Limits[key] = l
}

// limits reads the [choose.limit] table.
func (dec *designDecoder) limits(d *Design, v any) {
	tbl, ok := v.(map[string]any)
	if !ok {
		dec.fail("choose.limit", "", "", "\"choose.limit\" must be a table [choose.limit]")
		return
	}
	for _, key := range sortedKeys(tbl) {
		dec.limit(d, key, tbl[key])
	}
}

// encodeLimits writes the [choose.limit] table, figures in catalog order.
func encodeLimits(d *Design) string {
	var lines []string
	for _, fk := range catalog.FigureKeys() {
		l, ok := d.Choose.Limits[fk.Key]
		if !ok {
			continue
		}
		lines = append(lines, fk.Key+" = "+limitTOML(l))
	}
	if len(lines) == 0 {
		return ""
	}
	return "\n[choose.limit]\n" + strings.Join(lines, "\n") + "\n"
}

// limitTOML is the inline table a limit is written as:
// { min = "1 MHz", max = "6 MHz" }.
func limitTOML(l Limit) string {
	var sides []string
	if l.Min.Set {
		sides = append(sides, "min = "+quoteTOML(l.Min.Raw))
	}
	if l.Max.Set {
		sides = append(sides, "max = "+quoteTOML(l.Max.Raw))
	}
	return "{ " + strings.Join(sides, ", ") + " }"
}

// deriveLimits turns [choose.limit] into design-level requirements keyed
// limit.<figure>, in catalog order: a floor is BoundMin, a ceiling
// BoundMax, each checked against FigureFor at the plan's worst case.
func (p *Plan) deriveLimits(d *Design) error {
	for _, fk := range catalog.FigureKeys() {
		l, ok := d.Choose.Limits[fk.Key]
		if !ok {
			continue
		}
		field := "choose.limit." + fk.Key
		for _, v := range []Value{l.Min, l.Max} {
			if v.Set && v.V < 0 {
				return d.errAt(v.Line, field, "%q is negative, want a figure ≥ 0 as the catalog writes it", v.Raw)
			}
		}
		if l.Min.Set && l.Max.Set && l.Min.V > l.Max.V {
			return d.errAt(l.Min.Line, field, "min %q is above max %q", l.Min.Raw, l.Max.Raw)
		}
		over := fmt.Sprintf("at worst case over %s … %s", catalog.Format(p.TempLow, catalog.Celsius), catalog.Format(p.TempHigh, catalog.Celsius))
		for _, side := range []struct {
			v     Value
			bound Bound
			op    string
		}{{l.Min, BoundMin, "≥"}, {l.Max, BoundMax, "≤"}} {
			if !side.v.Set {
				continue
			}
			key, bound := fk.Key, side.bound
			p.Global = append(p.Global, Requirement{Key: LimitKey(key), Bound: bound, Value: side.v.V,
				Dim: fk.Dim, Unit: fk.Dim.Unit(),
				Why: fmt.Sprintf("[choose.limit] %s %s %s, %s", key, side.op, catalog.Format(side.v.V, fk.Dim), over),
				Measure: func(part *catalog.Part, f *PartFigures) Figure {
					fig, _ := FigureFor(part, f, p, key, bound)
					return fig
				}})
		}
	}
	return nil
}
