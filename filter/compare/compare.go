// Package compare lays a shortlist of 2–6 parts side by side for one
// design: one row per worst-case figure (the value the design's policy
// gives and its basis) and one per design check (the margin), the best
// value of each row marked, and the rows whose differences decide the
// choice first:
//
//  1. checks that some of the parts pass and others fail;
//  2. the other checks, by how far apart their margins lie;
//  3. figures, by how far apart their values lie (the ratio of the largest
//     to the smallest; volts and temperatures by their difference);
//  4. rows in which the parts do not differ, in definition order.
//
// The command line (opsift compare) and the selector's compare view both
// render a Table, so they show the same numbers.
package compare

import (
	"fmt"
	"math"
	"slices"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// MinParts and MaxParts bound how many parts a comparison takes.
const (
	MinParts = 2
	MaxParts = 6
)

// Kind says what a row holds.
type Kind uint8

// The row kinds.
const (
	Figure Kind = iota // a worst-case figure of each part
	Check              // a design check's margin (or pass/fail) for each part
)

// String returns "figure" or "check".
func (k Kind) String() string {
	if k == Check {
		return "check"
	}
	return "figure"
}

// Better says which way a row's value is better.
type Better int8

// The directions.
const (
	Higher Better = 1
	Lower  Better = -1
)

// String returns "higher" or "lower".
func (b Better) String() string {
	if b == Lower {
		return "lower"
	}
	return "higher"
}

// Cell is one part's entry in a row.
type Cell struct {
	Known bool    // the part gives the figure, or the check has a margin or a verdict
	V     float64 // figure value (SI) or margin (fraction); NaN when not known or a hard check
	Basis filter.Basis
	// Status is the check's outcome (Check rows only).
	Status filter.Status
	Best   bool
}

// Row is one figure or check across the parts.
type Row struct {
	Kind   Kind
	Stage  string // Check rows: the stage, "" design-level
	Key    string // figure key ("slew") or requirement key ("output_range")
	Label  string // for people: "slew rate", "gain/output_range"
	Dim    catalog.Dim
	Better Better
	Cells  []Cell
	// Group is the ordering group (see the package doc, 1 … 4 as 0 … 3)
	// and Spread how far apart the cells lie within it.
	Group  int
	Spread float64
}

// Decides reports whether the row's difference is one of those that
// decide the choice: a check split between pass and fail.
func (r *Row) Decides() bool { return r.Group == 0 }

// Table is the comparison.
type Table struct {
	Plan    *filter.Plan
	Results []filter.Result // one per part, in the order given
	Rows    []Row           // sorted, deciding rows first
}

// Build evaluates parts against plan and lays them side by side.
func Build(plan *filter.Plan, parts []*catalog.Part, o filter.Options) (*Table, error) {
	if len(parts) < MinParts || len(parts) > MaxParts {
		return nil, fmt.Errorf("compare takes %d to %d parts, got %d", MinParts, MaxParts, len(parts))
	}
	o.Summary = false
	t := &Table{Plan: plan, Results: filter.Evaluate(plan, parts, o)}
	figs := make([]filter.PartFigures, len(parts))
	for i, p := range parts {
		figs[i] = filter.Figures(p, plan)
	}
	var rows []Row
	for _, d := range figureDefs {
		r := Row{Kind: Figure, Key: d.key, Label: d.label, Dim: d.dim, Better: d.better}
		for i := range parts {
			f := d.get(&t.Results[i], &figs[i])
			c := Cell{Known: f.Known, V: math.NaN(), Basis: f.Basis}
			if f.Known {
				c.V = f.V
			}
			r.Cells = append(r.Cells, c)
		}
		rows = append(rows, r)
	}
	for ci := range t.Results[0].Checks {
		q := t.Results[0].Checks[ci].Req
		r := Row{Kind: Check, Stage: q.Stage, Key: string(q.Key), Label: checkLabel(q.Stage, q.Key),
			Dim: catalog.Ratio, Better: Higher}
		for i := range t.Results {
			c := &t.Results[i].Checks[ci]
			r.Cells = append(r.Cells, Cell{Known: c.Status != filter.StatusUnknown, V: c.Margin, Basis: c.Basis, Status: c.Status})
		}
		rows = append(rows, r)
	}
	for i := range rows {
		markBest(&rows[i])
		rank(&rows[i])
	}
	slices.SortStableFunc(rows, func(a, b Row) int {
		if a.Group != b.Group {
			return a.Group - b.Group
		}
		switch {
		case a.Spread > b.Spread:
			return -1
		case a.Spread < b.Spread:
			return 1
		}
		return 0
	})
	t.Rows = rows
	return t, nil
}

// checkLabel names a check: "gain/slew", or the key for design-level ones.
func checkLabel(stage string, key filter.Key) string {
	if stage == "" {
		return string(key)
	}
	return stage + "/" + string(key)
}

// sameTol is the relative difference under which two values tie.
const sameTol = 1e-9

// markBest marks the best known cells of a row: the largest (Higher) or
// smallest (Lower) value, ties included; for a hard check the passing
// cells when some fail. A row in which every known cell ties marks none.
func markBest(r *Row) {
	if r.Kind == Check && !anyMargin(r) {
		pass, fail := 0, 0
		for _, c := range r.Cells {
			switch c.Status {
			case filter.StatusPass:
				pass++
			case filter.StatusFail:
				fail++
			}
		}
		if pass > 0 && fail > 0 {
			for i := range r.Cells {
				r.Cells[i].Best = r.Cells[i].Status == filter.StatusPass
			}
		}
		return
	}
	best, n := math.NaN(), 0
	for _, c := range r.Cells {
		if !c.Known || math.IsNaN(c.V) {
			continue
		}
		n++
		if math.IsNaN(best) || float64(r.Better)*(c.V-best) > 0 {
			best = c.V
		}
	}
	if n == 0 {
		return
	}
	ties := 0
	for i, c := range r.Cells {
		if c.Known && same(c.V, best) {
			r.Cells[i].Best = true
			ties++
		}
	}
	if ties == len(r.Cells) {
		for i := range r.Cells {
			r.Cells[i].Best = false
		}
	}
}

func anyMargin(r *Row) bool {
	for _, c := range r.Cells {
		if !math.IsNaN(c.V) {
			return true
		}
	}
	return false
}

// same reports whether a and b tie (relative sameTol, infinities equal).
func same(a, b float64) bool {
	if a == b {
		return true
	}
	return math.Abs(a-b) <= sameTol*math.Max(math.Abs(a), math.Abs(b))
}

// Spread clipping for margins: a +∞ margin (a zero figure under an
// allowance) or a huge one must not outrank a close call.
const (
	marginLow  = -1.0
	marginHigh = 3.0
	// minSpread is the spread of a check whose margins differ only beyond
	// the clip.
	minSpread = 1e-9
)

// rank sets the row's ordering group and spread.
func rank(r *Row) {
	var vals []float64
	pass, fail, unknown := 0, 0, 0
	for _, c := range r.Cells {
		if r.Kind == Check {
			switch c.Status {
			case filter.StatusPass:
				pass++
			case filter.StatusFail:
				fail++
			default:
				unknown++
			}
		} else if !c.Known {
			unknown++
		}
		if c.Known && !math.IsNaN(c.V) {
			vals = append(vals, c.V)
		}
	}
	r.Spread = spread(r, vals)
	switch {
	case r.Kind == Check && pass > 0 && fail > 0:
		r.Group = 0
		if math.IsNaN(r.Spread) || r.Spread == 0 {
			r.Spread = math.Inf(1) // a hard filter split: nothing decides more
		}
	case unknown > 0 && len(vals) > 0:
		// Known for some parts only: a difference, ranked as a factor of e.
		r.Group, r.Spread = groupOf(r.Kind), math.Max(r.Spread, 1)
	case r.Spread > 0:
		r.Group = groupOf(r.Kind)
	default:
		r.Group, r.Spread = 3, 0
	}
}

func groupOf(k Kind) int {
	if k == Check {
		return 1
	}
	return 2
}

// spread is how far apart vals lie: margins clipped to [marginLow,
// marginHigh] by their difference; positive figures by the logarithm of
// largest/smallest; volts (rail offsets) by their difference over 1 V,
// temperatures over 100 K.
func spread(r *Row, vals []float64) float64 {
	if len(vals) < 2 {
		return 0
	}
	lo, hi := slices.Min(vals), slices.Max(vals)
	switch {
	case r.Kind == Check:
		clip := func(v float64) float64 { return math.Min(marginHigh, math.Max(marginLow, v)) }
		if d := clip(hi) - clip(lo); d > 0 || same(hi, lo) {
			return d
		}
		// Both beyond the clip yet different (+572 % against +4873 %):
		// a difference, ranked after every close call but before the rows
		// where the parts agree.
		return minSpread
	case r.Dim == catalog.Celsius:
		return (hi - lo) / 100
	case r.Dim == catalog.Volt && (r.Key != "vos" && r.Key != "vdiff_max" && r.Key != "supply_min" && r.Key != "supply_max"):
		return hi - lo
	case r.Dim == catalog.Decibel:
		return (hi - lo) / 20 * math.Ln10 // as the linear ratio it stands for
	case lo > 0:
		return math.Log(hi / lo)
	}
	return 0
}
