package filter

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
