package sim

import (
	"fmt"
	"math"
)

// full is the number of ticks in one grid step.
const full = int64(1) << levels

// runner integrates one stage on the uniform grid t_k = k·h. Inside a step
// the input is a straight line (a chord of a sine, or a piece of a square
// or step edge, whose corners split the step), so in each regime the step
// has the exact solution held in that regime's table. A regime switch
// inside a step is located by bisection to one tick and the step goes on
// from there in the new regime.
type runner struct {
	sys  *system
	amp  *ampParams
	src  *source
	tabs [4]*table
	h    float64
	tick float64

	// Records: state at grid point k, and per step k (t_k → t_{k+1}) the
	// ticks spent slewing and on a rail and the extremes of the output,
	// events included.
	ys   []vec
	regs []regime
	slew []int64
	rail []int64
	xlo  []float64
	xhi  []float64
	// ug caches the input at the grid points of a driven run.
	ug []float64

	// corners are the output at the input's corners inside steps (the
	// ends of square and step edges), where the error against an ideal
	// that follows the input is largest.
	corners []corner
}

// corner is the output x at time t, inside step k.
type corner struct {
	k    int
	t, x float64
}

// trace is the integrator's running state.
type trace struct {
	y        vec
	reg      regime
	slew     int64
	rail     int64
	xlo, xhi float64
}

// watch stops a step where the output crosses level.
type watch struct {
	level float64
	above bool // output above level at the start
}

func (w *watch) crossed(x float64) bool { return (x > w.level) != w.above }

func newRunner(sys *system, amp *ampParams, src *source, h float64) *runner {
	r := &runner{sys: sys, amp: amp, src: src, h: h, tick: math.Ldexp(h, -levels)}
	for _, reg := range []regime{linear, slewUp, slewDown, railHigh} {
		d := sys.dynamics(reg, amp)
		r.tabs[reg.tableIndex()] = newTable(&d, h)
	}
	return r
}

func (r *runner) u(t float64) inputs { return inputs{r.src.at(t), 1} }

// uk is the input at grid point k.
func (r *runner) uk(k int) float64 {
	if k < len(r.ug) {
		return r.ug[k]
	}
	return r.src.at(float64(k) * r.h)
}

// uAt is u at tick pos of step k (time t), from the grid cache when pos
// is a grid point.
func (r *runner) uAt(k int, pos int64, t float64) inputs {
	switch pos {
	case 0:
		return inputs{r.uk(k), 1}
	case full:
		return inputs{r.uk(k + 1), 1}
	}
	return r.u(t)
}

// run integrates from y0 for up to n steps; stop, when not nil, is asked
// after each step k+1 is recorded and ends the run early. The records are
// allocated for expect steps up front.
func (r *runner) run(y0 vec, n, expect int, stop func(k int) bool) error {
	tr := trace{y: y0}
	tr.reg = r.sys.classify(&tr.y, r.u(0), r.amp)
	r.ys = append(make([]vec, 0, expect+1), tr.y)
	r.regs = append(make([]regime, 0, expect+1), tr.reg)
	r.slew = make([]int64, 0, expect)
	r.rail = make([]int64, 0, expect)
	r.xlo = make([]float64, 0, expect)
	r.xhi = make([]float64, 0, expect)
	r.ug = nil
	if r.src.in.Shape != None {
		r.ug = make([]float64, n+1)
		for k := range r.ug {
			r.ug[k] = r.src.at(float64(k) * r.h)
		}
	}
	r.corners = r.corners[:0]
	for k := 0; k < n; k++ {
		tr.slew, tr.rail = 0, 0
		tr.xlo, tr.xhi = tr.y[0], tr.y[0]
		if _, _, err := r.step(k, &tr, nil); err != nil {
			return err
		}
		r.ys = append(r.ys, tr.y)
		r.regs = append(r.regs, tr.reg)
		r.slew = append(r.slew, tr.slew)
		r.rail = append(r.rail, tr.rail)
		r.xlo = append(r.xlo, tr.xlo)
		r.xhi = append(r.xhi, tr.xhi)
		if stop != nil && stop(k+1) {
			break
		}
	}
	return nil
}

// steps is the number of completed grid steps.
func (r *runner) steps() int { return len(r.slew) }

// step advances tr through grid step k, splitting it at the input's
// corners. With a watch it returns at the first crossing of the watched
// level: the tick offset in the step and true.
func (r *runner) step(k int, tr *trace, w *watch) (int64, bool, error) {
	t0 := float64(k) * r.h
	pos := int64(0)
	for pos < full {
		end := full
		tA := t0 + float64(pos)*r.tick
		if bp, ok := r.src.nextBreak(tA + 0.5*r.tick); ok {
			if bt := int64(math.Round((bp - t0) / r.tick)); bt > pos && bt < end {
				end = bt
			}
		}
		tB := t0 + float64(end)*r.tick
		uA, uB := r.uAt(k, pos, tA), r.uAt(k, end, tB)
		slope := (uB[0] - uA[0]) / (tB - tA)
		stop, fired, err := r.span(tr, pos, end, uA, slope, w, tA)
		if err != nil || fired {
			return stop, fired, err
		}
		if w == nil && end < full {
			r.corners = append(r.corners, corner{k: k, t: tB, x: tr.y[0]})
		}
		pos = end
	}
	return full, false, nil
}

// ok reports whether the regime (and the watch) still hold at (y, u).
func (r *runner) ok(reg regime, y *vec, u inputs, w *watch) bool {
	if !r.sys.valid(reg, y, u, r.amp) {
		return false
	}
	return w == nil || !w.crossed(y[0])
}

// span integrates tr from tick a to tick b of a step with a straight-line
// input (value uA at a, slope in units per second).
func (r *runner) span(tr *trace, a, b int64, uA inputs, slope float64, w *watch, tA float64) (int64, bool, error) {
	u1 := inputs{slope, 0}
	uAt := func(off int64) inputs { return inputs{uA[0] + float64(off)*r.tick*slope, 1} }
	pos := a
	for iter := 0; pos < b; iter++ {
		if iter > maxSwitches {
			return pos, false, fmt.Errorf("sim: integration stuck at t = %g s after %d regime switches in one step", tA+float64(pos-a)*r.tick, iter)
		}
		tb := r.tabs[tr.reg.tableIndex()]
		n := b - pos
		u0 := uAt(pos - a)
		yEnd := tr.y
		tb.advance(&yEnd, u0, u1, n, r.tick)
		bound := int64(-1)
		if !r.ok(tr.reg, &yEnd, uAt(b-a), w) {
			bound = n
		} else if n == full {
			// A second look at mid-step catches an excursion that is
			// back in the regime by the end of the step.
			yMid := tr.y
			tb.lv[1].apply(tb.n, &yMid, u0, u1)
			if !r.ok(tr.reg, &yMid, uAt(pos-a+full/2), w) {
				bound = full / 2
			}
		}
		if bound < 0 {
			r.account(tr, n)
			tr.y = yEnd
			r.extremes(tr)
			return b, false, nil
		}
		// Largest whole number of ticks that stays in the regime, built
		// from the longest step down: one matrix–vector product per level.
		lo, yLo := int64(0), tr.y
		for j := 0; j <= levels; j++ {
			s := int64(1) << (levels - j)
			if lo+s >= bound {
				continue
			}
			cand := yLo
			tb.lv[j].apply(tb.n, &cand, uAt(pos-a+lo), u1)
			if r.ok(tr.reg, &cand, uAt(pos-a+lo+s), w) {
				lo, yLo = lo+s, cand
			}
		}
		tb.lv[levels].apply(tb.n, &yLo, uAt(pos-a+lo), u1)
		r.account(tr, lo+1)
		pos += lo + 1
		tr.y = yLo
		if w != nil && w.crossed(tr.y[0]) {
			return pos, true, nil
		}
		tr.reg = r.sys.classify(&tr.y, uAt(pos-a), r.amp)
		r.extremes(tr)
	}
	return b, false, nil
}

func (r *runner) account(tr *trace, ticks int64) {
	switch {
	case tr.reg.slewing():
		tr.slew += ticks
	case tr.reg.onRail():
		tr.rail += ticks
	}
}

func (r *runner) extremes(tr *trace) {
	tr.xlo = math.Min(tr.xlo, tr.y[0])
	tr.xhi = math.Max(tr.xhi, tr.y[0])
}

// crossing re-runs step k from its recorded start and returns the time the
// output first crosses level in it, upward when rising, and the ticks
// spent slewing before that time; ok is false when it does not cross.
func (r *runner) crossing(k int, level float64, rising bool) (t float64, slewBefore int64, ok bool) {
	if k < 0 || k >= r.steps() {
		return 0, 0, false
	}
	tr := trace{y: r.ys[k], reg: r.regs[k]}
	w := watch{level: level, above: !rising}
	pos, fired, err := r.step(k, &tr, &w)
	if err != nil || !fired {
		return 0, 0, false
	}
	return float64(k)*r.h + float64(pos)*r.tick, tr.slew, true
}

// linearRun integrates a plain linear system (an ideal network) on the same
// grid and input, returning out·y at every grid point.
func linearRun(d *dyn, out *pin, r *runner, y0 vec, n int) []float64 {
	src, h := r.src, r.h
	tb := newTable(d, h)
	tick := math.Ldexp(h, -levels)
	y := y0
	res := make([]float64, 0, n+1)
	res = append(res, out.at(&y, inputs{r.uk(0), 1}))
	for k := 0; k < n; k++ {
		t0 := float64(k) * h
		pos := int64(0)
		for pos < full {
			end := full
			tA := t0 + float64(pos)*tick
			if bp, ok := src.nextBreak(tA + 0.5*tick); ok {
				if bt := int64(math.Round((bp - t0) / tick)); bt > pos && bt < end {
					end = bt
				}
			}
			tB := t0 + float64(end)*tick
			uA, uB := r.uAt(k, pos, tA), r.uAt(k, end, tB)
			tb.advance(&y, uA, inputs{(uB[0] - uA[0]) / (tB - tA), 0}, end-pos, tick)
			pos = end
		}
		res = append(res, out.at(&y, inputs{r.uk(k + 1), 1}))
	}
	return res
}
