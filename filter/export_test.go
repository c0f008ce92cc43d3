package filter

import "github.com/opsift/opsift/catalog"

// TIAFeedbackCap lets the external tests check the transimpedance
// stage's feedback capacitor, which the engine uses unexported.
var TIAFeedbackCap = tiaFeedbackCap

// PredictedFrequency is the frequency a relaxation stage's gbw check shows
// beside part (its Aside "predicted_freq"), as the command reports it; ok
// is false when the stage has none for the part.
func PredictedFrequency(sp *StagePlan, part *catalog.Part, f *PartFigures) (freq float64, ok bool) {
	for _, r := range sp.Requirements {
		if r.Aside == nil {
			continue
		}
		if a := r.Aside(part, f); a.Kind == AsidePredictedFreq {
			return a.V, true
		}
	}
	return 0, false
}

// SimRuns is how many thd simulations have run in this test binary.
func SimRuns() int64 { return simRuns.Load() }
