package replace

import (
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
)

// setTyp gives part p a single typical (or rating) figure for key, so a
// test can state each field's direction on its own.
func setTyp(p *catalog.Part, key string, v float64) {
	o := catalog.Some(v)
	s := catalog.Spec{Typ: o}
	switch key {
	case "supply_min":
		p.Supply.Min = o
	case "supply_max":
		p.Supply.Max = o
	case "input_cm_low":
		p.InputCM.Low = o
	case "input_cm_high":
		p.InputCM.High = o
	case "output_low":
		p.Output.Low = o
	case "output_high":
		p.Output.High = o
	case "gbw":
		p.GBW = s
	case "slew":
		p.Slew = s
	case "aol":
		p.Aol = s
	case "vos":
		p.Vos = s
	case "vos_drift":
		p.VosDrift = s
	case "ib":
		p.Ib = s
	case "ios":
		p.Ios = s
	case "en":
		p.En = s
	case "in":
		p.In = s
	case "iq":
		p.Iq = s
	case "iout":
		p.Iout = s
	case "temp_low":
		p.Temp[0] = o
	case "temp_high":
		p.Temp[1] = o
	case "vdiff_max":
		p.VdiffMax = o
	case "cload":
		p.CLoad = o
	case "en_corner":
		p.EnCorner = o
	case "in_corner":
		p.InCorner = o
	default:
		panic("setTyp: unknown key " + key)
	}
}

// TestVerdictRules states, for every compared field, which way is better.
// Directions are the trade's reading of a datasheet (common practice, no
// source): a part that runs from lower and to higher supplies, whose input
// range and output swing reach further toward (or past) the rails, that is
// faster, has more gain, drive, differential-input rating and stable
// capacitive load, a wider temperature range, and less offset, drift, bias
// current, noise and supply current is the better part.
func TestVerdictRules(t *testing.T) {
	tests := []struct {
		key        string
		orig, cand float64
		want       Verdict
	}{
		{"supply_min", 3, 2.7, Better},
		{"supply_min", 3, 5, Worse},
		{"supply_min", 3, 3.05, Same},
		{"supply_max", 32, 16, Worse},
		{"supply_max", 16, 36, Better},
		{"input_cm_low", 0, -0.1, Better}, // past V−
		{"input_cm_low", 0, 0.5, Worse},
		{"input_cm_low", 0, 0.003, Same}, // within 5 mV of the rail
		{"input_cm_high", -1.5, 0.1, Better},
		{"input_cm_high", -1.5, -2, Worse},
		{"input_cm_high", -1.5, -1.52, Same},
		{"output_low", 0.02, 0.005, Better},
		{"output_low", 0.02, 1, Worse},
		{"output_high", -1.5, -0.02, Better},
		{"output_high", -0.02, -1.5, Worse},
		{"gbw", 1e6, 3e6, Better},
		{"gbw", 1e6, 0.5e6, Worse},
		{"gbw", 1e6, 1.019e6, Same}, // 1.9 %: inside the 2 % tolerance
		{"gbw", 1e6, 1.03e6, Better},
		{"slew", 0.5e6, 5e6, Better},
		{"slew", 5e6, 0.5e6, Worse},
		{"aol", 100, 120, Better},
		{"aol", 100, 100.1, Same}, // 0.1 dB ≈ 1.2 % in V/V
		{"aol", 100, 90, Worse},
		{"vos", 2e-3, 1e-3, Better},
		{"vos", -2e-3, 1e-3, Better}, // magnitudes: offsets are signed
		{"vos", 1e-3, 5e-3, Worse},
		{"vos_drift", 7e-6, 1e-6, Better},
		{"vos_drift", 1e-6, 7e-6, Worse},
		{"ib", 20e-9, 1e-12, Better},
		{"ib", -20e-9, 45e-9, Worse},
		{"ios", 2e-9, 10e-9, Worse},
		{"en", 35e-9, 8e-9, Better},
		{"in", 0.1e-12, 1e-12, Worse},
		{"iq", 0.35e-3, 1e-3, Worse},
		{"iq", 0.35e-3, 0.1e-3, Better},
		{"iout", 30e-3, 10e-3, Worse},
		{"iout", 10e-3, 30e-3, Better},
		{"temp_low", -40, 0, Worse},
		{"temp_low", 0, -40, Better},
		{"temp_low", -40, -40.3, Same},
		{"temp_high", 85, 125, Better},
		{"temp_high", 125, 85, Worse},
		{"vdiff_max", 32, 0.7, Worse},
		{"vdiff_max", 0.7, 32, Better},
		{"en_corner", 100, 1e3, Worse}, // a higher 1/f corner is more low-frequency noise
		{"in_corner", 1e3, 100, Better},
		{"cload", 100e-12, 1e-9, Better},
		{"cload", 1e-9, 100e-12, Worse},
	}
	seen := map[string]bool{}
	for _, tt := range tests {
		seen[tt.key] = true
		t.Run(tt.key+"/"+string(tt.want), func(t *testing.T) {
			o, c := &catalog.Part{ID: "o"}, &catalog.Part{ID: "c"}
			setTyp(o, tt.key, tt.orig)
			setTyp(c, tt.key, tt.cand)
			f := field(t, Compare(o, c, false), tt.key)
			if f.Verdict != tt.want {
				t.Errorf("%s: %v against %v: verdict %s, want %s", tt.key, tt.cand, tt.orig, f.Verdict, tt.want)
			}
		})
	}
	for _, k := range fieldKeys() {
		if !seen[k] {
			t.Errorf("field %q has no verdict rule test", k)
		}
	}
}

// TestUnknownWhenEitherSideLacks: a figure one side lacks cannot be compared.
func TestUnknownWhenEitherSideLacks(t *testing.T) {
	for _, k := range fieldKeys() {
		t.Run(k, func(t *testing.T) {
			o, c := &catalog.Part{ID: "o"}, &catalog.Part{ID: "c"}
			setTyp(o, k, 1)
			if f := field(t, Compare(o, c, false), k); f.Verdict != Unknown || f.Candidate.Set {
				t.Errorf("candidate lacks %s: verdict %s, candidate set %v", k, f.Verdict, f.Candidate.Set)
			}
			if f := field(t, Compare(c, o, false), k); f.Verdict != Unknown || f.Original.Set {
				t.Errorf("original lacks %s: verdict %s", k, f.Verdict)
			}
		})
	}
}

// TestComparedFigure checks which limit each side contributes: the
// guaranteed limit in the direction that matters, else typical; like with
// like where both sides allow it.
func TestComparedFigure(t *testing.T) {
	g := catalog.Some
	tests := []struct {
		name               string
		key                string
		o, c               catalog.Spec
		overTemp           bool
		wantO, wantC       float64
		wantLimO, wantLimC Limit
		wantBasO, wantBasC Basis
		wantNote           bool
		wantVerdict        Verdict
	}{
		{name: "both guaranteed minimum", key: "gbw",
			o: typMin(1e6, 0.7e6), c: typMin(1.2e6, 0.6e6),
			wantO: 0.7e6, wantC: 0.6e6, wantLimO: LimitMin, wantLimC: LimitMin,
			wantBasO: Guaranteed, wantBasC: Guaranteed, wantVerdict: Worse},
		{name: "typical on both when only one is guaranteed", key: "gbw",
			o: typMin(1e6, 0.7e6), c: typ(1.5e6),
			wantO: 1e6, wantC: 1.5e6, wantLimO: LimitTyp, wantLimC: LimitTyp,
			wantBasO: Typical, wantBasC: Typical, wantVerdict: Better},
		{name: "mixed bases are noted", key: "slew",
			o: catalog.Spec{Min: g(0.3e6)}, c: typ(0.5e6),
			wantO: 0.3e6, wantC: 0.5e6, wantLimO: LimitMin, wantLimC: LimitTyp,
			wantBasO: Guaranteed, wantBasC: Typical, wantNote: true, wantVerdict: Better},
		{name: "smaller-is-better uses the maximum", key: "ib",
			o: typMax(20e-9, 250e-9), c: typMax(10e-9, 300e-9),
			wantO: 250e-9, wantC: 300e-9, wantLimO: LimitMax, wantLimC: LimitMax,
			wantBasO: Guaranteed, wantBasC: Guaranteed, wantVerdict: Worse},
		{name: "graph source", key: "slew",
			o: catalog.Spec{Typ: g(0.5e6), Source: catalog.SourceGraph}, c: catalog.Spec{Typ: g(0.6e6), Source: catalog.SourceGraph},
			wantO: 0.5e6, wantC: 0.6e6, wantLimO: LimitTyp, wantLimC: LimitTyp,
			wantBasO: Graph, wantBasC: Graph, wantVerdict: Better},
		{name: "over temperature when both give it", key: "vos", overTemp: true,
			o: catalog.Spec{Max: g(7e-3), MaxOT: g(9e-3)}, c: catalog.Spec{Max: g(5e-3), MaxOT: g(10e-3)},
			wantO: 9e-3, wantC: 10e-3, wantLimO: LimitMaxOT, wantLimC: LimitMaxOT,
			wantBasO: Guaranteed, wantBasC: Guaranteed, wantVerdict: Worse},
		{name: "25 °C limit when only one gives over temperature", key: "vos", overTemp: true,
			o: catalog.Spec{Max: g(7e-3), MaxOT: g(9e-3)}, c: catalog.Spec{Max: g(5e-3)},
			wantO: 7e-3, wantC: 5e-3, wantLimO: LimitMax, wantLimC: LimitMax,
			wantBasO: Guaranteed, wantBasC: Guaranteed, wantVerdict: Better},
		{name: "over temperature ignored at 25 °C", key: "vos",
			o: catalog.Spec{Max: g(7e-3), MaxOT: g(9e-3)}, c: catalog.Spec{Max: g(5e-3), MaxOT: g(10e-3)},
			wantO: 7e-3, wantC: 5e-3, wantLimO: LimitMax, wantLimC: LimitMax,
			wantBasO: Guaranteed, wantBasC: Guaranteed, wantVerdict: Better},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			o, c := &catalog.Part{ID: "o"}, &catalog.Part{ID: "c"}
			switch tt.key {
			case "gbw":
				o.GBW, c.GBW = tt.o, tt.c
			case "slew":
				o.Slew, c.Slew = tt.o, tt.c
			case "ib":
				o.Ib, c.Ib = tt.o, tt.c
			case "vos":
				o.Vos, c.Vos = tt.o, tt.c
			}
			f := field(t, Compare(o, c, tt.overTemp), tt.key)
			if f.Original.V != tt.wantO || f.Candidate.V != tt.wantC {
				t.Errorf("compared %v against %v, want %v against %v", f.Candidate.V, f.Original.V, tt.wantC, tt.wantO)
			}
			if f.Original.Limit != tt.wantLimO || f.Candidate.Limit != tt.wantLimC {
				t.Errorf("limits %s/%s, want %s/%s", f.Original.Limit, f.Candidate.Limit, tt.wantLimO, tt.wantLimC)
			}
			if f.Original.Basis != tt.wantBasO || f.Candidate.Basis != tt.wantBasC {
				t.Errorf("bases %s/%s, want %s/%s", f.Original.Basis, f.Candidate.Basis, tt.wantBasO, tt.wantBasC)
			}
			if (f.Note != "") != tt.wantNote {
				t.Errorf("note %q, want a note: %v", f.Note, tt.wantNote)
			}
			if f.Verdict != tt.wantVerdict {
				t.Errorf("verdict %s, want %s", f.Verdict, tt.wantVerdict)
			}
		})
	}
}

// TestHeadroomBasis: common-mode and swing limits from a table count as
// guaranteed (datasheets give them as test conditions), from a graph as
// graph.
func TestHeadroomBasis(t *testing.T) {
	o, c := bipQuad("o"), bipQuad("c")
	c.Output.Source = catalog.SourceGraph
	c.Output.Load = catalog.Some(2e3)
	fs := Compare(o, c, false)
	in := field(t, fs, "input_cm_low")
	if in.Original.Basis != Guaranteed || in.Candidate.Basis != Guaranteed {
		t.Errorf("table input range bases %s/%s, want guaranteed", in.Original.Basis, in.Candidate.Basis)
	}
	out := field(t, fs, "output_high")
	if out.Candidate.Basis != Graph || out.Original.Basis != Guaranteed {
		t.Errorf("output bases %s/%s, want guaranteed/graph", out.Original.Basis, out.Candidate.Basis)
	}
	if !strings.Contains(out.Note, "2 kΩ against 10 kΩ") {
		t.Errorf("swing at different loads: note %q, want the two loads", out.Note)
	}
}

func TestFormat(t *testing.T) {
	o, c := bipQuad("o"), cmosQuad("c")
	fs := Compare(o, c, false)
	tests := []struct {
		key        string
		orig, cand string
	}{
		{"input_cm_low", "V− + 0 V", "V− − 100 mV"},
		{"input_cm_high", "V+ − 1.5 V", "V+ − 1 V"},
		{"slew", "0.5 V/µs", "5 V/µs"},
		{"supply_max", "32 V", "16 V"},
	}
	for _, tt := range tests {
		t.Run(tt.key, func(t *testing.T) {
			f := field(t, fs, tt.key)
			if got := f.Format(f.Original); got != tt.orig {
				t.Errorf("original %q, want %q", got, tt.orig)
			}
			if got := f.Format(f.Candidate); got != tt.cand {
				t.Errorf("candidate %q, want %q", got, tt.cand)
			}
		})
	}
	if got := (Field{Key: "gbw", Dim: catalog.Hertz}).Format(Value{}); got != "—" {
		t.Errorf("unset value %q, want —", got)
	}
}

// fieldKeys are the keys of the compared fields in the order Compare lists
// them.
func fieldKeys() []string {
	keys := make([]string, len(fieldDefs))
	for i, d := range fieldDefs {
		keys[i] = d.key
	}
	return keys
}
