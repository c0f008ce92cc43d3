package main

import (
	"fmt"
	"strings"

	"github.com/opsift/opsift/filter/report"
)

// command is one subcommand of opsift.
type command struct {
	name    string
	summary string
	run     func(e *env, args []string) error
}

// commands lists the subcommands in the order --help shows them.
func commands() []command {
	return []command{
		{"rank", "rank the catalog's parts for a design", runRank},
		{"list", "list every part with the figures you choose, sorted by any", runList},
		{"derive", "show what a design needs from the op-amp, with formulas", runDerive},
		{"check", "validate catalog files and summarise them", runCheck},
		{"replace", "find parts that can take a part's place", runReplace},
		{"compare", "lay 2 to 6 parts side by side for a design", runCompare},
		{"preview", "simulate a part in a design's stage and plot it", runPreview},
		{"init", "write a starter catalog and design to edit", runInit},
		{"import", "turn a spreadsheet of parts (CSV) into a catalog file", runImport},
		{"schema", "print the JSON Schema of catalog or design files, for editors", runSchema},
		{"add", "enter a part in the selector's entry form and save it into a catalog file", runAdd},
		{"completion", "print a shell completion script (bash, zsh or fish)", runCompletion},
	}
}

// run dispatches to a subcommand, or starts the interactive selector.
func run(args []string, e *env) error {
	if len(args) > 0 {
		switch args[0] {
		case "-h", "--help", "help":
			fmt.Fprint(e.stdout, mainHelp())
			return nil
		case "--version", "version":
			fmt.Fprintf(e.stdout, "opsift %s\n", version)
			return nil
		case candidatesCmd: // the completion scripts' callback, not listed
			return runCandidates(e, args[1:])
		}
		for _, c := range commands() {
			if c.name == args[0] {
				return c.run(e, args[1:])
			}
		}
		if !strings.HasPrefix(args[0], "-") {
			return usageError("unknown command %q (see opsift --help)", args[0])
		}
	}
	return runSelector(e, args)
}

// caution is printed in --help and carried by every export; the text lives
// with the writers so exports and the command line say the same.
const caution = report.Caution

// mainHelp is the text of opsift --help.
func mainHelp() string {
	var b strings.Builder
	b.WriteString(`opsift — choose an op-amp for a circuit, at worst case

Usage:
  opsift [--catalog PATH]... [--design FILE]    interactive selector
  opsift COMMAND [options]
  opsift --version

Commands:
`)
	for _, c := range commands() {
		fmt.Fprintf(&b, "  %-10s %s\n", c.name, c.summary)
	}
	b.WriteString(`
Run "opsift COMMAND --help" for a command's options.

Catalog sources: --catalog FILE|DIR (repeatable; later overrides earlier by id).
Without --catalog: $XDG_CONFIG_HOME/opsift/catalog.d (else ~/.config/opsift/catalog.d)
if it exists, else the embedded demo catalog. Without --design: the embedded demo design.

Parts with problems are set aside with a warning and the rest is used;
--strict-catalog (rank, replace, preview, selector) refuses the catalog instead.

Exit status: 0 success (also with parts set aside); 1 check found problems;
2 bad usage, an unreadable or invalid design, a catalog that cannot be read
or has no valid part (with --strict-catalog: any catalog problem), or an
output file that cannot be written.

Caution: ` + caution + "\n")
	return b.String()
}
