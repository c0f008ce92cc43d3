package compare

import (
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// figureDef is one figure row: its catalog key, label, dimension, better
// direction and how to read it from a part's result and worst-case figures.
type figureDef struct {
	key, label string
	dim        catalog.Dim
	better     Better
	get        func(r *filter.Result, f *filter.PartFigures) filter.Figure
}

// rating is a single-valued catalog rating, which counts as guaranteed.
func rating(o catalog.Opt) filter.Figure {
	return filter.Figure{V: o.V(), Known: o.Known(), Basis: filter.BasisGuaranteed}
}

// side is one side of a window relative to its rail.
func side(v float64, known bool, b filter.Basis) filter.Figure {
	return filter.Figure{V: v, Known: known, Basis: b}
}

// magnitude compares |V|: offsets and bias currents may be written signed.
func magnitude(f filter.Figure) filter.Figure {
	f.V = math.Abs(f.V)
	return f
}

// figureDefs lists the figure rows in definition order: the worst-case
// figures the checks use (filter.Figures, at the design's temperature range
// and policy), the ratings, and the cost and supply current of the
// packages the design needs.
var figureDefs = []figureDef{
	{"gbw", "gain-bandwidth", catalog.Hertz, Higher, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return f.GBW }},
	{"slew", "slew rate", catalog.VoltPerSecond, Higher, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return f.Slew }},
	{"aol", "open-loop gain", catalog.Decibel, Higher, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return f.Aol }},
	{"iout", "output current", catalog.Ampere, Higher, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return f.Iout }},
	{"vos", "offset voltage", catalog.Volt, Lower, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return magnitude(f.Vos) }},
	{"ib", "input bias current", catalog.Ampere, Lower, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return magnitude(f.Ib) }},
	{"ios", "input offset current", catalog.Ampere, Lower, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return magnitude(f.Ios) }},
	{"en", "voltage noise density", catalog.VoltNoise, Lower, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return f.En }},
	{"in", "current noise density", catalog.CurrentNoise, Lower, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return f.In }},
	{"iq", "quiescent current per channel", catalog.Ampere, Lower, func(_ *filter.Result, f *filter.PartFigures) filter.Figure { return f.Iq }},
	{"input_cm_low", "input range above V−", catalog.Volt, Lower, func(_ *filter.Result, f *filter.PartFigures) filter.Figure {
		return side(f.Input.Low, f.Input.LowKnown, f.Input.Basis)
	}},
	{"input_cm_high", "input range from V+", catalog.Volt, Higher, func(_ *filter.Result, f *filter.PartFigures) filter.Figure {
		return side(f.Input.High, f.Input.HighKnown, f.Input.Basis)
	}},
	{"output_low", "output swing above V− (as rated)", catalog.Volt, Lower, func(_ *filter.Result, f *filter.PartFigures) filter.Figure {
		return side(f.Output.Low, f.Output.LowKnown, f.Output.Basis)
	}},
	{"output_high", "output swing from V+ (as rated)", catalog.Volt, Higher, func(_ *filter.Result, f *filter.PartFigures) filter.Figure {
		return side(f.Output.High, f.Output.HighKnown, f.Output.Basis)
	}},
	{"supply_min", "minimum supply span", catalog.Volt, Lower, func(r *filter.Result, _ *filter.PartFigures) filter.Figure { return rating(r.Part.Supply.Min) }},
	{"supply_max", "maximum supply span", catalog.Volt, Higher, func(r *filter.Result, _ *filter.PartFigures) filter.Figure { return rating(r.Part.Supply.Max) }},
	{"temp_low", "lowest rated temperature", catalog.Celsius, Lower, func(r *filter.Result, _ *filter.PartFigures) filter.Figure { return rating(r.Part.Temp[0]) }},
	{"temp_high", "highest rated temperature", catalog.Celsius, Higher, func(r *filter.Result, _ *filter.PartFigures) filter.Figure { return rating(r.Part.Temp[1]) }},
	{"vdiff_max", "largest differential input", catalog.Volt, Higher, func(r *filter.Result, _ *filter.PartFigures) filter.Figure { return rating(r.Part.VdiffMax) }},
	{"cload", "largest capacitive load", catalog.Farad, Higher, func(r *filter.Result, _ *filter.PartFigures) filter.Figure { return rating(r.Part.CLoad) }},
	{"cost", "cost of the packages needed", catalog.Dimensionless, Lower, func(r *filter.Result, _ *filter.PartFigures) filter.Figure {
		return filter.Figure{V: r.Cost, Known: !math.IsNaN(r.Cost)}
	}},
	{"supply_current", "supply current of the packages needed", catalog.Ampere, Lower, func(r *filter.Result, f *filter.PartFigures) filter.Figure {
		return filter.Figure{V: r.SupplyCurrent, Known: !math.IsNaN(r.SupplyCurrent), Basis: f.Iq.Basis}
	}},
}
