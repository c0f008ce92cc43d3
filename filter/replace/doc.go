// Package replace finds the parts of a catalog that can take another part's
// place, and says field by field what would get better and what worse.
//
//	original part ─┐
//	catalog parts ─┼─► footprint: drop-in? (pinout, package, channels)
//	               ├─► fields: one Field per figure, verdict better/same/worse/unknown
//	               ├─► regressions / improvements, ordered by how often they break a circuit
//	               ├─► strict: no regression and nothing missing the original gives
//	plan (opt.) ───┴─► filter.Evaluate: pass, worst margin, binding check
//	                      ▼
//	                   Result: candidates, drop-ins first, best first
//
// Find is a pure function: same inputs, same Result, no I/O. The command
// line (opsift replace) and the interactive selector's replacement mode both
// present its Result.
//
// Which figure is compared: for a bigger-is-better figure the guaranteed
// minimum, for a smaller-is-better one the guaranteed maximum, else the
// typical value; both sides on the same basis where both can be (see
// pickPair). Ratings (supply span, temperature range, vdiff_max, cload) and
// table-read common-mode and swing limits count as guaranteed. Figures
// within the tolerances of tuning.go count as the same.
package replace
