package catalog

import (
	"math"
	"strconv"
	"strings"
	"unicode"
)

// Opt is an optional number: a figure the catalog may or may not give.
// The zero value is "not given".
type Opt struct {
	// bits is the value's IEEE 754 bit pattern XOR unsetBits, so the zero
	// Opt is the unset one and a set figure costs eight bytes, not sixteen
	// (a part holds 70 of them).
	bits uint64
}

// unsetBits is the bit pattern of a quiet NaN that arithmetic does not
// produce; Some stores math.NaN() in its place, so it only ever means
// "unset" (stored XORed to zero).
const unsetBits = 0x7ff8_dead_0000_0000

// Some returns a set Opt holding v.
func Some(v float64) Opt {
	b := math.Float64bits(v)
	if b == unsetBits {
		b = math.Float64bits(math.NaN())
	}
	return Opt{bits: b ^ unsetBits}
}

// Known reports whether the catalog gives the figure.
func (o Opt) Known() bool { return o.bits != 0 }

// V returns the value in SI units of the field's Dim, or 0 when the figure
// is not given.
func (o Opt) V() float64 {
	if o.bits == 0 {
		return 0
	}
	return math.Float64frombits(o.bits ^ unsetBits)
}

// String formats the value as %g would, or "unset".
func (o Opt) String() string {
	if !o.Known() {
		return "unset"
	}
	return strconv.FormatFloat(o.V(), 'g', -1, 64)
}

// Source says where a figure was read from: a datasheet table (guaranteed or
// typical), a graph (typical, read off a curve), or an estimate.
type Source string

// The sources a figure may come from. The empty Source means SourceTable.
const (
	SourceTable    Source = "table"
	SourceGraph    Source = "graph"
	SourceEstimate Source = "estimate"
)

// Spec is one datasheet figure with its typical value, its guaranteed
// limits at 25 °C and, where the datasheet gives them, its limits over the
// rated temperature range (the _ot keys). Invariant after validation:
// Min ≤ Typ ≤ Max wherever both sides are set.
type Spec struct {
	Typ   Opt
	Min   Opt
	Max   Opt
	MinOT Opt // guaranteed minimum over the rated temperature range
	MaxOT Opt // guaranteed maximum over the rated temperature range
	// Source of the figure; "" is SourceTable.
	Source Source
}

// Known reports whether the spec holds any figure at all.
func (s Spec) Known() bool {
	return s.Typ.Known() || s.Min.Known() || s.Max.Known() || s.MinOT.Known() || s.MaxOT.Known()
}

// Tech is the input-stage technology of a part.
type Tech string

// The technologies a part may have.
const (
	TechBipolar Tech = "bipolar"
	TechCMOS    Tech = "cmos"
	TechJFET    Tech = "jfet"
	TechBiCMOS  Tech = "bicmos"
)

// FETInput reports whether the input stage is a FET whose bias current is
// gate leakage (doubling every 10 K above 25 °C).
func (t Tech) FETInput() bool { return t == TechCMOS || t == TechJFET }

// Lifecycle is a part's production status.
type Lifecycle string

// The lifecycle states a part may be in.
const (
	LifecycleActive   Lifecycle = "active"
	LifecycleNRND     Lifecycle = "nrnd" // not recommended for new designs
	LifecycleObsolete Lifecycle = "obsolete"
)

// Span is the supply range the part is rated for: total span V+ − V−.
type Span struct {
	Min Opt
	Max Opt
}

// Headroom is a voltage window relative to the rails: it extends from
// V− + Low to V+ + High (High is usually zero or negative; a rail-to-rail
// input that goes beyond the rails has Low < 0 and High > 0).
type Headroom struct {
	Low    Opt
	High   Opt
	Source Source
}

// Swing is the output range at a stated load: V− + Low … V+ + High.
type Swing struct {
	Low    Opt // distance above V− the output reaches (≥ 0)
	High   Opt // offset from V+ (≤ 0)
	Load   Opt // the load resistance the swing is specified at, Ω
	Source Source
}

// Pos is where something was written: a file and a 1-based line (0 = unknown).
type Pos struct {
	File string
	Line int
}

// Part is one op-amp parameter set from a catalog. All figures are held in
// SI units (V, A, Hz, V/s, Ω, F, s), temperatures in °C, Aol in dB.
type Part struct {
	ID        string
	Name      string
	Tech      Tech
	Channels  int
	Packages  []string
	Pinout    string // pin-compatibility family; equal value = drop-in footprint
	Lifecycle Lifecycle
	UnitCost  Opt
	Temp      [2]Opt // rated ambient range, °C: Temp[0] low, Temp[1] high

	Supply  Span
	InputCM Headroom
	Output  Swing

	GBW      Spec // Hz
	Slew     Spec // V/s
	Aol      Spec // dB
	Vos      Spec // V
	VosDrift Spec // V/K
	Ib       Spec // A
	Ios      Spec // A
	En       Spec // V/√Hz
	In       Spec // A/√Hz
	Iq       Spec // A per channel
	Iout     Spec // A, short-circuit or rated output current

	VdiffMax Opt // V, largest allowed differential input
	CLoad    Opt // F, largest capacitive load it is stable with
	Cin      Opt // F, input capacitance (common-mode + differential)
	EnCorner Opt // Hz, 1/f corner of the voltage noise density en (optional)
	InCorner Opt // Hz, 1/f corner of the current noise density in (optional)

	Datasheet string
	Notes     string

	// Pos is where the part's [[part]] table starts. Lines maps each key
	// the part gives ("slew", "gbw", …) to its line while the part is
	// decoded and validated, for error messages; the parts Decode and Load
	// return no longer hold it (KeyLine finds a key's line again), so a
	// large catalog does not keep a map per part.
	Pos   Pos
	Lines map[string]int
}

// Line returns the line of a key of the part, or the part's own line when
// the key was not written.
func (p *Part) Line(key string) int {
	if l, ok := p.Lines[key]; ok && l > 0 {
		return l
	}
	return p.Pos.Line
}

// HasPackage reports whether the part comes in package pkg, compared by
// PackageKey: case and separators do not count ("SOIC-8" is "soic8").
func (p *Part) HasPackage(pkg string) bool {
	k := PackageKey(pkg)
	for _, q := range p.Packages {
		if PackageKey(q) == k {
			return true
		}
	}
	return false
}

// PackageKey is the form package names are compared in: lower case,
// letters and digits only ("SOIC-8", "soic_8" and "soic8" are one package).
// A name already in that form is returned as is, without allocating.
func PackageKey(s string) string {
	plain := true
	for i := 0; i < len(s); i++ {
		if c := s[i]; !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9') {
			plain = false
			break
		}
	}
	if plain {
		return s
	}
	var b strings.Builder
	for _, r := range strings.ToLower(s) {
		if unicode.IsLetter(r) || unicode.IsDigit(r) {
			b.WriteRune(r)
		}
	}
	return b.String()
}
