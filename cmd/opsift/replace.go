package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/replace"
	"github.com/opsift/opsift/filter/report"
)

// replaceFormats are the output formats of opsift replace.
var replaceFormats = []string{"table", "json", "md", "csv"}

const replaceUsage = `Usage: opsift replace PART-ID [--catalog PATH]... [--design FILE] [--format table|json|md|csv]
                      [--all] [--top N] [--obsolete] [--over-temp] [--strict] [--strict-catalog] [--bom]
                      [--no-cache] [-o FILE [--force]]

List the parts that can take PART-ID's place: drop-ins (same pinout family,
a package in common, at least as many channels) first, then parts that need
a footprint change. Each candidate is compared figure by figure with the
original; "strict" means no figure the original gives is worse or missing.
The csv format ends every row with the caution in a "caution" column.
With --design, every candidate is also evaluated in the circuit at worst
case and the passing ones are ranked by their smallest margin; regressions
are then warnings. A table written to a terminal lists a screenful of
candidates ($LINES rows, else 24, less the header); --top N lists at most N,
--top 0 all. The other formats and files list every candidate unless --top
is given. Parts with problems
are set aside (listed on stderr) unless --strict-catalog refuses the catalog;
exit status as for rank.

Options:
`

// replaceFlags are the parsed options of opsift replace.
type replaceFlags struct {
	catalogs pathList
	design   string
	format   string
	all      bool
	obsolete bool
	overTemp bool
	strict   bool
	top      int
	// strictCatalog refuses the catalog on any problem.
	strictCatalog bool
	output        outputFlags
}

func runReplace(e *env, args []string) error {
	var f replaceFlags
	fs := newFlagSet(e, "replace", replaceUsage)
	catalogFlags(fs, e, &f.catalogs)
	fs.StringVar(&f.design, "design", "", "design TOML: evaluate every candidate in this circuit")
	fs.StringVar(&f.format, "format", "table", "output format: "+strings.Join(replaceFormats, ", "))
	fs.BoolVar(&f.all, "all", false, "with --design, list the candidates that fail the design too")
	fs.BoolVar(&f.obsolete, "obsolete", false, "list obsolete parts as candidates too")
	fs.BoolVar(&f.overTemp, "over-temp", false, "compare over-temperature limits (min_ot, max_ot) where both parts give them")
	fs.BoolVar(&f.strict, "strict", false, "with --design, a check whose figure the catalog lacks fails")
	fs.BoolVar(&f.strictCatalog, "strict-catalog", false, strictCatalogHelp)
	fs.IntVar(&f.top, "top", -1, "list at most N candidates (0: all; default: a screenful for a table on a terminal, else all)")
	f.output.register(fs)
	f.output.registerBOM(fs)
	pos, err := replaceParseArgs(fs, args)
	if helped, err := flagResult(e, fs, err); helped || err != nil {
		return err
	}
	switch {
	case len(pos) == 0:
		return usageError("replace: missing PART-ID (the id of the part to replace; see opsift replace --help)")
	case len(pos) > 1:
		return usageError("replace: one PART-ID expected, got %d: %s", len(pos), strings.Join(pos, " "))
	}
	if f.top < -1 {
		return usageError("replace: --top %d: want 0 (all) or a positive count", f.top)
	}
	if !replaceOneOf(f.format, replaceFormats) {
		return usageError("replace: --format %q: want one of %s", f.format, strings.Join(replaceFormats, ", "))
	}

	cat, err := loadCatalog(e, f.catalogs, f.strictCatalog)
	if err != nil {
		return err // already an input error (exit status 2)
	}
	parts := cat.Parts
	orig, err := lookupPart(cat, pos[0])
	if err != nil {
		return withPrefix("replace", err)
	}
	opts := replace.Options{IncludeObsolete: f.obsolete, OverTemperature: f.overTemp}
	var design *filter.Design
	var plan *filter.Plan
	if f.design != "" {
		design, plan, err = deriveDesign(f.design)
		if err != nil {
			return inputError(err)
		}
		opts.Plan, opts.Strict = plan, f.strict
	}
	res := replace.Find(orig, parts, opts)
	v := newReplaceView(res, f.all)
	v.limit(f.replaceTop(e))
	v.plan, v.meta = plan, meta(e, f.design, design, cat, f.strict)
	if plan != nil {
		v.meta.Warnings = filter.FilterWarnings(plan, parts)
	}
	if design != nil {
		v.designTitle, v.designFile = design.Title, f.design
	}

	var buf bytes.Buffer
	v.color = f.output.out == "" && f.format == "table" && e.isTTY && e.getenv("NO_COLOR") == ""
	if err := v.write(&buf, f.format); err != nil {
		return err
	}
	data := buf.Bytes()
	if f.format == "csv" {
		data = f.output.csv(data)
	}
	return f.output.emit(e, data)
}

// replaceParseArgs parses flags that may come before and after the
// positional arguments ("opsift replace ID --design d.toml"), which the
// flag package alone stops at. A lone "--" ends the flags.
func replaceParseArgs(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := parseQuiet(fs, args); err != nil {
			return nil, err
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, nil
		}
		if len(args) > len(rest) && args[len(args)-len(rest)-1] == "--" {
			return append(pos, rest...), nil
		}
		pos = append(pos, rest[0])
		args = rest[1:]
	}
}

func replaceOneOf(s string, set []string) bool {
	for _, x := range set {
		if s == x {
			return true
		}
	}
	return false
}

// replaceView is what the writers show of a Result: the candidates listed
// (with a design and without --all, only those that pass) and what was
// left out.
type replaceView struct {
	res         replace.Result
	list        []replace.Candidate
	failHidden  int // candidates failing the design, not listed
	topHidden   int // candidates past --top, not listed
	designTitle string
	designFile  string
	plan        *filter.Plan // the design evaluated; nil without --design
	meta        *report.Meta
	color       bool
}

// replaceTop is the number of candidates to list, 0 for all: --top when
// given, else a screenful for a table written to a terminal.
func (f *replaceFlags) replaceTop(e *env) int {
	if f.top >= 0 {
		return f.top
	}
	if f.format != "table" || f.output.out != "" || !e.isTTY {
		return 0
	}
	rows := 24
	if n, err := strconv.Atoi(strings.TrimSpace(e.getenv("LINES"))); err == nil && n > 0 {
		rows = n
	}
	return max(replaceTopMin, rows-replaceHeaderRows)
}

// The screenful of replace: the summary table gets the terminal's rows
// less the header above it and the notes below, and never fewer than
// replaceTopMin rows.
const (
	replaceHeaderRows = 10
	replaceTopMin     = 5
)

// limit lists at most top candidates (0: all), counting the rest.
func (v *replaceView) limit(top int) {
	if top > 0 && len(v.list) > top {
		v.topHidden = len(v.list) - top
		v.list = v.list[:top]
	}
}

func newReplaceView(res replace.Result, all bool) *replaceView {
	v := &replaceView{res: res}
	for _, c := range res.Candidates {
		if res.Designed && !all && !c.Design.Pass {
			v.failHidden++
			continue
		}
		v.list = append(v.list, c)
	}
	return v
}

// write renders the view in format. Only the table carries styling of
// its own (its data strings are escaped where they are written); every
// other format passes whole through the sanitiser.
func (v *replaceView) write(w io.Writer, format string) error {
	var buf bytes.Buffer
	switch format {
	case "json":
		if err := v.writeJSON(&buf); err != nil {
			return err
		}
		_, err := w.Write(safe.JSON(buf.Bytes()))
		return err
	case "csv", "md":
		write := v.writeCSV
		if format == "md" {
			write = v.writeMarkdown
		}
		if err := write(&buf); err != nil {
			return err
		}
		_, err := io.WriteString(w, safe.Lines(buf.String()))
		return err
	}
	return v.writeTable(w)
}

// replacePartLine describes a part in one line: id, lifecycle, pinout, packages, channels.
func replacePartLine(p *catalog.Part) string {
	pin := p.Pinout
	if pin == "" {
		pin = "no pinout family"
	} else {
		pin = "pinout " + pin
	}
	return safe.Text(fmt.Sprintf("%s, %s, %s, %d channel%s", p.Lifecycle, pin, strings.Join(p.Packages, "/"), p.Channels, replacePlural(p.Channels)))
}

func replacePlural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}
