// Package sim is opsift's time-domain model: one op-amp channel in one
// stage, driven by the stage's signal, so a margin ("fails slew by 40 %")
// can be seen as a waveform (the sine turning into a triangle, the
// oscillator running at half its frequency).
//
//	Amp (Aol, GBW, SR, swing, CM range) ─┐
//	Circuit (follower … transimpedance) ─┼─► stage: linear network + amp ─► integrator ─► grid records
//	Input (sine, square, step) ──────────┘                                                   │
//	                                       ideal response (algebraic, network, or astable) ─┤
//	                                                                                         ▼
//	                                           Metrics over the settled window + Waveform arrays
//
// # The amp
//
// The differential input vd = v+ − v− drives a single pole: DC gain Aol,
// pole at ωp = 2π·GBW/Aol, so the gain falls through 1 at GBW. The rate of
// the pole's node x is clamped to the slew rate, and x itself is held
// inside the output swing:
//
//	r     = ωp·(Aol·vd − x)                  unclamped rate, V/s
//	dx/dt = clamp(r, −SR_fall, +SR_rise)     while VOL < x < VOH
//	x     held at VOH while r ≥ 0 (at VOL while r ≤ 0)
//	out   = x
//
// Holding x at the limit — rather than clamping only the output and letting
// x wind up past the rails — matters: a wound-up node must first unwind
// before the output moves, and predicts an astable several times slower than
// a real part. The output has no impedance; input pins draw no current.
// The input common-mode is not limited, only observed: Metrics flags pins
// outside the amp's range.
//
// # Stages
//
// Around the amp every stage is linear: resistive feedback gives vd as a
// linear function of x and the input; capacitors add states (the timing
// capacitor of a Relaxation oscillator, the two capacitors of a Sallen–Key,
// the summing node of a transimpedance stage). So between switches of the
// amp between its five regimes — linear, slewing up, slewing down, on the
// high rail, on the low rail — the whole stage is a linear time-invariant
// system dy/dt = M·y + B·u of at most three states, with u = (signal, 1).
//
// # Integration method, and why
//
// The loop is stiff: a follower's closed-loop pole sits at GBW (a time
// constant of 1.6 ns at 100 MHz) while the signal period may be
// milliseconds, and in a relaxation oscillator the loop is regenerative
// (growth at about 2π·GBW·β) during the brief linear phase of each switch.
// An explicit method would need a step below the closed-loop time constant
// (millions of steps per preview); an implicit one would smear the regime
// switches that the metrics are about (where slewing starts and stops, when
// the output leaves a rail).
//
// So the model is integrated exactly instead. On a uniform grid h = T/400
// the input is taken as a straight line inside each step (a chord of a
// sine; the corners of square and step edges split a step), and in each
// regime the step then has a closed-form solution
//
//	y(s) = e^{Ms}·y(0) + G1(s)·u0 + G2(s)·u1
//
// with e^{Ms}, G1 and G2 from one matrix exponential of an augmented
// matrix (Van Loan's construction), by Taylor series below norm 1/2 and
// squaring above. This is exact for any stiffness and stable for any step:
// fast stable modes decay to nothing, growing modes grow as they should.
// The tables hold the update for h/2^j, j = 0…28, for each regime, so a
// regime switch inside a step is found by bisection to h/2^28 (about 1e-11
// of a period) at one matrix–vector product per halving, and the step goes
// on from the switch in the new regime. Each step is also checked at its
// midpoint so a brief excursion out of the regime is not stepped over. The
// clamped rate is a Lipschitz function of the state, so the switches are
// well posed (the rate is continuous across them) and do not chatter.
//
// What the grid step still controls is the chord: a sine's chords lose
// (π/N)²/3 of the fundamental (2e-5 at N = 400) and the DFT sees the
// samples; square and step inputs are exact. The convergence tests run
// each stage at 100 … 1600 points per period and show the metrics settle
// to better than 1e-3 at the default 400 (and oscillators, which have no
// input to chord, agree to rounding). A preview runs 25 periods (10 000
// steps) in about 1–3 ms (BenchmarkRun*).
//
// # Runs and metrics
//
// A driven stage starts in its linear steady state (the phasor solution at
// phase 0 for a sine, the DC point otherwise), runs SettlePeriods (20) to
// let nonlinear transients die out — a follower far past its full-power
// bandwidth recentres its triangle slowly — and is measured over
// MeasurePeriods (5) whole periods. An oscillator starts with its output at
// VOH and its capacitor at the lower threshold, runs three rising edges and
// is measured between rising mid-swing crossings located exactly. The
// ideal response is the ideal op-amp's: gain × input, the ideal network
// (Sallen–Key, transimpedance with Cf) integrated on the same grid, the
// ideal comparator, or the ideal astable (t_high = RC·ln((VOH−VTL)/(VOH−VTH)),
// t_low = RC·ln((VTH−VOL)/(VTL−VOL))). Metrics documents each figure.
//
// The package knows nothing of designs, catalogs or terminals; a caller
// turns a stage template and a part's worst-case (or typical) figures into
// a Circuit and an Amp. Results are advisory; verify against the current
// manufacturer datasheet; mains, medical and safety-critical designs need
// applicable standards, local codes and qualified review.
package sim
