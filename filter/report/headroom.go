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
// document: only what is exported is ever searched. A failing candidate,
// or a plan without its design, has none.
func (d *Doc) Headroom(r *filter.Result) []headroom.Limit {
	if !r.Pass || d.NoHeadroom || d.Plan == nil || d.Plan.Design == nil {
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

// prepareHeadroom computes the headroom of every listed candidate, the
// candidates spread over the CPUs (each search is independent).
func (d *Doc) prepareHeadroom() {
	if d.NoHeadroom || d.Plan == nil || d.Plan.Design == nil {
		return
	}
	var todo []*filter.Result
	for _, r := range d.Listed() {
		if _, ok := d.headroom[r.Part]; r.Pass && !ok {
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
