package filter

// Tuning constants of the requirements engine, each with its unit and the
// reason for its value. Physical constants and the constants of the
// formulas (0.35, 0.8, k) live with the formulas in filter/circuit.
const (
	// DefaultDerateTyp multiplies a bigger-is-better figure (GBW, slew,
	// linear Aol, output current) known only as typical. 0.7 is the usual
	// engineering allowance for process spread when only typ is quoted.
	DefaultDerateTyp = 0.7
	// DefaultInflateTyp multiplies a smaller-is-better figure (Vos, Ib, Ios,
	// noise densities, Iq) known only as typical: spread is lopsided, a
	// max is often 2–5 × typ, so 2 is the mildest sensible guess.
	DefaultInflateTyp = 2.0
	// DefaultSpeedTempco is the fraction by which a GBW or slew figure
	// given at 25 °C (a 25 °C limit or a typical) is lowered per kelvin
	// away from 25 °C, 1/K. From memory (textbook device behaviour, no
	// datasheet at hand): MOS mobility falls about as T^−1.5, which takes
	// a CMOS stage's gm, GBW and slew down roughly 0.2–0.4 %/K when hot;
	// bipolar parts lose slew at cold as their bias currents fall. 0.2 %/K
	// in both directions is the mild end, 13 % at 85 °C.
	DefaultSpeedTempco = 0.002
	// DefaultIbColdTempco is the fraction by which a bipolar part's Ib
	// and Ios given at 25 °C are raised per kelvin below 25 °C, 1/K. From
	// memory: the current gain β of a silicon transistor falls at cold, so
	// base current rises; bias current of a bipolar input roughly doubles
	// from 25 °C to −55 °C, 1/80 K = 0.0125/K (linear).
	DefaultIbColdTempco = 0.0125
	// DefaultGainError is the allowed gain error ε at the signal
	// frequency when a stage does not say (DESIGN.md: default 1 %).
	DefaultGainError = 0.01

	// RoomTemp is the temperature datasheet limits without _ot are given at, °C.
	RoomTemp = 25.0

	// FETDoubling is the temperature step over which FET-input bias current
	// (gate leakage) doubles, K.
	FETDoubling = 10.0

	// parallelMin is the number of parts per worker below which Evaluate
	// stays on one goroutine: starting a goroutine costs about as much as
	// evaluating a few hundred parts.
	parallelMin = 1000

	// assumedAolDB is the open-loop gain a simulation (the waveform
	// preview, the thd check) uses when the catalog has none (dB). It sets
	// only the DC error of the loop (1/Aol); 100 dB is a common
	// general-purpose figure (common practice, no source), and the notes
	// say it was assumed.
	assumedAolDB = 100.0

	// thdPointsPerPeriod is the fixed grid of the thd check's simulation
	// (points per period): the model's default first grid, without the
	// adaptive doubling the preview uses, so the check costs one run.
	// 400 samples per period put harmonic 10 far below the DFT's Nyquist
	// bin (200); the chord error (3e-5 of the peak) lands on the
	// fundamental's aliases (399, 401), not on harmonics 2…10. The tests
	// check the measured THD of a triangle and of a clipped sine against
	// their Fourier series to 1e-3 relative (thd_test.go).
	thdPointsPerPeriod = 400
	// thdSettlePeriods are run before the THD window (periods): the
	// model's default, which brings a follower far past its full-power
	// bandwidth within a small fraction of a percent.
	thdSettlePeriods = 20
	// thdFloor is the smallest THD the thd check reports (fraction,
	// 0.0001 %): a measured THD under it is reported as thdFloor, an upper
	// bound. The model's only distortions are the slew clamp and the
	// swing limits; a sine that reaches neither measures 1e-16 … 1e-12
	// (rounding), and a number like 4e-14 % would read as a claim about
	// the part. 1e-6 is far above that rounding and far below any limit
	// a design states (0.001 % and up).
	thdFloor = 1e-6
	// thdMeasurePeriods is the THD window, whole periods: the model's
	// default; on whole periods every harmonic falls on a DFT bin.
	thdMeasurePeriods = 5

	// The waveform preview's choices where a stage gives no value for
	// the model to run with (StagePlan.Circuit); the notes state them.

	// previewR is the resistor the preview picks when a stage gives only a
	// gain (Ω): the model's amp draws no input current and drives its
	// output from zero impedance, so only the ratio matters.
	previewR = 10e3

	// squarePeriodRises is the period of a square signal that gives no
	// frequency, in allowed rise times (dimensionless): each half period
	// is then 20 rise times, long enough for a passing part to settle.
	squarePeriodRises = 40

	// comparatorPeriodTransitions is the period of the sine a comparator
	// is driven with, in allowed transition times (dimensionless): a
	// design gives the comparator's input range but no frequency; at 100
	// transitions per period a passing part's edges are a few percent of
	// the period and a failing part's slow edges stand out.
	comparatorPeriodTransitions = 100

	// tiaStepRises is how long a transimpedance stage's light step is
	// shown, in rise times of the stage's bandwidth (0.35/bandwidth)
	// (dimensionless): a part that meets the bandwidth settles within a
	// few; 20 leave room to see a slow one.
	tiaStepRises = 20

	// tiaStepAt is where in the window the light step comes, as a fraction
	// of it (dimensionless): the dark level is seen first.
	tiaStepAt = 0.1
)
