package report

import (
	"bufio"
	"bytes"
	"fmt"
	"io"

	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
)

// WriteDerive writes the plan's requirements: "text" shows every
// requirement with its formula under a design summary; "json" the same as
// a document with SI numbers.
func WriteDerive(w io.Writer, format string, p *filter.Plan, m *Meta) error {
	switch format {
	case "", "text":
		return writeDeriveText(w, p)
	case "json":
		return writeDeriveJSON(w, p, m)
	}
	return fmt.Errorf("unknown format %q, want text or json", format)
}

// writeDeriveText writes the summary, the design's warnings and every
// requirement grouped by stage; every line passes through the sanitiser,
// since the design's strings (title, package lists) are in it.
func writeDeriveText(w io.Writer, p *filter.Plan) error {
	var buf bytes.Buffer
	b := bufio.NewWriter(&buf)
	fmt.Fprintln(b, oneLine(p.Title))
	for _, l := range summaryLines(p) {
		fmt.Fprintln(b, "  "+l)
	}
	if len(p.Warnings) > 0 {
		b.WriteByte('\n')
		for _, w := range p.Warnings {
			for _, l := range present.Wrap("⚠ "+w.String(), DefaultWidth, "  ") {
				fmt.Fprintln(b, l)
			}
		}
	}
	reqs := p.Requirements()
	stage := "\x00"
	for i := range reqs {
		q := &reqs[i]
		if q.Stage != stage {
			stage = q.Stage
			if stage == "" {
				fmt.Fprintln(b, "\ndesign")
			} else {
				fmt.Fprintf(b, "\nstage %s\n", stage)
			}
		}
		fmt.Fprintf(b, "  %-15s %-6s %-22s %s\n", q.Key, q.Bound, Need(q), q.Why)
	}
	fmt.Fprintf(b, "\nCaution: %s\n", Caution)
	if err := b.Flush(); err != nil {
		return err
	}
	_, err := io.WriteString(w, safe.Lines(buf.String()))
	return err
}

type jsonStage struct {
	Name      string `json:"name"`
	Kind      string `json:"kind"`
	Gain      *num   `json:"gain,omitempty"`
	NoiseGain *num   `json:"noise_gain,omitempty"`
	Shape     string `json:"shape,omitempty"`
	Peak      *num   `json:"peak,omitempty"`
	OutPeak   *num   `json:"output_peak,omitempty"`
	Freq      *num   `json:"freq,omitempty"`
	Rise      *num   `json:"rise,omitempty"`
	GainError *num   `json:"gain_error,omitempty"`
	SourceR   *num   `json:"source_r,omitempty"`
	LoadR     *num   `json:"load_r,omitempty"`
}

type jsonDerive struct {
	JSONMeta
	Title   string `json:"title"`
	Caution string `json:"caution"`
	Supply  struct {
		Pos       num `json:"pos"`
		Neg       num `json:"neg"`
		Tolerance num `json:"tolerance"`
		PosWorst  num `json:"pos_worst"`
		NegWorst  num `json:"neg_worst"`
		SpanMin   num `json:"span_min"`
		SpanMax   num `json:"span_max"`
	} `json:"supply"`
	Temp         [2]num            `json:"temp"`
	DerateTyp    num               `json:"derate_typ"`
	InflateTyp   num               `json:"inflate_typ"`
	Stages       []jsonStage       `json:"stages"`
	Requirements []jsonRequirement `json:"requirements"`
}

// positive returns nil for zero (not applicable) values.
func positive(v float64) *num {
	if v == 0 {
		return nil
	}
	return val(v)
}

func writeDeriveJSON(w io.Writer, p *filter.Plan, m *Meta) error {
	out := jsonDerive{JSONMeta: NewJSONMeta(m, p), Title: p.Title, Caution: Caution, Temp: [2]num{num(p.TempLow), num(p.TempHigh)},
		DerateTyp: num(p.DerateTyp), InflateTyp: num(p.InflateTyp), Requirements: jsonRequirements(p)}
	r := p.Rails
	out.Supply.Pos, out.Supply.Neg, out.Supply.Tolerance = num(r.Pos), num(r.Neg), num(r.Tol)
	out.Supply.PosWorst, out.Supply.NegWorst = num(r.PosWorst), num(r.NegWorst)
	out.Supply.SpanMin, out.Supply.SpanMax = num(r.SpanMin), num(r.SpanMax)
	for _, s := range p.Stages {
		out.Stages = append(out.Stages, jsonStage{Name: s.Name, Kind: s.Kind, Gain: positive(s.Gain),
			NoiseGain: positive(s.NoiseGain), Shape: s.Shape, Peak: positive(s.Peak), OutPeak: positive(s.Vo),
			Freq: positive(s.Freq), Rise: positive(s.Rise), GainError: positive(s.GainError),
			SourceR: positive(s.SourceR), LoadR: positive(s.LoadR)})
	}
	return encodeJSON(w, out)
}
