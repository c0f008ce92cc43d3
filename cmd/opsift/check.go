package main

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
)

const checkUsage = `Usage: opsift check [--catalog PATH]... [--no-cache]

Read every catalog source, check every part (units, keys, limits, ids,
plausible ranges, text a terminal would act on) and print a summary and
the problems found, one per line as FILE:LINE: part "ID": field "KEY":
what is wrong, at most 50 per file. Files other than regular files, over
4 MiB, or nested or dotted too deeply are refused before decoding.
Without --catalog it checks the catalog the other commands would use: the
user's catalog directory, else the embedded demo. Exit status 1 when there
is any problem, 0 when clean. Files without problems are kept parsed in
$XDG_CACHE_HOME/opsift (else ~/.cache/opsift); --no-cache reads them afresh.

Options:
`

func runCheck(e *env, args []string) error {
	var catalogs pathList
	fset := newFlagSet(e, "check", checkUsage)
	catalogFlags(fset, e, &catalogs)
	if helped, err := parseFlags(e, fset, args); helped || err != nil {
		return err
	}
	if fset.NArg() > 0 {
		return usageError("check: unexpected argument %q; give catalogs with --catalog (see opsift check --help)", fset.Arg(0))
	}
	c, err := e.readCatalog(catalogLayers(e, catalogs))
	var probs catalog.Problems
	if err != nil && !errors.As(err, &probs) {
		return inputError(err) // not a catalog problem: cannot happen with Load today
	}
	var buf strings.Builder
	writeCheckReport(&buf, c, probs)
	// Problems and file names are escaped where they are made; this is the net.
	if _, err := io.WriteString(e.stdout, safe.Lines(buf.String())); err != nil {
		return err
	}
	if len(probs) > 0 {
		return problemsFound()
	}
	return nil
}

// writeCheckReport prints check's summary of a loaded catalog and its problems.
func writeCheckReport(w io.Writer, c *catalog.Catalog, probs catalog.Problems) {
	row := func(label, format string, a ...any) {
		fmt.Fprintf(w, "%-10s %s\n", label+":", fmt.Sprintf(format, a...))
	}
	for i, s := range c.Sources {
		label := "sources:"
		if i > 0 {
			label = ""
		}
		fmt.Fprintf(w, "%-10s %s\n", label, s)
	}
	row("files", "%d", c.Files)
	parts := fmt.Sprintf("%d", len(c.Parts))
	if c.Invalid > 0 {
		parts += fmt.Sprintf(" (%d more left out for problems)", c.Invalid)
	}
	row("parts", "%s", parts)
	row("overrides", "%d", c.Overrides)
	row("figures", "%d given: %d known only as typical, %d read from graphs, %d estimated",
		c.Figures, c.TypicalOnly, c.FromGraph, c.Estimated)
	if c.TypicalOnly > 0 || c.FromGraph > 0 {
		fmt.Fprintf(w, "%-10s %s\n", "", "(typical figures are derated or inflated by the design's policy at worst case)")
	}
	for _, n := range c.Notes {
		fmt.Fprintf(w, "note: %s\n", n)
	}
	if len(probs) == 0 {
		fmt.Fprintln(w, "no problems found")
		return
	}
	fmt.Fprintf(w, "%s found:\n", plural(probs.Count(), "problem"))
	for _, p := range probs {
		fmt.Fprintln(w, p.Error())
	}
}

// plural renders "1 problem", "2 problems".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

// checkHint is the check command for the given paths, for messages.
func checkHint(paths []string) string {
	var b strings.Builder
	b.WriteString("opsift check")
	for _, p := range paths {
		b.WriteString(" --catalog " + p)
	}
	return b.String()
}
