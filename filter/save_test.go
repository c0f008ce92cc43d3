package filter_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/opsift/opsift/filter"
)

// handDesign is a design file as a user writes it: comments above and
// beside keys, aligned values, an inline signal table, a blank line
// between tables, no [environment].
const handDesign = `# Preamp for a moving-coil pickup.
# Rails from a ±15 V bench supply.
title = "MC preamp"

[supply]
pos = "12 V"    # raised to 15 V once the regulator arrives
neg = "-12 V"

# The head amp.
[[stage]]
name = "head"     # first stage
kind = "noninverting"
gain = 10         # 20 dB
signal = { peak = "1 mV", freq = "20 kHz" }   # top of the band
load_r = "10 kOhm"
dc_error = "50 mV"  # ADC headroom
`

// Saving edits in place keeps every comment, the order and the alignment:
// only the edited values change, a new key goes beside its neighbours in
// form order, a missing table is written before the stages (under its own
// header, above the comment that describes the stage), a key given for
// the first time inside the inline table joins it, and a cleared input
// leaves with its line. The wanted text is worked by hand from handDesign.
func TestUpdateDesignTextKeepsComments(t *testing.T) {
	d, err := filter.DecodeDesign("mc.toml", []byte(handDesign))
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range [][2]string{
		{"supply.pos", "15 V"},
		{"supply.tolerance", "5 %"},
		{"environment.temp.low", "-20 C"},
		{"environment.temp.high", "70 C"},
		{"stage.head.signal.freq", "30 kHz"},
		{"stage.head.signal.shape", "sine"},
		{"stage.head.source_r", "100 Ohm"},
		{"stage.head.dc_error", ""},
	} {
		if err := d.Set(e[0], e[1]); err != nil {
			t.Fatalf("Set %s: %v", e[0], err)
		}
	}
	got, err := filter.UpdateDesignText([]byte(handDesign), d)
	if err != nil {
		t.Fatal(err)
	}
	want := `# Preamp for a moving-coil pickup.
# Rails from a ±15 V bench supply.
title = "MC preamp"

[supply]
pos = "15 V"    # raised to 15 V once the regulator arrives
neg = "-12 V"
tolerance = "5 %"

[environment]
temp = ["-20 C", "70 C"]

# The head amp.
[[stage]]
name = "head"     # first stage
kind = "noninverting"
gain = 10         # 20 dB
signal = { peak = "1 mV", freq = "30 kHz", shape = "sine" }   # top of the band
source_r = "100 Ohm"
load_r = "10 kOhm"
`
	if string(got) != want {
		t.Errorf("saved text:\n%s\nwant:\n%s", got, want)
	}
	// Nothing edited: the text comes back byte for byte.
	same, _ := filter.DecodeDesign("mc.toml", []byte(handDesign))
	if again, err := filter.UpdateDesignText([]byte(handDesign), same); err != nil || string(again) != handDesign {
		t.Errorf("unedited save changed the text (%v):\n%s", err, again)
	}
}

// Changing a stage's kind drops the keys the new kind does not take, and
// a key whose parent table is missing is written as a new inline table.
func TestUpdateDesignTextKindAndNewInline(t *testing.T) {
	text := "[supply]\npos = \"5 V\"\n\n[[stage]]\nname = \"buf\"\nkind = \"direct\"\nnoise_gain = 1\ninput = [\"1 V\", \"2 V\"]\noutput = [\"1 V\", \"2 V\"]\n"
	d, err := filter.DecodeDesign("b.toml", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range [][2]string{{"stage.buf.kind", "follower"}, {"stage.buf.signal.peak", "1 V"}, {"stage.buf.signal.freq", "1 kHz"}} {
		if err := d.Set(e[0], e[1]); err != nil {
			t.Fatalf("Set %s: %v", e[0], err)
		}
	}
	got, err := filter.UpdateDesignText([]byte(text), d)
	if err != nil {
		t.Fatal(err)
	}
	want := "[supply]\npos = \"5 V\"\n\n[[stage]]\nname = \"buf\"\nkind = \"follower\"\nsignal = { peak = \"1 V\", freq = \"1 kHz\" }\n"
	if string(got) != want {
		t.Errorf("saved text:\n%s\nwant:\n%s", got, want)
	}
}

// The stages of the edited design must be the file's.
func TestUpdateDesignTextStagesMustMatch(t *testing.T) {
	d, _ := filter.DecodeDesign("mc.toml", []byte(handDesign))
	d.Stages[0].Name = "other"
	if _, err := filter.UpdateDesignText([]byte(handDesign), d); err == nil || !strings.Contains(err.Error(), "stages differ") {
		t.Errorf("err %v, want stages differ", err)
	}
}

// Over every design file the project ships, giving each input that has a
// default its default explicitly (a new key in every table and inline
// table) saves in place without losing a comment line, and reads back as
// the inputs set (UpdateDesignText checks that itself).
func TestUpdateDesignTextEveryShippedDesign(t *testing.T) {
	var files []string
	for _, dir := range []string{"../data/designs", "../testdata/designs"} {
		m, _ := filepath.Glob(filepath.Join(dir, "*.toml"))
		files = append(files, m...)
	}
	if len(files) < 4 {
		t.Fatalf("found %d design files", len(files))
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			text, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			d, err := filter.DecodeDesign(f, text)
			if err != nil {
				t.Skipf("not a valid design: %v", err)
			}
			n := 0
			for _, fl := range d.Fields() {
				if !fl.Set && fl.Default != "" && fl.Kind != filter.List {
					if err := d.Set(fl.Path, fl.Default); err == nil {
						n++
					}
				}
			}
			got, err := filter.UpdateDesignText(text, d)
			if err != nil {
				t.Fatalf("%d defaults set: %v", n, err)
			}
			for _, line := range strings.Split(string(text), "\n") {
				if i := strings.Index(line, "#"); i >= 0 && !strings.Contains(string(got), line[i:]) {
					t.Errorf("comment lost: %q", line[i:])
				}
			}
		})
	}
}

// Figure bounds ([choose.limit]) are saved in place like every input: a
// first bound writes the table before the stages, a changed one replaces
// its own inline table, a cleared one leaves with its line, and the file
// reads back with exactly those bounds. The wanted text is worked by hand.
func TestUpdateDesignTextLimits(t *testing.T) {
	d, err := filter.DecodeDesign("mc.toml", []byte(handDesign))
	if err != nil {
		t.Fatal(err)
	}
	for path, raw := range map[string]string{"choose.limit.vos": "max 6 mV", "choose.limit.gbw": "min 1 MHz"} {
		if err := d.Set(path, raw); err != nil {
			t.Fatal(err)
		}
	}
	out, err := filter.UpdateDesignText([]byte(handDesign), d)
	if err != nil {
		t.Fatal(err)
	}
	want := "[choose.limit]\ngbw = { min = \"1 MHz\" }\nvos = { max = \"6 mV\" }\n\n# The head amp.\n[[stage]]"
	if !strings.Contains(string(out), want) {
		t.Fatalf("saved text lacks\n%s\ngot:\n%s", want, out)
	}
	d2, err := filter.DecodeDesign("mc.toml", out)
	if err != nil {
		t.Fatal(err)
	}
	if err := d2.Set("choose.limit.vos", "max 5 mV"); err != nil {
		t.Fatal(err)
	}
	if err := d2.Set("choose.limit.gbw", ""); err != nil {
		t.Fatal(err)
	}
	out2, err := filter.UpdateDesignText(out, d2)
	if err != nil {
		t.Fatal(err)
	}
	got := strings.Replace(string(out), "gbw = { min = \"1 MHz\" }\nvos = { max = \"6 mV\" }", "vos = { max = \"5 mV\" }", 1)
	if string(out2) != got {
		t.Errorf("second save:\n%s\nwant:\n%s", out2, got)
	}
}
