package report

import (
	"bytes"
	"encoding/json"
	"io"
	"math"
	"strconv"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/catalog/safe"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/present"
)

// The JSON documents follow DESIGN.md "JSON output of rank". Numbers are
// SI (V, A, Hz, V/s, Ω, s, °C, dB); a missing number (no margin, an
// unknown figure) is null. Numbers are rounded to 12 significant digits so
// float noise (3.2009999999999996) does not reach the file.

type jsonRank struct {
	JSONMeta
	Title        string            `json:"title"`
	Caution      string            `json:"caution"`
	Sort         string            `json:"sort"`
	Strict       bool              `json:"strict"`
	Parts        int               `json:"parts"`
	Passing      int               `json:"passing"`
	Requirements []jsonRequirement `json:"requirements"`
	Candidates   []jsonCandidate   `json:"candidates"`
	// SetAside lists the catalog's parts and files left out for problems.
	SetAside []jsonSetAside `json:"set_aside"`
}

// jsonSetAside is one part or file the catalog load left out.
type jsonSetAside struct {
	Kind     string   `json:"kind"` // "part" or "file"
	ID       string   `json:"id,omitempty"`
	File     string   `json:"file"`
	Line     int      `json:"line,omitempty"`
	Problems []string `json:"problems"`
	InUse    string   `json:"in_use,omitempty"` // where the valid part with the same id used instead is written
}

// jsonSetAsides renders the set-aside entries of a document.
func jsonSetAsides(ss []catalog.SetAside) []jsonSetAside {
	out := make([]jsonSetAside, 0, len(ss))
	for _, s := range ss {
		j := jsonSetAside{Kind: "part", ID: s.ID, File: s.Pos.File, Line: s.Pos.Line, InUse: s.InUse}
		if s.IsFile() {
			j.Kind = "file"
		}
		for _, p := range s.Problems {
			j.Problems = append(j.Problems, p.Error())
		}
		out = append(out, j)
	}
	return out
}

type jsonRequirement struct {
	Stage   *string  `json:"stage"`
	Key     string   `json:"key"`
	Bound   string   `json:"bound"`
	Value   *num     `json:"value,omitempty"`
	Low     *num     `json:"low,omitempty"`
	High    *num     `json:"high,omitempty"`
	Allowed []string `json:"allowed,omitempty"`
	Unit    string   `json:"unit"`
	Why     string   `json:"why"`
}

type jsonBinding struct {
	Stage *string `json:"stage"`
	Key   string  `json:"key"`
}

type jsonCandidate struct {
	ID            string          `json:"id"`
	Name          string          `json:"name"`
	Datasheet     string          `json:"datasheet,omitempty"` // the catalog's reference, as written
	Pass          bool            `json:"pass"`
	WorstMargin   *num            `json:"worst_margin"`
	Binding       *jsonBinding    `json:"binding"`
	FailReason    string          `json:"fail_reason,omitempty"`
	Packages      int             `json:"packages"`
	Cost          *num            `json:"cost"`
	SupplyCurrent *num            `json:"supply_current"`
	FMax          map[string]*num `json:"fmax"`
	Failed        int             `json:"failed"`
	Unknown       int             `json:"unknown"`
	Checks        []jsonCheck     `json:"checks"`
	// Headroom is how far each design input can move before the part
	// fails (passing candidates; empty for failing ones; null for a
	// passing one beyond --headroom N, not searched).
	Headroom []jsonHeadroom `json:"headroom"`
}

type jsonCheck struct {
	Stage         *string `json:"stage"`
	Key           string  `json:"key"`
	Bound         string  `json:"bound"`
	Required      *num    `json:"required,omitempty"`
	Available     *num    `json:"available,omitempty"`
	RequiredLow   *num    `json:"required_low,omitempty"`
	RequiredHigh  *num    `json:"required_high,omitempty"`
	AvailableLow  *num    `json:"available_low,omitempty"`
	AvailableHigh *num    `json:"available_high,omitempty"`
	Have          string  `json:"have,omitempty"`
	Unit          string  `json:"unit"`
	Margin        *num    `json:"margin"`
	Pass          bool    `json:"pass"`
	Status        string  `json:"status"`
	Basis         string  `json:"basis,omitempty"`
	Note          string  `json:"note,omitempty"`
	// Cf is the feedback capacitor a transimpedance gbw check needs on
	// this part, F (DESIGN.md "Contract additions").
	Cf *num `json:"cf,omitempty"`
	// PredictedFreq is the frequency a relaxation stage runs at on this
	// part (its gbw check), Hz.
	PredictedFreq *num `json:"predicted_freq,omitempty"`
}

// num is a float64 written with at most 12 significant digits.
type num float64

func (n num) MarshalJSON() ([]byte, error) {
	f := float64(n)
	if math.IsInf(f, 0) {
		// JSON has no infinity. An unbounded figure or margin (a zero
		// figure under an allowance, a check relaxed by the circuit) has no
		// number to give: null, with pass and note saying why.
		return []byte("null"), nil
	}
	return strconv.AppendFloat(nil, f, 'g', 12, 64), nil
}

// opt returns nil for NaN.
func opt(v float64) *num {
	if math.IsNaN(v) {
		return nil
	}
	n := num(v)
	return &n
}

func val(v float64) *num { n := num(v); return &n }

func stagePtr(s string) *string {
	if s == "" {
		return nil
	}
	return &s
}

func jsonRequirements(p *filter.Plan) []jsonRequirement {
	reqs := p.Requirements()
	out := make([]jsonRequirement, 0, len(reqs))
	for i := range reqs {
		q := &reqs[i]
		j := jsonRequirement{Stage: stagePtr(q.Stage), Key: string(q.Key), Bound: q.Bound.String(),
			Unit: q.Unit, Why: q.Why, Allowed: q.Allowed}
		switch q.Bound {
		case filter.BoundMin, filter.BoundMax:
			j.Value = val(q.Value)
		case filter.BoundRange:
			j.Low, j.High = val(q.Low), val(q.High)
		default:
			switch q.Key {
			case filter.KeyTemperature:
				j.Low, j.High, j.Unit = val(q.Low), val(q.High), "°C"
			case filter.KeyCost:
				j.Value = val(q.Value)
			}
		}
		out = append(out, j)
	}
	return out
}

func jsonChecks(r *filter.Result) []jsonCheck {
	out := make([]jsonCheck, 0, len(r.Checks))
	for i := range r.Checks {
		c := &r.Checks[i]
		q := c.Req
		j := jsonCheck{Stage: stagePtr(q.Stage), Key: string(q.Key), Bound: q.Bound.String(), Unit: q.Unit,
			Margin: opt(c.Margin), Pass: c.Pass, Status: c.Status.String(), Basis: c.Basis.String(), Note: c.Note}
		switch q.Bound {
		case filter.BoundMin, filter.BoundMax:
			j.Required, j.Available = val(c.Required), opt(c.Available)
		case filter.BoundRange:
			j.RequiredLow, j.RequiredHigh = val(q.Low), val(q.High)
			j.AvailableLow, j.AvailableHigh = opt(c.AvailLow), opt(c.AvailHigh)
		default:
			switch q.Key {
			case filter.KeyTemperature:
				j.RequiredLow, j.RequiredHigh = val(q.Low), val(q.High)
				j.AvailableLow, j.AvailableHigh = opt(c.AvailLow), opt(c.AvailHigh)
				j.Unit = "°C"
			case filter.KeyCost:
				j.Required, j.Available = val(c.Required), opt(c.Available)
			default:
				j.Have = Has(c, r.Part)
			}
		}
		switch c.Aside.Kind {
		case filter.AsideCf:
			j.Cf = val(c.Aside.V)
		case filter.AsidePredictedFreq:
			j.PredictedFreq = val(c.Aside.V)
		}
		out = append(out, j)
	}
	return out
}

// WriteJSON writes the rank document of DESIGN.md "JSON output of rank".
func WriteJSON(w io.Writer, doc *Doc) error {
	p := doc.Plan
	out := jsonRank{JSONMeta: NewJSONMeta(doc.Meta, p), Title: p.Title, Caution: Caution, Sort: sortName(doc.Sort),
		Strict: doc.Strict, Parts: len(doc.Results), Passing: doc.Passing(),
		Requirements: jsonRequirements(p), Candidates: []jsonCandidate{}, SetAside: jsonSetAsides(doc.SetAside)}
	doc.prepareHeadroom()
	for _, r := range doc.Listed() {
		c := jsonCandidate{ID: r.Part.ID, Name: r.Part.Name, Datasheet: r.Part.Datasheet, Pass: r.Pass, WorstMargin: opt(present.ShownMargin(r)),
			Packages: r.Packages, Cost: opt(r.Cost), SupplyCurrent: opt(r.SupplyCurrent),
			FMax: map[string]*num{}, Failed: r.Failed, Unknown: r.Unknown, Checks: jsonChecks(r),
			Headroom: jsonHeadrooms(doc.Headroom(r))}
		if doc.HeadroomLeftOut(r) {
			c.Headroom = nil // not searched, unlike a failing part's []
		}
		switch w := present.Worst(r); {
		case w != nil:
			c.Binding = &jsonBinding{Stage: stagePtr(w.Req.Stage), Key: string(w.Req.Key)}
			c.FailReason = present.Reason(w)
		case r.Pass && !math.IsNaN(r.WorstMargin):
			c.Binding = &jsonBinding{Stage: stagePtr(r.Binding.Stage), Key: string(r.Binding.Key)}
		}
		for i, s := range p.Stages {
			c.FMax[s.Name] = opt(r.FMax[i])
		}
		out.Candidates = append(out.Candidates, c)
	}
	return encodeJSON(w, out)
}

// encodeJSON writes v indented; the unsafe runes encoding/json leaves
// alone are written as \u escapes (safe.JSON), so the document decodes to
// the same strings but cannot act on a terminal it is shown in.
func encodeJSON(w io.Writer, v any) error {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return err
	}
	_, err := w.Write(safe.JSON(buf.Bytes()))
	return err
}
