package replace

import (
	"testing"

	"github.com/opsift/opsift/catalog"
)

// Test parts are generic parameter sets, not any manufacturer's part.

func typ(v float64) catalog.Spec { return catalog.Spec{Typ: catalog.Some(v)} }

func typMin(t, mn float64) catalog.Spec {
	return catalog.Spec{Typ: catalog.Some(t), Min: catalog.Some(mn)}
}

func typMax(t, mx float64) catalog.Spec {
	return catalog.Spec{Typ: catalog.Some(t), Max: catalog.Some(mx)}
}

// bipQuad is a slow single-supply bipolar quad of the common kind: inputs
// down to V−, 3–32 V, 0.5 V/µs, 1 MHz (trade figures of the class, common
// practice, no source).
func bipQuad(id string) *catalog.Part {
	return &catalog.Part{
		ID: id, Name: "bipolar quad, single supply", Tech: catalog.TechBipolar,
		Channels: 4, Packages: []string{"dip14", "soic14"}, Pinout: "quad-a",
		Lifecycle: catalog.LifecycleActive, UnitCost: catalog.Some(0.18),
		Temp:     [2]catalog.Opt{catalog.Some(-40), catalog.Some(85)},
		Supply:   catalog.Span{Min: catalog.Some(3), Max: catalog.Some(32)},
		InputCM:  catalog.Headroom{Low: catalog.Some(0), High: catalog.Some(-1.5)},
		Output:   catalog.Swing{Low: catalog.Some(0.02), High: catalog.Some(-1.5), Load: catalog.Some(10e3)},
		GBW:      typMin(1e6, 0.7e6),
		Slew:     catalog.Spec{Typ: catalog.Some(0.5e6), Source: catalog.SourceGraph},
		Aol:      typMin(100, 88),
		Vos:      catalog.Spec{Typ: catalog.Some(2e-3), Max: catalog.Some(7e-3), MaxOT: catalog.Some(9e-3)},
		VosDrift: typ(7e-6),
		Ib:       typMax(20e-9, 250e-9),
		Ios:      typMax(2e-9, 50e-9),
		En:       typ(35e-9),
		In:       typ(0.1e-12),
		Iq:       typMax(0.35e-3, 0.6e-3),
		Iout:     typMin(30e-3, 10e-3),
		VdiffMax: catalog.Some(32),
		CLoad:    catalog.Some(100e-12),
	}
}

// cmosQuad is a CMOS quad in the same footprint: rail-to-rail output,
// inputs to V−, about ten times the slew rate and a 16 V maximum supply
// (common practice, no source).
func cmosQuad(id string) *catalog.Part {
	return &catalog.Part{
		ID: id, Name: "CMOS quad, same footprint", Tech: catalog.TechCMOS,
		Channels: 4, Packages: []string{"soic14", "tssop14"}, Pinout: "quad-a",
		Lifecycle: catalog.LifecycleActive, UnitCost: catalog.Some(0.35),
		Temp:     [2]catalog.Opt{catalog.Some(-40), catalog.Some(125)},
		Supply:   catalog.Span{Min: catalog.Some(2.7), Max: catalog.Some(16)},
		InputCM:  catalog.Headroom{Low: catalog.Some(-0.1), High: catalog.Some(-1.0)},
		Output:   catalog.Swing{Low: catalog.Some(0.015), High: catalog.Some(-0.015), Load: catalog.Some(10e3)},
		GBW:      typMin(5e6, 3.5e6),
		Slew:     typMin(5e6, 3.5e6),
		Aol:      typMin(110, 95),
		Vos:      catalog.Spec{Typ: catalog.Some(1e-3), Max: catalog.Some(5e-3), MaxOT: catalog.Some(6e-3)},
		VosDrift: typ(3e-6),
		Ib:       typMax(1e-12, 100e-12),
		Ios:      typMax(0.5e-12, 50e-12),
		En:       typ(20e-9),
		In:       typ(0.001e-12),
		Iq:       typMax(0.6e-3, 0.9e-3),
		Iout:     typMin(40e-3, 20e-3),
		VdiffMax: catalog.Some(16),
		CLoad:    catalog.Some(500e-12),
	}
}

// field returns the field of key in fs, failing the test when absent.
func field(t *testing.T, fs []Field, key string) Field {
	t.Helper()
	for _, f := range fs {
		if f.Key == key {
			return f
		}
	}
	t.Fatalf("no field %q", key)
	return Field{}
}

// byID returns the candidate with id, or nil.
func byID(res Result, id string) *Candidate {
	for i := range res.Candidates {
		if res.Candidates[i].Part.ID == id {
			return &res.Candidates[i]
		}
	}
	return nil
}

func ids(res Result) []string {
	var out []string
	for _, c := range res.Candidates {
		out = append(out, c.Part.ID)
	}
	return out
}

func keys(cs []Change) []string {
	var out []string
	for _, c := range cs {
		out = append(out, c.Key)
	}
	return out
}
