package filter_test

import (
	"context"
	"io/fs"
	"math"
	"math/rand/v2"
	"strconv"
	"sync/atomic"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/internal/gencat"
)

// sameFloat compares two figures, NaN equal to NaN.
func sameFloat(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }

// sameResults reports the first difference between two summary results.
func sameResults(t *testing.T, step int, got, want []filter.Result) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("step %d: %d results, want %d", step, len(got), len(want))
	}
	for i := range want {
		g, w := &got[i], &want[i]
		ok := g.Part == w.Part && g.Pass == w.Pass && sameFloat(g.WorstMargin, w.WorstMargin) &&
			g.Binding == w.Binding && g.Packages == w.Packages && sameFloat(g.Cost, w.Cost) &&
			sameFloat(g.SupplyCurrent, w.SupplyCurrent) && g.Failed == w.Failed && g.Unknown == w.Unknown &&
			len(g.FMax) == len(w.FMax) && g.Checks == nil
		for j := 0; ok && j < len(w.FMax); j++ {
			ok = sameFloat(g.FMax[j], w.FMax[j])
		}
		if !ok {
			t.Fatalf("step %d, part %s: incremental %+v, full %+v", step, w.Part.ID, *g, *w)
		}
	}
}

// edit changes one random field of d: a quantity scaled by a random
// factor, a choice or list picked from its choices, or left out.
func edit(r *rand.Rand, d *filter.Design) string {
	fields := d.Fields()
	for {
		f := fields[r.IntN(len(fields))]
		var raw string
		switch {
		case f.Kind == filter.Quantity && f.Raw != "":
			v, err := catalog.Parse(f.Raw, f.Dim)
			if err != nil {
				continue
			}
			k := []float64{0.5, 0.9, 1.1, 2, 5}[r.IntN(5)]
			if f.Dim == catalog.Celsius {
				v += []float64{-15, -5, 5, 15}[r.IntN(4)]
			} else {
				v *= k
			}
			raw = catalog.Exact(v, f.Dim)
		case len(f.Choices) > 0:
			raw = f.Choices[r.IntN(len(f.Choices))]
		case f.Kind == filter.Quantity:
			if f.Default == "" {
				continue
			}
			raw = f.Default
		default:
			continue
		}
		if err := d.Set(f.Path, raw); err != nil {
			continue
		}
		return f.Path + " = " + raw
	}
}

// TestIncrementalMatchesFull applies random edit sequences to every demo
// design and compares the incremental evaluation after each edit with a
// full one, strict and not. The full evaluation is the reference: the
// incremental path must give the same results, bit for bit. The default
// design is also run with a thd allowance on its gain stage (on fewer
// parts: the full evaluation simulates every passing part each step), so
// the simulated figures kept across edits are held to it too.
func TestIncrementalMatchesFull(t *testing.T) {
	names, err := fs.Glob(data.Designs, "*.toml")
	if err != nil || len(names) == 0 {
		t.Fatal(names, err)
	}
	type design struct {
		name, thd string // thd: the allowance set on stage gain, or none
		parts     []*catalog.Part
	}
	many := gencat.Parts(3000, 5)
	var designs []design
	for _, name := range names {
		designs = append(designs, design{name: name, parts: many})
	}
	designs = append(designs, design{name: data.DefaultDesign, thd: "0.5 %", parts: gencat.Parts(300, 11)})
	for _, ds := range designs {
		name, parts := ds.name, ds.parts
		if ds.thd != "" {
			name += "+thd"
		}
		for _, strict := range []bool{false, true} {
			t.Run(name+"/strict="+strconv.FormatBool(strict), func(t *testing.T) {
				raw, err := fs.ReadFile(data.Designs, ds.name)
				if err != nil {
					t.Fatal(err)
				}
				d, err := filter.DecodeDesign(ds.name, raw)
				if err != nil {
					t.Fatal(err)
				}
				if ds.thd != "" {
					if err := d.Set("stage.gain.thd", ds.thd); err != nil {
						t.Fatal(err)
					}
				}
				r := rand.New(rand.NewPCG(uint64(len(name)), 7))
				o := filter.Options{Strict: strict, Summary: true}
				in := filter.NewIncremental(parts, o)
				steps := 0
				for step := 0; steps < 25 && step < 200; step++ {
					before := d.Clone()
					what := edit(r, d)
					plan, err := filter.Derive(d)
					if err != nil {
						d = before // an edit the design refuses: the front end keeps the last plan
						continue
					}
					t.Log(what)
					full := filter.Evaluate(plan, parts, o)
					key := filter.SortKeys()[r.IntN(len(filter.SortKeys()))]
					// The calls in a random order, sometimes one cut short
					// part way first, so each may find the stage groups
					// evaluated for every part, for the candidates only
					// (Rank), or part of the way (a cancelled call).
					if r.IntN(3) == 0 {
						in.Rank(cutShort(r.IntN(6)), plan, key)
					}
					ranking, err := in.Rank(context.Background(), plan, key)
					if err != nil {
						t.Fatal(err)
					}
					if r.IntN(2) == 0 {
						got, err := in.Evaluate(context.Background(), plan)
						if err != nil {
							t.Fatal(err)
						}
						sameResults(t, step, got, full)
					}
					ranked, err := ranking.All(context.Background())
					if err != nil {
						t.Fatal(err)
					}
					filter.Rank(full, key)
					sameResults(t, step, ranked, full)
					pass := 0
					for pass < len(full) && full[pass].Pass {
						pass++
					}
					sameResults(t, step, ranking.Passing, full[:pass])
					if ranking.Parts != len(parts) {
						t.Fatalf("step %d: Ranking.Parts %d, want %d", step, ranking.Parts, len(parts))
					}
					steps++
				}
				if steps < 10 {
					t.Fatalf("only %d edits derived", steps)
				}
			})
		}
	}
}

// cutShort returns a context that is cancelled after its Err has been
// asked n times: the workers look at it once per chunk of parts, so a call
// with it stops part way, after a fixed share of the work.
func cutShort(n int) context.Context {
	c := &countdown{Context: context.Background()}
	c.left.Store(int32(n))
	return c
}

type countdown struct {
	context.Context
	left atomic.Int32
}

func (c *countdown) Err() error {
	if c.left.Add(-1) < 0 {
		return context.Canceled
	}
	return nil
}

// TestIncrementalCancelled checks that a cancelled evaluation returns an
// error and leaves the next one correct.
func TestIncrementalCancelled(t *testing.T) {
	parts := gencat.Parts(5000, 6)
	raw, _ := fs.ReadFile(data.Designs, data.DefaultDesign)
	d, err := filter.DecodeDesign(data.DefaultDesign, raw)
	if err != nil {
		t.Fatal(err)
	}
	plan, err := filter.Derive(d)
	if err != nil {
		t.Fatal(err)
	}
	in := filter.NewIncremental(parts, filter.Options{})
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if res, err := in.Evaluate(ctx, plan); err == nil || res != nil {
		t.Fatalf("cancelled evaluation gave %d results, %v", len(res), err)
	}
	got, err := in.Evaluate(context.Background(), plan)
	if err != nil {
		t.Fatal(err)
	}
	sameResults(t, 0, got, filter.Evaluate(plan, parts, filter.Options{Summary: true}))
}
