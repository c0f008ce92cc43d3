package sim

import (
	"errors"
	"fmt"
	"math"
)

// Options tune a Run. The zero value gives the defaults.
type Options struct {
	// PointsPerPeriod sets the grid step h = T/PointsPerPeriod (rounded
	// up to a multiple of 4 so the quarter periods of a sine fall on the
	// grid); at least 16. Default: adaptive — 400, doubled until no metric
	// changes by more than convergeTolerance between two grids (at most
	// maxAdaptivePoints); Metrics.PointsPerPeriod reports the grid used.
	PointsPerPeriod int
	// SettlePeriods are run before the metrics window: periods of the
	// input, or rising output edges of an oscillator. Default 20, or 3 for
	// an oscillator.
	SettlePeriods int
	// MeasurePeriods is the length of the metrics window and of the
	// returned arrays, whole periods. Default 5.
	MeasurePeriods int
	// MaxPoints bounds the length of the returned arrays. Default 2000.
	MaxPoints int
	// Duration is the run length for a Step input, s. Default: the step
	// time plus stepTimeConstants of the stage's slowest time constant
	// plus three times the swing over the slew rate. A Step run uses
	// PointsPerPeriod × MeasurePeriods grid steps and shows all of it.
	Duration float64
}

func (o Options) withDefaults(osc bool) (Options, error) {
	if o.PointsPerPeriod < 0 || o.SettlePeriods < 0 || o.MeasurePeriods < 0 || o.MaxPoints < 0 ||
		math.IsNaN(o.Duration) || o.Duration < 0 {
		return o, fmt.Errorf("sim: options: %+v, want no negative values", o)
	}
	if o.PointsPerPeriod == 0 {
		o.PointsPerPeriod = defaultPointsPerPeriod
	}
	if o.PointsPerPeriod < 16 {
		return o, fmt.Errorf("sim: options: points per period = %d, want 16 or more", o.PointsPerPeriod)
	}
	o.PointsPerPeriod = (o.PointsPerPeriod + 3) / 4 * 4
	if o.SettlePeriods == 0 {
		o.SettlePeriods = defaultSettlePeriods
		if osc {
			o.SettlePeriods = defaultOscSettle
		}
	}
	if o.MeasurePeriods == 0 {
		o.MeasurePeriods = defaultMeasurePeriods
	}
	if o.MaxPoints == 0 {
		o.MaxPoints = defaultMaxPoints
	}
	if o.MaxPoints < 2 {
		return o, fmt.Errorf("sim: options: max points = %d, want 2 or more", o.MaxPoints)
	}
	return o, nil
}

// Waveform is the result of a Run: the settled window sampled for display,
// and the metrics measured over it. T is time since the start of the
// window, s; In is the stage input (V, or A for Transimpedance; for
// Relaxation the capacitor voltage); Out the output and Ideal the ideal
// response, V. Slewing marks the samples whose following grid step was
// at least partly slew-limited.
type Waveform struct {
	Kind    string    `json:"kind"`
	InUnit  string    `json:"in_unit"`
	T       []float64 `json:"t"`
	In      []float64 `json:"in"`
	Out     []float64 `json:"out"`
	Ideal   []float64 `json:"ideal"`
	Slewing []bool    `json:"slewing,omitempty"`
	Metrics Metrics   `json:"metrics"`
}

// Range is the smallest and largest value of Out and Ideal together, V:
// the vertical span a plot of both needs.
func (w *Waveform) Range() (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, s := range [][]float64{w.Out, w.Ideal} {
		for _, v := range s {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	return lo, hi
}

// InRange is the smallest and largest value of In.
func (w *Waveform) InRange() (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range w.In {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	return lo, hi
}

// Span is the time the arrays cover, s.
func (w *Waveform) Span() float64 {
	if len(w.T) == 0 {
		return 0
	}
	return w.T[len(w.T)-1]
}

// Run simulates circuit c around amp a driven by in, and measures the
// settled response. A Relaxation ignores in. The model and its integration
// are described in the package documentation.
func Run(c Circuit, a Amp, in Input, opt Options) (*Waveform, error) {
	if c == nil {
		return nil, errors.New("sim: no circuit given")
	}
	ap, err := a.params()
	if err != nil {
		return nil, err
	}
	st, err := c.stage(&ap)
	if err != nil {
		return nil, err
	}
	adaptive := opt.PointsPerPeriod == 0
	opt, err = opt.withDefaults(st.kind == kindOscillator)
	if err != nil {
		return nil, err
	}
	if st.kind != kindOscillator {
		if err := in.validate(); err != nil {
			return nil, err
		}
	}
	w, err := runOnce(c, st, &ap, in, opt)
	for adaptive && err == nil && opt.PointsPerPeriod < maxAdaptivePoints {
		// Each run builds its own stage: runs keep state in it.
		if st, err = c.stage(&ap); err != nil {
			return nil, err
		}
		opt.PointsPerPeriod *= 2
		fine, ferr := runOnce(c, st, &ap, in, opt)
		if ferr != nil {
			break // keep the converged-so-far coarser result
		}
		done := metricsConverged(&w.Metrics, &fine.Metrics)
		w = fine
		if done {
			break
		}
	}
	return w, err
}

// runOnce is one Run on one grid.
func runOnce(c Circuit, st *stage, ap *ampParams, in Input, opt Options) (*Waveform, error) {
	var w *Waveform
	var err error
	if st.kind == kindOscillator {
		w, err = runOscillator(st, ap, opt)
	} else {
		w, err = runDriven(st, ap, in, opt)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", c.Kind(), err)
	}
	w.Kind = c.Kind()
	w.InUnit = st.inUnit
	w.Metrics.PointsPerPeriod = opt.PointsPerPeriod
	return w, nil
}

// metricsConverged reports whether every metric of two runs on successive
// grids agrees within convergeTolerance, relative to the figure's scale:
// the output peak-to-peak for voltages, 1 for fractions, the figure itself
// for times and frequencies.
func metricsConverged(a, b *Metrics) bool {
	pp := math.Max(a.OutputPP, b.OutputPP)
	close := func(x, y, scale float64) bool {
		return math.Abs(x-y) <= convergeTolerance*math.Max(scale, math.Max(math.Abs(x), math.Abs(y)))
	}
	opt := func(x, y *float64, scale float64) bool {
		if (x == nil) != (y == nil) {
			return false
		}
		return x == nil || close(*x, *y, scale)
	}
	return close(a.OutputPP, b.OutputPP, 0) &&
		close(a.SlewingFraction, b.SlewingFraction, 1) &&
		opt(a.PeakError, b.PeakError, pp) &&
		opt(a.THD, b.THD, thdFloor) &&
		opt(a.Frequency, b.Frequency, 0) &&
		opt(a.Duty, b.Duty, 1) &&
		opt(a.TransitionTime, b.TransitionTime, 0)
}

// window is the part of a run the metrics and arrays cover: grid points
// i0…i1, or for an oscillator the exact times t0…t1 between rising edges.
type window struct {
	i0, i1 int
	t0, t1 float64
}

func runDriven(st *stage, ap *ampParams, in Input, opt Options) (*Waveform, error) {
	var h, dur float64
	var n int
	win := window{}
	switch in.Shape {
	case Sine, Square:
		per := 1 / in.Freq
		h = per / float64(opt.PointsPerPeriod)
		n = (opt.SettlePeriods + opt.MeasurePeriods) * opt.PointsPerPeriod
		win.i0, win.i1 = opt.SettlePeriods*opt.PointsPerPeriod, n
	case Step:
		dur = opt.Duration
		if dur == 0 {
			swing := math.Abs(st.idealAt(in.Offset+in.Peak, ap) - st.idealAt(in.Offset, ap))
			dur = in.At + in.Rise/0.8 + stepTimeConstants*st.timeScale + 3*swing/ap.slowSlew()
		}
		if dur <= in.At {
			return nil, fmt.Errorf("sim: options: duration = %g s, want longer than the step time %g s", dur, in.At)
		}
		n = opt.PointsPerPeriod * opt.MeasurePeriods
		h = dur / float64(n)
		win.i0, win.i1 = 0, n
	}
	src := newSource(in, dur)
	r := newRunner(&st.sys, ap, &src, h)
	y0, err := st.start(ap, &src)
	if err != nil {
		return nil, err
	}
	if err := r.run(y0, n, n, nil); err != nil {
		return nil, err
	}
	ideal, err := st.idealSeries(r, &src, n)
	if err != nil {
		return nil, err
	}
	win.t0, win.t1 = float64(win.i0)*h, float64(win.i1)*h
	m := measureDriven(st, ap, r, ideal, in, opt, win)
	// The last point of whole periods repeats the first; leave it out.
	show := win
	show.i1--
	w := r.arrays(st, show, ideal, opt.MaxPoints)
	w.Metrics = m
	return w, nil
}

// idealAt is the ideal DC output for input level v (steady state of the
// ideal network).
func (st *stage) idealAt(v float64, ap *ampParams) float64 {
	if st.idealOf != nil {
		return st.idealOf(v)
	}
	if st.idealSys != nil {
		y, err := dcPoint(st.idealSys, inputs{v, 1})
		if err == nil {
			return st.idealOut.at(&y, inputs{v, 1})
		}
	}
	return 0
}

// start is the state the stage starts from: settled for the input's start
// (see steadyState), with the amp node clamped into the swing and the
// capacitors re-solved around it when the linear solution lies outside.
func (st *stage) start(ap *ampParams, src *source) (vec, error) {
	d := st.sys.dynamics(linear, ap)
	y, err := steadyState(&d, src)
	if err != nil {
		return y, err
	}
	if y[0] > ap.voh || y[0] < ap.vol {
		y[0] = math.Min(math.Max(y[0], ap.vol), ap.voh)
		rail := st.sys.dynamics(railHigh, ap)
		y = holdAtRail(&rail, y, inputs{src.at(0), 1})
	}
	return y, nil
}

// idealSeries is the ideal output at every grid point.
func (st *stage) idealSeries(r *runner, src *source, n int) ([]float64, error) {
	if st.idealSys != nil {
		y0, err := steadyState(st.idealSys, src)
		if err != nil {
			return nil, err
		}
		return linearRun(st.idealSys, &st.idealOut, r, y0, n), nil
	}
	out := make([]float64, n+1)
	for k := range out {
		out[k] = st.idealOf(r.uk(k))
	}
	return out, nil
}

func runOscillator(st *stage, ap *ampParams, opt Options) (*Waveform, error) {
	o := st.osc
	per := o.tHigh + o.tLow
	h := per / float64(opt.PointsPerPeriod)
	src := newSource(Input{}, 0)
	src.level = 0
	r := newRunner(&st.sys, ap, &src, h)
	mid := (ap.vol + ap.voh) / 2
	need := opt.SettlePeriods + opt.MeasurePeriods + 1
	var rising []int
	stop := func(k int) bool {
		if r.ys[k-1][0] <= mid && r.ys[k][0] > mid {
			rising = append(rising, k-1)
		}
		return len(rising) >= need
	}
	maxSteps := need * opt.PointsPerPeriod * maxOscSlowdown
	if err := r.run(o.init, maxSteps, 2*need*opt.PointsPerPeriod, stop); err != nil {
		return nil, err
	}
	ideal := func(t float64) float64 { // t since a rising edge
		if math.Mod(t, per) < o.tHigh {
			return ap.voh
		}
		return ap.vol
	}
	if len(rising) < need {
		// No steady oscillation: show the end of the run.
		n := r.steps()
		i0 := max(0, n-opt.PointsPerPeriod*opt.MeasurePeriods)
		win := window{i0: i0, i1: n, t0: float64(i0) * h, t1: float64(n) * h}
		idealArr := make([]float64, n+1)
		for k := range idealArr {
			idealArr[k] = ideal(float64(k) * h)
		}
		w := r.arrays(st, win, idealArr, opt.MaxPoints)
		m := Metrics{OutputPP: r.outputPP(i0, n), IdealPP: ap.voh - ap.vol,
			SlewingFraction: r.slewFraction(i0, n), IdealFrequency: ptr(1 / per), Frequency: ptr(0)}
		m.Notes = append(m.Notes, fmt.Sprintf("no steady oscillation within %d ideal periods", need*maxOscSlowdown))
		r.checkCM(st, ap, win, &m)
		w.Metrics = m
		return w, nil
	}
	kS, kE := rising[opt.SettlePeriods], rising[opt.SettlePeriods+opt.MeasurePeriods]
	tS, slewS, okS := r.crossing(kS, mid, true)
	tE, slewE, okE := r.crossing(kE, mid, true)
	if !okS || !okE || tE <= tS {
		return nil, fmt.Errorf("sim: could not locate the oscillator's edges")
	}
	win := window{i0: kS + 1, i1: kE, t0: tS, t1: tE}
	m := measureOscillator(st, ap, r, rising[opt.SettlePeriods:], mid, win, slewS, slewE)
	m.IdealFrequency = ptr(1 / per)
	m.IdealPP = ap.voh - ap.vol
	idealArr := make([]float64, r.steps()+1)
	for k := win.i0; k <= win.i1; k++ {
		idealArr[k] = ideal(float64(k)*h - tS)
	}
	w := r.arrays(st, win, idealArr, opt.MaxPoints)
	w.Metrics = m
	return w, nil
}

// arrays samples the window for display, at most maxPoints long.
func (r *runner) arrays(st *stage, win window, ideal []float64, maxPoints int) *Waveform {
	count := win.i1 - win.i0 + 1
	stride := (count + maxPoints - 1) / maxPoints
	size := (count + stride - 1) / stride
	w := &Waveform{
		T: make([]float64, 0, size), In: make([]float64, 0, size),
		Out: make([]float64, 0, size), Ideal: make([]float64, 0, size), Slewing: make([]bool, 0, size),
	}
	for k := win.i0; k <= win.i1; k += stride {
		t := float64(k) * r.h
		y := r.ys[k]
		in := r.uk(k)
		if st.inTrace != nil {
			in = st.inTrace.at(&y, inputs{in, 1})
		}
		slewing := false
		for j := k; j < min(k+stride, r.steps()); j++ {
			slewing = slewing || r.slew[j] > 0
		}
		w.T = append(w.T, t-win.t0)
		w.In = append(w.In, in)
		w.Out = append(w.Out, y[0])
		w.Ideal = append(w.Ideal, ideal[k])
		w.Slewing = append(w.Slewing, slewing)
	}
	return w
}
