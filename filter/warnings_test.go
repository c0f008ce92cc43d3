package filter_test

import (
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/filter"
)

func warningTexts(ws []filter.Warning) string {
	var b []string
	for _, w := range ws {
		b = append(b, w.String())
	}
	return strings.Join(b, "\n")
}

// Gain 10 on a 10 V peak is 100 V peak around the 6 V mid-rail of a 12 V
// supply: 6 ± 100 V = -94 … 106 V (DESIGN.md: Vo = G·Vp around ref), far
// beyond the rails. The design derives (the user sees every part fail) but
// carries a warning that says why no part can pass.
func TestWarningOutputBeyondRails(t *testing.T) {
	_, p := mustDesign(t, sineDesign(`pos = "12 V"`,
		`kind = "noninverting"
gain = 10
signal = { shape = "sine", peak = "10 V", freq = "1 kHz" }
load_r = "10 kOhm"`))
	got := warningTexts(p.Warnings)
	for _, want := range []string{`stage "s": the output must reach -94 V … 106 V, beyond the rails 0 V … 12 V`,
		"no temperature range given ([environment] temp): evaluated at 25 °C only"} {
		if !strings.Contains(got, want) {
			t.Errorf("warnings %q, want one containing %q", got, want)
		}
	}
}

// A design inside its rails, with a temperature range, has no warning.
func TestNoWarningForSoundDesign(t *testing.T) {
	_, p := mustDesign(t, sineDesign("pos = \"12 V\"\n[environment]\ntemp = [\"-20 C\", \"70 C\"]",
		`kind = "noninverting"
gain = 2
signal = { shape = "sine", peak = "1 V", freq = "1 kHz" }`))
	if len(p.Warnings) != 0 {
		t.Errorf("warnings %q, want none", warningTexts(p.Warnings))
	}
}

// A non-inverting gain below 1 cannot be built: it is an error, not a
// warning (the closed-loop gain is 1 + Rf/Rg ≥ 1; textbook, from memory).
func TestNoninvertingGainBelowOneIsAnError(t *testing.T) {
	d, err := filter.DecodeDesign("t.toml", []byte(sineDesign(`pos = "12 V"`, `kind = "noninverting"
gain = 0.5
signal = { shape = "sine", peak = "1 V", freq = "1 kHz" }`)))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := filter.Derive(d); err == nil || !strings.Contains(err.Error(), "below 1") {
		t.Errorf("Derive: %v, want a gain below 1 error", err)
	}
}

// Package and technology filters match whatever the case and separators
// ("SOIC-8" is "soic8", "soic8 msop8" typed with a space is two items),
// and a value the catalog does not hold is named with a did-you-mean.
func TestFilterMatchingAndWarnings(t *testing.T) {
	a := basePart("a") // soic8, cmos
	b := basePart("b")
	b.Packages, b.Tech = []string{"msop8"}, catalog.TechBipolar
	parts := []*catalog.Part{a, b}
	design := func(choose string) *filter.Plan {
		_, p := mustDesign(t, sineDesign("pos = \"12 V\"\n[environment]\ntemp = [\"25 C\", \"25 C\"]\n[choose]\n"+choose,
			"kind = \"follower\"\nsignal = { shape = \"sine\", peak = \"1 V\", freq = \"1 kHz\" }"))
		return p
	}
	passing := func(p *filter.Plan) []string {
		var ids []string
		for _, r := range filter.Evaluate(p, parts, filter.Options{}) {
			if r.Pass {
				ids = append(ids, r.Part.ID)
			}
		}
		return ids
	}
	tests := []struct {
		name, choose string
		pass         string
		warn         string // "" none
	}{
		{"upper case with a dash", `packages = ["SOIC-8"]`, "a", ""},
		{"space-separated in one item", `packages = ["soic8 msop8"]`, "a b", ""},
		{"tech in capitals", `tech = ["CMOS"]`, "a", ""},
		{"unknown package", `packages = ["soic80"]`, "",
			"package \"soic80\" is not in the catalog (did you mean \"soic8\"?)\nno part in the catalog passes the package filter"},
		{"together none", "packages = [\"msop8\"]\ntech = [\"cmos\"]", "",
			"the package and tech filters together leave no part; each alone leaves some"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := design(tc.choose)
			if got := strings.Join(passing(p), " "); got != tc.pass {
				t.Errorf("passing %q, want %q", got, tc.pass)
			}
			got := warningTexts(filter.FilterWarnings(p, parts))
			if tc.warn == "" && got != "" || !strings.Contains(got, tc.warn) {
				t.Errorf("warnings %q, want %q", got, tc.warn)
			}
		})
	}
}

// A technology the design file spells in capitals is read as the choice.
func TestTechChoiceCaseInsensitive(t *testing.T) {
	d, _ := mustDesign(t, sineDesign("pos = \"5 V\"\n[choose]\ntech = [\"JFET\", \"Bi-CMOS\"]",
		"kind = \"follower\"\nsignal = { shape = \"sine\", peak = \"1 V\", freq = \"1 kHz\" }"))
	if got := d.Choose.Tech.List(); strings.Join(got, ",") != "jfet,bicmos" {
		t.Errorf("tech %q, want jfet,bicmos", got)
	}
	if err := d.Set("choose.tech", "cmso"); err == nil || !strings.Contains(err.Error(), `did you mean "cmos"?`) {
		t.Errorf("Set tech cmso: %v, want a did-you-mean", err)
	}
}

// An amplifier given by its gain with a dc_error or noise budget is
// warned that the checks take no resistance at the inverting input; the
// same stage with its resistors, and a follower, are not.
func TestWarningGainOnlyErrorBudgets(t *testing.T) {
	env := "pos = \"5 V\"\nneg = \"-5 V\"\n[environment]\ntemp = [\"0 C\", \"50 C\"]"
	sig := "\nref = \"0 V\"\nsignal = { peak = \"0.1 V\", freq = \"1 kHz\" }\n"
	tests := []struct{ name, stage, want string }{
		{"inverting gain, dc_error", `kind = "inverting"` + "\ngain = 10" + sig + `dc_error = "15 mV"`,
			`stage "s": dc_error assumes no resistance at the inverting input` + " (the stage gives gain, not its resistors): the bias current through the feedback network and its resistors' noise are not counted; give rf and rin to include them"},
		{"noninverting gain, both", `kind = "noninverting"` + "\ngain = 10" + sig + "dc_error = \"15 mV\"\nnoise = \"1 mV\"",
			"dc_error and noise assume no resistance at the inverting input"},
		{"resistors given", `kind = "inverting"` + "\nrf = \"100 kOhm\"\nrin = \"10 kOhm\"" + sig + `dc_error = "15 mV"`, ""},
		{"no budget", `kind = "inverting"` + "\ngain = 10" + sig, ""},
		{"follower", `kind = "follower"` + sig + `dc_error = "15 mV"`, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, p := mustDesign(t, sineDesign(env, tc.stage))
			got := warningTexts(p.Warnings)
			if tc.want == "" && got != "" {
				t.Errorf("warnings %q, want none", got)
			}
			if tc.want != "" && !strings.Contains(got, tc.want) {
				t.Errorf("warnings %q, want one containing %q", got, tc.want)
			}
		})
	}
}
