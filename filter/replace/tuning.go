package replace

// Tolerances below which two figures count as "same". Datasheet figures
// are quoted to two or three significant figures and read off graphs to
// perhaps 5 %; a difference smaller than the rounding of the figure itself
// says nothing about the parts.
const (
	// relTol is the relative difference (a fraction of the larger
	// magnitude) within which two figures are the same: 2 %, the rounding
	// of a figure quoted to two significant figures near the top of a decade.
	relTol = 0.02

	// voltTol is the absolute floor, in volts, for common-mode and swing
	// limits, which sit near zero (V− + 0 V) where a relative test fails:
	// 5 mV is below the resolution such limits are quoted to (tens of mV
	// for rail-to-rail outputs, 0.1 V for input ranges).
	voltTol = 0.005

	// tempTol is the absolute floor, in °C, for rated temperature limits,
	// which datasheets quote in whole degrees.
	tempTol = 0.5

	// dBTol is the absolute tolerance for open-loop gain in dB: 0.2 dB is
	// about 2 % in V/V (20·log10(1.02) = 0.17 dB).
	dBTol = 0.2
)
