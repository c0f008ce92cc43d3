// Package listing lays the catalog out as a table of parts × figures: every
// part with the columns a user picks from every catalog figure (and the
// part's stated ranges, cost and words), each value at a design's worst
// case (filter.FigureFor on the figure's worst side) or as the catalog's
// typical, with its basis, and the part's verdict when a design was
// evaluated. `opsift list` and the selector's explorer share it; the
// writers are in filter/report (WriteList).
//
//	plan + []filter.Result (or bare parts) + []Column ─► Build ─► []Row ─► Sort
package listing

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
)

// Column is one column a listing can show.
type Column struct {
	Key   string      // what --columns and --sort name: "gbw", "supply.min", "tech"
	Head  string      // table header: "GBW", "SUPPLY MIN"
	Label string      // a few words for help and pickers
	Dim   catalog.Dim // of a number column
	Text  bool        // a word column (tech, lifecycle, packages, pinout)
	// Plain marks a number that is no datasheet figure (cost, channels,
	// the margin): it has no basis.
	Plain bool
	value func(r *Row, typical bool) Cell
}

// Cell is one value of a row. A number column's value is V (SI, NaN when
// the catalog lacks it), a word column's Text; Basis says what a figure
// rests on (BasisNone for what is not a datasheet figure: cost, channels,
// words, the margin).
type Cell struct {
	V     float64
	Text  string
	Basis filter.Basis
}

// Known reports whether the cell holds a value.
func (c Cell) Known() bool { return c.Text != "" || !math.IsNaN(c.V) }

// Row is one part of a listing: the part, its evaluation against the
// design (nil without one) and its cells in column order.
type Row struct {
	Part   *catalog.Part
	Result *filter.Result
	Cells  []Cell
	plan   *filter.Plan
	figs   filter.PartFigures
}

// Pass reports the row's verdict: known is false without a design.
func (r *Row) Pass() (pass, known bool) {
	if r.Result == nil {
		return false, false
	}
	return r.Result.Pass, true
}

func number(v float64, b filter.Basis) Cell { return Cell{V: v, Basis: b} }

func unknown() Cell { return Cell{V: math.NaN()} }

func optCell(o catalog.Opt, b filter.Basis) Cell {
	if !o.Known() {
		return unknown()
	}
	return number(o.V(), b)
}

func figCell(f filter.Figure) Cell {
	if !f.Known {
		return unknown()
	}
	return number(f.V, f.Basis)
}

// figureColumn is the column of a catalog figure key.
func figureColumn(fk catalog.FigureKey, head, label string) Column {
	key := fk.Key
	return Column{Key: key, Head: head, Label: label, Dim: fk.Dim, value: func(r *Row, typical bool) Cell {
		var f filter.Figure
		if typical {
			f, _ = filter.TypicalFor(r.Part, key)
		} else {
			f, _ = filter.FigureFor(r.Part, &r.figs, r.plan, key, filter.WorstBound(key))
		}
		return figCell(f)
	}}
}

// figureWords are the headers and labels of the catalog's figure keys.
var figureWords = map[string][2]string{
	"gbw":       {"GBW", "gain-bandwidth product"},
	"slew":      {"SLEW", "slew rate"},
	"aol":       {"AOL", "open-loop gain"},
	"vos":       {"VOS", "input offset voltage"},
	"vos_drift": {"VOS DRIFT", "offset drift"},
	"ib":        {"IB", "input bias current"},
	"ios":       {"IOS", "input offset current"},
	"en":        {"EN", "voltage noise density"},
	"in":        {"IN", "current noise density"},
	"iq":        {"IQ PER CH", "quiescent current per channel"},
	"iout":      {"IOUT", "output current"},
	"vdiff_max": {"VDIFF MAX", "largest differential input"},
	"cload":     {"CLOAD", "largest stable capacitive load"},
	"cin":       {"CIN", "input capacitance"},
	"en_corner": {"EN CORNER", "1/f corner of en"},
	"in_corner": {"IN CORNER", "1/f corner of in"},
}

// Columns lists every column a listing can show: the catalog's figures in
// catalog order, then the stated ranges, cost, channels and words, then
// the two that depend on the design (supply_current, margin).
func Columns() []Column {
	var out []Column
	for _, fk := range catalog.FigureKeys() {
		w, ok := figureWords[fk.Key]
		if !ok {
			w = [2]string{strings.ToUpper(strings.ReplaceAll(fk.Key, "_", " ")), fk.Key}
		}
		out = append(out, figureColumn(fk, w[0], w[1]))
	}
	g := filter.BasisGuaranteed
	stated := func(key, head, label string, d catalog.Dim, get func(r *Row) Cell) Column {
		return Column{Key: key, Head: head, Label: label, Dim: d, value: func(r *Row, _ bool) Cell { return get(r) }}
	}
	word := func(key, head, label string, get func(p *catalog.Part) string) Column {
		return Column{Key: key, Head: head, Label: label, Text: true, value: func(r *Row, _ bool) Cell {
			return Cell{V: math.NaN(), Text: get(r.Part)}
		}}
	}
	out = append(out,
		stated("supply.min", "SUPPLY MIN", "lowest rated supply span", catalog.Volt, func(r *Row) Cell { return optCell(r.Part.Supply.Min, g) }),
		stated("supply.max", "SUPPLY MAX", "highest rated supply span", catalog.Volt, func(r *Row) Cell { return optCell(r.Part.Supply.Max, g) }),
		stated("input_cm.low", "CM LOW", "common-mode range from V−", catalog.Volt, func(r *Row) Cell { return optCell(r.Part.InputCM.Low, r.figs.Input.Basis) }),
		stated("input_cm.high", "CM HIGH", "common-mode range from V+", catalog.Volt, func(r *Row) Cell { return optCell(r.Part.InputCM.High, r.figs.Input.Basis) }),
		stated("output.low", "SWING LOW", "output swing from V−", catalog.Volt, func(r *Row) Cell { return optCell(r.Part.Output.Low, r.figs.Output.Basis) }),
		stated("output.high", "SWING HIGH", "output swing from V+", catalog.Volt, func(r *Row) Cell { return optCell(r.Part.Output.High, r.figs.Output.Basis) }),
		stated("output.load", "SWING LOAD", "load the swing is stated at", catalog.Ohm, func(r *Row) Cell { return optCell(r.Part.Output.Load, g) }),
		stated("temp.low", "TEMP LOW", "rated ambient, low end", catalog.Celsius, func(r *Row) Cell { return optCell(r.Part.Temp[0], g) }),
		stated("temp.high", "TEMP HIGH", "rated ambient, high end", catalog.Celsius, func(r *Row) Cell { return optCell(r.Part.Temp[1], g) }),
		plain(stated("unit_cost", "UNIT COST", "cost of one package", catalog.Dimensionless, func(r *Row) Cell { return optCell(r.Part.UnitCost, filter.BasisNone) })),
		plain(stated("channels", "CHANNELS", "op-amps per package", catalog.Dimensionless, func(r *Row) Cell {
			return number(float64(r.Part.Channels), filter.BasisNone)
		})),
		word("tech", "TECH", "input technology", func(p *catalog.Part) string { return string(p.Tech) }),
		word("lifecycle", "LIFECYCLE", "production status", func(p *catalog.Part) string { return string(p.Lifecycle) }),
		word("packages", "PACKAGES", "packages it comes in", func(p *catalog.Part) string { return strings.Join(p.Packages, " ") }),
		word("pinout", "PINOUT", "pin-compatibility family", func(p *catalog.Part) string { return p.Pinout }),
		Column{Key: "supply_current", Head: "SUPPLY CURRENT", Label: "all channels of the packages the design needs (one package without a design)",
			Dim: catalog.Ampere, value: supplyCurrent},
		Column{Key: "margin", Head: "WORST MARGIN", Label: "smallest margin against the design (a fraction; a failing part's worst miss, — when it fails on a filter)", Plain: true,
			value: func(r *Row, _ bool) Cell {
				if r.Result == nil {
					return unknown()
				}
				return number(present.ShownMargin(r.Result), filter.BasisNone)
			}},
	)
	return out
}

func plain(c Column) Column {
	c.Plain = true
	return c
}

// supplyCurrent is packages × channels × Iq per channel (DESIGN.md "Worst
// case and margins"), packages as the design needs them (1 without one),
// Iq at worst case or typical.
func supplyCurrent(r *Row, typical bool) Cell {
	ch := max(r.Part.Channels, 1)
	pk := 1
	if r.Result != nil {
		pk = r.Result.Packages
	}
	f := r.figs.Iq
	if typical {
		f, _ = filter.TypicalFor(r.Part, "iq")
	}
	if !f.Known {
		return unknown()
	}
	return number(float64(pk*ch)*f.V, f.Basis)
}

// DefaultColumns are the keys a listing shows when none are asked for: the
// figures a designer compares first, the supply range and the price.
func DefaultColumns() []string {
	return []string{"gbw", "slew", "vos", "ib", "en", "iq", "supply.min", "supply.max", "unit_cost"}
}

// Keys lists every column key, in Columns order.
func Keys() []string {
	var out []string
	for _, c := range Columns() {
		out = append(out, c.Key)
	}
	return out
}

// Lookup returns the column under key; the error names the closest key.
func Lookup(key string) (Column, error) {
	for _, c := range Columns() {
		if c.Key == key {
			return c, nil
		}
	}
	if s := catalog.Suggest(key, Keys()); s != "" {
		return Column{}, fmt.Errorf("unknown column %q (did you mean %q?)", key, s)
	}
	return Column{}, fmt.Errorf("unknown column %q, want one of %s", key, strings.Join(Keys(), ", "))
}

// ParseColumns reads a comma-separated list of column keys; empty is
// DefaultColumns. A key given twice is kept once.
func ParseColumns(s string) ([]Column, error) {
	keys := DefaultColumns()
	if strings.TrimSpace(s) != "" {
		keys = strings.Split(s, ",")
	}
	var out []Column
	seen := map[string]bool{}
	for _, k := range keys {
		k = strings.TrimSpace(k)
		if k == "" || seen[k] {
			continue
		}
		seen[k] = true
		c, err := Lookup(k)
		if err != nil {
			return nil, err
		}
		out = append(out, c)
	}
	return out, nil
}

// Build makes the rows of a listing: one per result when a design was
// evaluated (results from filter.Evaluate at plan), else one per part with
// the figures at 25 °C and the default policy. typical shows the
// catalog's typical figures instead of the worst case.
func Build(plan *filter.Plan, results []filter.Result, parts []*catalog.Part, cols []Column, typical bool) []Row {
	p := plan
	if p == nil {
		p = &filter.Plan{TempLow: filter.RoomTemp, TempHigh: filter.RoomTemp}
	}
	var rows []Row
	if plan != nil && results != nil {
		rows = make([]Row, len(results))
		for i := range results {
			rows[i] = Row{Part: results[i].Part, Result: &results[i]}
		}
	} else {
		rows = make([]Row, len(parts))
		for i, q := range parts {
			rows[i] = Row{Part: q}
		}
	}
	for i := range rows {
		r := &rows[i]
		r.plan = p
		r.figs = filter.Figures(r.Part, p)
		r.Cells = make([]Cell, len(cols))
		for j, c := range cols {
			r.Cells[j] = c.value(r, typical)
		}
	}
	return rows
}

// Value computes the cell of column c for row r (c need not be one of the
// row's columns).
func (r *Row) Value(c Column, typical bool) Cell { return c.value(r, typical) }

// SortKey is what a listing is sorted by: a column key, or "id" / "name";
// Desc reverses the order (unknown values stay last either way).
type SortKey struct {
	Key  string
	Desc bool
}

// String renders the key as --sort takes it: "gbw", "-gbw".
func (k SortKey) String() string {
	if k.Desc {
		return "-" + k.Key
	}
	return k.Key
}

// ParseSort reads "[-]KEY"; empty is "id".
func ParseSort(s string) (SortKey, error) {
	s = strings.TrimSpace(s)
	k := SortKey{Key: "id"}
	if s == "" {
		return k, nil
	}
	k.Key, k.Desc = strings.TrimPrefix(s, "-"), strings.HasPrefix(s, "-")
	if k.Key == "id" || k.Key == "name" {
		return k, nil
	}
	if _, err := Lookup(k.Key); err != nil {
		return SortKey{}, fmt.Errorf("%w; or id, name", err)
	}
	return k, nil
}

// Sort orders rows by k (values in SI, words by their text; typical as the
// rows were built), ties and unknown values by id.
func Sort(rows []Row, k SortKey, typical bool) {
	type entry struct {
		c   Cell
		txt string
	}
	keys := make(map[*catalog.Part]entry, len(rows))
	col, err := Lookup(k.Key)
	for i := range rows {
		r := &rows[i]
		switch {
		case k.Key == "id":
			keys[r.Part] = entry{txt: r.Part.ID}
		case k.Key == "name":
			keys[r.Part] = entry{txt: strings.ToLower(r.Part.Name)}
		case err == nil:
			c := col.value(r, typical)
			keys[r.Part] = entry{c: c, txt: strings.ToLower(c.Text)}
		}
	}
	text := k.Key == "id" || k.Key == "name" || col.Text
	slices.SortStableFunc(rows, func(a, b Row) int {
		ea, eb := keys[a.Part], keys[b.Part]
		var ka, kb bool
		if text {
			ka, kb = ea.txt != "", eb.txt != ""
		} else {
			ka, kb = !math.IsNaN(ea.c.V), !math.IsNaN(eb.c.V)
		}
		if ka != kb {
			if ka {
				return -1
			}
			return 1
		}
		d := 0
		if ka {
			if text {
				d = strings.Compare(ea.txt, eb.txt)
			} else {
				d = cmp.Compare(ea.c.V, eb.c.V)
			}
			if k.Desc {
				d = -d
			}
		}
		if d == 0 {
			d = strings.Compare(a.Part.ID, b.Part.ID)
		}
		return d
	})
}
