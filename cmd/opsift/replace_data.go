package main

import (
	"encoding/csv"
	"encoding/json"
	"io"
	"strconv"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter/replace"
	"github.com/opsift/opsift/filter/report"
)

// The JSON document of opsift replace. Numbers are SI base units (V, A,
// Hz, V/s, F, V/√Hz, A/√Hz, V/K), temperatures °C, open-loop gain dB; a
// figure a part does not give is null.
type replaceJSON struct {
	report.JSONMeta
	Original        replacePartJSON   `json:"original"`
	Candidates      []replaceCandJSON `json:"candidates"`
	ObsoleteLeftOut int               `json:"obsolete_left_out"`
	FailingLeftOut  int               `json:"failing_left_out,omitempty"`
	TopLeftOut      int               `json:"top_left_out,omitempty"`
	Caution         string            `json:"caution"`
}

type replacePartJSON struct {
	ID        string   `json:"id"`
	Name      string   `json:"name"`
	Lifecycle string   `json:"lifecycle"`
	Pinout    string   `json:"pinout"`
	Packages  []string `json:"packages"`
	Channels  int      `json:"channels"`
	Datasheet string   `json:"datasheet,omitempty"`
}

type replaceCandJSON struct {
	ID             string              `json:"id"`
	Name           string              `json:"name"`
	Lifecycle      string              `json:"lifecycle"`
	Datasheet      string              `json:"datasheet,omitempty"`
	DropIn         bool                `json:"drop_in"`
	Footprint      string              `json:"footprint"`
	SharedPackages []string            `json:"shared_packages"`
	Strict         bool                `json:"strict"`
	Regressions    []replaceChangeJSON `json:"regressions"`
	Improvements   []replaceChangeJSON `json:"improvements"`
	Missing        []string            `json:"missing"`
	Fields         []replaceFieldJSON  `json:"fields"`
	Design         *replaceFitJSON     `json:"design,omitempty"`
}

type replaceChangeJSON struct {
	Key    string `json:"key"`
	Class  int    `json:"class"`
	Reason string `json:"reason"`
}

type replaceFieldJSON struct {
	Key            string   `json:"key"`
	Label          string   `json:"label"`
	Original       *float64 `json:"original"`
	OriginalBasis  string   `json:"original_basis,omitempty"`
	OriginalLimit  string   `json:"original_limit,omitempty"`
	Candidate      *float64 `json:"candidate"`
	CandidateBasis string   `json:"candidate_basis,omitempty"`
	CandidateLimit string   `json:"candidate_limit,omitempty"`
	Unit           string   `json:"unit"`
	Better         string   `json:"better"`
	Verdict        string   `json:"verdict"`
	Note           string   `json:"note,omitempty"`
}

type replaceFitJSON struct {
	Pass        bool                `json:"pass"`
	WorstMargin *float64            `json:"worst_margin"`
	Binding     *replaceBindingJSON `json:"binding"`
	Failed      []string            `json:"failed"`
}

type replaceBindingJSON struct {
	Stage string `json:"stage"`
	Key   string `json:"key"`
}

func (v *replaceView) writeJSON(w io.Writer) error {
	o := v.res.Original
	doc := replaceJSON{
		Original: replacePartJSON{ID: o.ID, Name: o.Name, Lifecycle: string(o.Lifecycle), Pinout: o.Pinout,
			Packages: replaceNonNil(o.Packages), Channels: o.Channels, Datasheet: o.Datasheet},
		Candidates:      []replaceCandJSON{},
		ObsoleteLeftOut: v.res.ObsoleteLeftOut,
		FailingLeftOut:  v.failHidden,
		TopLeftOut:      v.topHidden,
		Caution:         caution,
	}
	doc.JSONMeta = report.NewJSONMeta(v.meta, v.plan)
	for _, c := range v.list {
		doc.Candidates = append(doc.Candidates, replaceCandidateJSON(c))
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(doc)
}

func replaceCandidateJSON(c replace.Candidate) replaceCandJSON {
	p := c.Part
	j := replaceCandJSON{
		ID: p.ID, Name: p.Name, Lifecycle: string(p.Lifecycle), Datasheet: p.Datasheet,
		DropIn: c.DropIn, Footprint: c.Footprint, SharedPackages: replaceNonNil(c.Shared), Strict: c.Strict,
		Regressions: replaceChangesJSON(c.Regressions), Improvements: replaceChangesJSON(c.Improvements),
		Missing: replaceNonNil(c.Missing),
	}
	for _, f := range c.Fields {
		j.Fields = append(j.Fields, replaceFieldJSON{
			Key: f.Key, Label: f.Label,
			Original: replaceOptNum(f.Original), OriginalBasis: string(f.Original.Basis), OriginalLimit: string(f.Original.Limit),
			Candidate: replaceOptNum(f.Candidate), CandidateBasis: string(f.Candidate.Basis), CandidateLimit: string(f.Candidate.Limit),
			Unit: f.Unit(), Better: string(f.Better), Verdict: string(f.Verdict), Note: f.Note,
		})
	}
	if d := c.Design; d != nil {
		fj := &replaceFitJSON{Pass: d.Pass, Failed: replaceNonNil(d.Failed)}
		if d.WorstMargin.Known() {
			m := d.WorstMargin.V()
			fj.WorstMargin = &m
			fj.Binding = &replaceBindingJSON{Stage: d.Binding.Stage, Key: d.Binding.Key}
		}
		j.Design = fj
	}
	return j
}

func replaceChangesJSON(cs []replace.Change) []replaceChangeJSON {
	out := []replaceChangeJSON{}
	for _, c := range cs {
		out = append(out, replaceChangeJSON{Key: c.Key, Class: c.Class, Reason: c.Reason()})
	}
	return out
}

func replaceOptNum(v replace.Value) *float64 {
	if !v.Set {
		return nil
	}
	x := v.V
	return &x
}

func replaceNonNil(xs []string) []string {
	if xs == nil {
		return []string{}
	}
	return xs
}

// replaceCSVHeader is the header row of the CSV: one row per candidate and
// field, numbers in SI units (the unit column names them). The last column,
// caution, carries the caution on every row (see report.CautionColumn).
var replaceCSVHeader = []string{
	"rank", "part", "drop_in", "strict", "design_pass", "worst_margin",
	"key", "original", "original_basis", "candidate", "candidate_basis", "unit", "verdict", report.CautionColumn,
}

func (v *replaceView) writeCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write(replaceCSVHeader)
	for i, c := range v.list {
		pass, margin := "", ""
		if c.Design != nil {
			pass = strconv.FormatBool(c.Design.Pass)
			if c.Design.WorstMargin.Known() {
				margin = replaceSIText(c.Design.WorstMargin)
			}
		}
		for _, f := range c.Fields {
			cw.Write([]string{
				strconv.Itoa(i + 1), c.Part.ID, strconv.FormatBool(c.DropIn), strconv.FormatBool(c.Strict), pass, margin,
				f.Key, replaceValueText(f.Original), string(f.Original.Basis), replaceValueText(f.Candidate), string(f.Candidate.Basis),
				f.Unit(), string(f.Verdict), caution,
			})
		}
	}
	cw.Flush()
	return cw.Error()
}

func replaceValueText(v replace.Value) string {
	if !v.Set {
		return ""
	}
	return strconv.FormatFloat(v.V, 'g', -1, 64)
}

func replaceSIText(o catalog.Opt) string { return strconv.FormatFloat(o.V(), 'g', -1, 64) }
