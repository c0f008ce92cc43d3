package filter

import "github.com/opsift/opsift/catalog"

// Key names a requirement (the contract keys of DESIGN.md; templates may add
// their own).
type Key string

// The requirement keys. The first six are hard filters (pass/fail, no
// margin) except supply, which carries a range margin; the rest are
// numeric checks.
const (
	KeySupply        Key = "supply"
	KeyTemperature   Key = "temperature"
	KeyPackage       Key = "package"
	KeyTech          Key = "tech"
	KeyLifecycle     Key = "lifecycle"
	KeyCost          Key = "cost"
	KeyInputRange    Key = "input_range"
	KeyOutputRange   Key = "output_range"
	KeySlew          Key = "slew"
	KeyGBW           Key = "gbw"
	KeyDCError       Key = "dc_error"
	KeyNoise         Key = "noise"
	KeyOutputCurrent Key = "output_current"
	KeySupplyCurrent Key = "supply_current"
	KeyVdiff         Key = "vdiff"
	KeyCLoad         Key = "cload"
	KeyAol           Key = "aol"
	KeyVos           Key = "vos" // direct stages: vos_max
	KeyIb            Key = "ib"  // direct stages: ib_max
	// KeyTHD is checked by simulation (Requirement.Simulated), not by a
	// closed form: the output THD the time-domain model measures.
	KeyTHD Key = "thd"
)

// Bound says how a requirement compares.
type Bound uint8

// The bounds. Margins are fractions; ≥ 0 means pass:
//
//	BoundMin   available/required − 1   (the part must reach at least Value)
//	BoundMax   required/available − 1   (Value is an allowance the part must stay under)
//	BoundRange spare volts / minimum supply span (the part's window must cover [Low, High])
//	BoundHard  pass or fail, no margin
const (
	BoundMin Bound = iota
	BoundMax
	BoundRange
	BoundHard
)

// String returns "min", "max", "range" or "hard".
func (b Bound) String() string {
	switch b {
	case BoundMin:
		return "min"
	case BoundMax:
		return "max"
	case BoundRange:
		return "range"
	}
	return "hard"
}

// Requirement is one thing the op-amp must do, derived from the design.
// Stage is "" for design-level requirements (supply, temperature, hard
// filters, supply current).
type Requirement struct {
	Stage string
	Key   Key
	Bound Bound
	Value float64 // BoundMin/BoundMax: the required figure, SI
	Low   float64 // BoundRange: the window the part must cover, SI
	High  float64
	Dim   catalog.Dim // of Value/Low/High; Unit is Dim.Unit()
	Unit  string      // SI unit symbol: "V/s", "Hz", "V", "dB", "A", "F", ""
	// Allowed lists the accepted words of a hard filter (packages, tech,
	// lifecycle); nil for other bounds.
	Allowed []string
	// Why is one line with the formula and the numbers put in:
	// "2π·f·Vo = 2π·20 kHz·5 V".
	Why string
	// Measure, when set, computes the part's available figure for a
	// template-specific check instead of the built-in rule for Key.
	// Known false makes the check unknown.
	Measure func(p *catalog.Part, f *PartFigures) Figure
	// Need, when set, computes the required figure for a part instead of
	// Value, with a constant note saying what was used (the amplifier gbw
	// with the part's own Aol). Value is then the floor no part goes
	// below, shown where no part is at hand (derive).
	Need func(p *catalog.Part, f *PartFigures) (float64, string)
	// Aside, when set, computes a per-part quantity shown beside the check
	// (the transimpedance Cf, the relaxation stage's predicted frequency).
	// It runs only when checks are kept (not in Options.Summary).
	Aside func(p *catalog.Part, f *PartFigures) Aside
	// Simulated marks a check made by running the time-domain model
	// (filter/sim) at worst-case figures: a second pass, made only for the
	// parts that pass every other check (see Evaluate). Its basis is
	// BasisSimulated.
	Simulated bool
}

// Aside is a per-part quantity reported beside a check, V in SI units of
// its kind. The zero value (AsideNone) is none. It is kept small: every
// check of every part carries one.
type Aside struct {
	Kind AsideKind
	V    float64
}

// AsideKind names what an Aside holds.
type AsideKind uint8

// The Aside kinds.
const (
	AsideNone          AsideKind = iota
	AsideCf                      // transimpedance feedback capacitor, F
	AsidePredictedFreq           // relaxation stage's predicted frequency, Hz
)

// Key is the JSON field of the kind: "cf" (fixed by DESIGN.md "Contract
// additions"), "predicted_freq", or "" for none.
func (k AsideKind) Key() string {
	switch k {
	case AsideCf:
		return "cf"
	case AsidePredictedFreq:
		return "predicted_freq"
	}
	return ""
}

// Label introduces the quantity in text: "Cf", "runs at".
func (k AsideKind) Label() string {
	switch k {
	case AsideCf:
		return "Cf"
	case AsidePredictedFreq:
		return "runs at"
	}
	return ""
}

// Dim is the quantity's dimension.
func (k AsideKind) Dim() catalog.Dim {
	switch k {
	case AsideCf:
		return catalog.Farad
	case AsidePredictedFreq:
		return catalog.Hertz
	}
	return catalog.Dimensionless
}

// Text formats the quantity with its label, "Cf 2.2 pF"; "" for none.
func (a Aside) Text() string {
	if a.Kind == AsideNone {
		return ""
	}
	return a.Kind.Label() + " " + catalog.Format(a.V, a.Kind.Dim())
}

// Rails is the supply as the checks use it.
type Rails struct {
	Pos, Neg           float64 // nominal rails, V
	PosWorst, NegWorst float64 // each rail moved toward the other by tolerance × its magnitude (RailsInward)
	Tol                float64 // tolerance, fraction
	Span               float64 // nominal span Pos − Neg
	SpanMin, SpanMax   float64 // PosWorst − NegWorst (rails inward) … the span with both rails outward (RailsOutward)
}

// StagePlan is what a template derived for one stage: the circuit
// quantities part-dependent checks need (noise gain, source and load
// resistance), the resolved circuit values, and the stage's requirements.
type StagePlan struct {
	Stage     *Stage
	Name      string
	Kind      string
	Gain      float64 // signal gain magnitude, V/V (0 when not applicable)
	NoiseGain float64 // NG, V/V (0 when not applicable)
	Shape     string  // "sine", "square" or "" (no signal)
	Peak      float64 // input peak Vp, V
	Vo        float64 // output peak, V
	Freq      float64 // signal frequency, Hz (0 when not applicable)
	Rise      float64 // allowed 10–90 % output rise time, s (square)
	GainError float64 // allowed gain error ε, fraction
	SourceR   float64 // Ω, 0 when not given
	LoadR     float64 // Ω, 0 when not given (no resistive load)
	// DriveR is the resistance the output effectively drives, Vo over the
	// worst output current the stage draws (load_r ∥ the feedback network
	// for the amplifiers, load_r ∥ Rf for a transimpedance stage); 0 when
	// the stage sets none, and then LoadR stands. The output_range check
	// scales a part's swing to it (SwingLoad).
	DriveR float64
	// Ref is the node the stage is centred on, V, resolved: the stage's
	// ref or its default, the middle of the nominal rails (0 for kinds
	// without one: direct, comparator).
	Ref float64
	// Values are the circuit values Derive resolved, SI, by stage key
	// ("rf", "rg", "cin", "i_max", "threshold", "input.low", …), defaults
	// applied; only the keys the stage gives or defaults are present.
	// Front ends build the stage's circuit from them (StagePlan.Circuit)
	// instead of re-reading the inputs.
	Values map[string]float64
	// Resistors names the keys that would give an amplifier's feedback
	// network ("rf and rg", "rf and rin") when the stage gives only its
	// gain, so its dc_error and noise checks count no resistance at the
	// inverting input (a design warning says so); "" otherwise.
	Resistors string
	// Texts are the resolved choice inputs by stage key ("polarity"),
	// defaults applied, for the kinds whose circuit depends on one.
	Texts map[string]string
	// Requirements of this stage, in derivation order.
	Requirements []Requirement
}

// HasFMax reports whether fmax applies to the stage: an amplifier with a
// sine signal, a noise gain and a gain error. Other stages (square signals,
// filters, oscillators, comparators) have no fmax whatever the part.
func (s *StagePlan) HasFMax() bool {
	return s.Shape == "sine" && s.Vo > 0 && s.NoiseGain > 0 && s.GainError > 0 && s.GainError < 1
}

// HasFMax reports whether fmax applies to any stage of the plan; when not,
// a part's fmax is "not applicable" rather than unknown.
func (p *Plan) HasFMax() bool {
	for i := range p.Stages {
		if p.Stages[i].HasFMax() {
			return true
		}
	}
	return false
}

// Plan is a design with its requirements derived: the input to Evaluate.
type Plan struct {
	Design *Design
	Title  string
	Rails  Rails
	// TempLow, TempHigh are the design's ambient range, °C.
	TempLow, TempHigh float64
	DerateTyp         float64
	InflateTyp        float64
	SpeedTempco       float64 // policy.speed_tempco, 1/K
	IbColdTempco      float64 // policy.ib_cold_tempco, 1/K
	// Global holds the design-level requirements (supply, temperature,
	// hard filters, supply current); Stages hold each stage's own.
	Global []Requirement
	Stages []StagePlan
	// Warnings are what is impossible or suspect in the design (an output
	// beyond the rails, no temperature range); FilterWarnings adds those
	// that need the catalog.
	Warnings []Warning
	// sims keeps the figures of the plan's simulated checks by
	// requirement and part, so Explain does not simulate again what the
	// ranking did (nil: nothing is kept).
	sims *simMemo
}

// Requirements returns every requirement of the plan: design-level first,
// then each stage's in stage order.
func (p *Plan) Requirements() []Requirement {
	out := append([]Requirement(nil), p.Global...)
	for _, s := range p.Stages {
		out = append(out, s.Requirements...)
	}
	return out
}

// SwingLoad is the resistance at which a part's output swing is judged:
// DriveR when the stage sets it, else LoadR (0: no resistive load).
func (sp *StagePlan) SwingLoad() float64 {
	if sp.DriveR > 0 {
		return sp.DriveR
	}
	return sp.LoadR
}

// driveR is Vo/i, the resistance a stage's output drives when it delivers
// current i at output peak vo; 0 when either is not positive.
func driveR(vo, i float64) float64 {
	if !(vo > 0) || !(i > 0) {
		return 0
	}
	return vo / i
}
