// Package data holds opsift's embedded demo material: a catalog of invented,
// generic op-amp parameter sets and a few example designs. They are what
// opsift uses when the user has no catalog directory and gives no --design,
// and what `opsift init` copies out as a starting point.
//
//	catalog/*.toml ──► Catalog (fs.FS rooted at the catalog dir) ──► catalog loader
//	designs/*.toml ──► Designs (fs.FS rooted at the designs dir) ──► design decoder
//
// The figures are typical of each class of part, not any manufacturer's
// data; results built on them are advisory only.
package data

import (
	"embed"
	"fmt"
	"io/fs"
)

//go:embed catalog/*.toml designs/*.toml
var files embed.FS

// Catalog is the demo catalog: its root holds one *.toml file per family of
// parts (general.toml, cmos.toml, …). It is read-only; treat it as a
// catalog directory.
var Catalog fs.FS = sub("catalog")

// Designs holds the example designs: its root holds the design *.toml files.
// It is read-only.
var Designs fs.FS = sub("designs")

// DefaultDesign is the file name, within Designs, of the design used when
// no --design is given: a ±5 V vibration monitor in which the
// pin-compatible slow bipolar quad fails on slew rate.
const DefaultDesign = "vibration-monitor-5v.toml"

// sub roots the embedded files at dir. dir is a constant known to exist in
// the embed pattern, so an error is a build defect, not bad input.
func sub(dir string) fs.FS {
	f, err := fs.Sub(files, dir)
	if err != nil {
		panic(fmt.Sprintf("data: embedded directory %q: %v", dir, err))
	}
	return f
}
