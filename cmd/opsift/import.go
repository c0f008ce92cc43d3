package main

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/catalog/sheet"
)

const importUsage = `Usage: opsift import FILE.csv [--map MAP.toml] [-o FILE.toml [--force]] [--dry-run]

Turn a spreadsheet of parts, saved as CSV, into a catalog file. Columns map
to catalog keys by their header: "GBW (MHz)" is gbw.typ in MHz, "Ib max (nA)"
ib.max in nA, "Supply min (V)" supply.min, "Temp high (C)" the top of the
rated range, "gbw.min_ot" as written; a figure's column without typ, min,
max, min_ot or max_ot is its typical value. A cell may carry its own unit
("35 nA"), which wins over the header's; "", "-", "n/a" are not given.
--map names a TOML file that maps headers to keys and units, e.g.

  separator = ";"                       # , ; or "\t" (default: the header row's)
  decimal = ","                         # default "," with ";" separators, else "."
  [columns]
  "Part number" = "id"
  "UGBW" = { key = "gbw.typ", unit = "MHz" }
  "Internal code" = "-"                 # skip this column

Excel-style CSV is read as saved: a UTF-8 byte-order mark is dropped, the
separator is sniffed from the header row, and with ";" a decimal comma
("1,5 MHz") is read as 1.5 MHz. Every row is checked as opsift check
checks a part; a row that cannot be read is reported on stderr as
FILE:ROW:COLUMN: … and left out, and the other rows are imported. Columns
that map to no key are listed. Without -o the catalog goes to stdout; -o
writes it atomically and refuses to replace an existing file unless
--force; --dry-run prints what would be written and writes nothing.

Exit status 0 when at least one part was imported (rows may have been left
out: see stderr); 2 for bad usage, a sheet or map file that cannot be read,
or no row imported.

Options:
`

// importFlags are the parsed options of opsift import.
type importFlags struct {
	mapFile string
	dryRun  bool
	output  outputFlags
}

func runImport(e *env, args []string) error {
	var f importFlags
	fset := newFlagSet(e, "import", importUsage)
	fset.StringVar(&f.mapFile, "map", "", "TOML file mapping headers to catalog keys and units")
	fset.BoolVar(&f.dryRun, "dry-run", false, "print the catalog that would be written and write nothing")
	f.output.register(fset)
	pos, err := replaceParseArgs(fset, args)
	if helped, err := flagResult(e, fset, err); helped || err != nil {
		return err
	}
	if len(pos) != 1 {
		return usageError("import: want one FILE.csv (see opsift import --help)")
	}
	file := pos[0]
	var m *sheet.Map
	if f.mapFile != "" {
		data, err := catalog.ReadFile(f.mapFile)
		if err != nil {
			return inputError(fmt.Errorf("import: %s: %w", safe.Text(f.mapFile), err))
		}
		if m, err = sheet.ReadMap(f.mapFile, data); err != nil {
			return inputError(fmt.Errorf("import: %w", err))
		}
	}
	data, err := catalog.ReadFile(file)
	if err != nil {
		return inputError(fmt.Errorf("import: %s: %w", safe.Text(file), err))
	}
	res, err := sheet.Read(file, data, m)
	if err != nil {
		return inputError(fmt.Errorf("import: %w", err))
	}
	reportImport(e, file, res)
	if len(res.Parts) == 0 {
		return inputError(fmt.Errorf("import: %s: no row could be imported", safe.Text(file)))
	}
	doc, err := importDoc(file, res)
	if err != nil {
		return err
	}
	switch {
	case f.dryRun:
		if f.output.out != "" {
			fmt.Fprintf(e.stderr, "opsift: dry run: would write %s\n", safe.Text(f.output.out))
		}
		_, err := e.stdout.Write(doc)
		return err
	case f.output.out != "":
		if _, err := os.Lstat(f.output.out); err == nil && !f.output.force {
			return inputError(fmt.Errorf("import: %s already exists; pass --force to replace it, or add the parts to it by hand", safe.Text(f.output.out)))
		} else if err != nil && !errors.Is(err, fs.ErrNotExist) {
			return inputError(fmt.Errorf("import: %w", err))
		}
	}
	return f.output.emit(e, doc)
}

// reportImport tells on stderr what the import made of the sheet: the
// rows left out with their problems (at most catalog.MaxProblems), the
// unmapped columns, and a summary.
func reportImport(e *env, file string, res *sheet.Result) {
	for i, p := range res.Problems {
		if i == catalog.MaxProblems {
			fmt.Fprintf(e.stderr, "opsift: … and %d more problems\n", len(res.Problems)-i)
			break
		}
		fmt.Fprintf(e.stderr, "opsift: %s\n", p.Error())
	}
	if un := res.Unmapped(); len(un) > 0 {
		var b bytes.Buffer
		for i, c := range un {
			if i > 0 {
				b.WriteString(", ")
			}
			fmt.Fprintf(&b, "%d %q", c.N, safe.Text(c.Header))
		}
		fmt.Fprintf(e.stderr, "opsift: note: columns not imported (no catalog key; name one in --map, or \"-\" to skip): %s\n", b.String())
	}
	left := res.Rows - len(res.Parts)
	fmt.Fprintf(e.stderr, "opsift: %s: %s of %s imported", safe.Text(file), plural(len(res.Parts), "part"), plural(res.Rows, "row"))
	if left > 0 {
		fmt.Fprintf(e.stderr, "; %d left out for problems", left)
	}
	fmt.Fprintln(e.stderr)
}

// importDoc is the catalog file of the imported parts, with a header
// saying where they came from; it is decoded again before it is given
// out, so what is written is a catalog opsift check accepts.
func importDoc(file string, res *sheet.Result) ([]byte, error) {
	var buf bytes.Buffer
	fmt.Fprintf(&buf, "# opsift import from %s: %s.\n", safe.Text(file), plural(len(res.Parts), "part"))
	buf.WriteString(commentLines("CAUTION: "+caution, 76) + "\n\n")
	if err := catalog.Encode(&buf, res.Parts); err != nil {
		return nil, err
	}
	if _, err := catalog.Decode("import", buf.Bytes()); err != nil {
		return nil, fmt.Errorf("import: the catalog made from %s does not read back: %w", safe.Text(file), err)
	}
	return buf.Bytes(), nil
}
