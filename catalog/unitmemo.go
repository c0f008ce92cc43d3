package catalog

import (
	"math"
	"strings"
)

// unitInfo is what a unit spelling means in a field of some dimension:
// parseUnit's answer, and whether its factor is a power of ten (every SI
// prefix is) with that power.
type unitInfo struct {
	scale float64
	dim   Dim
	ok    bool
	pow10 bool // scale is 10^exp10, read exactly by exactDecimal
	exp10 int
}

// unitKey is a unit spelling and the dimension its field wants.
type unitKey struct {
	unit string
	want Dim
}

// unitMemo remembers unitInfo per spelling while one file is decoded. A
// nil memo remembers nothing. It holds at most maxUnitMemo spellings, so a
// hostile file of a million distinct units cannot grow it.
type unitMemo map[unitKey]unitInfo

// maxUnitMemo bounds a unitMemo; real catalogs use a few dozen spellings.
const maxUnitMemo = 256

// unit returns what u means in a field wanting want.
func (m *unitMemo) unit(u string, want Dim) unitInfo {
	if m != nil && *m != nil {
		if info, ok := (*m)[unitKey{u, want}]; ok {
			return info
		}
	}
	var info unitInfo
	info.scale, info.dim, info.ok = parseUnit(u, want)
	if info.ok && info.scale != 1 {
		// The same test scaled makes before it reads the product as one
		// decimal number.
		k := math.Round(math.Log10(info.scale))
		if math.Abs(k) <= 30 && math.Abs(info.scale/math.Pow(10, k)-1) <= 1e-9 {
			info.pow10, info.exp10 = true, int(k)
		}
	}
	if m != nil {
		if *m == nil {
			*m = unitMemo{}
		}
		if len(*m) < maxUnitMemo {
			// A copy: u may share memory with the whole file's text.
			(*m)[unitKey{strings.Clone(u), want}] = info
		}
	}
	return info
}

// pow10s are the powers of ten a float64 holds exactly.
var pow10s = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// exactDecimal returns the float64 nearest num·10^shift, where num is a
// decimal number as splitNumber cuts it ("-1.25", "4.7e-3"), when that can
// be had exactly with one IEEE 754 operation: at most 15 significant
// digits (an integer below 2^53, exact in a float64) and a power of ten
// between 10^-22 and 10^22 (exact too). One correctly rounded multiply or
// divide of two exact operands is the nearest float64 to the exact value,
// the same number strconv.ParseFloat returns (Clinger's fast path, which
// strconv itself takes first). ok is false for anything else; the caller
// then parses the slow way.
func exactDecimal(num string, shift int) (v float64, ok bool) {
	i, neg := 0, false
	if i < len(num) && (num[i] == '+' || num[i] == '-') {
		neg = num[i] == '-'
		i++
	}
	var mant uint64
	digits, exp := 0, shift
	seenDot := false
	for ; i < len(num); i++ {
		c := num[i]
		switch {
		case c >= '0' && c <= '9':
			if mant == 0 && c == '0' {
				if seenDot {
					exp--
				}
				continue // a leading zero adds no digit
			}
			if digits == 15 {
				return 0, false
			}
			mant = mant*10 + uint64(c-'0')
			digits++
			if seenDot {
				exp--
			}
		case c == '.' && !seenDot:
			seenDot = true
		case c == 'e' || c == 'E':
			e, ok := smallExponent(num[i+1:])
			if !ok {
				return 0, false
			}
			exp += e
			i = len(num)
		default:
			return 0, false
		}
	}
	if mant == 0 {
		v = 0
	} else {
		switch {
		case exp == 0:
			v = float64(mant)
		case exp > 0 && exp < len(pow10s):
			v = float64(mant) * pow10s[exp]
		case exp < 0 && -exp < len(pow10s):
			v = float64(mant) / pow10s[-exp]
		default:
			return 0, false
		}
	}
	if neg {
		v = -v
	}
	return v, true
}

// smallExponent reads an exponent of at most three digits with an
// optional sign; false for anything longer or malformed.
func smallExponent(s string) (int, bool) {
	neg := false
	if s != "" && (s[0] == '+' || s[0] == '-') {
		neg = s[0] == '-'
		s = s[1:]
	}
	if s == "" || len(s) > 3 {
		return 0, false
	}
	e := 0
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return 0, false
		}
		e = e*10 + int(s[i]-'0')
	}
	if neg {
		e = -e
	}
	return e, true
}
