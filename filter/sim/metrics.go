package sim

import (
	"fmt"
	"math"
)

// Metrics are measured over the settled window, whole periods. All values
// are SI (V, s, Hz) or plain fractions. Pointer fields are nil where they
// do not apply. The JSON names belong to the front end that writes them
// (opsift preview's previewMetricsJSON).
type Metrics struct {
	// OutputPP and IdealPP are the peak-to-peak output and ideal output, V.
	OutputPP float64
	IdealPP  float64
	// PeakError is the largest |output − ideal| over the window, V
	// (amplifiers and filters).
	PeakError *float64
	// THD is the RMS sum of harmonics 2…10 over the fundamental, from a
	// DFT of the window (amplifiers and filters with a sine input).
	THD *float64
	// SlewingFraction is the fraction of the window the output spent
	// slew-limited.
	SlewingFraction float64
	// Frequency, IdealFrequency (Hz) and Duty (fraction of the period the
	// output is above mid-swing) describe an oscillator.
	Frequency      *float64
	IdealFrequency *float64
	Duty           *float64
	// TransitionTime is the slowest 10–90 % output edge in the window, s
	// (comparators, and square or step inputs).
	TransitionTime *float64
	// InputLow and InputHigh are the lowest and highest voltages seen on
	// either input pin, V.
	InputLow  float64
	InputHigh float64
	// CMExceeded is set when an input pin leaves the amp's common-mode
	// range; Notes says by how much.
	CMExceeded bool
	// Clipped is set when an amplifier or filter output sat on a swing
	// limit during the window.
	Clipped bool
	// Notes are messages for the user: clipping, common-mode excursions,
	// an output that has not settled, an oscillator that does not start.
	Notes []string
	// PointsPerPeriod is the grid the metrics were measured on.
	PointsPerPeriod int
}

func ptr(v float64) *float64 { return &v }

func measureDriven(st *stage, ap *ampParams, r *runner, ideal []float64, in Input, opt Options, win window) Metrics {
	i0, i1 := win.i0, win.i1
	m := Metrics{OutputPP: r.outputPP(i0, i1), SlewingFraction: r.slewFraction(i0, i1)}
	lo, hi := math.Inf(1), math.Inf(-1)
	for k := i0; k <= i1; k++ {
		lo, hi = math.Min(lo, ideal[k]), math.Max(hi, ideal[k])
	}
	m.IdealPP = hi - lo
	if st.kind == kindLinear {
		pe := 0.0
		for k := i0; k <= i1; k++ {
			pe = math.Max(pe, math.Abs(r.ys[k][0]-ideal[k]))
		}
		if st.idealOf != nil {
			for _, c := range r.corners {
				if c.k >= i0 && c.k < i1 {
					pe = math.Max(pe, math.Abs(c.x-st.idealOf(r.src.at(c.t))))
				}
			}
		}
		m.PeakError = ptr(pe)
		if in.Shape == Sine {
			if thd, ok := r.thd(i0, opt.MeasurePeriods, opt.PointsPerPeriod); ok {
				m.THD = ptr(thd)
			}
		}
		railTicks := int64(0)
		for k := i0; k < i1; k++ {
			railTicks += r.rail[k]
		}
		if railTicks > 0 {
			m.Clipped = true
			m.Notes = append(m.Notes, fmt.Sprintf("output held at the swing limit (%.4g V … %.4g V) for %.1f %% of the time",
				ap.vol, ap.voh, 100*float64(railTicks)*r.tick/(win.t1-win.t0)))
		}
	}
	// Edges.
	var eLo, eHi float64
	edges := false
	switch {
	case st.kind == kindComparator:
		eLo, eHi, edges = st.edgeLo, st.edgeHi, true
	case in.Shape == Square:
		n := opt.PointsPerPeriod
		a, b := 0.0, 0.0
		for p := 0; p < opt.MeasurePeriods; p++ {
			a += r.ys[i0+p*n+n/2][0]
			b += r.ys[i0+(p+1)*n][0]
		}
		a, b = a/float64(opt.MeasurePeriods), b/float64(opt.MeasurePeriods)
		eLo, eHi, edges = math.Min(a, b), math.Max(a, b), true
	case in.Shape == Step:
		ks := min(int(in.At/r.h), i1)
		a, b := r.ys[ks][0], r.ys[i1][0]
		eLo, eHi, edges = math.Min(a, b), math.Max(a, b), true
	}
	if edges && eHi-eLo > 1e-9*math.Max(1, math.Abs(eHi)) {
		if tt, ok := r.transition(i0, i1, eLo, eHi); ok {
			m.TransitionTime = ptr(tt)
		} else if st.kind == kindComparator {
			m.Notes = append(m.Notes, "the comparator did not switch in the window")
		}
	}
	if in.Shape == Sine || in.Shape == Square {
		n := opt.PointsPerPeriod
		first := r.outputPP(i0, i0+n)
		last := r.outputPP(i1-n, i1)
		if d := math.Abs(last - first); d > settleTolerance*math.Max(first, last) && d > 1e-9 {
			m.Notes = append(m.Notes, fmt.Sprintf("output not settled: peak-to-peak changes by %.2g %% over the window",
				100*d/math.Max(first, last)))
		}
	}
	r.checkCM(st, ap, win, &m)
	return m
}

func measureOscillator(st *stage, ap *ampParams, r *runner, rising []int, mid float64, win window, slewS, slewE int64) Metrics {
	kS, kE := win.i0-1, win.i1
	m := Metrics{OutputPP: r.outputPP(kS, kE+1)}
	slew := r.slew[kS] - slewS + slewE
	for k := kS + 1; k < kE; k++ {
		slew += r.slew[k]
	}
	span := win.t1 - win.t0
	m.SlewingFraction = float64(slew) * r.tick / span
	periods := len(rising) - 1
	m.Frequency = ptr(float64(periods) / span)
	high := 0.0
	for p := 0; p < periods; p++ {
		tRise, _, _ := r.crossing(rising[p], mid, true)
		for k := rising[p]; k < rising[p+1]; k++ {
			if r.ys[k][0] > mid && r.ys[k+1][0] <= mid {
				if tFall, _, ok := r.crossing(k, mid, false); ok {
					high += tFall - tRise
				}
				break
			}
		}
	}
	m.Duty = ptr(high / span)
	r.checkCM(st, ap, win, &m)
	return m
}

// outputPP is the peak-to-peak output over steps i0…i1−1, events included.
func (r *runner) outputPP(i0, i1 int) float64 {
	lo, hi := math.Inf(1), math.Inf(-1)
	for k := i0; k < i1 && k < r.steps(); k++ {
		lo, hi = math.Min(lo, r.xlo[k]), math.Max(hi, r.xhi[k])
	}
	// A smooth extremum between grid points (linear regime, no event in
	// the two steps around it): the vertex of the parabola through three
	// samples, which takes the sampling error from O(h²) to O(h⁴).
	for k := max(i0, 1); k < i1 && k+1 <= r.steps(); k++ {
		if r.regs[k-1] != linear || r.regs[k] != linear || r.regs[k+1] != linear ||
			r.slew[k-1]+r.slew[k]+r.rail[k-1]+r.rail[k] != 0 {
			continue
		}
		a, b, c := r.ys[k-1][0], r.ys[k][0], r.ys[k+1][0]
		den := a - 2*b + c
		if den == 0 || (b-a)*(b-c) <= 0 {
			continue
		}
		v := b - (c-a)*(c-a)/(8*den)
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if hi < lo {
		return 0
	}
	return hi - lo
}

// slewFraction is the fraction of steps i0…i1−1 spent slewing.
func (r *runner) slewFraction(i0, i1 int) float64 {
	if i1 <= i0 {
		return 0
	}
	s := int64(0)
	for k := i0; k < i1; k++ {
		s += r.slew[k]
	}
	return float64(s) / (float64(i1-i0) * float64(full))
}

// thd is the RMS sum of harmonics 2…10 over the fundamental of the output
// samples i0 … i0+periods·n−1 (whole periods of n samples), by a direct DFT
// at the harmonic bins.
func (r *runner) thd(i0, periods, n int) (float64, bool) {
	cs := make([]float64, n)
	sn := make([]float64, n)
	for i := range cs {
		cs[i], sn[i] = math.Cos(2*math.Pi*float64(i)/float64(n)), math.Sin(2*math.Pi*float64(i)/float64(n))
	}
	var mag [11]float64
	for hm := 1; hm <= 10; hm++ {
		re, im := 0.0, 0.0
		for i := 0; i < periods*n; i++ {
			x := r.ys[i0+i][0]
			j := (hm * i) % n
			re += x * cs[j]
			im -= x * sn[j]
		}
		mag[hm] = math.Hypot(re, im)
	}
	if mag[1] == 0 {
		return 0, false
	}
	s := 0.0
	for hm := 2; hm <= 10; hm++ {
		s += mag[hm] * mag[hm]
	}
	return math.Sqrt(s) / mag[1], true
}

// transition is the slowest 10–90 % edge between levels lo and hi among the
// output edges (mid-level crossings) in steps i0…i1−1.
func (r *runner) transition(i0, i1 int, lo, hi float64) (float64, bool) {
	l10, l90, mid := lo+0.1*(hi-lo), lo+0.9*(hi-lo), (lo+hi)/2
	x := func(k int) float64 { return r.ys[k][0] }
	worst, found := 0.0, false
	for k := i0; k < i1; k++ {
		up := x(k) <= mid && x(k+1) > mid
		down := x(k) > mid && x(k+1) <= mid
		if !up && !down {
			continue
		}
		first, second := l10, l90
		if down {
			first, second = l90, l10
		}
		past := func(v, level float64) bool { // v is beyond level in the edge's direction
			if up {
				return v > level
			}
			return v < level
		}
		j := k
		for j >= i0 && past(x(j), first) {
			j--
		}
		if j < i0 {
			continue
		}
		ta, _, okA := r.crossing(j, first, up)
		j = k
		for j < i1 && !past(x(j+1), second) {
			j++
		}
		if j >= i1 {
			continue
		}
		tb, _, okB := r.crossing(j, second, up)
		if okA && okB && tb > ta {
			worst, found = math.Max(worst, tb-ta), true
		}
	}
	return worst, found
}

// checkCM records the range of the input pins over the window and flags
// excursions beyond the amp's common-mode range.
func (r *runner) checkCM(st *stage, ap *ampParams, win window, m *Metrics) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for k := win.i0; k <= win.i1 && k < len(r.ys); k++ {
		y := r.ys[k]
		u := inputs{r.uk(k), 1}
		for _, p := range []*pin{&st.sys.plus, &st.sys.minus} {
			v := p.at(&y, u)
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	m.InputLow, m.InputHigh = lo, hi
	if ap.cmSet && (lo < ap.cmLow || hi > ap.cmHigh) {
		m.CMExceeded = true
		m.Notes = append(m.Notes, fmt.Sprintf("input pins swing %.4g V … %.4g V, outside the common-mode range %.4g V … %.4g V",
			lo, hi, ap.cmLow, ap.cmHigh))
	}
}
