package filter

// Tuning constants of the requirements engine, each with its unit and the
// reason for its value.
const (
	// DefaultDerateTyp multiplies a bigger-is-better figure (GBW, slew,
	// linear Aol, output current) known only as typical. 0.7 is the usual
	// engineering allowance for process spread when only typ is quoted.
	DefaultDerateTyp = 0.7
	// DefaultInflateTyp multiplies a smaller-is-better figure (Vos, Ib, Ios,
	// noise densities, Iq) known only as typical: spread is lopsided, a
	// max is often 2–5 × typ, so 2 is the mildest sensible guess.
	DefaultInflateTyp = 2.0
	// DefaultGainError is the allowed gain error ε at the signal
	// frequency when a stage does not say (DESIGN.md: default 1 %).
	DefaultGainError = 0.01

	// Boltzmann is the Boltzmann constant k, J/K (exact, SI 2019).
	Boltzmann = 1.380649e-23
	// ZeroCelsius is 0 °C in kelvin (exact).
	ZeroCelsius = 273.15
	// RoomTemp is the temperature datasheet limits without _ot are given at, °C.
	RoomTemp = 25.0

	// SlewFraction is the part of a square step the slew must cover in the
	// allowed rise time: the 10–90 % span, 0.8 of the step.
	SlewFraction = 0.8
	// RiseBandwidth is the rise-time × bandwidth product of a single-pole
	// response, ln 9 / 2π ≈ 0.35 (10–90 % rise time t = 0.35 / f−3dB).
	RiseBandwidth = 0.35
	// FETDoubling is the temperature step over which FET-input bias current
	// (gate leakage) doubles, K.
	FETDoubling = 10.0

	// parallelMin is the number of parts per worker below which Evaluate
	// stays on one goroutine: starting a goroutine costs about as much as
	// evaluating a few hundred parts.
	parallelMin = 1000
)
