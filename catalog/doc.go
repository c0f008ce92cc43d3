// Package catalog holds opsift's op-amp parameter sets: the Part type, the
// units every figure is written in, decoding and validation of catalog TOML
// files, layered loading of several sources, and encoding back to TOML.
//
//	file bytes ──► tomlpos.Scan (key → line) ─┐
//	           ──► TOML decode (in pieces on large files) ─► partDecoder (units, types, unknown keys)
//	                                          └─► validate (required keys, signs, limit order, names)
//	                                              ──► []*Part + Problems (every problem, FILE:LINE: part: field)
//	Layer 1, Layer 2 … ──► Load: duplicate id within a layer is a problem,
//	                       a later layer overrides an earlier one by id (a note) ──► Catalog
//	[]*Part ──► Encode ──► catalog TOML that decodes to the same values
//
// All values are held in SI units (Dim says which); Parse and Exact convert
// from and to text. catalog knows nothing of designs or terminals; filter
// and the front ends build on it.
package catalog
