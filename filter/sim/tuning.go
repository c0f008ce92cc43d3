package sim

// Tuning constants of the model, each with its unit and the reason for its
// value.
const (
	// levels is the depth of the binary step tables: a grid step h is split
	// into 2^levels ticks, the time resolution of every regime switch and
	// level crossing. 2^-28 ≈ 4e-9 of a step (1e-11 of a period at 400
	// points per period) is far below any effect the metrics can show,
	// and 29 matrix–vector products per bisection stay cheap.
	levels = 28

	// defaultPointsPerPeriod is the grid step h = T/400 (dimensionless). The
	// update is exact for a straight-line input, so h only sets how well
	// chords follow a sine: the worst chord error is Vp·(1 − cos(π/400))
	// ≈ 3e-5·Vp. It also gives 400 samples per period for the DFT (10
	// harmonics, far from aliasing) and 2000 display points over 5
	// periods.
	defaultPointsPerPeriod = 400

	// convergeTolerance is how little the metrics may change between two
	// grids (h and h/2) for an adaptive run to stop refining (relative).
	// The chord error is second order, so each halving cuts it about
	// fourfold: 1e-5 is reached by 1600–3200 points per period where the
	// default 400 reads peaks 2–7e-4 low.
	convergeTolerance = 1e-5

	// maxAdaptivePoints caps the adaptive grid (points per period): 16×
	// the default, where the chord error of a sine is 2e-8 of its peak.
	maxAdaptivePoints = 6400

	// thdFloor is the scale below which THD changes count as absolute
	// (fraction): harmonics under 1e-3·1e-5 are rounding, not distortion.
	thdFloor = 1e-3

	// defaultSettlePeriods is how many periods a driven stage runs before
	// the metrics window (dimensionless). A follower far past its
	// full-power bandwidth has a triangle whose centre drifts back only
	// slowly; 20 periods bring it within a small fraction of a percent.
	defaultSettlePeriods = 20

	// defaultOscSettle is how many rising edges an oscillator runs before
	// the window. Each half cycle restarts from a rail and a threshold, so
	// the cycle repeats exactly from the second edge on; three is margin.
	defaultOscSettle = 3

	// defaultMeasurePeriods is the length of the metrics window, whole
	// periods (dimensionless).
	defaultMeasurePeriods = 5

	// defaultMaxPoints bounds the display arrays of a Waveform (points).
	defaultMaxPoints = 2000

	// maxOscSlowdown is how many ideal periods per wanted period an
	// oscillator may take before the run gives up and reports that it does
	// not oscillate (dimensionless): a part 20× slower than its RC is an
	// answer, not a reason to run forever.
	maxOscSlowdown = 20

	// maxSwitches bounds regime switches inside one grid step (count). A
	// well-posed stage switches a handful of times per period; hitting the
	// bound means the model is stuck at a boundary and the run stops with
	// an error rather than looping.
	maxSwitches = 1000

	// settleTolerance is the relative change of peak-to-peak between the
	// first and last period of the window above which Metrics notes that
	// the output has not settled (dimensionless).
	settleTolerance = 0.01

	// stepTimeConstants is how many of a stage's time constants a Step
	// input runs after the step by default (dimensionless); e^-10 leaves
	// nothing visible.
	stepTimeConstants = 10
)
