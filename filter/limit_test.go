package filter_test

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

// limitDesign is a one-stage design over temp with a [choose.limit] table.
// The speed and cold-bias tempcos are 0 unless policy sets speed_tempco, so
// each case exercises one worst-case rule.
func limitDesign(temp, policy, limits string) string {
	if policy == "" {
		policy = "speed_tempco = 0"
	}
	return `title = "t"
[supply]
pos = "10 V"
[environment]
temp = ` + temp + `
[policy]
ib_cold_tempco = 0
` + policy + `
[choose.limit]
` + limits + `
[[stage]]
name = "s"
kind = "follower"
signal = { peak = "1 V", freq = "10 Hz" }
ref = "5 V"
`
}

// Figure bounds are checked at worst case by the rules of DESIGN.md "Worst
// case and margins"; every expected figure is worked by hand beside it, and
// a part exactly at the bound has margin 0 and passes ("Pass at the
// limit": a margin under 1e-9 in magnitude counts as 0).
func TestLimitWorstCase(t *testing.T) {
	tests := []struct {
		name, temp, policy, limits string
		key                        filter.Key
		bound                      filter.Bound
		set                        func(p *catalog.Part)
		avail, margin              float64
		basis                      filter.Basis
	}{
		// Rule 2, Vos + drift·|ΔT|: ΔT = max(|−20 − 25|, |70 − 25|) = 45 K;
		// 5.55 mV + 10 µV/K · 45 K = 6.00 mV, exactly the bound.
		{"vos at the bound with drift", `["-20 C", "70 C"]`, "", `vos = { max = "6 mV" }`, "limit.vos", filter.BoundMax,
			func(p *catalog.Part) {
				p.Vos = catalog.Spec{Max: opt(5.55e-3)}
				p.VosDrift = catalog.Spec{Max: opt(10e-6)}
			}, 6e-3, 0, filter.BasisGuaranteed},
		// 5.56 mV + 0.45 mV = 6.01 mV: margin 6/6.01 − 1 = −0.166 %.
		{"vos just beyond", `["-20 C", "70 C"]`, "", `vos = { max = "6 mV" }`, "limit.vos", filter.BoundMax,
			func(p *catalog.Part) {
				p.Vos = catalog.Spec{Max: opt(5.56e-3)}
				p.VosDrift = catalog.Spec{Max: opt(10e-6)}
			}, 6.01e-3, 6/6.01 - 1, filter.BasisGuaranteed},
		// Rule 1: the over-temperature limit is used as given when the range
		// leaves 25 °C (max 2 mV would be lower but is not the worst case).
		{"vos over-temperature limit", `["-20 C", "70 C"]`, "", `vos = { max = "6 mV" }`, "limit.vos", filter.BoundMax,
			func(p *catalog.Part) { p.Vos = catalog.Spec{Max: opt(2e-3), MaxOT: opt(6e-3)} }, 6e-3, 0, filter.BasisGuaranteed},
		// Rule 3: typical × inflate_typ at 25 °C: 3 mV × 2 = 6 mV.
		{"vos typical inflated", `["25 C", "25 C"]`, "", `vos = { max = "6 mV" }`, "limit.vos", filter.BoundMax,
			func(p *catalog.Part) { p.Vos = catalog.Spec{Typ: opt(3e-3)}; p.VosDrift = catalog.Spec{} }, 6e-3, 0, filter.BasisTypical},
		// FET input: Ib × 2^(ΔT/10 K) above 25 °C: 1 pA × 2^(20/10) = 4 pA at 45 °C.
		{"ib of a FET input at 45 °C", `["25 C", "45 C"]`, "", `ib = { max = "4 pA" }`, "limit.ib", filter.BoundMax,
			func(p *catalog.Part) { p.Tech = catalog.TechCMOS; p.Ib = catalog.Spec{Max: opt(1e-12)} }, 4e-12, 0, filter.BasisGuaranteed},
		// The same part at 70 °C: 1 pA × 2^4.5 = 22.63 pA against 10 pA:
		// margin 10/22.63 − 1 = −55.8 %.
		{"ib of a FET input at 70 °C", `["25 C", "70 C"]`, "", `ib = { max = "10 pA" }`, "limit.ib", filter.BoundMax,
			func(p *catalog.Part) { p.Tech = catalog.TechCMOS; p.Ib = catalog.Spec{Max: opt(1e-12)} },
			1e-12 * math.Exp2(4.5), 10/(1e-12*math.Exp2(4.5)*1e12) - 1, filter.BasisGuaranteed},
		// Rule 3, bigger is better: typical 1.4 MHz × derate_typ 0.7 = 0.98 MHz < 1 MHz.
		{"gbw floor on a typical figure", `["25 C", "25 C"]`, "", `gbw = { min = "1 MHz" }`, "limit.gbw", filter.BoundMin,
			func(p *catalog.Part) { p.GBW = catalog.Spec{Typ: opt(1.4e6)} }, 0.98e6, 0.98 - 1, filter.BasisTypical},
		// speed_tempco 0.002/K over ΔT 45 K: 1.25 MHz × (1 − 0.09) = 1.1375 MHz.
		{"gbw floor with speed tempco", `["-20 C", "70 C"]`, "speed_tempco = 0.002", `gbw = { min = "1.1375 MHz" }`, "limit.gbw", filter.BoundMin,
			func(p *catalog.Part) { p.GBW = catalog.Spec{Min: opt(1.25e6)} }, 1.1375e6, 0, filter.BasisGuaranteed},
		// A ceiling on a bigger-is-better figure takes the mirror rule: the
		// typical × inflate_typ, 5 MHz × 2 = 10 MHz, exactly the ceiling.
		{"gbw ceiling on a typical figure", `["25 C", "25 C"]`, "", `gbw = { max = "10 MHz" }`, "limit.gbw", filter.BoundMax,
			func(p *catalog.Part) { p.GBW = catalog.Spec{Typ: opt(5e6)} }, 10e6, 0, filter.BasisTypical},
		// Aol in dB derated as a linear gain: 103 dB + 20·log10(0.7) =
		// 103 − 3.098 = 99.902 dB; against 100 dB the margin is the linear
		// ratio 10^(−0.098/20) − 1 = −1.12 %.
		{"aol floor on a typical figure", `["25 C", "25 C"]`, "", `aol = { min = "100 dB" }`, "limit.aol", filter.BoundMin,
			func(p *catalog.Part) { p.Aol = catalog.Spec{Typ: opt(103)} },
			103 + 20*math.Log10(0.7), math.Pow(10, (3+20*math.Log10(0.7))/20) - 1, filter.BasisTypical},
		// A single-quantity key is its stated value: cload 100 pF against a
		// floor of 100 pF.
		{"cload floor", `["-20 C", "70 C"]`, "", `cload = { min = "100 pF" }`, "limit.cload", filter.BoundMin,
			func(p *catalog.Part) { p.CLoad = opt(100e-12) }, 100e-12, 0, filter.BasisGuaranteed},
		// Iq ceiling on the per-channel figure: the max is used as given at
		// 25 °C, 450 µA against 500 µA → 500/450 − 1 = +11.1 %.
		{"iq ceiling", `["25 C", "25 C"]`, "", `iq = { max = "500 uA" }`, "limit.iq", filter.BoundMax,
			func(p *catalog.Part) { p.Iq = catalog.Spec{Typ: opt(300e-6), Max: opt(450e-6)} }, 450e-6, 500.0/450 - 1, filter.BasisGuaranteed},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, p := mustDesign(t, limitDesign(tc.temp, tc.policy, tc.limits))
			part := basePart("x")
			tc.set(part)
			r := evalOne(t, p, part, filter.Options{})
			var c *filter.Check
			for i := range r.Checks {
				if r.Checks[i].Req.Key == tc.key && r.Checks[i].Req.Bound == tc.bound {
					c = &r.Checks[i]
				}
			}
			if c == nil {
				t.Fatalf("no %s %s check", tc.key, tc.bound)
			}
			near(t, "available", c.Available, tc.avail, 1e-9)
			if tc.margin == 0 {
				if c.Margin != 0 || !c.Pass {
					t.Errorf("margin %g pass %v, want exactly 0 and a pass", c.Margin, c.Pass)
				}
			} else {
				near(t, "margin", c.Margin, tc.margin, 1e-6)
				if c.Pass != (tc.margin >= 0) {
					t.Errorf("pass = %v with margin %g", c.Pass, c.Margin)
				}
			}
			if c.Basis != tc.basis {
				t.Errorf("basis %v, want %v", c.Basis, tc.basis)
			}
		})
	}
}

// A vos ceiling of 6 mV drops exactly the parts whose worst-case offset
// exceeds it, shown as the check limit.vos; the others still pass. Worst
// case at −20 … 70 °C (ΔT 45 K) by Vos + drift·|ΔT|.
func TestLimitDropsExactlyTheParts(t *testing.T) {
	_, p := mustDesign(t, limitDesign(`["-20 C", "70 C"]`, "", `vos = { max = "6 mV" }`))
	mk := func(id string, vos, drift float64) *catalog.Part {
		q := basePart(id)
		q.Vos = catalog.Spec{Max: opt(vos)}
		q.VosDrift = catalog.Spec{Max: opt(drift)}
		return q
	}
	parts := []*catalog.Part{
		mk("low", 1e-3, 5e-6),       // 1 + 0.225 = 1.225 mV: pass
		mk("edge", 5.1e-3, 20e-6),   // 5.1 + 0.9 = 6.0 mV: pass at margin 0
		mk("over", 5.2e-3, 20e-6),   // 5.2 + 0.9 = 6.1 mV: fails
		mk("typ-only", 0, 0),        // replaced below: typ 2.9 mV × 2 + 0.45 = 6.25 mV: fails
		mk("room-only", 5.99e-3, 0), // 5.99 mV + 0 drift = 5.99 mV: pass
	}
	parts[3].Vos = catalog.Spec{Typ: opt(2.9e-3)}
	parts[3].VosDrift = catalog.Spec{Typ: opt(5e-6)} // typ × inflate 2 → 10 µV/K × 45 K = 0.45 mV
	rs := filter.Evaluate(p, parts, filter.Options{})
	want := map[string]bool{"low": true, "edge": true, "over": false, "typ-only": false, "room-only": true}
	for _, r := range rs {
		if r.Pass != want[r.Part.ID] {
			t.Errorf("%s: pass %v, want %v", r.Part.ID, r.Pass, want[r.Part.ID])
		}
		c := check(t, r, "", "limit.vos")
		if !want[r.Part.ID] && (c.Status != filter.StatusFail || r.Failed != 1) {
			t.Errorf("%s: limit.vos %v, %d failing checks, want the one failing check", r.Part.ID, c.Status, r.Failed)
		}
	}
	near(t, "typ-only vos", check(t, rs[3], "", "limit.vos").Available, 6.25e-3, 1e-9)
}

// Bad [choose.limit] entries name the file, the line and the key, with a
// did-you-mean where one is close. The entry is on line 10 of limitDesign.
func TestLimitDecodeErrors(t *testing.T) {
	tests := []struct{ limits, want string }{
		{`slw = { min = "1 V/us" }`, `test.toml:10: unknown field "choose.limit.slw" (did you mean "choose.limit.slew"?)`},
		{`vos = { mx = "6 mV" }`, `test.toml:10: unknown field "choose.limit.vos.mx" (did you mean "choose.limit.vos.max"?)`},
		{`vos = { max = "6 MHz" }`, `test.toml:10: field "choose.limit.vos.max": "6 MHz" is a frequency, want a voltage`},
		{`vos = "6 mV"`, `test.toml:10: field "choose.limit.vos": want a table with min and/or max`},
		{`vos = { max = 6 }`, `test.toml:10: field "choose.limit.vos.max": "6" has no unit`},
		{`gbw = { min = "2 MHz", max = "1 MHz" }`, `test.toml:10: field "choose.limit.gbw": min "2 MHz" is above max "1 MHz"`},
		{`ib = { max = "-1 pA" }`, `test.toml:10: field "choose.limit.ib": "-1 pA" is negative`},
	}
	for _, tc := range tests {
		t.Run(tc.limits, func(t *testing.T) {
			d, err := filter.DecodeDesign("test.toml", []byte(limitDesign(`["25 C", "25 C"]`, "", tc.limits)))
			if err == nil {
				_, err = filter.Derive(d)
			}
			if err == nil || !strings.HasPrefix(err.Error(), tc.want) {
				t.Errorf("error %v\nwant prefix %s", err, tc.want)
			}
		})
	}
}

// A limit written in a file comes back from EncodeDesign, and the design
// pane's text ("max 6 mV", "min 1 MHz, max 10 MHz") sets and clears it.
func TestLimitEditAndEncode(t *testing.T) {
	d, _ := mustDesign(t, limitDesign(`["25 C", "25 C"]`, "", `vos = { max = "6 mV" }`))
	if err := d.Set("choose.limit.gbw", "min 1 MHz, ≤ 10 MHz"); err != nil {
		t.Fatal(err)
	}
	if err := d.Set("choose.limit.slew", "at least 1 V/us"); err == nil {
		t.Error("text without min/max was accepted")
	}
	if err := d.Set("choose.limit.slw", "min 1 V/us"); err == nil || !strings.Contains(err.Error(), `did you mean "slew"`) {
		t.Errorf("unknown figure: %v", err)
	}
	var buf bytes.Buffer
	if err := filter.EncodeDesign(&buf, d); err != nil {
		t.Fatal(err)
	}
	for _, line := range []string{"[choose.limit]\n", `gbw = { min = "1 MHz", max = "10 MHz" }`, `vos = { max = "6 mV" }`} {
		if !strings.Contains(buf.String(), line) {
			t.Errorf("encoded design lacks %q:\n%s", line, buf.String())
		}
	}
	back, err := filter.DecodeDesign("back.toml", buf.Bytes())
	if err != nil {
		t.Fatal(err)
	}
	fields := map[string]string{}
	for _, f := range back.Fields() {
		fields[f.Path] = f.Raw
	}
	if fields["choose.limit.gbw"] != "min 1 MHz, max 10 MHz" || fields["choose.limit.vos"] != "max 6 mV" || fields["choose.limit.ib"] != "" {
		t.Errorf("limit fields after a round trip: gbw %q vos %q ib %q", fields["choose.limit.gbw"], fields["choose.limit.vos"], fields["choose.limit.ib"])
	}
	if err := back.Set("choose.limit.vos", ""); err != nil {
		t.Fatal(err)
	}
	p, err := filter.Derive(back)
	if err != nil {
		t.Fatal(err)
	}
	var keys []string
	for _, q := range p.Global {
		if strings.HasPrefix(string(q.Key), filter.LimitPrefix) {
			keys = append(keys, string(q.Key)+" "+q.Bound.String())
		}
	}
	if got := strings.Join(keys, ", "); got != "limit.gbw min, limit.gbw max" {
		t.Errorf("limit requirements %s, want limit.gbw min and max only", got)
	}
}
