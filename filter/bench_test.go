package filter_test

import (
	"context"
	"fmt"
	"io/fs"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/internal/gencat"
)

// synthetic returns n parts with figures spread over the usual ranges,
// some known only as typical, some missing, from a fixed seed.
func synthetic(n int) []*catalog.Part {
	rng := rand.New(rand.NewPCG(1, 2))
	techs := []catalog.Tech{catalog.TechBipolar, catalog.TechCMOS, catalog.TechJFET, catalog.TechBiCMOS}
	spread := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rng.Float64()) }
	spec := func(lo, hi float64, bigger bool) catalog.Spec {
		typ := spread(lo, hi)
		s := catalog.Spec{Typ: opt(typ)}
		switch rng.IntN(4) {
		case 0: // typical only
		case 1:
			if bigger {
				s.Min = opt(typ * 0.7)
			} else {
				s.Max = opt(typ * 2)
			}
		case 2:
			if bigger {
				s.Min, s.MinOT = opt(typ*0.7), opt(typ*0.6)
			} else {
				s.Max, s.MaxOT = opt(typ*2), opt(typ*3)
			}
		case 3:
			s.Source = catalog.SourceGraph
		}
		return s
	}
	parts := make([]*catalog.Part, n)
	for i := range parts {
		p := basePart(fmt.Sprintf("syn-%05d", i))
		p.Tech = techs[rng.IntN(len(techs))]
		p.Channels = []int{1, 2, 4}[rng.IntN(3)]
		p.Supply = catalog.Span{Min: opt(spread(1.8, 5)), Max: opt(spread(5.5, 44))}
		p.GBW = spec(10e3, 500e6, true)
		p.Slew = spec(3e3, 500e6, true)
		p.Aol = spec(80, 140, true)
		p.Vos = spec(1e-6, 5e-3, false)
		p.Ib = spec(1e-12, 500e-9, false)
		p.Iq = spec(1e-6, 10e-3, false)
		p.Iout = spec(1e-3, 100e-3, true)
		if rng.IntN(5) == 0 {
			p.En = catalog.Spec{}
		}
		p.UnitCost = opt(spread(0.1, 10))
		parts[i] = p
	}
	return parts
}

// benchDesign is the demo design, edited on every iteration the way the
// TUI does on a keystroke.
func benchDesign(b *testing.B) *filter.Design {
	raw, err := fs.ReadFile(data.Designs, data.DefaultDesign)
	if err != nil {
		b.Fatal(err)
	}
	d, err := filter.DecodeDesign(data.DefaultDesign, raw)
	if err != nil {
		b.Fatal(err)
	}
	return d
}

// benchEdit runs edit → re-derive → evaluate → rank, the work of one keystroke.
func benchEdit(b *testing.B, parts []*catalog.Part, o filter.Options) {
	benchKeys(b, o, func(p *filter.Plan) ([]filter.Result, error) {
		rs := filter.Evaluate(p, parts, o)
		filter.Rank(rs, filter.SortMargin)
		return rs, nil
	})
}

// benchKeys runs edit → re-derive → rank (by the given function) and, in
// summary mode, explains the rows a screen shows.
func benchKeys(b *testing.B, o filter.Options, rank func(*filter.Plan) ([]filter.Result, error)) {
	d := benchDesign(b)
	freqs := []string{"20 kHz", "21 kHz"}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		if err := d.Set("stage.gain.signal.freq", freqs[i%2]); err != nil {
			b.Fatal(err)
		}
		p, err := filter.Derive(d)
		if err != nil {
			b.Fatal(err)
		}
		rs, err := rank(p)
		if err != nil {
			b.Fatal(err)
		}
		if o.Summary {
			// The rows a screen shows get their checks.
			for i := 0; i < min(len(rs), 30); i++ {
				filter.Explain(p, &rs[i], o)
			}
		}
	}
}

func BenchmarkEvaluate(b *testing.B) {
	b.Run("demo", func(b *testing.B) {
		c, err := catalog.Load(catalog.FSLayer("demo", data.Catalog))
		if err != nil {
			b.Fatal(err)
		}
		benchEdit(b, c.Parts, filter.Options{})
	})
	for _, n := range []int{1000, 10000, 100000} {
		parts := synthetic(n)
		b.Run(fmt.Sprintf("synthetic-%d", n), func(b *testing.B) { benchEdit(b, parts, filter.Options{}) })
		b.Run(fmt.Sprintf("synthetic-%d-summary", n), func(b *testing.B) {
			benchEdit(b, parts, filter.Options{Summary: true})
		})
	}
}

// BenchmarkIncremental measures one stage edit on the incremental path
// (derive, Incremental.Ranked, explain the rows a screen shows) on
// generated catalogs; compare with BenchmarkEvaluate. The passing
// variants rank only the passing parts (Incremental.Rank), as the
// selector does while failing parts are hidden.
func BenchmarkIncremental(b *testing.B) {
	for _, n := range []int{10_000, 100_000} {
		parts := gencat.Parts(n, 1)
		b.Run(fmt.Sprintf("parts=%d", n), func(b *testing.B) {
			o := filter.Options{Summary: true}
			in := filter.NewIncremental(parts, o)
			if p, err := filter.Derive(benchDesign(b)); err != nil {
				b.Fatal(err)
			} else if _, err := in.Ranked(context.Background(), p, filter.SortMargin); err != nil {
				b.Fatal(err) // the first evaluation computes every group
			}
			benchKeys(b, o, func(p *filter.Plan) ([]filter.Result, error) {
				return in.Ranked(context.Background(), p, filter.SortMargin)
			})
		})
		b.Run(fmt.Sprintf("parts=%d/passing", n), func(b *testing.B) {
			in := filter.NewIncremental(parts, filter.Options{})
			if p, err := filter.Derive(benchDesign(b)); err != nil {
				b.Fatal(err)
			} else if _, err := in.Ranked(context.Background(), p, filter.SortMargin); err != nil {
				b.Fatal(err)
			}
			benchKeys(b, filter.Options{Summary: true}, func(p *filter.Plan) ([]filter.Result, error) {
				rk, err := in.Rank(context.Background(), p, filter.SortMargin)
				if err != nil {
					return nil, err
				}
				return rk.Passing, nil
			})
		})
	}
}
