package filter

import (
	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

func init() { register(noninvertingTemplate{}) }

// noninvertingTemplate is a non-inverting amplifier: signal at the
// non-inverting input, G = NG = 1 + Rf/Rg.
type noninvertingTemplate struct{}

func (noninvertingTemplate) Kind() string    { return "noninverting" }
func (noninvertingTemplate) Summary() string { return "non-inverting amplifier (NG = G ≥ 1)" }
func (noninvertingTemplate) Params() []Param {
	ps := []Param{{Key: "gain", Label: "gain", Kind: Quantity, Dim: catalog.Dimensionless, Required: true,
		Help: "signal gain, V/V (≥ 1); or give rf and rg"}}
	ps = append(ps, signalParams()...)
	ps = append(ps, loadParams()...)
	ps = append(ps, feedbackParam("Rf + Rg: the feedback divider the output drives to ref"))
	// The resistor form (instead of gain) comes last so the form keeps its order.
	return append(ps,
		Param{Key: "rf", Label: "Rf", Kind: Quantity, Dim: catalog.Ohm,
			Help: "Rf from the output to the inverting input (with rg, instead of gain)"},
		Param{Key: "rg", Label: "Rg", Kind: Quantity, Dim: catalog.Ohm,
			Help: "Rg from the inverting input to ref (with rf, instead of gain)"})
}

func (noninvertingTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	rf, rg, res, err := amplifierResistors(in, "rg")
	if err != nil {
		return StagePlan{}, err
	}
	if res {
		// G = NG = 1 + Rf/Rg; the output drives Rf + Rg; the inverting input sees Rf ∥ Rg.
		g := circuit.NonInvertingGain(rf, rg)
		fb, ok := in.Num("feedback_r")
		if !ok {
			fb = rf + rg
		}
		sp, err := deriveAmplifier(in, p, amplifier{gain: g, noiseGain: circuit.NoiseGainNonInverting(g), feedbackR: fb,
			invR: circuit.Parallel(rf, rg), invName: "Rf∥Rg"})
		sp.Values = map[string]float64{"rf": rf, "rg": rg}
		return sp, err
	}
	g, err := in.Need("gain")
	if err != nil {
		return StagePlan{}, noted(err, "or give rf and rg")
	}
	if g < 1 {
		return StagePlan{}, fieldErrorf("gain", "%q is below 1, want a non-inverting gain ≥ 1 V/V", in.Raw("gain"))
	}
	fb, _ := in.Num("feedback_r")
	return deriveAmplifier(in, p, amplifier{gain: g, noiseGain: circuit.NoiseGainNonInverting(g), feedbackR: fb,
		resistors: "rf and rg"})
}

// circuit is the stage's divider (Rf, Rg as given, else Rg = previewR and
// Rf for the gain; a follower at gain 1) driven with the stage's signal.
func (noninvertingTemplate) circuit(sp *StagePlan, _ *catalog.Part, _ *PartFigures) (StageCircuit, error) {
	rf, okF := sp.Values["rf"]
	rg, okG := sp.Values["rg"]
	switch {
	case okF && okG:
		return amplifierCircuit(sp, sim.NonInverting{Rf: rf, Rg: rg, Ref: sp.Ref})
	case sp.Gain == 1:
		return amplifierCircuit(sp, sim.Follower{})
	}
	return amplifierCircuit(sp, sim.NonInverting{Rf: (sp.Gain - 1) * previewR, Rg: previewR, Ref: sp.Ref})
}
