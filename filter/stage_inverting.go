package filter

import (
	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

func init() { register(invertingTemplate{}) }

// invertingTemplate is an inverting amplifier: signal through Rg into the
// inverting input, which sits at ref; |G| = Rf/Rg, NG = 1 + |G|.
type invertingTemplate struct{}

func (invertingTemplate) Kind() string    { return "inverting" }
func (invertingTemplate) Summary() string { return "inverting amplifier (NG = 1 + G)" }
func (invertingTemplate) Params() []Param {
	ps := []Param{{Key: "gain", Label: "gain", Kind: Quantity, Dim: catalog.Dimensionless, Required: true,
		Help: "magnitude of the signal gain, V/V; or give rf and rin"}}
	ps = append(ps, signalParams()...)
	ps = append(ps, loadParams()...)
	ps = append(ps, feedbackParam("Rf: the feedback resistor the output drives to the virtual ground at ref"))
	// The resistor form (instead of gain) comes last so the form keeps its order.
	return append(ps,
		Param{Key: "rf", Label: "Rf", Kind: Quantity, Dim: catalog.Ohm,
			Help: "Rf from the output to the inverting input (with rin, instead of gain)"},
		Param{Key: "rin", Label: "Rin", Kind: Quantity, Dim: catalog.Ohm,
			Help: "Rin from the signal to the inverting input (with rf, instead of gain)"})
}

func (invertingTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	rf, rin, res, err := amplifierResistors(in, "rin")
	if err != nil {
		return StagePlan{}, err
	}
	if res {
		// |G| = Rf/Rin, NG = 1 + |G|; the output drives Rf to the virtual
		// ground at ref; the inverting input sees Rf ∥ Rin.
		g := circuit.InvertingGain(rf, rin)
		fb, ok := in.Num("feedback_r")
		if !ok {
			fb = rf
		}
		sp, err := deriveAmplifier(in, p, amplifier{gain: g, noiseGain: circuit.NoiseGainInverting(g), inputAtRef: true,
			feedbackR: fb, invR: circuit.Parallel(rf, rin), invName: "Rf∥Rin"})
		sp.Values = map[string]float64{"rf": rf, "rin": rin}
		return sp, err
	}
	g, err := in.Need("gain")
	if err != nil {
		return StagePlan{}, noted(err, "or give rf and rin")
	}
	if g <= 0 {
		return StagePlan{}, fieldErrorf("gain", "%q is not positive, want the gain magnitude such as \"10\"", in.Raw("gain"))
	}
	fb, _ := in.Num("feedback_r")
	return deriveAmplifier(in, p, amplifier{gain: g, noiseGain: circuit.NoiseGainInverting(g), inputAtRef: true, feedbackR: fb,
		resistors: "rf and rin"})
}

// circuit is the stage's resistors (Rf, Rin as given, else Rin = previewR
// and Rf for the gain) driven with the stage's signal.
func (invertingTemplate) circuit(sp *StagePlan, _ *catalog.Part, _ *PartFigures) (StageCircuit, error) {
	rf, okF := sp.Values["rf"]
	rin, okI := sp.Values["rin"]
	if okF && okI {
		return amplifierCircuit(sp, sim.Inverting{Rf: rf, Rin: rin, Ref: sp.Ref})
	}
	return amplifierCircuit(sp, sim.Inverting{Rf: sp.Gain * previewR, Rin: previewR, Ref: sp.Ref})
}
