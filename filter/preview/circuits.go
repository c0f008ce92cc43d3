package preview

import (
	"fmt"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/filter/circuit"
	"github.com/opsift/opsift/filter/sim"
)

// HasWaveform reports whether stages of kind have a waveform preview.
// direct stages state their needs without a circuit, and a rail splitter
// holds a DC level: neither has a waveform.
func HasWaveform(kind string) bool {
	switch kind {
	case "follower", "noninverting", "inverting", "comparator", "relaxation", "sallen_key_lowpass", "transimpedance":
		return true
	}
	return false
}

// stageBuild is a stage turned into the model's terms.
type stageBuild struct {
	circuit sim.Circuit
	input   sim.Input
	// duration is the run length of a Step input, s (0: the model's default).
	duration float64
	notes    []string
}

// reader reads a stage's values with its template's defaults.
type reader struct {
	in   *filter.StageInput
	plan *filter.Plan
	sp   *filter.StagePlan
}

func newReader(plan *filter.Plan, sp *filter.StagePlan) (*reader, error) {
	t, ok := filter.TemplateFor(sp.Kind)
	if !ok || sp.Stage == nil {
		return nil, fmt.Errorf("stage %q: kind %q has no template", sp.Name, sp.Kind)
	}
	return &reader{in: filter.NewStageInput(sp.Stage, t), plan: plan, sp: sp}, nil
}

// ref is the stage's ref, default the middle of the nominal rails (as the
// templates take it).
func (r *reader) ref() float64 {
	if v, ok := r.in.Num("ref"); ok {
		return v
	}
	return (r.plan.Rails.Pos + r.plan.Rails.Neg) / 2
}

// need returns a quantity the template already required, or an error
// naming the stage and field.
func (r *reader) need(key string) (float64, error) {
	v, err := r.in.Need(key)
	if err != nil {
		return 0, fmt.Errorf("stage %q: %w", r.sp.Name, err)
	}
	return v, nil
}

// given returns a quantity only when the stage itself states it.
func (r *reader) given(key string) (float64, bool) {
	if !r.in.Given(key) {
		return 0, false
	}
	return r.in.Num(key)
}

// buildStage turns a stage plan into a circuit and its drive. part and
// worst are needed by kinds whose circuit depends on the part (the
// transimpedance stage's feedback capacitor).
func buildStage(plan *filter.Plan, sp *filter.StagePlan, part *catalog.Part, worst *filter.PartFigures) (stageBuild, error) {
	r, err := newReader(plan, sp)
	if err != nil {
		return stageBuild{}, err
	}
	switch sp.Kind {
	case "follower", "noninverting", "inverting":
		return r.amplifier()
	case "comparator":
		return r.comparator()
	case "relaxation":
		return r.relaxation()
	case "sallen_key_lowpass":
		return r.sallenKey()
	}
	return r.transimpedance(part, worst)
}

func (r *reader) amplifier() (stageBuild, error) {
	sp := r.sp
	ref := r.ref()
	var b stageBuild
	switch sp.Kind {
	case "follower":
		b.circuit = sim.Follower{}
	case "noninverting":
		rf, okF := r.given("rf")
		rg, okG := r.given("rg")
		switch {
		case okF && okG:
			b.circuit = sim.NonInverting{Rf: rf, Rg: rg, Ref: ref}
		case sp.Gain == 1:
			b.circuit = sim.Follower{}
		default:
			b.circuit = sim.NonInverting{Rf: (sp.Gain - 1) * defaultR, Rg: defaultR, Ref: ref}
		}
	case "inverting":
		rf, okF := r.given("rf")
		rin, okI := r.given("rin")
		if okF && okI {
			b.circuit = sim.Inverting{Rf: rf, Rin: rin, Ref: ref}
		} else {
			b.circuit = sim.Inverting{Rf: sp.Gain * defaultR, Rin: defaultR, Ref: ref}
		}
	}
	switch sp.Shape {
	case "sine":
		b.input = sim.Input{Shape: sim.Sine, Peak: sp.Peak, Freq: sp.Freq, Offset: ref}
	case "square":
		f := sp.Freq
		if !(f > 0) {
			f = 1 / (squarePeriodRises * sp.Rise)
			b.notes = append(b.notes, fmt.Sprintf("the design gives the square no frequency; %s (a period of %d allowed rise times) is used",
				catalog.Format(f, catalog.Hertz), squarePeriodRises))
		}
		b.input = sim.Input{Shape: sim.Square, Peak: sp.Peak, Freq: f, Offset: ref}
	default:
		return b, fmt.Errorf("stage %q: signal shape %q has no waveform preview, want sine or square", sp.Name, sp.Shape)
	}
	return b, nil
}

func (r *reader) comparator() (stageBuild, error) {
	th, err := r.need("threshold")
	if err != nil {
		return stageBuild{}, err
	}
	lo, err := r.need("input.low")
	if err != nil {
		return stageBuild{}, err
	}
	hi, err := r.need("input.high")
	if err != nil {
		return stageBuild{}, err
	}
	vol, err := r.need("out_low")
	if err != nil {
		return stageBuild{}, err
	}
	voh, err := r.need("out_high")
	if err != nil {
		return stageBuild{}, err
	}
	f := 1 / (comparatorPeriodTransitions * r.sp.Rise)
	return stageBuild{
		// The edge is timed between the stage's levels, as its slew
		// requirement counts it.
		circuit: sim.Comparator{Threshold: th, Low: vol, High: voh},
		input:   sim.Input{Shape: sim.Sine, Peak: (hi - lo) / 2, Offset: (hi + lo) / 2, Freq: f},
		notes: []string{fmt.Sprintf("driven by a sine over the input range %s … %s at %s (the design gives no frequency; a period of %d allowed transition times)",
			catalog.Format(lo, catalog.Volt), catalog.Format(hi, catalog.Volt), catalog.Format(f, catalog.Hertz), comparatorPeriodTransitions)},
	}, nil
}

func (r *reader) relaxation() (stageBuild, error) {
	var c sim.Relaxation
	for _, f := range []struct {
		key string
		v   *float64
	}{{"r", &c.R}, {"c", &c.C}, {"r1", &c.R1}, {"r2", &c.R2}} {
		v, err := r.need(f.key)
		if err != nil {
			return stageBuild{}, err
		}
		*f.v = v
	}
	c.Ref = r.ref()
	return stageBuild{circuit: c, notes: []string{"free-running: the output swings between the part's own limits; \"in\" is the capacitor voltage"}}, nil
}

func (r *reader) sallenKey() (stageBuild, error) {
	var c sim.SallenKeyLowPass
	var f0, q float64
	if v, ok := r.given("r1"); ok {
		c.R1 = v
		var err error
		if c.R2, err = r.need("r2"); err != nil {
			return stageBuild{}, err
		}
		if c.C1, err = r.need("c1"); err != nil {
			return stageBuild{}, err
		}
		if c.C2, err = r.need("c2"); err != nil {
			return stageBuild{}, err
		}
		f0 = circuit.SallenKeyF0(c.R1, c.R2, c.C1, c.C2)
	} else {
		var err error
		if f0, err = r.need("f0"); err != nil {
			return stageBuild{}, err
		}
		if q, err = r.need("q"); err != nil {
			return stageBuild{}, err
		}
		// Equal resistors (circuit.SallenKeyEqualR).
		c.R1, c.R2 = defaultR, defaultR
		c.C1, c.C2 = circuit.SallenKeyEqualR(defaultR, f0, q)
	}
	b := stageBuild{circuit: c,
		input: sim.Input{Shape: sim.Sine, Peak: r.sp.Peak, Freq: f0, Offset: r.ref()},
		notes: []string{fmt.Sprintf("driven by a sine of the stage's peak at f0 = %s, where the output is steepest", catalog.Format(f0, catalog.Hertz))},
	}
	if q > 0 {
		b.notes = append(b.notes, fmt.Sprintf("components chosen for f0 and Q: R1 = R2 = %s, C1 = %s, C2 = %s",
			catalog.Format(c.R1, catalog.Ohm), catalog.Format(c.C1, catalog.Farad), catalog.Format(c.C2, catalog.Farad)))
	}
	return b, nil
}

func (r *reader) transimpedance(part *catalog.Part, worst *filter.PartFigures) (stageBuild, error) {
	rf, err := r.need("rf")
	if err != nil {
		return stageBuild{}, err
	}
	cin, err := r.need("cin")
	if err != nil {
		return stageBuild{}, err
	}
	imax, err := r.need("i_max")
	if err != nil {
		return stageBuild{}, err
	}
	bw := r.sp.Freq
	// The feedback capacitor is chosen as the engine chooses it: maximally
	// flat at the part's worst-case GBW (the circuit as it would be built;
	// a typical run keeps it).
	cf, _, ok := filter.TIAFeedbackCap(r.sp, part, worst)
	if !ok {
		return stageBuild{}, fmt.Errorf("stage %q: part %q: no feedback capacitor can be chosen without a gbw figure", r.sp.Name, part.ID)
	}
	if part.Cin.Set {
		cin += part.Cin.V
	}
	step := imax
	if r.in.Text("polarity") == "negative" {
		step = -imax
	}
	// A light step, shown over a fixed number of the design's rise times
	// so that parts share one time axis and a slow part is seen not to
	// settle in time.
	rise := circuit.RiseBandwidth / bw
	dur := tiaStepRises * rise
	return stageBuild{
		circuit:  sim.Transimpedance{Rf: rf, Cf: cf, Cin: cin, Ref: r.ref()},
		input:    sim.Input{Shape: sim.Step, Peak: step, At: tiaStepAt * dur},
		duration: dur,
		notes: []string{
			fmt.Sprintf("driven by a light step 0 … %s at %s, shown over %d rise times of the %s bandwidth; \"in\" is the photocurrent, A",
				catalog.Format(imax, catalog.Ampere), catalog.Format(tiaStepAt*dur, catalog.Second), tiaStepRises, catalog.Format(bw, catalog.Hertz)),
			fmt.Sprintf("Cf = %s, maximally flat at the part's worst-case gbw with Cin = %s", catalog.Format(cf, catalog.Farad), catalog.Format(cin, catalog.Farad)),
		},
	}, nil
}
