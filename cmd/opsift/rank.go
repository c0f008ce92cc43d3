package main

import (
	"bytes"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/report"
)

const rankUsage = `Usage: opsift rank [--design FILE] [--catalog PATH]... [--format table|csv|json|md|toml]
                  [--all] [--top N] [--sort KEY] [--strict] [--no-headroom] [--headroom N] [--bom]
                  [--strict-catalog] [--no-cache] [-o FILE [--force]]

Evaluate every part of the catalog against the design at worst case and
rank the ones that pass by their smallest margin (the binding requirement
is named). With --all the failing parts follow, each with the checks it
fails and by how much. Formats: table (terminal), csv (the caution in the
last column of every row), json (SI units), md (a shortlist for design
review), toml (the ranked parts as a catalog file). json and md give each
passing candidate's headroom: for every design input, moved alone, the
value at which the part fails and the requirement that breaks there.
A stage's thd limit is checked by simulation (basis simulated) for the
parts that pass every other check; on such a design rank and its headroom
search take longer (--no-headroom leaves the search out).
--bom starts csv with a UTF-8 byte-order mark for spreadsheets (without it
some read µ, ° and √ wrongly). Tables are fitted to the terminal
($COLUMNS); written to a file or a pipe they are not shortened. Sort keys: margin
(default), cost, supply_current, fmax, id. -o writes atomically: a
symlink's target is replaced, devices and FIFOs are refused (except
/dev/stdout), a read-only file only with --force.

A part with a problem (or a file that is not valid TOML) is set aside and
the rest is ranked: the set-aside parts are listed on stderr and in the
json and md documents. --strict-catalog refuses the whole catalog instead.
Exit status 0 (also when no part passes or parts were set aside); 2 for bad
usage, an unreadable or invalid design, a catalog source that cannot be
read, no valid part left, or any catalog problem with --strict-catalog.

Options:
`

// rankFlags are the parsed options of opsift rank.
type rankFlags struct {
	catalogs pathList
	design   string
	format   string
	all      bool
	top      int
	sort     string
	strict   bool
	noHead   bool
	headTop  int
	// strictCatalog refuses the catalog on any problem.
	strictCatalog bool
	output        outputFlags
}

func runRank(e *env, args []string) error {
	var f rankFlags
	fset := newFlagSet(e, "rank", rankUsage)
	catalogFlags(fset, e, &f.catalogs)
	fset.StringVar(&f.design, "design", "", "design TOML file (default: the embedded demo design)")
	fset.StringVar(&f.format, "format", "table", "output format: table, csv, json, md or toml")
	fset.BoolVar(&f.all, "all", false, "list failing parts too, after the passing ones")
	fset.IntVar(&f.top, "top", 0, "list at most N candidates (0: all)")
	fset.StringVar(&f.sort, "sort", "margin", "sort key: margin, cost, supply_current, fmax or id")
	fset.BoolVar(&f.strict, "strict", false, "a check whose figure the catalog lacks fails")
	fset.BoolVar(&f.strictCatalog, "strict-catalog", false, strictCatalogHelp)
	fset.BoolVar(&f.noHead, "no-headroom", false, "leave each candidate's headroom out of json and md (faster on a long list)")
	fset.IntVar(&f.headTop, "headroom", defaultHeadroomTop, "search headroom for the first N passing candidates in json and md (0: all; the rest carry null)")
	f.output.register(fset)
	f.output.registerBOM(fset)
	if helped, err := parseFlags(e, fset, args); helped || err != nil {
		return err
	}
	if fset.NArg() > 0 {
		return usageError("rank: unexpected argument %q (see opsift rank --help)", fset.Arg(0))
	}
	format, err := report.ParseFormat(f.format)
	if err != nil {
		return usageError("rank: --format: %w", err)
	}
	key, err := filter.ParseSortKey(f.sort)
	if err != nil {
		return usageError("rank: --sort: %w", err)
	}
	if f.top < 0 {
		return usageError("rank: --top %d: want 0 (all) or a positive count", f.top)
	}
	d, plan, err := deriveDesign(f.design)
	if err != nil {
		return inputError(err)
	}
	cat, err := loadCatalog(e, f.catalogs, f.strictCatalog) // its errors carry exit status 2
	if err != nil {
		return err
	}
	results := filter.Evaluate(plan, cat.Parts, filter.Options{Strict: f.strict})
	filter.Rank(results, key)
	doc := &report.Doc{Plan: plan, Results: results, Sort: key, All: f.all, Top: f.top, Strict: f.strict, NoHeadroom: f.noHead, HeadroomTop: f.headTop,
		Sources: cat.Sources, SetAside: cat.SetAside, Width: e.tableWidth(f.output.out != ""), Meta: meta(e, f.design, d, cat, f.strict)}
	doc.Meta.Warnings = filter.FilterWarnings(plan, cat.Parts)
	doc.Color = f.output.out == "" && format == report.Table && e.isTTY && e.getenv("NO_COLOR") == ""
	var buf bytes.Buffer
	if err := report.Write(&buf, format, doc); err != nil {
		return err
	}
	data := buf.Bytes()
	if format == report.CSV {
		data = f.output.csv(data)
	}
	return f.output.emit(e, data)
}

// defaultHeadroomTop is how many passing candidates rank searches for
// headroom unless told: each search evaluates the part a few hundred
// times, so a 100k-part catalog's full list would take minutes.
const defaultHeadroomTop = 50
