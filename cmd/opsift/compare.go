package main

import (
	"bytes"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/compare"
	"github.com/opsift/opsift/filter/report"
)

const compareUsage = `Usage: opsift compare PART-ID PART-ID... [--design FILE] [--catalog PATH]...
                     [--format table|md|json|csv] [--strict] [--bom] [--strict-catalog] [--no-cache] [-o FILE [--force]]

Lay 2 to 6 parts side by side for a design: one row per worst-case
figure (the value the design's policy gives, with its basis: unmarked
guaranteed, ~ typical, g read off a graph) and one per design check (the margin;
s marks a check measured by simulation, thd), the
best value of each row marked ◆ (md: bold and ◆; csv: a best column; json:
"best"). Rows whose differences decide the choice come first: checks some
of the parts fail, then checks and figures by how far apart they lie.
Part ids are those of the catalog: opsift list shows them all. Parts with
problems are set aside (listed on stderr) unless --strict-catalog refuses
the catalog; exit status as for rank.

Options:
`

// compareFormats are the formats of opsift compare.
var compareFormats = []string{"table", "md", "json", "csv"}

// compareFlags are the parsed options of opsift compare.
type compareFlags struct {
	catalogs pathList
	design   string
	format   string
	strict   bool
	// strictCatalog refuses the catalog on any problem.
	strictCatalog bool
	output        outputFlags
}

func runCompare(e *env, args []string) error {
	var f compareFlags
	fset := newFlagSet(e, "compare", compareUsage)
	catalogFlags(fset, e, &f.catalogs)
	fset.StringVar(&f.design, "design", "", "design TOML file (default: the embedded demo design)")
	fset.StringVar(&f.format, "format", "table", "output format: table, md, json or csv")
	fset.BoolVar(&f.strict, "strict", false, "a check whose figure the catalog lacks fails")
	fset.BoolVar(&f.strictCatalog, "strict-catalog", false, strictCatalogHelp)
	f.output.register(fset)
	f.output.registerBOM(fset)
	ids, err := replaceParseArgs(fset, args)
	if helped, err := flagResult(e, fset, err); helped || err != nil {
		return err
	}
	if len(ids) < compare.MinParts || len(ids) > compare.MaxParts {
		return usageError("compare: want %d to %d PART-IDs, got %d (see opsift compare --help)",
			compare.MinParts, compare.MaxParts, len(ids))
	}
	if !replaceOneOf(f.format, compareFormats) {
		return usageError("compare: --format %q: want one of %s", f.format, strings.Join(compareFormats, ", "))
	}
	d, plan, err := deriveDesign(f.design)
	if err != nil {
		return inputError(err)
	}
	cat, err := loadCatalog(e, f.catalogs, f.strictCatalog)
	if err != nil {
		return err
	}
	parts, err := compareParts(ids, cat)
	if err != nil {
		return err
	}
	t, err := compare.Build(plan, parts, filter.Options{Strict: f.strict})
	if err != nil {
		return usageError("compare: %w", err)
	}
	doc := &report.CompareDoc{Table: t, Sources: cat.Sources, Width: e.columns(report.DefaultWidth),
		Meta: meta(e, f.design, d, cat, f.strict)}
	doc.Meta.Warnings = filter.FilterWarnings(plan, cat.Parts)
	var buf bytes.Buffer
	if err := report.WriteCompare(&buf, report.Format(f.format), doc); err != nil {
		return err
	}
	data := buf.Bytes()
	if f.format == "csv" {
		data = f.output.csv(data)
	}
	return f.output.emit(e, data)
}

// compareParts looks every id up in the catalog; an unknown id is a usage
// error naming it, with the nearest ids (or where to find them), and an
// id given twice is refused.
func compareParts(ids []string, cat *catalog.Catalog) ([]*catalog.Part, error) {
	var parts []*catalog.Part
	seen := map[string]bool{}
	for _, id := range ids {
		if seen[id] {
			return nil, usageError("compare: part %q given twice", safe.Text(id))
		}
		seen[id] = true
		p, err := lookupPart(cat, id)
		if err != nil {
			return nil, withPrefix("compare", err)
		}
		parts = append(parts, p)
	}
	return parts, nil
}
