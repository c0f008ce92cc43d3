package replace

import (
	"fmt"
	"slices"
)

// Change is one regression or improvement of a candidate: the field that
// changed, and its class. Reason writes it as one line.
type Change struct {
	Key string
	// Class orders changes by how often they break (or rescue) a circuit:
	// 1 maximum supply, 2 common-mode range reaching a rail, 3 output
	// swing, 4 slew rate and gain-bandwidth, 5 differential input rating,
	// 6 input bias current, 7 everything else.
	Class int
	// Field is the comparison the change comes from: an element of the
	// candidate's Fields.
	Field *Field

	order int // place within the class
}

// Reason is the change as one line with both figures, candidate first:
// "lower maximum supply: 16 V against 32 V — fails on rails wider than the
// candidate's maximum". It is written on demand, so Find stays cheap on
// large catalogs.
func (c Change) Reason() string { return describe(*c.Field) }

// prio is where a change sorts: by class, then by order within the class.
type prio struct {
	class, order int
}

// priorityOf returns the class and order of a change of field f.
func priorityOf(f Field) prio {
	switch f.Key {
	case "supply_max":
		return prio{1, 0}
	case "input_cm_low", "input_cm_high":
		if railCrossed(f) {
			return prio{2, keyOrder(f.Key)}
		}
	case "output_low", "output_high":
		return prio{3, keyOrder(f.Key)}
	case "slew":
		return prio{4, 0}
	case "gbw":
		return prio{4, 1}
	case "vdiff_max":
		return prio{5, 0}
	case "ib":
		return prio{6, 0}
	}
	return prio{7, keyOrder(f.Key)}
}

// keyOrder is the order of class-7 changes: the input range first (it
// still decides whether the circuit works at all), then the ratings, then
// the precision and noise figures, supply current last.
func keyOrder(key string) int {
	for i, k := range []string{
		"input_cm_low", "input_cm_high", "output_low", "output_high",
		"supply_min", "temp_low", "temp_high", "iout", "cload", "aol",
		"vos", "vos_drift", "ios", "en", "in", "iq",
	} {
		if k == key {
			return i
		}
	}
	return 99
}

// reaches reports whether a common-mode limit reaches its rail: the low
// end at or below V−, the high end at or above V+ (within voltTol).
func reaches(key string, v float64) bool {
	if key == "input_cm_low" {
		return v <= voltTol
	}
	return v >= -voltTol
}

// railCrossed reports whether the candidate's common-mode limit reaches
// its rail and the original's does not, or the other way round.
func railCrossed(f Field) bool {
	if !f.Original.Set || !f.Candidate.Set {
		return false
	}
	return reaches(f.Key, f.Original.V) != reaches(f.Key, f.Candidate.V)
}

// consequence is the second half of a regression's reason: what it breaks.
func consequence(key string) string {
	switch key {
	case "supply_max":
		return "fails on rails wider than the candidate's maximum"
	case "supply_min":
		return "will not run from rails below the candidate's minimum"
	case "input_cm_low", "input_cm_high":
		return "inputs near that rail leave the common-mode range"
	case "output_low", "output_high":
		return "output clips sooner at that rail"
	case "slew":
		return "large or fast signals distort"
	case "gbw":
		return "less bandwidth and more gain error at a given gain"
	case "vdiff_max":
		return "comparator, clamp and switched inputs may exceed it"
	case "ib":
		return "more error with high-impedance sources (Ib × Rs)"
	case "ios":
		return "more error with balanced source impedances"
	case "vos", "vos_drift":
		return "more DC error"
	case "aol":
		return "more gain error at high closed-loop gain"
	case "en", "in":
		return "more noise"
	case "iq":
		return "more supply current per channel"
	case "iout":
		return "heavy loads pull the output in sooner"
	case "cload":
		return "may ring or oscillate driving cables or capacitive loads"
	case "temp_low", "temp_high":
		return "narrower rated temperature range"
	}
	return ""
}

// describe writes a change of field f as one line.
func describe(f Field) string {
	word := "worse"
	if f.Verdict == Better {
		word = "better"
	}
	head := fmt.Sprintf("%s %s: %s against %s", f.Label, word, f.Format(f.Candidate), f.Format(f.Original))
	switch f.Key {
	case "input_cm_low", "input_cm_high":
		rail := "V−"
		if f.Key == "input_cm_high" {
			rail = "V+"
		}
		if railCrossed(f) {
			if f.Verdict == Worse {
				return fmt.Sprintf("input range no longer reaches %s: %s against %s", rail, f.Format(f.Candidate), f.Format(f.Original))
			}
			return fmt.Sprintf("input range now reaches %s: %s against %s", rail, f.Format(f.Candidate), f.Format(f.Original))
		}
	case "supply_max":
		if f.Verdict == Worse {
			return fmt.Sprintf("lower maximum supply: %s against %s — %s", f.Format(f.Candidate), f.Format(f.Original), consequence(f.Key))
		}
		return fmt.Sprintf("higher maximum supply: %s against %s", f.Format(f.Candidate), f.Format(f.Original))
	}
	if f.Verdict == Worse {
		if c := consequence(f.Key); c != "" {
			return head + " — " + c
		}
	}
	return head
}

// changes collects the fields with verdict v as Changes, most
// circuit-breaking first. The Changes point into fields.
func changes(fields []Field, v Verdict) []Change {
	n := 0
	for i := range fields {
		if fields[i].Verdict == v {
			n++
		}
	}
	if n == 0 {
		return nil
	}
	out := make([]Change, 0, n)
	for i := range fields {
		f := &fields[i]
		if f.Verdict != v {
			continue
		}
		p := priorityOf(*f)
		out = append(out, Change{Key: f.Key, Class: p.class, Field: f, order: p.order})
	}
	slices.SortStableFunc(out, func(a, b Change) int {
		if a.Class != b.Class {
			return a.Class - b.Class
		}
		return a.order - b.order
	})
	return out
}
