package main

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
)

// catalogHelp is the --catalog flag's help, the same for every command.
const catalogHelp = "catalog file or directory of *.toml (repeatable; later overrides earlier by id)"

// newFlagSet returns the flag set of a command: problems go to stderr and
// its usage prints the command's usage text, the flag defaults and the
// caution.
func newFlagSet(e *env, name, usage string) *flag.FlagSet {
	fset := flag.NewFlagSet(name, flag.ContinueOnError)
	fset.SetOutput(e.stderr)
	if e.flagSets != nil {
		e.flagSets(fset)
	}
	fset.Usage = func() {
		fmt.Fprint(fset.Output(), usage)
		fset.PrintDefaults()
		fmt.Fprintf(fset.Output(), "\nCaution: %s\n", caution)
	}
	return fset
}

// parseQuiet parses args with the usage text held back: the flag package
// prints the usage itself on -h and on a bad flag, and flagResult decides
// where it goes (stdout for --help, stderr after an error), so it is
// printed once.
func parseQuiet(fset *flag.FlagSet, args []string) error {
	out := fset.Output()
	usage := fset.Usage
	var held bytes.Buffer
	fset.Usage = func() {
		fset.SetOutput(&held)
		usage()
		fset.SetOutput(out)
	}
	err := fset.Parse(args)
	fset.Usage = usage
	if err != nil && !errors.Is(err, flag.ErrHelp) {
		out.Write(held.Bytes())
	}
	return err
}

// parseFlags parses args with fset. helped is true when the user asked for
// --help: the usage then goes to stdout and the command should return nil.
// A bad flag is exit status 2; the flag package has already said what.
func parseFlags(e *env, fset *flag.FlagSet, args []string) (helped bool, err error) {
	return flagResult(e, fset, parseQuiet(fset, args))
}

// flagResult turns the error of a flag parse into parseFlags' answer, for
// commands that parse in steps (flags after a positional argument).
func flagResult(e *env, fset *flag.FlagSet, err error) (helped bool, _ error) {
	switch {
	case err == nil:
		return false, nil
	case errors.Is(err, flag.ErrHelp):
		fset.SetOutput(e.stdout)
		fset.Usage()
		return true, nil
	}
	return false, &exitError{code: 2}
}
