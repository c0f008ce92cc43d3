package preview

import (
	"fmt"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

// Figure is one part figure the preview used, as it was resolved: Name is
// the catalog key ("gbw", "slew", "aol", "output", "input_cm"), V the value
// in SI (dB for aol; for the windows the low end, High the high end, V),
// Basis "guaranteed", "typical", "graph" or "assumed", and Note the rule
// applied ("typical × derate_typ").
type Figure struct {
	Name  string
	V     float64
	High  float64
	Dim   catalog.Dim
	Basis string
	Note  string
}

// String shows the figure for a header line:
// "slew 0.35 V/µs [graph: typical × derate_typ]".
func (f Figure) String() string {
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

// ampBuild is what buildAmp resolved.
type ampBuild struct {
	amp     sim.Amp
	figs    []Figure
	notes   []string
	cmLow   float64 // the known sides of the CM range, for the adapter's own check
	cmHigh  float64
	cmLowK  bool
	cmHighK bool
	worst   filter.PartFigures
}

// buildAmp resolves the part's amp for one stage: worst-case figures
// (filter.Figures) or typical ones, the swing at the design's rails and
// the stage's load, and the input common-mode range at the same rails.
func buildAmp(plan *filter.Plan, sp *filter.StagePlan, p *catalog.Part, typical bool) (ampBuild, error) {
	var b ampBuild
	b.worst = filter.Figures(p, plan)
	f := &b.worst
	pick := func(name string, worst filter.Figure, typ catalog.Spec, dim catalog.Dim) (Figure, bool) {
		if typical && typ.Typ.Known() {
			basis := "typical"
			if typ.Source == catalog.SourceGraph {
				basis = "graph"
			}
			return Figure{Name: name, V: typ.Typ.V(), Dim: dim, Basis: basis, Note: "typical, not derated"}, true
		}
		if !worst.Known {
			return Figure{}, false
		}
		fig := Figure{Name: name, V: worst.V, Dim: dim, Basis: worst.Basis.String(), Note: worst.Note}
		if typical {
			b.notes = append(b.notes, fmt.Sprintf("no typical %s in the catalog; the worst-case figure is used", name))
		}
		return fig, true
	}
	gbw, ok := pick("gbw", f.GBW, p.GBW, catalog.Hertz)
	if !ok {
		return b, fmt.Errorf("part %q: field \"gbw\": the catalog gives no figure, and the preview needs gbw and slew", p.ID)
	}
	slew, ok := pick("slew", f.Slew, p.Slew, catalog.VoltPerSecond)
	if !ok {
		return b, fmt.Errorf("part %q: field \"slew\": the catalog gives no figure, and the preview needs gbw and slew", p.ID)
	}
	aol, ok := pick("aol", f.Aol, p.Aol, catalog.Decibel)
	if !ok {
		aol = Figure{Name: "aol", V: assumedAolDB, Dim: catalog.Decibel, Basis: "assumed"}
		b.notes = append(b.notes, fmt.Sprintf("no aol in the catalog; %s assumed (it sets only the loop's DC error)",
			catalog.Format(assumedAolDB, catalog.Decibel)))
	}
	if !(gbw.V > 0) || !(slew.V > 0) || !(aol.V > 0) {
		return b, fmt.Errorf("part %q: gbw %s, slew %s, aol %s: want all above zero for the preview", p.ID,
			catalog.Format(gbw.V, catalog.Hertz), catalog.Format(slew.V, catalog.VoltPerSecond), catalog.Format(aol.V, catalog.Decibel))
	}
	b.figs = append(b.figs, gbw, slew, aol)
	b.amp = sim.Amp{Aol: circuit.FromDB(aol.V), GBW: gbw.V, SlewRise: slew.V}

	// The rails: at their tolerance extremes for worst case, as the
	// output_range and input_range checks take them; nominal for typical.
	neg, pos := plan.Rails.NegWorst, plan.Rails.PosWorst
	railNote := "rails at tolerance"
	if typical {
		neg, pos = plan.Rails.Neg, plan.Rails.Pos
		railNote = "nominal rails"
	}
	w, scaled := f.OutputAt(sp.LoadR)
	vol, voh := neg, pos
	outNote := railNote
	if w.LowKnown {
		vol = neg + w.Low
	}
	if w.HighKnown {
		voh = pos + w.High
	}
	if !w.LowKnown || !w.HighKnown {
		b.notes = append(b.notes, "the catalog lacks part of the output swing; the output is taken to reach the rail on that side")
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
	b.amp.VOL, b.amp.VOH = vol, voh
	b.figs = append(b.figs, Figure{Name: "output", V: vol, High: voh, Dim: catalog.Volt, Basis: w.Basis.String(), Note: outNote})

	in := f.Input
	b.cmLow, b.cmHigh = neg+in.Low, pos+in.High
	b.cmLowK, b.cmHighK = in.LowKnown, in.HighKnown
	switch {
	case in.LowKnown && in.HighKnown && b.cmHigh > b.cmLow:
		b.amp.CMLow, b.amp.CMHigh = b.cmLow, b.cmHigh
		b.figs = append(b.figs, Figure{Name: "input_cm", V: b.cmLow, High: b.cmHigh, Dim: catalog.Volt,
			Basis: in.Basis.String(), Note: railNote})
	case in.LowKnown && in.HighKnown:
		b.notes = append(b.notes, fmt.Sprintf("input common-mode range %s … %s at the design's rails is empty",
			catalog.Format(b.cmLow, catalog.Volt), catalog.Format(b.cmHigh, catalog.Volt)))
	case !in.LowKnown && !in.HighKnown:
		b.notes = append(b.notes, "the catalog gives no input common-mode range; it is not checked")
	}
	return b, nil
}

// checkCM flags an input common-mode excursion beyond a range the catalog
// gives only one side of (the model checks full ranges itself).
func (b *ampBuild) checkCM(m *sim.Metrics) []string {
	if b.amp.CMHigh > b.amp.CMLow || (!b.cmLowK && !b.cmHighK) {
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
