// Package catalog holds opsift's op-amp parameter sets: the Part type, the
// units every figure is written in, decoding and validation of catalog TOML
// files, and layered loading of several sources.
//
//	TOML file / dir ──► Decode (units, keys, lines) ──► Validate ──► []Part
//	source 1, source 2 … ──► Load: later source overrides earlier by id ──► Catalog
//
// catalog knows nothing of designs or terminals; filter and the front ends
// build on it.
package catalog
