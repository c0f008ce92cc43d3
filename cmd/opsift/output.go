package main

import (
	"flag"

	"github.com/opsift/opsift/filter/report"
)

// outputFlags are -o FILE and --force, shared by rank and replace.
type outputFlags struct {
	out   string
	force bool
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
