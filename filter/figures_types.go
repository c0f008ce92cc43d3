package filter

// Basis says what a worst-case figure rests on.
type Basis uint8

// The bases a figure may have, weakest last among the catalog's own.
// BasisSimulated is a check's figure measured by the time-domain model
// (filter/sim) run on the worst-case figures, not a catalog figure: it
// comes after the others only to keep their order.
const (
	BasisNone       Basis = iota // the catalog lacks the figure
	BasisGuaranteed              // a guaranteed limit (min/max, or over temperature)
	BasisTypical                 // a typical table figure, derated or inflated
	BasisGraph                   // a typical figure read off a graph, derated or inflated
	BasisSimulated               // measured by simulation at worst-case figures (the thd check)
)

// String returns "guaranteed", "typical", "graph", "simulated" or "" for
// BasisNone.
func (b Basis) String() string {
	switch b {
	case BasisGuaranteed:
		return "guaranteed"
	case BasisTypical:
		return "typical"
	case BasisGraph:
		return "graph"
	case BasisSimulated:
		return "simulated"
	}
	return ""
}

// Figure is one worst-case figure of a part in a design. Known is false
// when the catalog lacks it. Note explains an adjustment ("typ × 0.7",
// "max + drift·60 K"); it is a constant string, never formatted per part.
type Figure struct {
	V     float64
	Known bool
	Basis Basis
	Note  string
}

// Window is a voltage window relative to the rails as the part's figures
// give it: V− + Low … V+ + High. A side whose figure is missing is not known.
type Window struct {
	Low, High           float64
	LowKnown, HighKnown bool
	Basis               Basis
}

// PartFigures are the worst-case figures of one part at a design's
// temperature range and policy, computed once per (part, plan). The
// simulator uses the same figures so its pictures agree with the margins.
type PartFigures struct {
	GBW, Slew, Aol, Iout     Figure // bigger is better: minimum over temperature
	Vos, Ib, Ios, En, In, Iq Figure // smaller is better: maximum over temperature
	// GBWHigh is the largest credible GBW (typical, not derated; else the
	// limit): the worst case for noise bandwidth.
	GBWHigh Figure
	// Input is the common-mode window; Output the swing at the load the
	// catalog states it at (OutputLoad, Ω; 0 when not stated). Use
	// OutputAt to scale it to a stage's load.
	Input      Window
	Output     Window
	OutputLoad float64
	// AolRatio is Aol as a voltage ratio (V/V), circuit.FromDB(Aol.V),
	// when Aol is known: kept so the gain-error need of every stage and
	// keystroke takes no power of ten.
	AolRatio float64
}
