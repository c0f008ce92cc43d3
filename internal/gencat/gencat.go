// Package gencat generates large invented catalogs for benchmarks and
// scale tests: n valid parts with figures spread over the classes a real
// catalog mixes (general purpose, precision, micropower, high speed, FET
// input), a share of figures given only as typical values, written as
// several catalog files. Everything comes from a seed, so a run is
// repeatable. The parts are invented parameter sets, not anyone's data.
package gencat

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"

	"github.com/opsift/opsift/catalog"
)

// class is a family of parts with the plausible span of its figures
// (common practice, no source).
type class struct {
	name         string
	tech         []catalog.Tech
	gbw          [2]float64 // Hz
	slewPerGBW   [2]float64 // V/s per Hz of GBW
	vos          [2]float64 // V, typical
	ib           [2]float64 // A, typical
	iq           [2]float64 // A per channel, typical
	en           [2]float64 // V/√Hz
	supplyMax    []float64  // V
	railToRail   bool
	costLo, cost float64
}

var classes = []class{
	{"general", []catalog.Tech{catalog.TechBipolar}, [2]float64{0.5e6, 5e6}, [2]float64{0.3, 1.5},
		[2]float64{0.3e-3, 3e-3}, [2]float64{5e-9, 80e-9}, [2]float64{0.1e-3, 1e-3}, [2]float64{8e-9, 40e-9},
		[]float64{32, 36, 40}, false, 0.08, 0.6},
	{"cmos-rr", []catalog.Tech{catalog.TechCMOS}, [2]float64{0.3e6, 20e6}, [2]float64{0.4, 1.2},
		[2]float64{0.1e-3, 2e-3}, [2]float64{0.2e-12, 10e-12}, [2]float64{20e-6, 1.5e-3}, [2]float64{7e-9, 45e-9},
		[]float64{5.5, 6, 16, 18}, true, 0.1, 1.5},
	{"precision", []catalog.Tech{catalog.TechBipolar, catalog.TechCMOS, catalog.TechBiCMOS}, [2]float64{0.2e6, 10e6},
		[2]float64{0.1, 0.6}, [2]float64{2e-6, 60e-6}, [2]float64{20e-12, 2e-9}, [2]float64{0.2e-3, 2e-3},
		[2]float64{3e-9, 15e-9}, []float64{5.5, 16, 36}, false, 0.8, 6},
	{"micropower", []catalog.Tech{catalog.TechCMOS, catalog.TechBipolar}, [2]float64{2e3, 200e3}, [2]float64{0.3, 1.5},
		[2]float64{0.2e-3, 4e-3}, [2]float64{0.5e-12, 20e-9}, [2]float64{0.4e-6, 15e-6}, [2]float64{50e-9, 400e-9},
		[]float64{5.5, 6, 16}, true, 0.2, 2},
	{"speed", []catalog.Tech{catalog.TechBipolar, catalog.TechBiCMOS}, [2]float64{30e6, 800e6}, [2]float64{1, 6},
		[2]float64{0.2e-3, 3e-3}, [2]float64{0.5e-6, 15e-6}, [2]float64{2e-3, 15e-3}, [2]float64{1e-9, 8e-9},
		[]float64{5.5, 12, 36}, false, 0.9, 8},
	{"jfet", []catalog.Tech{catalog.TechJFET}, [2]float64{1e6, 20e6}, [2]float64{2, 6},
		[2]float64{0.2e-3, 5e-3}, [2]float64{2e-12, 60e-12}, [2]float64{0.2e-3, 2.5e-3}, [2]float64{5e-9, 20e-9},
		[]float64{36, 40, 44}, false, 0.3, 3},
}

var packages = map[int][]string{
	1: {"sot5", "soic8", "sc70-5", "dip8"},
	2: {"soic8", "msop8", "dip8", "dfn8"},
	4: {"soic14", "tssop14", "dip14", "qfn16"},
}

var pinouts = map[int][]string{1: {"single-a", "single-sot5"}, 2: {"dual-a"}, 4: {"quad-a"}}

// gen draws figures from one seeded source.
type gen struct{ r *rand.Rand }

// lg draws from [lo, hi] evenly on a log scale, rounded to 3 figures.
func (g gen) lg(r [2]float64) float64 {
	return round3(r[0] * math.Pow(r[1]/r[0], g.r.Float64()))
}

// between draws from [lo, hi] evenly, rounded to 3 figures.
func (g gen) between(lo, hi float64) float64 { return round3(lo + (hi-lo)*g.r.Float64()) }

func round3(v float64) float64 {
	if v == 0 {
		return 0
	}
	x, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 3, 64), 64)
	return x
}

// bigger is a bigger-is-better figure around typ: typical only with
// probability typOnly (a third of those read from a graph), else with a
// guaranteed minimum below it, a third of those also over temperature.
func (g gen) bigger(typ, typOnly float64) catalog.Spec {
	return g.spec(typ, typOnly, 3, [2]float64{0.55, 0.85}, [2]float64{0.8, 0.95}, true)
}

// smaller is a smaller-is-better figure around typ, like bigger with a
// guaranteed maximum above it.
func (g gen) smaller(typ, typOnly float64) catalog.Spec {
	return g.spec(typ, typOnly, 4, [2]float64{1.5, 4}, [2]float64{1.1, 1.6}, false)
}

// spec draws a figure: typical only with probability typOnly (one in
// graphEvery of those from a graph), else with a limit at typ × lim and,
// one time in three, an over-temperature limit at that × ot.
func (g gen) spec(typ, typOnly float64, graphEvery int, lim, ot [2]float64, bigger bool) catalog.Spec {
	s := catalog.Spec{Typ: catalog.Some(typ)}
	if g.r.Float64() < typOnly {
		if g.r.IntN(graphEvery) == 0 {
			s.Source = catalog.SourceGraph
		}
		return s
	}
	limit, overTemp := &s.Max, &s.MaxOT
	if bigger {
		limit, overTemp = &s.Min, &s.MinOT
	}
	*limit = catalog.Some(round3(typ * g.between(lim[0], lim[1])))
	if g.r.IntN(3) == 0 {
		*overTemp = catalog.Some(round3(limit.V() * g.between(ot[0], ot[1])))
	}
	return s
}

// Parts returns n valid invented parts drawn from seed, with ids
// "gen-NNNNNNN". Between about 35 and 50 % of the figures are typical only.
func Parts(n int, seed uint64) []*catalog.Part {
	g := gen{rand.New(rand.NewPCG(seed, seed^0x9e3779b97f4a7c15))}
	parts := make([]*catalog.Part, n)
	lifecycles := []catalog.Lifecycle{catalog.LifecycleActive, catalog.LifecycleActive, catalog.LifecycleActive,
		catalog.LifecycleActive, catalog.LifecycleNRND, catalog.LifecycleObsolete}
	for i := range parts {
		c := classes[g.r.IntN(len(classes))]
		ch := []int{1, 2, 4}[g.r.IntN(3)]
		tech := c.tech[g.r.IntN(len(c.tech))]
		typOnly := 0.1 + 0.2*g.r.Float64()
		gbw := g.lg(c.gbw)
		smax := c.supplyMax[g.r.IntN(len(c.supplyMax))]
		pk := packages[ch]
		p := &catalog.Part{
			ID:        fmt.Sprintf("gen-%07d", i),
			Name:      fmt.Sprintf("Generated %s %d-channel part, %s, %s supply", c.name, ch, catalog.Format(gbw, catalog.Hertz), catalog.Format(smax, catalog.Volt)),
			Tech:      tech,
			Channels:  ch,
			Packages:  []string{pk[g.r.IntN(len(pk))], pk[g.r.IntN(len(pk))]},
			Pinout:    pinouts[ch][g.r.IntN(len(pinouts[ch]))],
			Lifecycle: lifecycles[g.r.IntN(len(lifecycles))],
			UnitCost:  catalog.Some(round3(g.between(c.costLo, c.cost))),
			Temp:      [2]catalog.Opt{catalog.Some([]float64{-40, -40, 0, -55}[g.r.IntN(4)]), catalog.Some([]float64{85, 105, 125, 70}[g.r.IntN(4)])},
			Supply:    catalog.Span{Min: catalog.Some(g.between(3, 5)), Max: catalog.Some(smax)},
			GBW:       g.bigger(gbw, typOnly),
			Slew:      g.bigger(round3(gbw*g.between(c.slewPerGBW[0], c.slewPerGBW[1])), typOnly),
			Aol:       g.bigger(g.between(85, 135), typOnly),
			Vos:       g.smaller(g.lg(c.vos), typOnly),
			VosDrift:  catalog.Spec{Typ: catalog.Some(g.lg([2]float64{0.05e-6, 10e-6}))},
			Ib:        g.smaller(g.lg(c.ib), typOnly),
			Ios:       g.smaller(g.lg([2]float64{c.ib[0] / 10, c.ib[1] / 5}), typOnly),
			En:        catalog.Spec{Typ: catalog.Some(g.lg(c.en))},
			Iq:        g.smaller(g.lg(c.iq), typOnly),
			Iout:      g.bigger(g.lg([2]float64{5e-3, 80e-3}), typOnly),
			VdiffMax:  catalog.Some(smax),
			CLoad:     catalog.Some(g.lg([2]float64{50e-12, 1e-9})),
			Notes:     "Generated for scale tests; figures drawn from the " + c.name + " class.",
		}
		if tech.FETInput() {
			p.In = catalog.Spec{Typ: catalog.Some(g.lg([2]float64{0.1e-15, 5e-15}))}
		} else {
			p.In = catalog.Spec{Typ: catalog.Some(g.lg([2]float64{0.1e-12, 2e-12}))}
		}
		if p.Packages[0] == p.Packages[1] {
			p.Packages = p.Packages[:1]
		}
		if c.railToRail {
			p.Supply.Min = catalog.Some(g.between(1.6, 2.7))
			p.InputCM = catalog.Headroom{Low: catalog.Some(-g.between(0.05, 0.2)), High: catalog.Some(g.between(0.05, 0.2))}
			p.Output = catalog.Swing{Low: catalog.Some(g.between(0.005, 0.05)), High: catalog.Some(-g.between(0.005, 0.05)), Load: catalog.Some(10e3)}
		} else {
			p.InputCM = catalog.Headroom{Low: catalog.Some(g.between(-0.3, 0.8)), High: catalog.Some(-g.between(0.8, 1.8))}
			p.Output = catalog.Swing{Low: catalog.Some(g.between(0.02, 0.8)), High: catalog.Some(-g.between(0.8, 1.6)), Load: catalog.Some([]float64{2e3, 10e3}[g.r.IntN(2)])}
		}
		if g.r.IntN(5) == 0 {
			p.Aol = catalog.Spec{} // some catalogs lack a figure
		}
		parts[i] = p
	}
	return parts
}

// PerFile is the default number of parts per generated file: about 3.7 MB
// of TOML, under the 4 MiB a catalog file may hold.
const PerFile = 4000

// Write generates n parts from seed into dir as files of at most perFile
// parts each (gen-0001.toml, …) and returns their paths. dir must exist.
func Write(dir string, n, perFile int, seed uint64) ([]string, error) {
	if perFile <= 0 {
		perFile = PerFile
	}
	parts := Parts(n, seed)
	var files []string
	for lo, k := 0, 1; lo < len(parts); lo, k = lo+perFile, k+1 {
		hi := min(lo+perFile, len(parts))
		f, err := os.Create(filepath.Join(dir, fmt.Sprintf("gen-%04d.toml", k)))
		if err != nil {
			return nil, fmt.Errorf("gencat: %w", err)
		}
		err = catalog.Encode(f, parts[lo:hi])
		if cerr := f.Close(); err == nil {
			err = cerr
		}
		if err != nil {
			return nil, fmt.Errorf("gencat: %s: %w", f.Name(), err)
		}
		files = append(files, f.Name())
	}
	return files, nil
}
