// Package circuit holds the closed-form formulas opsift uses to turn circuit
// values into op-amp needs: gain and noise gain, slew and bandwidth, noise,
// the op-amp relaxation oscillator (astable multivibrator), the unity-gain
// Sallen–Key low-pass, the photodiode transimpedance amplifier and the
// op-amp used as a comparator.
//
// Every function takes and returns SI base units (V, A, Hz, V/s, Ω, F, s, K)
// and has no state. The package imports only the standard library so the
// stage templates (package filter) and the time-domain model (filter/sim)
// can both use it for ideal references:
//
//	circuit values ─► circuit.X(...) ─► requirement value ─► filter: Requirement{Why: formula}
//	                                └─► ideal reference  ─► filter/sim: compare waveform
//
// Functions whose result is only defined on part of their inputs (logarithms
// of threshold ratios, an allowed error outside 0…1) return a *DomainError
// naming the argument, its value and the range wanted; the others are plain
// formulas and document the inputs they expect (positive resistances and so
// on), which the callers validate against the user's file.
//
// Each doc comment gives the formula and where it comes from. Sources marked
// "from memory" are standard textbook results quoted without the book at
// hand; the tests check them against independent calculations (nodal
// analysis, brute-force integration, worked numbers).
package circuit
