package preview

// Tuning constants of the adapter, each with its unit and the reason for
// its value. The choices that build a stage's circuit (resistors, drive
// periods) live with the stage kinds, in filter/tuning.go.
const (
	// assumedAolDB is the open-loop gain used when the catalog has none
	// (dB). It sets only the DC error of the loop (1/Aol); 100 dB is a
	// common general-purpose figure (common practice, no source), and the
	// notes say it was assumed.
	assumedAolDB = 100.0
)
