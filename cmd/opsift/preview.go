package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/preview"
	"github.com/opsift/opsift/filter/report"
	"github.com/opsift/opsift/filter/sim"
	"github.com/opsift/opsift/tui/plot"
)

const previewUsage = `Usage: opsift preview PART-ID [--design FILE] [--stage NAME] [--catalog PATH]...
                      [--typical] [--format text|json] [--width N] [--height N] [--points N]
                      [--strict-catalog] [--no-cache] [-o FILE [--force]]

Simulate PART-ID in one stage of the design and show the settled waveform
beside the ideal op-amp's: output and ideal peak-to-peak, peak error, THD,
the share of time spent slew-limited, an oscillator's frequency and duty
cycle, a comparator's transition time, and a plot. The part runs on the
same worst-case figures the margins use (--typical: the catalog's typical
figures on the nominal rails). Without --design, the embedded demo design;
without --stage, its first stage that has a waveform (direct and
rail_splitter stages have none). JSON is in SI units: V, s, Hz, fractions.
Parts with problems are set aside (listed on stderr) unless --strict-catalog
refuses the catalog; exit status as for rank.

Options:
`

// previewFlags are the parsed options of opsift preview.
type previewFlags struct {
	catalogs      pathList
	design        string
	stage         string
	typical       bool
	format        string
	width, height int
	points        int
	strictCatalog bool // refuse the catalog on any problem
	output        outputFlags
}

// Plot size defaults: 80 columns when COLUMNS is not set, 16 lines.
const (
	previewDefaultWidth  = 80
	previewDefaultHeight = 16
	// The largest plot and sample count accepted: far past any screen,
	// small enough that a typo cannot exhaust memory.
	previewMaxWidth  = 1000
	previewMaxHeight = 500
	previewMaxPoints = 100000
)

func runPreview(e *env, args []string) error {
	var f previewFlags
	fset := newFlagSet(e, "preview", previewUsage)
	catalogFlags(fset, e, &f.catalogs)
	fset.StringVar(&f.design, "design", "", "design TOML file (default: the embedded demo design)")
	fset.StringVar(&f.stage, "stage", "", "stage to simulate (default: the first stage that has a waveform)")
	fset.BoolVar(&f.typical, "typical", false, "use typical figures on the nominal rails instead of the worst case")
	fset.StringVar(&f.format, "format", "text", "output format: text or json")
	fset.IntVar(&f.width, "width", 0, "plot width in columns (default: $COLUMNS, else 80)")
	fset.IntVar(&f.height, "height", previewDefaultHeight, "plot height in lines")
	fset.IntVar(&f.points, "points", 0, "largest number of samples in the t, in, out, ideal arrays (default 2000)")
	fset.BoolVar(&f.strictCatalog, "strict-catalog", false, strictCatalogHelp)
	f.output.register(fset)
	pos, err := replaceParseArgs(fset, args)
	if helped, err := flagResult(e, fset, err); helped || err != nil {
		return err
	}
	switch {
	case len(pos) == 0:
		return usageError("preview: missing PART-ID (the id of the part to simulate; see opsift preview --help)")
	case len(pos) > 1:
		return usageError("preview: one PART-ID expected, got %d: %s", len(pos), strings.Join(pos, " "))
	case f.format != "text" && f.format != "json":
		return usageError("preview: --format %q: want text or json", f.format)
	case f.width < 0 || (f.width > 0 && f.width < 20) || f.width > previewMaxWidth:
		return usageError("preview: --width %d: want 20 to %d columns", f.width, previewMaxWidth)
	case f.height < 4 || f.height > previewMaxHeight:
		return usageError("preview: --height %d: want 4 to %d lines", f.height, previewMaxHeight)
	case f.points < 0 || f.points == 1 || f.points > previewMaxPoints:
		return usageError("preview: --points %d: want 2 to %d", f.points, previewMaxPoints)
	}
	if f.width == 0 {
		f.width = min(max(e.columns(previewDefaultWidth), 20), previewMaxWidth)
	}

	cat, err := loadPart(e, f.catalogs, f.strictCatalog, pos[0])
	if err != nil {
		return err // already an input error (exit status 2)
	}
	part, err := lookupPart(cat, pos[0])
	if err != nil {
		return withPrefix("preview", err)
	}
	design, plan, err := deriveDesign(f.design)
	if err != nil {
		return inputError(err)
	}
	stage := f.stage
	if stage == "" {
		var ok bool
		if stage, ok = preview.FirstStage(plan); !ok {
			return usageError("preview: design %s has no stage with a waveform (direct and rail_splitter stages have none)", safe.Text(design.Name))
		}
	} else if err := previewCheckStage(plan, stage); err != nil {
		return usageError("preview: design %s: %w", safe.Text(design.Name), err)
	}
	res, err := preview.Run(plan, stage, part, preview.Options{Typical: f.typical, Sim: sim.Options{MaxPoints: f.points}})
	if err != nil {
		return inputError(fmt.Errorf("preview: %w", err))
	}
	var buf bytes.Buffer
	if f.format == "json" {
		err = writePreviewJSON(&buf, res, report.NewJSONMeta(meta(e, f.design, design, cat, false), plan))
	} else {
		err = writePreviewText(&buf, design, res, f.width, f.height)
	}
	if err != nil {
		return err
	}
	return f.output.emit(e, buf.Bytes())
}

// previewCheckStage reports a stage the design lacks, or one without a
// waveform, naming the stages that have one.
func previewCheckStage(plan *filter.Plan, name string) error {
	have := preview.Stages(plan)
	quoted := make([]string, len(have))
	for i, s := range have {
		quoted[i] = strconv.Quote(s)
	}
	want := "want one of " + strings.Join(quoted, ", ")
	if len(have) == 0 {
		want = "and no stage of it has a waveform"
	}
	for _, s := range plan.Stages {
		if s.Name == name {
			if filter.HasWaveform(s.Kind) {
				return nil
			}
			return fmt.Errorf("--stage %q: stage kind %s has no waveform preview, %s", name, s.Kind, want)
		}
	}
	return fmt.Errorf("--stage %q: no such stage, %s", name, want)
}

// previewMetricsJSON are the metrics of the contract, those that apply: the
// one home of their JSON names (sim.Metrics has none).
type previewMetricsJSON struct {
	OutputPP        float64  `json:"output_pp"`
	IdealPP         float64  `json:"ideal_pp"`
	PeakError       *float64 `json:"peak_error,omitempty"`
	THD             *float64 `json:"thd,omitempty"`
	SlewingFraction float64  `json:"slewing_fraction"`
	Frequency       *float64 `json:"frequency,omitempty"`
	IdealFrequency  *float64 `json:"ideal_frequency,omitempty"`
	Duty            *float64 `json:"duty,omitempty"`
	TransitionTime  *float64 `json:"transition_time,omitempty"`
}

// previewJSON is opsift preview's JSON output (SI units).
type previewJSON struct {
	report.JSONMeta
	Part    string             `json:"part"`
	Stage   string             `json:"stage"`
	Kind    string             `json:"kind"`
	Basis   string             `json:"basis"`
	Caution string             `json:"caution"`
	Metrics previewMetricsJSON `json:"metrics"`
	InUnit  string             `json:"in_unit"`
	T       []float64          `json:"t"`
	In      []float64          `json:"in"`
	Out     []float64          `json:"out"`
	Ideal   []float64          `json:"ideal"`
	Notes   []string           `json:"notes"`
}

func writePreviewJSON(w io.Writer, r *preview.Result, meta report.JSONMeta) error {
	m, wf := r.Metrics, r.Waveform
	out := previewJSON{JSONMeta: meta,
		Part: r.Part.ID, Stage: r.Stage, Kind: r.Kind, Basis: string(r.Basis), Caution: caution,
		Metrics: previewMetricsJSON{OutputPP: m.OutputPP, IdealPP: m.IdealPP, PeakError: m.PeakError, THD: m.THD,
			SlewingFraction: m.SlewingFraction, Frequency: m.Frequency, IdealFrequency: m.IdealFrequency,
			Duty: m.Duty, TransitionTime: m.TransitionTime},
		InUnit: wf.InUnit, T: wf.T, In: wf.In, Out: wf.Out, Ideal: wf.Ideal, Notes: r.Notes,
	}
	if out.Notes == nil {
		out.Notes = []string{}
	}
	b, err := json.MarshalIndent(out, "", "  ")
	if err != nil {
		return err
	}
	_, err = w.Write(append(safe.JSON(b), '\n'))
	return err
}

func writePreviewText(w io.Writer, d *filter.Design, r *preview.Result, width, height int) error {
	basis := "worst case (the figures the margins use)"
	if r.Basis == preview.Typical {
		basis = "typical figures, nominal rails"
	}
	fmt.Fprintf(w, "%s in stage %q (%s) of %s\n", r.Part.ID, r.Stage, r.Kind, safe.Text(d.Name))
	fmt.Fprintf(w, "basis: %s\n", basis)
	for _, f := range r.Figures {
		fmt.Fprintf(w, "  %s\n", f)
	}
	fmt.Fprintf(w, "signal: %s\n\n", previewInput(r))

	m := r.Metrics
	row := func(name, value, extra string) {
		if extra != "" {
			value += "  " + extra
		}
		fmt.Fprintf(w, "  %-17s %s\n", name, value)
	}
	V := func(v float64) string { return catalog.Format(v, catalog.Volt) }
	row("output_pp", V(m.OutputPP), "(ideal "+V(m.IdealPP)+")")
	if m.PeakError != nil {
		row("peak_error", V(*m.PeakError), "")
	}
	if m.THD != nil {
		thd := catalog.Format(*m.THD, catalog.Ratio)
		if *m.THD < previewTHDFloor {
			thd = "< " + catalog.Format(previewTHDFloor, catalog.Ratio) + " (a clean sine)"
		}
		row("thd", thd, "")
	}
	row("slewing_fraction", catalog.Format(m.SlewingFraction, catalog.Ratio), "")
	if m.Frequency != nil {
		extra := ""
		if m.IdealFrequency != nil {
			extra = "(ideal " + catalog.Format(*m.IdealFrequency, catalog.Hertz) + ")"
		}
		row("frequency", catalog.Format(*m.Frequency, catalog.Hertz), extra)
	}
	if m.Duty != nil {
		row("duty", catalog.Format(*m.Duty, catalog.Ratio), "")
	}
	if m.TransitionTime != nil {
		row("transition_time", catalog.Format(*m.TransitionTime, catalog.Second), "(10–90 %)")
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, plot.Render(width, height, previewSeries(r), plot.Options{XDim: catalog.Second, YDim: catalog.Volt, XMin: 0, XMax: r.Waveform.Span()}))
	if len(r.Notes) > 0 {
		fmt.Fprintln(w, "\nnotes:")
		for _, n := range r.Notes {
			fmt.Fprintf(w, "  - %s\n", n)
		}
	}
	_, err := fmt.Fprintf(w, "\nCaution: %s\n", caution)
	return err
}

// previewTHDFloor is the THD below which the text shows "< 0.0001 %": the
// DFT of a settled linear stage gives rounding noise (1e-15 or so) there.
const previewTHDFloor = 1e-6

// previewSeries are the traces to plot: the output solid, the ideal as
// markers and, where it shares the output's volts, the input dotted (a
// comparator's input, an oscillator's capacitor).
func previewSeries(r *preview.Result) []plot.Series {
	wf := r.Waveform
	s := []plot.Series{
		{Name: "out", X: wf.T, Y: wf.Out, Mark: plot.Solid},
		{Name: "ideal", X: wf.T, Y: wf.Ideal, Mark: plot.Marker},
	}
	if r.InTrace != "" {
		s = append(s, plot.Series{Name: r.InTrace, X: wf.T, Y: wf.In, Mark: plot.Dotted})
	}
	return s
}

// previewInput describes the drive of the stage in one line.
func previewInput(r *preview.Result) string {
	in := r.Input
	dim := catalog.Volt
	if r.Waveform.InUnit == "A" {
		dim = catalog.Ampere
	}
	switch in.Shape {
	case sim.Sine, sim.Square:
		return fmt.Sprintf("%s, %s peak at %s about %s", in.Shape, catalog.Format(in.Peak, dim),
			catalog.Format(in.Freq, catalog.Hertz), catalog.Format(in.Offset, dim))
	case sim.Step:
		return fmt.Sprintf("step of %s from %s at %s", catalog.Format(in.Peak, dim), catalog.Format(in.Offset, dim),
			catalog.Format(in.At, catalog.Second))
	}
	return "none (free-running)"
}
