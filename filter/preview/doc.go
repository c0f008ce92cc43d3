// Package preview is the adapter from opsift's design stages to the
// time-domain model: given a derived plan, a stage and a part, it takes the
// stage's circuit and drive from the stage kind (StagePlan.Circuit, built in
// the kind's filter/stage_<kind>.go from the circuit its derivation
// resolved), builds the part's amp from the same worst-case figures the
// engine's margins use (filter.BuildAmp, which the thd check uses too), or
// from its typical figures on request, and runs the model.
//
//	Plan ─► StagePlan.Circuit (ref, R/C, signal) ─► sim.Circuit + sim.Input ─────┐
//	Part ─► filter.Figures (worst case) | typical  ─► sim.Amp (Aol, GBW, SR,    ├─► sim.Run ─► Result
//	        swing at the design's rails and the stage's load, CM range) ───────┘
//
// Worst case uses each rail at its tolerance extreme (as the output_range
// and input_range checks do) and the swing scaled to the stage's load;
// typical uses the nominal rails. Where a design gives no signal for a
// kind (a comparator's input frequency, a filter's drive frequency, a
// transimpedance stage's light pulse), the choice is stated in the notes.
//
// Results are advisory; verify against the current manufacturer datasheet;
// mains, medical and safety-critical designs need applicable standards,
// local codes and qualified review.
package preview
