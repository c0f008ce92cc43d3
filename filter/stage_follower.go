package filter

import (
	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/sim"
)

func init() { register(followerTemplate{}) }

// followerTemplate is a unity-gain buffer: output tied to the inverting
// input, G = NG = 1.
type followerTemplate struct{}

func (followerTemplate) Kind() string    { return "follower" }
func (followerTemplate) Summary() string { return "unity-gain buffer (G = NG = 1)" }
func (followerTemplate) Params() []Param {
	return append(signalParams(), loadParams()...)
}

func (followerTemplate) Derive(in *StageInput, p *Plan) (StagePlan, error) {
	return deriveAmplifier(in, p, amplifier{gain: 1, noiseGain: 1})
}

// circuit is the follower driven with the stage's signal.
func (followerTemplate) circuit(sp *StagePlan, _ *catalog.Part, _ *PartFigures) (StageCircuit, error) {
	return amplifierCircuit(sp, sim.Follower{})
}
