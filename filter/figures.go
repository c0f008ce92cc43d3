package filter

import (
	"math"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
)

// Notes the figure rules attach; constant so evaluation never formats text.
const (
	noteOT          = "limit over the rated temperature range"
	noteOTRoom      = "limit over the rated temperature range, used at 25 °C (no 25 °C limit given; the rated range includes it)"
	noteRoom        = "25 °C limit (no over-temperature limit given)"
	noteRoomNoDrift = "25 °C limit; no drift figure to move it to temperature"
	noteDrift       = "25 °C limit + drift·ΔT"
	noteTypDrift    = "25 °C limit + typical drift × inflate_typ·ΔT"
	noteFET         = "25 °C limit × 2^(ΔT/10 K), FET input"
	noteDerate      = "typical × derate_typ"
	noteInflate     = "typical × inflate_typ"
	noteInflDrift   = "typical × inflate_typ + drift·ΔT"
	noteInflFET     = "typical × inflate_typ × 2^(ΔT/10 K), FET input"
	noteEstimate    = "estimated figure"
	noteSpeedTemp   = "25 °C limit × (1 − speed_tempco·|ΔT|)"
	noteTypSpeed    = "typical × derate_typ × (1 − speed_tempco·|ΔT|)"
	noteBipCold     = "25 °C limit × (1 + ib_cold_tempco·ΔT below 25 °C), bipolar input"
	noteTypBipCold  = "typical × inflate_typ × (1 + ib_cold_tempco·ΔT below 25 °C), bipolar input"
)

// Figures returns the worst-case figures of part p at plan's temperature
// range and policy (DESIGN.md "Worst case and margins"):
//
//  1. the over-temperature limit (min_ot/max_ot) when the range leaves 25 °C;
//  2. else the guaranteed limit (min/max) moved to the range's extreme by the
//     figure's rule: Vos + drift·ΔT (drift max, else typical × inflate_typ,
//     ΔT the larger distance from 25 °C); FET-input (cmos, jfet) Ib and Ios
//     × 2^(ΔT/10 K) with ΔT the rise above 25 °C; other figures as given;
//  3. else the typical figure × derate_typ (bigger is better: GBW, slew,
//     output current; Aol derated as a linear gain) or × inflate_typ (smaller
//     is better: Vos, Ib, Ios, en, in, Iq), moved by the same rule.
//
// Basis is guaranteed for limits, typical or graph (Source "graph") for
// typical figures.
func Figures(p *catalog.Part, plan *Plan) PartFigures {
	w := newWorst(plan)
	dtAbs := math.Max(math.Abs(plan.TempLow-RoomTemp), math.Abs(plan.TempHigh-RoomTemp))
	dtHot := math.Max(0, plan.TempHigh-RoomTemp)
	f := PartFigures{
		GBW:  w.bigger(p.GBW),
		Slew: w.bigger(p.Slew),
		Iout: w.bigger(p.Iout),
		Aol:  w.biggerDB(p.Aol),
		En:   w.smaller(p.En),
		In:   w.smaller(p.In),
		Iq:   w.smaller(p.Iq),
		Vos:  w.vos(p.Vos, p.VosDrift, dtAbs),
		Ib:   w.leakage(p.Ib, p.Tech.FETInput(), dtHot),
		Ios:  w.leakage(p.Ios, p.Tech.FETInput(), dtHot),
	}
	if f.Aol.Known {
		f.AolRatio = circuit.FromDB(f.Aol.V)
	}
	f.GBWHigh = f.GBW
	f.GBW = w.speed(f.GBW, plan.SpeedTempco, dtAbs)
	f.Slew = w.speed(f.Slew, plan.SpeedTempco, dtAbs)
	if p.Tech == catalog.TechBipolar {
		dtCold := math.Max(0, RoomTemp-plan.TempLow)
		f.Ib = w.cold(f.Ib, plan.IbColdTempco, dtCold)
		f.Ios = w.cold(f.Ios, plan.IbColdTempco, dtCold)
	}
	if p.GBW.Typ.Known() {
		f.GBWHigh = Figure{p.GBW.Typ.V(), true, typBasis(p.GBW.Source), "typical, not derated (noise bandwidth)"}
	}
	f.Input = Window{Low: p.InputCM.Low.V(), High: p.InputCM.High.V(),
		LowKnown: p.InputCM.Low.Known(), HighKnown: p.InputCM.High.Known(), Basis: sourceBasis(p.InputCM.Source)}
	f.Output = Window{Low: p.Output.Low.V(), High: p.Output.High.V(),
		LowKnown: p.Output.Low.Known(), HighKnown: p.Output.High.Known(), Basis: sourceBasis(p.Output.Source)}
	if p.Output.Load.Known() {
		f.OutputLoad = p.Output.Load.V()
	}
	return f
}

// OutputAt returns the output swing window at a resistive load (Ω; 0 = no
// load). A swing stated at R_spec is scaled to a heavier load R_load <
// R_spec as headroom × R_spec/R_load: a linear output-resistance
// approximation (the drop across the output resistance grows with the
// current). scaled reports whether it was.
func (f *PartFigures) OutputAt(load float64) (w Window, scaled bool) {
	w = f.Output
	if load > 0 && f.OutputLoad > 0 && load < f.OutputLoad {
		k := f.OutputLoad / load
		w.Low *= k
		w.High *= k
		return w, true
	}
	return w, false
}

// sourceBasis maps a figure's source to the basis of a guaranteed-style
// figure (windows and swings have no typ/max split in the catalog).
func sourceBasis(s catalog.Source) Basis {
	if s == catalog.SourceGraph {
		return BasisGraph
	}
	if s == catalog.SourceEstimate {
		return BasisTypical
	}
	return BasisGuaranteed
}

// typBasis is the basis of a typical figure from source s.
func typBasis(s catalog.Source) Basis {
	if s == catalog.SourceGraph {
		return BasisGraph
	}
	return BasisTypical
}

// worst applies the figure-selection rules of one plan.
type worst struct {
	leaves          bool // the design's range leaves 25 °C
	derate, inflate float64
}

// newWorst returns the rules of plan (the default factors where the plan
// leaves them zero).
func newWorst(plan *Plan) worst {
	w := worst{leaves: plan.TempLow < RoomTemp || plan.TempHigh > RoomTemp,
		derate: plan.DerateTyp, inflate: plan.InflateTyp}
	if w.derate == 0 {
		w.derate = DefaultDerateTyp
	}
	if w.inflate == 0 {
		w.inflate = DefaultInflateTyp
	}
	return w
}

// WorstBound is the side a figure's worst case lies on: BoundMin for a
// bigger-is-better figure (gbw, slew, aol, iout, vdiff_max, cload), whose
// worst case is its lowest value, BoundMax for every other figure key
// (offset, bias and noise, supply current, cin, the noise corners).
func WorstBound(key string) Bound {
	switch key {
	case "gbw", "slew", "aol", "iout", "vdiff_max", "cload":
		return BoundMin
	}
	return BoundMax
}

// byKey returns the worst-case figure under a catalog figure key for the
// figures PartFigures holds.
func (f *PartFigures) byKey(key string) (Figure, bool) {
	switch key {
	case "gbw":
		return f.GBW, true
	case "slew":
		return f.Slew, true
	case "aol":
		return f.Aol, true
	case "iout":
		return f.Iout, true
	case "vos":
		return f.Vos, true
	case "ib":
		return f.Ib, true
	case "ios":
		return f.Ios, true
	case "en":
		return f.En, true
	case "in":
		return f.In, true
	case "iq":
		return f.Iq, true
	}
	return Figure{}, false
}

// FigureFor returns the worst-case figure of part p under a catalog figure
// key ("vos", "gbw", "cload", …) for a bound: BoundMin asks for the lowest
// value the part may have over the plan's range, BoundMax the highest. f
// holds p's Figures at plan.
//
// On the side of a figure's worst case (WorstBound: the lower side of gbw,
// slew, aol, iout, the upper side of vos, ib, ios, en, in, iq) this is the
// figure every other check uses, with all its temperature rules. vos_drift's upper side is its max, else
// typical × inflate_typ. Against the direction (a ceiling on GBW, a floor
// on offset) the mirror rule applies without temperature moves: the upper
// side is max_ot / max / typical × inflate_typ, the lower side min_ot / min
// / typical × derate_typ (a dB figure moves by 20·log10 of the factor). A
// single-quantity key (vdiff_max, cload, cin, en_corner, in_corner) is
// its stated value, guaranteed, on both sides. ok is false for a key that
// is no figure.
func FigureFor(p *catalog.Part, f *PartFigures, plan *Plan, key string, b Bound) (fig Figure, ok bool) {
	if v, ok := p.Scalar(key); ok {
		return Figure{V: v.V(), Known: v.Known(), Basis: BasisGuaranteed}, true
	}
	s, ok := p.Spec(key)
	if !ok {
		return Figure{}, false
	}
	if b == WorstBound(key) {
		if fig, ok := f.byKey(key); ok {
			return fig, true
		}
	}
	w := newWorst(plan)
	if b == BoundMin {
		return w.bigger(s), true
	}
	fig = w.smaller(s)
	if key == "aol" && fig.Known && fig.Basis != BasisGuaranteed {
		fig.V = s.Typ.V() + circuit.DB(w.inflate)
	}
	return fig, true
}

func (w worst) bigger(s catalog.Spec) Figure {
	switch {
	case w.leaves && s.MinOT.Known():
		return Figure{s.MinOT.V(), true, BasisGuaranteed, noteOT}
	case s.Min.Known():
		return Figure{s.Min.V(), true, BasisGuaranteed, roomNote(w.leaves)}
	case s.MinOT.Known():
		return Figure{s.MinOT.V(), true, BasisGuaranteed, noteOTRoom}
	case s.Typ.Known():
		return Figure{s.Typ.V() * w.derate, true, typBasis(s.Source), typNote(s.Source, noteDerate)}
	}
	return Figure{}
}

// biggerDB is bigger for a figure in dB: the typical is derated as a linear
// gain (× derate_typ = + 20·log10(derate_typ) dB).
func (w worst) biggerDB(s catalog.Spec) Figure {
	f := w.bigger(s)
	if f.Known && f.Basis != BasisGuaranteed {
		f.V = s.Typ.V() + circuit.DB(w.derate)
	}
	return f
}

func (w worst) smaller(s catalog.Spec) Figure {
	switch {
	case w.leaves && s.MaxOT.Known():
		return Figure{s.MaxOT.V(), true, BasisGuaranteed, noteOT}
	case s.Max.Known():
		return Figure{s.Max.V(), true, BasisGuaranteed, roomNote(w.leaves)}
	case s.MaxOT.Known():
		return Figure{s.MaxOT.V(), true, BasisGuaranteed, noteOTRoom}
	case s.Typ.Known():
		return Figure{s.Typ.V() * w.inflate, true, typBasis(s.Source), typNote(s.Source, noteInflate)}
	}
	return Figure{}
}

// vos moves the offset to the design's temperature extreme by its drift.
func (w worst) vos(s, drift catalog.Spec, dt float64) Figure {
	f := w.smaller(s)
	if !f.Known || !w.leaves || isOT(f.Note) {
		return f
	}
	d, typDrift := math.NaN(), false
	switch {
	case drift.Max.Known():
		d = drift.Max.V()
	case drift.Typ.Known():
		d, typDrift = drift.Typ.V()*w.inflate, true
	}
	if math.IsNaN(d) {
		if f.Basis == BasisGuaranteed {
			f.Note = noteRoomNoDrift
		}
		return f
	}
	f.V += math.Abs(d) * dt
	switch {
	case f.Basis == BasisGuaranteed && typDrift:
		// Part of the figure rests on a typical drift: it is no longer a
		// guaranteed value, and its basis says so.
		f.Basis = weaker(f.Basis, typBasis(drift.Source))
		f.Note = noteTypDrift
	case f.Basis == BasisGuaranteed:
		f.Note = noteDrift
	default:
		f.Note = noteInflDrift
		if typDrift {
			f.Basis = weaker(f.Basis, typBasis(drift.Source))
		}
	}
	return f
}

// leakage moves a FET-input bias or offset current to the hottest point:
// gate leakage doubles every FETDoubling kelvin above 25 °C.
func (w worst) leakage(s catalog.Spec, fet bool, dtHot float64) Figure {
	f := w.smaller(s)
	if !f.Known || !fet || dtHot == 0 || isOT(f.Note) {
		return f
	}
	f.V *= math.Exp2(dtHot / FETDoubling)
	if f.Basis == BasisGuaranteed {
		f.Note = noteFET
	} else {
		f.Note = noteInflFET
	}
	return f
}

func roomNote(leaves bool) string {
	if leaves {
		return noteRoom
	}
	return ""
}

func typNote(s catalog.Source, note string) string {
	if s == catalog.SourceEstimate {
		return noteEstimate + "; " + note
	}
	return note
}

// isOT reports whether a figure came from an over-temperature limit, which
// already covers the range and is not moved further.
func isOT(note string) bool { return note == noteOT || note == noteOTRoom }

// speed lowers a GBW or slew figure given at 25 °C by k per kelvin of
// dtAbs (policy.speed_tempco); over-temperature limits already hold over
// the range and are left alone.
func (w worst) speed(f Figure, k, dtAbs float64) Figure {
	if !f.Known || !w.leaves || k == 0 || isOT(f.Note) {
		return f
	}
	f.V *= math.Max(0, 1-k*dtAbs)
	if f.Basis == BasisGuaranteed {
		f.Note = noteSpeedTemp
	} else {
		f.Note = noteTypSpeed
	}
	return f
}

// cold raises a bipolar bias or offset current given at 25 °C by k per
// kelvin below 25 °C (policy.ib_cold_tempco).
func (w worst) cold(f Figure, k, dtCold float64) Figure {
	if !f.Known || dtCold == 0 || k == 0 || isOT(f.Note) {
		return f
	}
	f.V *= 1 + k*dtCold
	if f.Basis == BasisGuaranteed {
		f.Note = noteBipCold
	} else {
		f.Note = noteTypBipCold
	}
	return f
}

// TypicalFor returns the typical figure of part p under a catalog figure
// key, as the catalog gives it (not derated or inflated), with basis
// typical or graph; a single-quantity key is its stated value, guaranteed.
// Known is false when the catalog gives no typical; ok is false for a key
// that is no figure.
func TypicalFor(p *catalog.Part, key string) (fig Figure, ok bool) {
	if v, ok := p.Scalar(key); ok {
		return Figure{V: v.V(), Known: v.Known(), Basis: BasisGuaranteed}, true
	}
	s, ok := p.Spec(key)
	if !ok {
		return Figure{}, false
	}
	if !s.Typ.Known() {
		return Figure{}, true
	}
	return Figure{V: s.Typ.V(), Known: true, Basis: typBasis(s.Source)}, true
}
