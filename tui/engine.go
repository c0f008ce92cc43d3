package tui

import (
	"context"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"github.com/opsift/opsift/filter"
)

// rankJob is one evaluation of the catalog against a derived plan. It runs
// off the UI path in a tea.Cmd; gen is the model's generation when the job
// was made, so a result overtaken by a newer edit is dropped on arrival.
type rankJob struct {
	gen  uint64
	ctx  context.Context // cancelled when a newer job starts
	plan *filter.Plan
	eval *filter.Incremental
	sort filter.SortKey
}

// rankedMsg carries a finished rankJob back to Update.
type rankedMsg struct {
	gen     uint64
	plan    *filter.Plan
	results []filter.Result
	// rest is set when results hold only the passing parts: the ranking
	// whose All gives every part, which a second job fetches next.
	rest *filter.Ranking
	// warnings are the plan's own and those about its filters against the
	// catalog (a package no part comes in, filters that leave no part).
	warnings []filter.Warning
	took     time.Duration
}

// explain fills in the checks of a result evaluated in summary mode: the
// ranking keeps only summaries (pass, worst margin, binding, fmax), and the
// rows that are drawn, the selected part and exports get their checks here.
// plan must be the plan the result was ranked with.
func explain(plan *filter.Plan, r *filter.Result, strict bool) {
	if r.Checks == nil && plan != nil {
		filter.Explain(plan, r, filter.Options{Strict: strict})
	}
}

// run evaluates and ranks in two steps: first the passing parts
// (filter.Incremental.Rank, the part a keystroke waits for while failing
// parts are hidden), then, in a second job that Update starts on the
// first one's arrival, every part (rest). The plan and parts are never
// written after the job is made (an edit derives a new plan from a clone
// of the design), so the job shares them with the model safely. A job
// cancelled by a newer one stops inside the evaluation and reports nothing.
func (j rankJob) run() tea.Msg {
	start := time.Now()
	rk, err := j.eval.Rank(j.ctx, j.plan, j.sort)
	if err != nil {
		return nil
	}
	warns := append(append([]filter.Warning(nil), j.plan.Warnings...), filter.FilterWarnings(j.plan, j.eval.Parts())...)
	return rankedMsg{gen: j.gen, plan: j.plan, results: rk.Passing, rest: rk, warnings: warns, took: time.Since(start)}
}

// rest is the second step of the job: every part ranked, failing ones
// included, with the warnings the first step found.
func (j rankJob) rest(first rankedMsg) tea.Cmd {
	return func() tea.Msg {
		start := time.Now()
		res, err := first.rest.All(j.ctx)
		if err != nil {
			return nil
		}
		return rankedMsg{gen: j.gen, plan: first.plan, results: res, warnings: first.warnings, took: first.took + time.Since(start)}
	}
}
