package filter_test

import (
	"math"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// planAt derives a minimal design at an ambient range, with a policy.
func planAt(t *testing.T, temp, policy string) *filter.Plan {
	t.Helper()
	text := "title = \"t\"\n[supply]\npos = \"5 V\"\n"
	if temp != "" {
		text += "[environment]\ntemp = " + temp + "\n"
	}
	if policy != "" {
		text += "[policy]\n" + policy + "\n"
	}
	text += "[[stage]]\nname = \"s\"\nkind = \"follower\"\nsignal = { peak = \"0.1 V\", freq = \"1 kHz\" }\n"
	_, p := mustDesign(t, text)
	return p
}

// Each worst-case rule of DESIGN.md "Worst case and margins", worked by hand.
func TestFigureRules(t *testing.T) {
	const hot = `["-40 C", "85 C"]` // ΔT = 65 K from 25 °C; 60 K above
	tests := []struct {
		name   string
		temp   string
		policy string
		set    func(p *catalog.Part)
		get    func(f filter.PartFigures) filter.Figure
		want   float64
		basis  filter.Basis
	}{
		{"over-temperature min used when the range leaves 25 C", hot, "",
			func(p *catalog.Part) { p.GBW = catalog.Spec{Typ: opt(1e6), Min: opt(0.8e6), MinOT: opt(0.6e6)} },
			func(f filter.PartFigures) filter.Figure { return f.GBW }, 0.6e6, filter.BasisGuaranteed},
		{"25 C min used at 25 C even with an OT limit", "", "",
			func(p *catalog.Part) { p.GBW = catalog.Spec{Typ: opt(1e6), Min: opt(0.8e6), MinOT: opt(0.6e6)} },
			func(f filter.PartFigures) filter.Figure { return f.GBW }, 0.8e6, filter.BasisGuaranteed},
		{"typical derated by the default 0.7", "", "",
			func(p *catalog.Part) { p.Slew = catalog.Spec{Typ: opt(1e6)} },
			func(f filter.PartFigures) filter.Figure { return f.Slew }, 0.7e6, filter.BasisTypical},
		{"typical from a graph derated, basis graph", "", "derate_typ = 0.5",
			func(p *catalog.Part) { p.Slew = catalog.Spec{Typ: opt(1e6), Source: catalog.SourceGraph} },
			func(f filter.PartFigures) filter.Figure { return f.Slew }, 0.5e6, filter.BasisGraph},
		{"typical Iq inflated by the default 2", "", "",
			func(p *catalog.Part) { p.Iq = catalog.Spec{Typ: opt(1e-3)} },
			func(f filter.PartFigures) filter.Figure { return f.Iq }, 2e-3, filter.BasisTypical},
		{"typical Iq inflated by policy 3", "", "inflate_typ = 3",
			func(p *catalog.Part) { p.Iq = catalog.Spec{Typ: opt(1e-3)} },
			func(f filter.PartFigures) filter.Figure { return f.Iq }, 3e-3, filter.BasisTypical},
		{"Aol typical derated as a linear gain: 100 dB × 0.7 = 96.9 dB", "", "",
			func(p *catalog.Part) { p.Aol = catalog.Spec{Typ: opt(100)} },
			func(f filter.PartFigures) filter.Figure { return f.Aol }, 100 + 20*math.Log10(0.7), filter.BasisTypical},
		{"Vos max_ot used when the range leaves 25 C", hot, "",
			func(p *catalog.Part) { p.Vos = catalog.Spec{Max: opt(1e-3), MaxOT: opt(1.5e-3)} },
			func(f filter.PartFigures) filter.Figure { return f.Vos }, 1.5e-3, filter.BasisGuaranteed},
		{"Vos max + drift max · 65 K", hot, "",
			func(p *catalog.Part) {
				p.Vos = catalog.Spec{Max: opt(1e-3)}
				p.VosDrift = catalog.Spec{Typ: opt(2e-6), Max: opt(5e-6)}
			},
			func(f filter.PartFigures) filter.Figure { return f.Vos }, 1e-3 + 5e-6*65, filter.BasisGuaranteed},
		{"Vos max + typical drift × 2 · 65 K: typical, part of it rests on a typical", hot, "",
			func(p *catalog.Part) {
				p.Vos = catalog.Spec{Max: opt(1e-3)}
				p.VosDrift = catalog.Spec{Typ: opt(2e-6)}
			},
			func(f filter.PartFigures) filter.Figure { return f.Vos }, 1e-3 + 2*2e-6*65, filter.BasisTypical},
		{"Vos ΔT is the larger distance from 25 C (cold side)", `["-55 C", "30 C"]`, "",
			func(p *catalog.Part) {
				p.Vos = catalog.Spec{Max: opt(1e-3)}
				p.VosDrift = catalog.Spec{Max: opt(5e-6)}
			},
			func(f filter.PartFigures) filter.Figure { return f.Vos }, 1e-3 + 5e-6*80, filter.BasisGuaranteed},
		{"Vos at 25 C is not moved", "", "",
			func(p *catalog.Part) {
				p.Vos = catalog.Spec{Max: opt(1e-3)}
				p.VosDrift = catalog.Spec{Max: opt(5e-6)}
			},
			func(f filter.PartFigures) filter.Figure { return f.Vos }, 1e-3, filter.BasisGuaranteed},
		{"typical Vos inflated plus drift", hot, "",
			func(p *catalog.Part) {
				p.Vos = catalog.Spec{Typ: opt(1e-3)}
				p.VosDrift = catalog.Spec{Max: opt(5e-6)}
			},
			func(f filter.PartFigures) filter.Figure { return f.Vos }, 2e-3 + 5e-6*65, filter.BasisTypical},
		{"FET Ib doubles every 10 K above 25 C: 60 K is × 64", hot, "",
			func(p *catalog.Part) { p.Tech = catalog.TechJFET; p.Ib = catalog.Spec{Max: opt(10e-12)} },
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 10e-12 * 64, filter.BasisGuaranteed},
		{"CMOS Ib doubling, 35 K", `["0 C", "60 C"]`, "",
			func(p *catalog.Part) { p.Tech = catalog.TechCMOS; p.Ib = catalog.Spec{Max: opt(1e-12)} },
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 1e-12 * math.Pow(2, 3.5), filter.BasisGuaranteed},
		{"FET Ib max_ot wins over doubling", hot, "",
			func(p *catalog.Part) {
				p.Tech = catalog.TechJFET
				p.Ib = catalog.Spec{Max: opt(10e-12), MaxOT: opt(2e-9)}
			},
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 2e-9, filter.BasisGuaranteed},
		{"bipolar Ib not doubled hot, raised at cold: × (1 + 0.0125·65 K) = 1.8125", hot, "",
			func(p *catalog.Part) { p.Tech = catalog.TechBipolar; p.Ib = catalog.Spec{Max: opt(100e-9)} },
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 181.25e-9, filter.BasisGuaranteed},
		{"bipolar Ib only hot: not raised", `["25 C", "85 C"]`, "",
			func(p *catalog.Part) { p.Tech = catalog.TechBipolar; p.Ib = catalog.Spec{Max: opt(100e-9)} },
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 100e-9, filter.BasisGuaranteed},
		{"bipolar Ib cold rise by policy 0.01: × 1.65", hot, "ib_cold_tempco = 0.01",
			func(p *catalog.Part) { p.Tech = catalog.TechBipolar; p.Ib = catalog.Spec{Max: opt(100e-9)} },
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 165e-9, filter.BasisGuaranteed},
		{"bipolar Ib max_ot is not raised again", hot, "",
			func(p *catalog.Part) {
				p.Tech = catalog.TechBipolar
				p.Ib = catalog.Spec{Max: opt(100e-9), MaxOT: opt(250e-9)}
			},
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 250e-9, filter.BasisGuaranteed},
		{"25 C GBW limit lowered over temperature: × (1 − 0.002·65 K) = 0.87", hot, "",
			func(p *catalog.Part) { p.GBW = catalog.Spec{Min: opt(1e6)} },
			func(f filter.PartFigures) filter.Figure { return f.GBW }, 0.87e6, filter.BasisGuaranteed},
		{"typical slew derated, then lowered: 0.7 × 0.87", hot, "",
			func(p *catalog.Part) { p.Slew = catalog.Spec{Typ: opt(1e6)} },
			func(f filter.PartFigures) filter.Figure { return f.Slew }, 0.7 * 0.87 * 1e6, filter.BasisTypical},
		{"speed_tempco 0 leaves GBW alone", hot, "speed_tempco = 0",
			func(p *catalog.Part) { p.GBW = catalog.Spec{Min: opt(1e6)} },
			func(f filter.PartFigures) filter.Figure { return f.GBW }, 1e6, filter.BasisGuaranteed},
		{"max_ot alone is used at 25 C (the rated range includes 25 C)", "", "",
			func(p *catalog.Part) { p.Vos = catalog.Spec{Typ: opt(0.1e-3), MaxOT: opt(9e-3)} },
			func(f filter.PartFigures) filter.Figure { return f.Vos }, 9e-3, filter.BasisGuaranteed},
		{"min_ot alone is used at 25 C", "", "",
			func(p *catalog.Part) { p.GBW = catalog.Spec{MinOT: opt(0.6e6)} },
			func(f filter.PartFigures) filter.Figure { return f.GBW }, 0.6e6, filter.BasisGuaranteed},
		{"FET Ib not doubled when the range stays at or below 25 C", `["-40 C", "25 C"]`, "",
			func(p *catalog.Part) { p.Tech = catalog.TechJFET; p.Ib = catalog.Spec{Max: opt(10e-12)} },
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 10e-12, filter.BasisGuaranteed},
		{"FET typical Ib inflated then doubled", hot, "",
			func(p *catalog.Part) { p.Tech = catalog.TechJFET; p.Ib = catalog.Spec{Typ: opt(5e-12)} },
			func(f filter.PartFigures) filter.Figure { return f.Ib }, 5e-12 * 2 * 64, filter.BasisTypical},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := planAt(t, tc.temp, tc.policy)
			part := basePart("x")
			tc.set(part)
			f := tc.get(filter.Figures(part, p))
			if !f.Known {
				t.Fatalf("figure unknown")
			}
			near(t, "figure", f.V, tc.want, 1e-12)
			if f.Basis != tc.basis {
				t.Errorf("basis = %s, want %s", f.Basis, tc.basis)
			}
		})
	}
}

// A figure given only as max_ot was unknown at 25 °C, so a part whose
// worst-case DC error is 9 mV·NG against 50 mV allowed ranked without
// --strict. The OT bound includes 25 °C: now it is used and the check
// fails. By hand: NG 45 × 9 mV = 405 mV > 50 mV.
func TestMaxOTAtRoom(t *testing.T) {
	_, p := mustDesign(t, sineDesign("pos = \"15 V\"\nneg = \"-15 V\"",
		"kind = \"noninverting\"\ngain = 45\nref = \"0 V\"\nsignal = { peak = \"0.1 V\", freq = \"1 Hz\" }\ndc_error = \"50 mV\""))
	part := basePart("x")
	part.Vos = catalog.Spec{MaxOT: opt(9e-3)}
	c := check(t, evalOne(t, p, part, filter.Options{}), "s", filter.KeyDCError)
	if c.Status != filter.StatusFail {
		t.Fatalf("status %s, want fail", c.Status)
	}
	near(t, "dc error", c.Available, 45*9e-3, 1e-12)
}

// A figure the catalog lacks is unknown: no margin, no pass, left out of
// the worst margin; strict fails the candidate.
func TestUnknownFigure(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "5 V"`, `kind = "follower"`+"\n"+`signal = { peak = "0.1 V", freq = "1 kHz" }`))
	part := basePart("x")
	part.Aol = catalog.Spec{}
	r := evalOne(t, p, part, filter.Options{})
	c := check(t, r, "s", filter.KeyAol)
	if c.Status != filter.StatusUnknown || c.HasMargin() || c.Pass {
		t.Errorf("aol check = %s, margin %v, pass %v; want unknown, none, false", c.Status, c.Margin, c.Pass)
	}
	if !r.Pass || r.Unknown != 1 {
		t.Errorf("result pass = %v unknown = %d, want true 1", r.Pass, r.Unknown)
	}
	if r.Binding.Key == filter.KeyAol {
		t.Errorf("binding is the unknown check")
	}
	if rs := evalOne(t, p, part, filter.Options{Strict: true}); rs.Pass {
		t.Errorf("strict: unknown aol still passes")
	}
}
