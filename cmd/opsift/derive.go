package main

import (
	"bytes"
	"fmt"
	"io/fs"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/report"
)

const deriveUsage = `Usage: opsift derive [--design FILE] [--format text|json] [-o FILE [--force]]

Show what the design needs from the op-amp: every requirement with its
bound and the formula with the numbers put in. Without --design, the
embedded demo design.

Options:
`

func runDerive(e *env, args []string) error {
	var (
		design, format string
		output         outputFlags
	)
	fset := newFlagSet(e, "derive", deriveUsage)
	fset.StringVar(&design, "design", "", "design TOML file (default: the embedded demo design)")
	fset.StringVar(&format, "format", "text", "output format: text or json")
	output.register(fset)
	if helped, err := parseFlags(e, fset, args); helped || err != nil {
		return err
	}
	if fset.NArg() > 0 {
		return usageError("derive: unexpected argument %q (see opsift derive --help)", fset.Arg(0))
	}
	if format != "text" && format != "json" {
		return usageError("derive: --format %q: want text or json", format)
	}
	d, plan, err := deriveDesign(design)
	if err != nil {
		return inputError(err)
	}
	var buf bytes.Buffer
	if err := report.WriteDerive(&buf, format, plan, meta(e, design, d, nil, false)); err != nil {
		return err
	}
	return output.emit(e, buf.Bytes())
}

// deriveDesign reads, decodes and derives the design at path, or the
// embedded demo design when path is "".
func deriveDesign(path string) (*filter.Design, *filter.Plan, error) {
	d, _, err := readDesign(path)
	if err != nil {
		return nil, nil, err
	}
	p, err := filter.Derive(d)
	if err != nil {
		return nil, nil, err
	}
	return d, p, nil
}

// readDesign reads and decodes the design at path ("" for the embedded
// demo) and returns it with the text it was decoded from.
func readDesign(path string) (*filter.Design, []byte, error) {
	var (
		b    []byte
		err  error
		name = path
	)
	if path == "" {
		name = data.DefaultDesign
		b, err = fs.ReadFile(data.Designs, data.DefaultDesign)
	} else {
		b, err = catalog.ReadFile(path)
	}
	if err != nil {
		return nil, nil, fmt.Errorf("design %s: %w", safe.Text(name), err)
	}
	d, err := filter.DecodeDesign(name, b)
	if err != nil {
		return nil, nil, err
	}
	return d, b, nil
}
