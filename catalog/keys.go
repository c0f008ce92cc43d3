package catalog

import "strings"

// partKeys are the keys a [[part]] table may hold, in the order the
// catalog format documents them and Encode writes them.
var partKeys = []string{
	"id", "name", "tech", "channels", "packages", "pinout", "lifecycle", "unit_cost", "temp",
	"supply", "input_cm", "output",
	"gbw", "slew", "aol", "vos", "vos_drift", "ib", "ios", "en", "in", "iq", "iout",
	"vdiff_max", "cload", "cin", "en_corner", "in_corner", "datasheet", "notes",
}

// specKeys are the keys of a figure's inline table.
var specKeys = []string{"typ", "min", "max", "min_ot", "max_ot", "source"}

// Sub-keys of the supply, input_cm and output tables.
var (
	spanKeys  = []string{"min", "max"}
	cmKeys    = []string{"low", "high", "source"}
	swingKeys = []string{"low", "high", "load", "source"}
)

// sign is the physical sign rule of a figure.
type sign int

const (
	anySign  sign = iota
	positive      // > 0: a bandwidth, a rate, a current drawn
	nonNeg        // ≥ 0: a magnitude (offset, bias current, drift)
)

// figure describes one datasheet figure of a part: its key, its dimension,
// the sign it must have, and where it lives in Part.
type figure struct {
	key  string
	dim  Dim
	sign sign
	spec func(*Part) *Spec
}

// figures lists every Spec-valued key of a part, in partKeys order.
// Signs: GBW, slew, Aol (dB above unity), noise, Iq and Iout are positive
// by nature; Vos, its drift, Ib and Ios are written as magnitudes, because
// the worst case uses |Vos| + |drift|·|ΔT| and |Ib| (common practice, no source).
var figures = []figure{
	{"gbw", Hertz, positive, func(p *Part) *Spec { return &p.GBW }},
	{"slew", VoltPerSecond, positive, func(p *Part) *Spec { return &p.Slew }},
	{"aol", Decibel, positive, func(p *Part) *Spec { return &p.Aol }},
	{"vos", Volt, nonNeg, func(p *Part) *Spec { return &p.Vos }},
	{"vos_drift", VoltPerKelvin, nonNeg, func(p *Part) *Spec { return &p.VosDrift }},
	{"ib", Ampere, nonNeg, func(p *Part) *Spec { return &p.Ib }},
	{"ios", Ampere, nonNeg, func(p *Part) *Spec { return &p.Ios }},
	{"en", VoltNoise, positive, func(p *Part) *Spec { return &p.En }},
	{"in", CurrentNoise, positive, func(p *Part) *Spec { return &p.In }},
	{"iq", Ampere, positive, func(p *Part) *Spec { return &p.Iq }},
	{"iout", Ampere, positive, func(p *Part) *Spec { return &p.Iout }},
}

// scalar describes a single-quantity key such as vdiff_max.
type scalar struct {
	key string
	dim Dim
	opt func(*Part) *Opt
}

// scalars lists the single-quantity keys; all are positive by nature.
var scalars = []scalar{
	{"vdiff_max", Volt, func(p *Part) *Opt { return &p.VdiffMax }},
	{"cload", Farad, func(p *Part) *Opt { return &p.CLoad }},
	{"cin", Farad, func(p *Part) *Opt { return &p.Cin }},
	{"en_corner", Hertz, func(p *Part) *Opt { return &p.EnCorner }},
	{"in_corner", Hertz, func(p *Part) *Opt { return &p.InCorner }},
}

// Known enumerations, for validation and suggestions.
var (
	techs      = []string{string(TechBipolar), string(TechCMOS), string(TechJFET), string(TechBiCMOS)}
	lifecycles = []string{string(LifecycleActive), string(LifecycleNRND), string(LifecycleObsolete)}
	sources    = []string{string(SourceTable), string(SourceGraph), string(SourceEstimate)}
)

// suggest returns the known word the user most likely meant by got, or ""
// when nothing is close. A small edit distance wins; failing that, the
// known word sharing the longest prefix with got, when one is a prefix of
// the other ("slewrate" → "slew", "input" → "input_cm").
func suggest(got string, known []string) string {
	g := strings.ToLower(got)
	limit := max(1, len(g)/3)
	best, bestD := "", limit+1
	for _, k := range known {
		if d := EditDistance(g, k); d < bestD {
			best, bestD = k, d
		}
	}
	if best != "" {
		return best
	}
	best, bestN := "", 1
	for _, k := range known {
		if !strings.HasPrefix(g, k) && !strings.HasPrefix(k, g) {
			continue
		}
		if n := min(len(g), len(k)); n > bestN {
			best, bestN = k, n
		}
	}
	return best
}

// EditDistance is the optimal-string-alignment distance between sa and sb,
// in runes: insertions, deletions, substitutions and swaps of two
// neighbouring letters each count 1, so "tpy" is one edit from "typ".
func EditDistance(sa, sb string) int {
	a, b := []rune(sa), []rune(sb)
	// d[i][j] is the distance between a[:i] and b[:j], kept in three rows.
	prev2 := make([]int, len(b)+1)
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(b)]
}

// didYouMean returns ` (did you mean "x"?)` or "".
func didYouMean(got string, known []string) string {
	if s := suggest(got, known); s != "" && s != got {
		return ` (did you mean "` + s + `"?)`
	}
	return ""
}

// FigureKey describes one numeric figure of a part by its catalog key: a
// datasheet figure with typical and guaranteed values ("gbw", "vos", …) or
// a single-quantity key ("vdiff_max", "cload", …). Designs bound figures by
// these keys ([choose.limit]) and listings show them as columns.
type FigureKey struct {
	Key    string
	Dim    Dim
	Scalar bool // a single quantity, not a {typ, min, max, …} table
}

// FigureKeys lists every numeric figure key of a part, in catalog order:
// the figure tables, then the single quantities.
func FigureKeys() []FigureKey {
	out := make([]FigureKey, 0, len(figures)+len(scalars))
	for _, f := range figures {
		out = append(out, FigureKey{Key: f.key, Dim: f.dim})
	}
	for _, s := range scalars {
		out = append(out, FigureKey{Key: s.key, Dim: s.dim, Scalar: true})
	}
	return out
}

// Spec returns the figure table of p under key ("gbw", "vos", …); ok is
// false when key is not a figure table.
func (p *Part) Spec(key string) (s Spec, ok bool) {
	for _, f := range figures {
		if f.key == key {
			return *f.spec(p), true
		}
	}
	return Spec{}, false
}

// Scalar returns the single quantity of p under key ("vdiff_max",
// "cload", …); ok is false when key is not a single-quantity key.
func (p *Part) Scalar(key string) (v Opt, ok bool) {
	for _, s := range scalars {
		if s.key == key {
			return *s.opt(p), true
		}
	}
	return Opt{}, false
}

// Suggest returns the known word the user most likely meant by got ("" when
// nothing is close or got is itself known), by the rule catalog messages
// use for did-you-mean.
func Suggest(got string, known []string) string {
	if s := suggest(got, known); s != got {
		return s
	}
	return ""
}
