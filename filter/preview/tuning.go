package preview

// Tuning constants of the adapter, each with its unit and the reason for
// its value.
const (
	// defaultR is the resistor the adapter picks when a stage gives only a
	// gain (Ω): the model's amp draws no input current and drives its
	// output from zero impedance, so only the ratio matters.
	defaultR = 10e3

	// assumedAolDB is the open-loop gain used when the catalog has none
	// (dB). It sets only the DC error of the loop (1/Aol); 100 dB is a
	// common general-purpose figure (common practice, no source), and the
	// notes say it was assumed.
	assumedAolDB = 100.0

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
