package catalog

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/opsift/opsift/catalog/safe"
)

// Encode writes parts as a catalog file that Decode reads back to the same
// values, bit for bit. Quantities are written with the engineering prefix a
// reader expects ("0.7 MHz", "250 nA", slew in V/us) whenever that reads
// back exactly, else in the plain SI unit with the shortest exact mantissa.
// Only ASCII unit spellings are used. Figures not given are left out.
func Encode(w io.Writer, parts []*Part) error {
	bw := bufio.NewWriter(w)
	for i, p := range parts {
		if i > 0 {
			bw.WriteByte('\n')
		}
		encodePart(bw, p)
	}
	return bw.Flush()
}

// encodePart writes one [[part]] table in the documented key order.
func encodePart(w *bufio.Writer, p *Part) {
	w.WriteString("[[part]]\n")
	str := func(k, v string) {
		if v != "" {
			fmt.Fprintf(w, "%s = %s\n", k, quoteTOML(v))
		}
	}
	str("id", p.ID)
	str("name", p.Name)
	str("tech", string(p.Tech))
	if p.Channels != 0 {
		fmt.Fprintf(w, "channels = %d\n", p.Channels)
	}
	if len(p.Packages) > 0 {
		q := make([]string, len(p.Packages))
		for i, s := range p.Packages {
			q[i] = quoteTOML(s)
		}
		fmt.Fprintf(w, "packages = [%s]\n", strings.Join(q, ", "))
	}
	str("pinout", p.Pinout)
	str("lifecycle", string(p.Lifecycle))
	if p.UnitCost.Known() {
		fmt.Fprintf(w, "unit_cost = %s\n", tomlFloat(p.UnitCost.V()))
	}
	if p.Temp[0].Known() && p.Temp[1].Known() {
		fmt.Fprintf(w, "temp = [%s, %s]\n", quoteTOML(Exact(p.Temp[0].V(), Celsius)), quoteTOML(Exact(p.Temp[1].V(), Celsius)))
	}
	inline(w, "supply", "", []kv{{"min", p.Supply.Min, Volt}, {"max", p.Supply.Max, Volt}})
	inline(w, "input_cm", p.InputCM.Source, []kv{{"low", p.InputCM.Low, Volt}, {"high", p.InputCM.High, Volt}})
	inline(w, "output", p.Output.Source, []kv{{"low", p.Output.Low, Volt}, {"high", p.Output.High, Volt}, {"load", p.Output.Load, Ohm}})
	for _, f := range figures {
		s := f.spec(p)
		inline(w, f.key, s.Source, []kv{
			{"typ", s.Typ, f.dim}, {"min", s.Min, f.dim}, {"max", s.Max, f.dim},
			{"min_ot", s.MinOT, f.dim}, {"max_ot", s.MaxOT, f.dim},
		})
	}
	for _, s := range scalars {
		if o := s.opt(p); o.Known() {
			fmt.Fprintf(w, "%s = %s\n", s.key, quoteTOML(Exact(o.V(), s.dim)))
		}
	}
	str("datasheet", p.Datasheet)
	str("notes", p.Notes)
}

// kv is one sub-key of an inline table.
type kv struct {
	key string
	v   Opt
	dim Dim
}

// inline writes `key = { a = "…", b = "…", source = "…" }` holding the set
// values, or nothing when none is set and there is no source.
func inline(w *bufio.Writer, key string, src Source, vals []kv) {
	var parts []string
	for _, e := range vals {
		if e.v.Known() {
			parts = append(parts, e.key+" = "+quoteTOML(Exact(e.v.V(), e.dim)))
		}
	}
	if src != "" {
		parts = append(parts, "source = "+quoteTOML(string(src)))
	}
	if len(parts) > 0 {
		fmt.Fprintf(w, "%s = { %s }\n", key, strings.Join(parts, ", "))
	}
}

// asciiUnits are the unit spellings Exact writes, per dimension.
var asciiUnits = map[Dim]string{
	Volt: "V", Ampere: "A", Hertz: "Hz", VoltPerSecond: "V/s", Ohm: "Ohm", Second: "s",
	Farad: "F", Celsius: "C", Decibel: "dB", VoltNoise: "V/rtHz", CurrentNoise: "A/rtHz",
	VoltPerKelvin: "V/K",
}

// Exact renders an SI value of dimension d as text that Parse reads back to
// exactly v, in ASCII: "700 kHz", "0.5 V/us", "-40 C". It prefers the
// engineering prefix a reader expects with a mantissa of up to six
// figures; when no such text reads back exactly, it writes the plain SI
// unit with the shortest exact mantissa ("0.009 V"). Ratios are written as
// plain fractions and dimensionless values as bare numbers. NaN and
// infinities, which no catalog may hold, come out as text Parse refuses.
func Exact(v float64, d Dim) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return FormatASCII(v, d)
	}
	g := plainNum
	switch d {
	case Dimensionless, Ratio:
		return g(v)
	case Celsius, Decibel:
		return g(v) + " " + asciiUnits[d]
	case VoltPerSecond:
		if s, ok := shortest(v, 1e6, " V/us", d); ok {
			return s
		}
		return g(v) + " V/s"
	}
	unit := asciiUnits[d]
	if p := engPrefix(v); p.sym != "" {
		sym := p.sym
		if sym == "µ" {
			sym = "u"
		}
		if s, ok := shortest(v, p.f, " "+sym+unit, d); ok {
			return s
		}
	}
	return g(v) + " " + unit
}

// shortest returns the text with the fewest figures, up to six, of v/f
// followed by unit that Parse reads back to exactly v.
func shortest(v, f float64, unit string, d Dim) (string, bool) {
	m := v / f
	for prec := 1; prec <= 6; prec++ {
		s := strconv.FormatFloat(m, 'g', prec, 64)
		if strings.ContainsAny(s, "e") {
			continue
		}
		if s += unit; readsBack(s, v, d) {
			return s, true
		}
	}
	return "", false
}

// plainNum renders x with the shortest exact mantissa, in decimal notation
// when that is of reasonable length ("1234567.891", not "1.234567891e+06").
func plainNum(x float64) string {
	if a := math.Abs(x); a == 0 || (a >= 1e-4 && a < 1e15) {
		return strconv.FormatFloat(x, 'f', -1, 64)
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}

// engPrefix is the prefix that leaves a mantissa of v in [1, 1000).
func engPrefix(v float64) (best struct {
	sym string
	f   float64
}) {
	a := math.Abs(v)
	best = engPrefixes[5] // no prefix
	if a == 0 {
		return best
	}
	for _, p := range engPrefixes {
		if a >= p.f {
			best = p
		}
	}
	return best
}

// readsBack reports whether Parse(s, d) gives exactly v.
func readsBack(s string, v float64, d Dim) bool {
	x, err := Parse(s, d)
	return err == nil && x == v
}

// tomlFloat renders a plain number; integers stay integers.
func tomlFloat(v float64) string {
	switch {
	case math.IsNaN(v):
		return "nan"
	case math.IsInf(v, 1):
		return "inf"
	case math.IsInf(v, -1):
		return "-inf"
	}
	return plainNum(v)
}

// quoteTOML renders s as a TOML basic string.
func quoteTOML(s string) string {
	var b strings.Builder
	b.Grow(len(s) + 2)
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"':
			b.WriteString(`\"`)
		case r == '\\':
			b.WriteString(`\\`)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\t':
			b.WriteString(`\t`)
		case r == '\r':
			b.WriteString(`\r`)
		case safe.Unsafe(r):
			// Controls, C1, bidi and zero-width characters are written as
			// escapes: the file decodes to the same text but shows none.
			fmt.Fprintf(&b, `\u%04X`, r)
		case r == 0xFFFD:
			// Invalid UTF-8 decodes to U+FFFD; TOML files must be UTF-8.
			b.WriteString(`\uFFFD`)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}
