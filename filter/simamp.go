package filter

import (
	"fmt"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

// SimFigure is one part figure a simulation used, as it was resolved: Name is
// the catalog key ("gbw", "slew", "aol", "output", "input_cm"), V the value
// in SI (dB for aol; for the windows the low end, High the high end, V),
// Basis "guaranteed", "typical", "graph" or "assumed", and Note the rule
// applied ("typical × derate_typ").
type SimFigure struct {
	Name  string
	V     float64
	High  float64
	Dim   catalog.Dim
	Basis string
	Note  string
}

// String shows the figure for a header line:
// "slew 0.35 V/µs [graph: typical × derate_typ]".
func (f SimFigure) String() string {
	v := catalog.Format(f.V, f.Dim)
	if f.Name == "output" || f.Name == "input_cm" {
		v += " … " + catalog.Format(f.High, f.Dim)
	}
	why := f.Basis
	if f.Note != "" {
		why += ": " + f.Note
	}
	if why == "" {
		return f.Name + " " + v
	}
	return f.Name + " " + v + " [" + why + "]"
}

// SimAmp is the amp BuildAmp resolved for one part in one stage, with the
// figures it was built from and the choices made.
type SimAmp struct {
	// Amp is what the time-domain model runs.
	Amp sim.Amp
	// Figures are the part figures Amp was built from, with their basis.
	Figures []SimFigure
	// Notes are the choices and assumptions made (an assumed Aol, a swing
	// taken to the rail where the catalog lacks it).
	Notes []string
	// Worst is the part's worst-case figures in the design (Figures).
	Worst   PartFigures
	cmLow   float64 // the known sides of the CM range, for CheckCM
	cmHigh  float64
	cmLowK  bool
	cmHighK bool
}

// BuildAmp resolves the part's amp for one stage of plan: worst-case
// figures (Figures) or, with typical, the typical ones; the swing at the
// design's rails (at their tolerance extremes for worst case, nominal for
// typical) and the stage's load; and the input common-mode range at the
// same rails. The waveform preview and the simulated thd check both build
// their amp here.
func BuildAmp(plan *Plan, sp *StagePlan, p *catalog.Part, typical bool) (SimAmp, error) {
	f := Figures(p, plan)
	return buildAmp(plan, sp, p, &f, typical)
}

// buildAmp is BuildAmp on the part's worst-case figures f, already computed.
func buildAmp(plan *Plan, sp *StagePlan, p *catalog.Part, f *PartFigures, typical bool) (SimAmp, error) {
	b := SimAmp{Worst: *f}
	pick := func(name string, worst Figure, typ catalog.Spec, dim catalog.Dim) (SimFigure, bool) {
		if typical && typ.Typ.Known() {
			basis := "typical"
			if typ.Source == catalog.SourceGraph {
				basis = "graph"
			}
			return SimFigure{Name: name, V: typ.Typ.V(), Dim: dim, Basis: basis, Note: "typical, not derated"}, true
		}
		if !worst.Known {
			return SimFigure{}, false
		}
		fig := SimFigure{Name: name, V: worst.V, Dim: dim, Basis: worst.Basis.String(), Note: worst.Note}
		if typical {
			b.Notes = append(b.Notes, fmt.Sprintf("no typical %s in the catalog; the worst-case figure is used", name))
		}
		return fig, true
	}
	gbw, ok := pick("gbw", f.GBW, p.GBW, catalog.Hertz)
	if !ok {
		return b, fmt.Errorf("part %q: field \"gbw\": the catalog gives no figure, and the simulation needs gbw and slew", p.ID)
	}
	slew, ok := pick("slew", f.Slew, p.Slew, catalog.VoltPerSecond)
	if !ok {
		return b, fmt.Errorf("part %q: field \"slew\": the catalog gives no figure, and the simulation needs gbw and slew", p.ID)
	}
	aol, ok := pick("aol", f.Aol, p.Aol, catalog.Decibel)
	if !ok {
		aol = SimFigure{Name: "aol", V: assumedAolDB, Dim: catalog.Decibel, Basis: "assumed"}
		b.Notes = append(b.Notes, fmt.Sprintf("no aol in the catalog; %s assumed (it sets only the loop's DC error)",
			catalog.Format(assumedAolDB, catalog.Decibel)))
	}
	if !(gbw.V > 0) || !(slew.V > 0) || !(aol.V > 0) {
		return b, fmt.Errorf("part %q: gbw %s, slew %s, aol %s: want all above zero for the simulation", p.ID,
			catalog.Format(gbw.V, catalog.Hertz), catalog.Format(slew.V, catalog.VoltPerSecond), catalog.Format(aol.V, catalog.Decibel))
	}
	b.Figures = append(b.Figures, gbw, slew, aol)
	b.Amp = sim.Amp{Aol: circuit.FromDB(aol.V), GBW: gbw.V, SlewRise: slew.V}

	// The rails: at their tolerance extremes for worst case, as the
	// output_range and input_range checks take them; nominal for typical.
	neg, pos := plan.Rails.NegWorst, plan.Rails.PosWorst
	railNote := "rails at tolerance"
	if typical {
		neg, pos = plan.Rails.Neg, plan.Rails.Pos
		railNote = "nominal rails"
	}
	w, scaled := f.OutputAt(sp.SwingLoad())
	vol, voh := neg, pos
	outNote := railNote
	if w.LowKnown {
		vol = neg + w.Low
	}
	if w.HighKnown {
		voh = pos + w.High
	}
	if !w.LowKnown || !w.HighKnown {
		b.Notes = append(b.Notes, "the catalog lacks part of the output swing; the output is taken to reach the rail on that side")
	}
	switch {
	case scaled:
		outNote += fmt.Sprintf(", scaled to the %s load", catalog.Format(sp.LoadR, catalog.Ohm))
	case sp.LoadR > 0 && f.OutputLoad == 0:
		outNote += ", swing load not stated; used as given"
	}
	if !(voh > vol) {
		return b, fmt.Errorf("part %q: output swing %s … %s at the design's rails (%s … %s) is empty",
			p.ID, catalog.Format(vol, catalog.Volt), catalog.Format(voh, catalog.Volt),
			catalog.Format(neg, catalog.Volt), catalog.Format(pos, catalog.Volt))
	}
	b.Amp.VOL, b.Amp.VOH = vol, voh
	b.Figures = append(b.Figures, SimFigure{Name: "output", V: vol, High: voh, Dim: catalog.Volt, Basis: w.Basis.String(), Note: outNote})

	in := f.Input
	b.cmLow, b.cmHigh = neg+in.Low, pos+in.High
	b.cmLowK, b.cmHighK = in.LowKnown, in.HighKnown
	switch {
	case in.LowKnown && in.HighKnown && b.cmHigh > b.cmLow:
		b.Amp.CMLow, b.Amp.CMHigh = b.cmLow, b.cmHigh
		b.Figures = append(b.Figures, SimFigure{Name: "input_cm", V: b.cmLow, High: b.cmHigh, Dim: catalog.Volt,
			Basis: in.Basis.String(), Note: railNote})
	case in.LowKnown && in.HighKnown:
		b.Notes = append(b.Notes, fmt.Sprintf("input common-mode range %s … %s at the design's rails is empty",
			catalog.Format(b.cmLow, catalog.Volt), catalog.Format(b.cmHigh, catalog.Volt)))
	case !in.LowKnown && !in.HighKnown:
		b.Notes = append(b.Notes, "the catalog gives no input common-mode range; it is not checked")
	}
	return b, nil
}

// CheckCM flags an input common-mode excursion beyond a range the catalog
// gives only one side of (the model checks full ranges itself).
func (b *SimAmp) CheckCM(m *sim.Metrics) []string {
	if b.Amp.CMHigh > b.Amp.CMLow || (!b.cmLowK && !b.cmHighK) {
		return nil
	}
	var out []string
	if b.cmLowK && m.InputLow < b.cmLow {
		out = append(out, fmt.Sprintf("input pins go down to %s, below the common-mode range's low end %s",
			catalog.Format(m.InputLow, catalog.Volt), catalog.Format(b.cmLow, catalog.Volt)))
	}
	if b.cmHighK && m.InputHigh > b.cmHigh {
		out = append(out, fmt.Sprintf("input pins go up to %s, above the common-mode range's high end %s",
			catalog.Format(m.InputHigh, catalog.Volt), catalog.Format(b.cmHigh, catalog.Volt)))
	}
	if len(out) == 0 {
		side := "high"
		if b.cmHighK {
			side = "low"
		}
		out = append(out, fmt.Sprintf("the catalog gives only one side of the input common-mode range; the %s side is not checked", side))
	}
	return out
}
