package main

import (
	"flag"

	"github.com/opsift/opsift/filter/report"
)

// outputFlags are -o FILE and --force, shared by the commands that write
// a document, and --bom for those that write CSV.
type outputFlags struct {
	out   string
	force bool
	bom   bool
}

// registerBOM adds --bom to fset, for a command with a csv format.
func (o *outputFlags) registerBOM(fset *flag.FlagSet) {
	fset.BoolVar(&o.bom, "bom", false, "start csv output with a UTF-8 byte-order mark, so spreadsheets read µ, ° and √ right")
}

// csv returns CSV data as it is written: after the byte-order mark with
// --bom.
func (o *outputFlags) csv(data []byte) []byte {
	if !o.bom {
		return data
	}
	return append([]byte(report.BOM), data...)
}

// register adds -o and --force to fset.
func (o *outputFlags) register(fset *flag.FlagSet) {
	fset.StringVar(&o.out, "o", "", "write the output to FILE (atomically; a symlink's target is written) instead of stdout")
	fset.BoolVar(&o.force, "force", false, "with -o, replace FILE even when it is read-only")
}

// emit writes data to the -o file, or to standard output without one.
func (o *outputFlags) emit(e *env, data []byte) error {
	if o.out == "" {
		_, err := e.stdout.Write(data)
		return err
	}
	if err := report.WriteFileWith(o.out, data, report.WriteOptions{Force: o.force}); err != nil {
		return inputError(err)
	}
	return nil
}
