package main

import (
	"bytes"
	"fmt"
	"strings"

	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/listing"
	"github.com/opsift/opsift/filter/report"
)

const listUsage = `Usage: opsift list [--catalog PATH]... [--design FILE] [--columns KEY,KEY...]
                  [--sort [-]KEY] [--typical] [--format table|csv|json|md] [--bom]
                  [--strict-catalog] [--no-cache] [-o FILE [--force]]

List every part of the catalog with the figures you choose, side by side,
sorted by any of them (-KEY sorts descending; parts lacking the figure come
last either way). This is also how to find the part ids other commands take.

With --design the figures are at the design's worst case (its temperature
range and policy, the rules rank uses) and each part carries its verdict;
without it they are at 25 °C with the default policy, and no verdict.
--typical shows the catalog's typical figures instead. Each figure carries
its basis: guaranteed (unmarked in table and md), typical (~) or read from a
graph (g). Formats: table, csv (SI numbers, a basis column per figure, the
caution in the last column; --bom starts it with a UTF-8 byte-order mark
for spreadsheets), json (SI units), md. Parts with problems
are set aside (listed on stderr) unless --strict-catalog refuses the catalog.

Columns (default ` + "gbw,slew,vos,ib,en,iq,supply.min,supply.max,unit_cost" + `):
%s
Options:
`

// listColumnsHelp lists the column keys with what each holds.
func listColumnsHelp() string {
	var b strings.Builder
	for _, c := range listing.Columns() {
		fmt.Fprintf(&b, "  %-15s %s\n", c.Key, c.Label)
	}
	return b.String()
}

func runList(e *env, args []string) error {
	var (
		catalogs pathList
		design   string
		columns  string
		sortKey  string
		format   string
		typical  bool
		// strictCatalog refuses the catalog on any problem.
		strictCatalog bool
		output        outputFlags
	)
	fset := newFlagSet(e, "list", fmt.Sprintf(listUsage, listColumnsHelp()))
	catalogFlags(fset, e, &catalogs)
	fset.StringVar(&design, "design", "", "design TOML file: figures at its worst case, with verdicts (default: none, 25 °C)")
	fset.StringVar(&columns, "columns", "", "comma-separated column keys (default: "+strings.Join(listing.DefaultColumns(), ",")+")")
	fset.StringVar(&sortKey, "sort", "id", "column key, id or name to sort by; -KEY for descending")
	fset.StringVar(&format, "format", "table", "output format: table, csv, json or md")
	fset.BoolVar(&typical, "typical", false, "show the catalog's typical figures instead of the worst case")
	fset.BoolVar(&strictCatalog, "strict-catalog", false, strictCatalogHelp)
	output.register(fset)
	output.registerBOM(fset)
	if helped, err := parseFlags(e, fset, args); helped || err != nil {
		return err
	}
	if fset.NArg() > 0 {
		return usageError("list: unexpected argument %q (see opsift list --help)", fset.Arg(0))
	}
	f, err := report.ParseFormat(format)
	if err == nil && f == report.TOML {
		err = fmt.Errorf("format %q is not one of table, csv, json, md", format)
	}
	if err != nil {
		return usageError("list: --format: %w", err)
	}
	cols, err := listing.ParseColumns(columns)
	if err != nil {
		return usageError("list: --columns: %w", err)
	}
	key, err := listing.ParseSort(sortKey)
	if err != nil {
		return usageError("list: --sort: %w", err)
	}
	var (
		plan *filter.Plan
		d    *filter.Design
	)
	if design != "" {
		if d, plan, err = deriveDesign(design); err != nil {
			return inputError(err)
		}
	}
	cat, err := loadCatalog(e, catalogs, strictCatalog)
	if err != nil {
		return err
	}
	var results []filter.Result
	if plan != nil {
		results = filter.Evaluate(plan, cat.Parts, filter.Options{})
	}
	rows := listing.Build(plan, results, cat.Parts, cols, typical)
	listing.Sort(rows, key, typical)
	doc := &report.ListDoc{Plan: plan, Rows: rows, Columns: cols, Sort: key, Typical: typical, Sources: cat.Sources,
		Meta: meta(e, design, d, cat, false)}
	if w := e.tableWidth(output.out != ""); w != report.Unclipped {
		doc.Width = w
	}
	var buf bytes.Buffer
	if err := report.WriteList(&buf, f, doc); err != nil {
		return err
	}
	data := buf.Bytes()
	if f == report.CSV {
		data = output.csv(data)
	}
	return output.emit(e, data)
}
