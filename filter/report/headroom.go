package report

import (
	"runtime"
	"sync"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/headroom"
)

// Headroom returns the headroom of a listed candidate (filter/headroom),
// computed on first use and kept for the other writers of the same
// document: only what is exported is ever searched. A candidate the
// document does not search (HeadroomSearched) has none.
func (d *Doc) Headroom(r *filter.Result) []headroom.Limit {
	if !d.HeadroomSearched(r) {
		return nil
	}
	if ls, ok := d.headroom[r.Part]; ok {
		return ls
	}
	if d.headroom == nil {
		d.headroom = map[*catalog.Part][]headroom.Limit{}
	}
	ls := headroom.Find(d.Plan.Design, d.Plan, r.Part, filter.Options{Strict: d.Strict})
	d.headroom[r.Part] = ls
	return ls
}

// HeadroomSearched reports whether the document searches r's headroom:
// r passes, headroom is on, the plan has its design, and r is within
// HeadroomTop.
func (d *Doc) HeadroomSearched(r *filter.Result) bool {
	return r.Pass && d.headroomOn() && d.inHeadroomTop(r)
}

// HeadroomLeftOut reports whether r is a passing candidate whose headroom
// would be searched but for HeadroomTop (the writers say so).
func (d *Doc) HeadroomLeftOut(r *filter.Result) bool {
	return r.Pass && d.headroomOn() && !d.inHeadroomTop(r)
}

// headroomOn reports whether the document carries headroom at all.
func (d *Doc) headroomOn() bool {
	return !d.NoHeadroom && d.Plan != nil && d.Plan.Design != nil
}

// inHeadroomTop reports whether a listed passing candidate is among the
// first HeadroomTop passing ones (every one when HeadroomTop is 0).
func (d *Doc) inHeadroomTop(r *filter.Result) bool {
	if d.HeadroomTop <= 0 {
		return true
	}
	if d.headroomTop == nil {
		d.headroomTop = map[*filter.Result]bool{}
		for _, l := range d.Listed() {
			if len(d.headroomTop) == d.HeadroomTop {
				break
			}
			if l.Pass {
				d.headroomTop[l] = true
			}
		}
	}
	return d.headroomTop[r]
}

// prepareHeadroom computes the headroom of every listed candidate, the
// candidates spread over the CPUs (each search is independent).
func (d *Doc) prepareHeadroom() {
	if !d.headroomOn() {
		return
	}
	var todo []*filter.Result
	for _, r := range d.Listed() {
		if _, ok := d.headroom[r.Part]; !ok && d.HeadroomSearched(r) {
			todo = append(todo, r)
		}
	}
	out := make([][]headroom.Limit, len(todo))
	var wg sync.WaitGroup
	next := make(chan int)
	for range min(runtime.GOMAXPROCS(0), len(todo)) {
		wg.Go(func() {
			for i := range next {
				out[i] = headroom.Find(d.Plan.Design, d.Plan, todo[i].Part, filter.Options{Strict: d.Strict})
			}
		})
	}
	for i := range todo {
		next <- i
	}
	close(next)
	wg.Wait()
	if d.headroom == nil {
		d.headroom = map[*catalog.Part][]headroom.Limit{}
	}
	for i, r := range todo {
		d.headroom[r.Part] = out[i]
	}
}

// jsonHeadroom is one headroom limit (DESIGN.md "Contract additions"),
// with the direction searched and the design's value beside it.
type jsonHeadroom struct {
	Stage     *string     `json:"stage"`
	Input     string      `json:"input"`
	Direction string      `json:"direction"`
	Value     num         `json:"value"`
	Limit     num         `json:"limit"`
	Unit      string      `json:"unit"`
	Breaks    jsonBinding `json:"breaks"`
	Method    string      `json:"method"`
}

func jsonHeadrooms(ls []headroom.Limit) []jsonHeadroom {
	out := make([]jsonHeadroom, 0, len(ls))
	for _, l := range ls {
		unit := l.Dim.Unit()
		if l.Dim == catalog.Ratio {
			unit = "" // held and written as a fraction, like every JSON figure
		}
		out = append(out, jsonHeadroom{Stage: stagePtr(l.Stage), Input: l.Input, Direction: l.Dir.String(),
			Value: num(l.Value), Limit: num(l.Limit), Unit: unit,
			Breaks: jsonBinding{Stage: stagePtr(l.Breaks.Stage), Key: string(l.Breaks.Key)}, Method: l.Method.String()})
	}
	return out
}
