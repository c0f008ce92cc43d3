package filter

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/opsift/opsift/catalog"
)

// Warning is something suspect about a design or its filters that does
// not stop the evaluation but that the user must see: an output range
// beyond the rails (no part can pass), a design evaluated at 25 °C only
// because it gives no temperature range, a filter value the catalog does
// not hold, filters that leave no part. Front ends list Warnings beside
// the results.
type Warning struct {
	Stage string // the stage concerned; "" design-level
	Field string // the design key concerned ("environment.temp", "choose.packages")
	Text  string // one line for the user
}

// String renders the warning on one line, with its stage.
func (w Warning) String() string {
	if w.Stage != "" {
		return fmt.Sprintf("stage %q: %s", w.Stage, w.Text)
	}
	return w.Text
}

// designWarnings looks at a derived plan for what is impossible or
// suspect in the design itself; Derive stores them in Plan.Warnings.
func (p *Plan) designWarnings(d *Design) []Warning {
	var out []Warning
	if !d.Temp[0].Set && !d.Temp[1].Set {
		out = append(out, Warning{Field: "environment.temp", Text: "no temperature range given " +
			"([environment] temp): evaluated at 25 °C only; give the real ambient range, " +
			"e.g. temp = [\"-20 C\", \"70 C\"]"})
	}
	V := func(x float64) string { return catalog.Format(x, catalog.Volt) }
	for _, sp := range p.Stages {
		if w, ok := gainOnlyWarning(&sp); ok {
			out = append(out, w)
		}
		for _, q := range sp.Requirements {
			if q.Key != KeyOutputRange || q.Bound != BoundRange {
				continue
			}
			if q.Low < p.Rails.Neg || q.High > p.Rails.Pos {
				out = append(out, Warning{Stage: sp.Name, Field: "output_range", Text: fmt.Sprintf(
					"the output must reach %s … %s, beyond the rails %s … %s: no op-amp on these rails can pass "+
						"(check the gain, the signal peak and ref)", V(q.Low), V(q.High), V(p.Rails.Neg), V(p.Rails.Pos))})
			}
		}
	}
	return out
}

// FilterWarnings checks the design's hard filters against the parts of
// the catalog: a package or technology the catalog does not hold (with a
// did-you-mean from what it holds), a filter that no part passes, and
// filters that each leave parts but together leave none. Names are
// compared by catalog.PackageKey.
func FilterWarnings(plan *Plan, parts []*catalog.Part) []Warning {
	var out []Warning
	var hard []*Requirement
	for i := range plan.Global {
		if q := &plan.Global[i]; q.Bound == BoundHard {
			hard = append(hard, q)
		}
	}
	held := map[Key]map[string]string{KeyPackage: {}, KeyTech: {}} // key → name → as the catalog spells it
	for _, p := range parts {
		for _, pk := range p.Packages {
			held[KeyPackage][catalog.PackageKey(pk)] = pk
		}
		if p.Tech != "" {
			held[KeyTech][catalog.PackageKey(string(p.Tech))] = string(p.Tech)
		}
	}
	field := map[Key]string{KeyPackage: "choose.packages", KeyTech: "choose.tech", KeyLifecycle: "choose.lifecycle",
		KeyCost: "choose.max_unit_cost", KeyTemperature: "environment.temp"}
	for _, q := range hard {
		names, ok := held[q.Key]
		if !ok {
			continue
		}
		var known []string
		for _, n := range names {
			known = append(known, n)
		}
		sort.Strings(known)
		for _, a := range q.Allowed {
			if _, ok := names[catalog.PackageKey(a)]; ok {
				continue
			}
			text := fmt.Sprintf("%s %q is not in the catalog", q.Key, a)
			if s := nearestKey(a, known); s != "" {
				text += fmt.Sprintf(" (did you mean %q?)", s)
			} else if len(known) > 0 {
				text += " (it holds " + strings.Join(known, ", ") + ")"
			}
			out = append(out, Warning{Field: field[q.Key], Text: text})
		}
	}
	if len(parts) == 0 || len(hard) == 0 {
		return out
	}
	pass := make([]int, len(hard)) // parts passing each filter alone
	all := 0                       // parts passing every filter
	ev := evaluator{plan: plan}
	for _, p := range parts {
		every := true
		for i, q := range hard {
			c := Check{Req: q, Available: math.NaN(), AvailLow: math.NaN(), AvailHigh: math.NaN(), Margin: math.NaN()}
			ev.hardCheck(&c, q, p)
			if c.Status == StatusPass || c.Status == StatusUnknown {
				pass[i]++
			} else {
				every = false
			}
		}
		if every {
			all++
		}
	}
	none := false
	for i, q := range hard {
		if pass[i] == 0 {
			none = true
			out = append(out, Warning{Field: field[q.Key], Text: fmt.Sprintf("no part in the catalog passes the %s filter (%s)", q.Key, q.Why)})
		}
	}
	if !none && all == 0 {
		// Name the filters the design chose: not the temperature range,
		// nor the default lifecycle rule.
		var keys []string
		for _, q := range hard {
			if q.Key == KeyTemperature || q.Key == KeyLifecycle && (plan.Design == nil || !plan.Design.Choose.Lifecycle.Set) {
				continue
			}
			keys = append(keys, string(q.Key))
		}
		what := "the filters together leave"
		switch n := len(keys); {
		case n == 1:
			what = "the " + keys[0] + " filter, with the temperature range and lifecycle, leaves"
		case n > 1:
			what = "the " + strings.Join(keys[:n-1], ", ") + " and " + keys[n-1] + " filters together leave"
		}
		out = append(out, Warning{Text: what + " no part; each alone leaves some"})
	}
	return out
}

// nearestKey is nearest on PackageKey forms, returning the name as the
// catalog spells it.
func nearestKey(s string, names []string) string {
	keys := make([]string, len(names))
	back := map[string]string{}
	for i, n := range names {
		keys[i] = catalog.PackageKey(n)
		back[keys[i]] = n
	}
	if k := nearest(catalog.PackageKey(s), keys); k != "" {
		return back[k]
	}
	return ""
}

// gainOnlyWarning says when an amplifier given by its gain alone carries a
// dc_error or noise budget: without its resistors (StagePlan.Resistors)
// the checks take no resistance at the inverting input, so Ib·(Rf∥Rg) and
// the resistors' noise are left out and a real network may need more than
// they show.
func gainOnlyWarning(sp *StagePlan) (Warning, bool) {
	if sp.Resistors == "" {
		return Warning{}, false
	}
	var keys []string
	for _, q := range sp.Requirements {
		if q.Key == KeyDCError || q.Key == KeyNoise {
			keys = append(keys, string(q.Key))
		}
	}
	if len(keys) == 0 {
		return Warning{}, false
	}
	verb := "assumes"
	if len(keys) > 1 {
		verb = "assume"
	}
	return Warning{Stage: sp.Name, Field: "gain", Text: fmt.Sprintf(
		"%s %s no resistance at the inverting input (the stage gives gain, not its resistors): "+
			"the bias current through the feedback network and its resistors' noise are not counted; "+
			"give %s to include them", strings.Join(keys, " and "), verb, sp.Resistors)}, true
}
