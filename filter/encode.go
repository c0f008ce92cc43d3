package filter

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// EncodeDesign writes d as design TOML that DecodeDesign reads back to the
// same inputs: every Value is written with its Raw text (quantities as
// strings, plain numbers as TOML numbers), unset inputs are left out so
// their defaults still apply. A pair with only one end set is written with
// the missing end at its default (the file format needs both).
func EncodeDesign(w io.Writer, d *Design) error {
	b := bufio.NewWriter(w)
	if d.Title != "" {
		fmt.Fprintf(b, "title = %s\n", quoteTOML(d.Title))
	}
	params := d.designParams()
	for _, table := range []string{"supply", "environment", "choose", "policy"} {
		var lines []string
		if table == "environment" {
			if d.Temp[0].Set || d.Temp[1].Set {
				lines = append(lines, "temp = "+pairTOML(d.Temp[0], d.Temp[1], "25 C"))
			}
		}
		for _, p := range params {
			key, ok := strings.CutPrefix(p.Key, table+".")
			if !ok || table == "environment" || !p.v.Set {
				continue
			}
			lines = append(lines, key+" = "+valueTOML(p.Param, *p.v))
		}
		if len(lines) > 0 {
			fmt.Fprintf(b, "\n[%s]\n%s\n", table, strings.Join(lines, "\n"))
		}
		if table == "choose" {
			b.WriteString(encodeLimits(d))
		}
	}
	for _, s := range d.Stages {
		fmt.Fprintf(b, "\n[[stage]]\nname = %s\nkind = %s\n", quoteTOML(s.Name), quoteTOML(s.Kind))
		t, ok := TemplateFor(s.Kind)
		if !ok {
			return fmt.Errorf("stage %q: %w", s.Name, unknownKind(s.Kind))
		}
		// Dotted keys under one parent ("signal.peak") are gathered into an
		// inline table, the way the examples write them.
		var inline []string
		var parent string
		flush := func() {
			if len(inline) > 0 {
				fmt.Fprintf(b, "%s = { %s }\n", parent, strings.Join(inline, ", "))
				inline = nil
			}
		}
		for _, p := range t.Params() {
			if p.Kind == Pair {
				lo, hi := s.Values[p.Key+".low"], s.Values[p.Key+".high"]
				if lo.Set || hi.Set {
					flush()
					fmt.Fprintf(b, "%s = %s\n", p.Key, pairTOML(lo, hi, "0 V"))
				}
				continue
			}
			v := s.Values[p.Key]
			if !v.Set {
				continue
			}
			par, sub, dotted := strings.Cut(p.Key, ".")
			if dotted {
				if par != parent {
					flush()
					parent = par
				}
				inline = append(inline, sub+" = "+valueTOML(p, v))
				continue
			}
			flush()
			fmt.Fprintf(b, "%s = %s\n", p.Key, valueTOML(p, v))
		}
		flush()
	}
	return b.Flush()
}

// valueTOML renders one input: lists as arrays, plain numbers as numbers,
// everything else as a string holding the text as written.
func valueTOML(p Param, v Value) string {
	switch p.Kind {
	case List:
		items := v.List()
		q := make([]string, len(items))
		for i, it := range items {
			q[i] = quoteTOML(it)
		}
		return "[" + strings.Join(q, ", ") + "]"
	case Quantity:
		if p.Dim == catalog.Dimensionless {
			if _, err := strconv.ParseFloat(v.Raw, 64); err == nil {
				return v.Raw
			}
		}
	}
	return quoteTOML(v.Raw)
}

func pairTOML(lo, hi Value, def string) string {
	l, h := lo.Raw, hi.Raw
	if !lo.Set {
		l = def
	}
	if !hi.Set {
		h = def
	}
	return "[" + quoteTOML(l) + ", " + quoteTOML(h) + "]"
}

// quoteTOML writes s as a TOML basic string.
func quoteTOML(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"' || r == '\\':
			b.WriteByte('\\')
			b.WriteRune(r)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}
