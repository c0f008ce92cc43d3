package filter_test

import (
	"math"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

const resistorRails = "pos = \"12 V\"\nneg = \"0 V\""

// Amplifiers from resistors: G = 1 + Rf/Rg (non-inverting), |G| = Rf/Rin
// and NG = 1 + |G| (inverting) (Sedra & Smith, ideal op-amp circuits; from
// memory). A stage given resistors must derive what the same stage given
// the gain derives, plus the feedback network's current at the output.
func TestAmplifierFromResistors(t *testing.T) {
	sig := "ref = \"6 V\"\nsignal = { peak = \"0.5 V\", freq = \"20 kHz\" }\nload_r = \"10 kOhm\""
	tests := []struct {
		name, byR, byGain string
		feedback          float64 // Ω the output drives besides the load
		pointInput        bool
	}{
		{"noninverting 1 + 90k/10k", "kind = \"noninverting\"\nrf = \"90 kOhm\"\nrg = \"10 kOhm\"", "kind = \"noninverting\"\ngain = 10", 100e3, false},
		{"inverting 100k/10k", "kind = \"inverting\"\nrf = \"100 kOhm\"\nrin = \"10 kOhm\"", "kind = \"inverting\"\ngain = 10", 100e3, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			pr := tmplPlan(t, resistorRails, tt.byR+"\n"+sig)
			pg := tmplPlan(t, resistorRails, tt.byGain+"\n"+sig)
			for _, key := range []filter.Key{filter.KeySlew, filter.KeyGBW, filter.KeyAol, filter.KeyOutputRange, filter.KeyInputRange} {
				a, b := tmplMust(t, pr, key), tmplMust(t, pg, key)
				if math.Abs(a.Value-b.Value) > 1e-9*math.Abs(b.Value) || a.Low != b.Low || a.High != b.High {
					t.Errorf("%s: from resistors %+v, from gain %+v", key, a, b)
				}
			}
			// Output peak 10 × 0.5 V = 5 V into the 10 kΩ load and the feedback network.
			tmplNear(t, "output current", tmplMust(t, pr, filter.KeyOutputCurrent).Value, 5/10e3+5/tt.feedback, 1e-12)
			in := tmplMust(t, pr, filter.KeyInputRange)
			if tt.pointInput != (in.Low == in.High) {
				t.Errorf("input range %g … %g V, want a point: %v", in.Low, in.High, tt.pointInput)
			}
		})
	}
}

// worstBiasError is the output DC error by superposition (Sedra & Smith,
// effect of input bias and offset currents; from memory):
// V_O = NG·(Vos + Ib+·Rs − Ib−·Rp) with Ib± = Ib ± Ios/2, maximised over
// the corners of |Vos| ≤ vos, |Ib| ≤ ib, |Ios| ≤ ios (it is linear in each).
func worstBiasError(ng, vos, ib, ios, rs, rp float64) float64 {
	worst := 0.0
	for _, sv := range []float64{-1, 1} {
		for _, sb := range []float64{-1, 1} {
			for _, so := range []float64{-1, 1} {
				b, o := sb*ib, so*ios
				v := ng * (sv*vos + (b+o/2)*rs - (b-o/2)*rp)
				worst = math.Max(worst, math.Abs(v))
			}
		}
	}
	return worst
}

// With resistors the dc_error check counts the bias current of each input
// through the resistance it sees; matching Rs to Rf ∥ Rg cancels Ib and
// leaves Ios·R (the bias-compensation resistor; Sedra & Smith, from memory).
func TestAmplifierResistorBiasError(t *testing.T) {
	tests := []struct {
		name   string
		rs     string
		rsV    float64
		ios    bool
		corner bool // compare with the corner enumeration
	}{
		{"source 22k against 9k", "22 kOhm", 22e3, true, true},
		{"matched 9k cancels Ib", "9 kOhm", 9e3, true, true},
		{"no Ios figure adds both", "22 kOhm", 22e3, false, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := tmplPlan(t, resistorRails, "kind = \"noninverting\"\nrf = \"90 kOhm\"\nrg = \"10 kOhm\"\nref = \"6 V\"\n"+
				"signal = { peak = \"0.1 V\", freq = \"1 kHz\" }\nsource_r = \""+tt.rs+"\"\ndc_error = \"50 mV\"")
			part := tmplPart("b") // Vos 1 mV, Ib 10 nA, Ios 1 nA (max)
			if !tt.ios {
				part.Ios = catalog.Spec{}
			}
			c := tmplCheck(t, p, part, filter.KeyDCError)
			rp := 90e3 * 10e3 / 100e3
			want := 10 * (1e-3 + 10e-9*(tt.rsV+rp))
			if tt.corner {
				want = worstBiasError(10, 1e-3, 10e-9, 1e-9, tt.rsV, rp)
			}
			tmplNear(t, "dc error", c.Available, want, 1e-9)
			tmplContains(t, "why", c.Req.Why, "Rf∥Rg = 9 kΩ")
		})
	}
	t.Run("matched case is Vos + Ios·R", func(t *testing.T) {
		tmplNear(t, "corner", worstBiasError(10, 1e-3, 10e-9, 1e-9, 9e3, 9e3), 10*(1e-3+1e-9*9e3), 1e-12)
	})
}

func TestAmplifierResistorErrors(t *testing.T) {
	sig := "\nsignal = { peak = \"0.1 V\", freq = \"1 kHz\" }"
	tests := []struct{ name, stage, want string }{
		{"gain and resistors", "kind = \"noninverting\"\ngain = 10\nrf = \"90 kOhm\"\nrg = \"10 kOhm\"", "not both"},
		{"rf without rg", "kind = \"noninverting\"\nrf = \"90 kOhm\"", `"rg": missing`},
		{"rin without rf", "kind = \"inverting\"\nrin = \"10 kOhm\"", `"rf": missing`},
		{"neither", "kind = \"inverting\"", "or give rf and rin"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			msg := tmplDeriveErr(t, resistorRails, tt.stage+sig)
			if !strings.Contains(msg, tt.want) {
				t.Errorf("error %q, want it to contain %q", msg, tt.want)
			}
		})
	}
}
