package catalog

import (
	"errors"
	"github.com/opsift/opsift/internal/golden"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// TestDecodeBad decodes every faulty catalog in testdata/bad and compares
// the problems with NAME.golden.
func TestDecodeBad(t *testing.T) {
	files, err := filepath.Glob("../testdata/bad/*.toml")
	if err != nil {
		t.Fatal(err)
	}
	if len(files) < 15 {
		t.Fatalf("only %d faulty catalogs in testdata/bad", len(files))
	}
	for _, f := range files {
		name := strings.TrimSuffix(filepath.Base(f), ".toml")
		t.Run(name, func(t *testing.T) {
			data, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			_, err = Decode(filepath.Base(f), data)
			if err == nil {
				t.Fatalf("Decode accepted %s", f)
			}
			var ps Problems
			if !errors.As(err, &ps) || len(ps) == 0 {
				t.Fatalf("error %T is not a non-empty Problems", err)
			}
			for _, p := range ps {
				if p.Pos.Line <= 0 {
					t.Errorf("problem without a line: %v", p)
				}
			}
			checkGolden(t, strings.TrimSuffix(f, ".toml")+".golden", err.Error()+"\n")
		})
	}
}

// TestGoldenHaveInput keeps testdata/bad free of golden files nothing reads.
func TestGoldenHaveInput(t *testing.T) {
	goldens, _ := filepath.Glob("../testdata/bad/*.golden")
	for _, g := range goldens {
		if _, err := os.Stat(strings.TrimSuffix(g, ".golden") + ".toml"); err != nil {
			t.Errorf("%s has no .toml input", g)
		}
	}
}

// checkGolden compares got with the golden file (go test -update rewrites it).
func checkGolden(t *testing.T, file, got string) {
	t.Helper()
	golden.Check(t, file, []byte(got))
}

// TestDecodeContract reads the catalog format's own example part and checks
// each figure in SI units, converted by hand from the text.
func TestDecodeContract(t *testing.T) {
	data, err := os.ReadFile("../testdata/catalog/contract.toml")
	if err != nil {
		t.Fatal(err)
	}
	parts, err := Decode("contract.toml", data)
	if err != nil {
		t.Fatal(err)
	}
	if len(parts) != 2 {
		t.Fatalf("got %d parts, want 2", len(parts))
	}
	p := parts[0]
	checks := []struct {
		name string
		got  Opt
		want float64
	}{
		{"unit_cost", p.UnitCost, 0.19},
		{"temp low", p.Temp[0], -40},
		{"temp high", p.Temp[1], 85},
		{"supply min", p.Supply.Min, 3.3},
		{"supply max", p.Supply.Max, 29},
		{"input_cm low", p.InputCM.Low, 0},
		{"input_cm high", p.InputCM.High, -1.6},
		{"output low", p.Output.Low, 0.04},
		{"output high", p.Output.High, -1.45},
		{"output load", p.Output.Load, 10e3},
		{"gbw typ", p.GBW.Typ, 0.9e6},
		{"gbw min", p.GBW.Min, 0.55e6},
		{"slew typ", p.Slew.Typ, 0.38e6}, // 0.38 V/µs = 0.38 V / 1e-6 s
		{"aol typ", p.Aol.Typ, 96},
		{"aol min", p.Aol.Min, 85},
		{"vos typ", p.Vos.Typ, 1.7e-3},
		{"vos max", p.Vos.Max, 5.9e-3},
		{"vos max_ot", p.Vos.MaxOT, 7.7e-3},
		{"vos_drift typ", p.VosDrift.Typ, 6.5e-6},
		{"ib typ", p.Ib.Typ, 23e-9},
		{"ib max", p.Ib.Max, 205e-9},
		{"ios typ", p.Ios.Typ, 2.6e-9},
		{"ios max", p.Ios.Max, 41e-9},
		{"en typ", p.En.Typ, 38e-9},
		{"in typ", p.In.Typ, 0.09e-12},
		{"iq typ", p.Iq.Typ, 0.31e-3},
		{"iq max", p.Iq.Max, 0.52e-3},
		{"iout typ", p.Iout.Typ, 27e-3},
		{"iout min", p.Iout.Min, 12e-3},
		{"vdiff_max", p.VdiffMax, 29},
		{"cload", p.CLoad, 120e-12},
		{"cin", p.Cin, 3.4e-12},
		{"[part.ib] typ", parts[1].Ib.Typ, 0.8e-12},
		{"[part.ib] max", parts[1].Ib.Max, 11e-12},
	}
	for _, c := range checks {
		t.Run(c.name, func(t *testing.T) {
			if !c.got.Known() {
				t.Fatal("not set")
			}
			assertNear(t, c.got.V(), c.want, 1e-12)
		})
	}
	if p.ID != "xq4-bip" || p.Tech != TechBipolar || p.Channels != 4 || p.Pinout != "quad-a" ||
		p.Lifecycle != LifecycleActive || strings.Join(p.Packages, ",") != "dip14,soic14" ||
		p.Slew.Source != SourceGraph || p.Datasheet == "" || p.Notes != "..." {
		t.Errorf("identity fields wrong: %+v", p)
	}
	if p.Aol.Max.Known() || p.GBW.Max.Known() || p.Slew.Min.Known() {
		t.Error("figures not in the file are set")
	}
	if parts[1].Lifecycle != LifecycleActive {
		t.Errorf("lifecycle defaults to %q, want active", parts[1].Lifecycle)
	}
	// Line numbers as written in the file.
	lines := []struct {
		part int
		key  string
		want int
	}{
		{0, "", 3}, {0, "id", 4}, {0, "slew", 17}, {0, "cin", 29}, {0, "notes", 31},
		{1, "", 33}, {1, "slew", 43}, {1, "ib", 45},
	}
	for _, l := range lines {
		got := parts[l.part].Pos.Line
		if l.key != "" {
			got = KeyLine(data, got, l.key)
		}
		if got != l.want {
			t.Errorf("part %d key %q at line %d, want %d", l.part, l.key, got, l.want)
		}
	}
}

func TestScanLines(t *testing.T) {
	text := `top = 1
[[part]]
id = "a"   # [[part]] in a comment
notes = """
[[part]]
slew = "inside a string"
"""
aol = {
  typ = "100 dB",
}
"quoted".x = 1
slew.typ = "1 V/us"
[part.gbw]
typ = "1 MHz"
[[ "part" ]]
id = 'b'
`
	fl := scanLines(text)
	if fl.top["top"] != 1 {
		t.Errorf("top key at %d, want 1", fl.top["top"])
	}
	if len(fl.parts) != 2 {
		t.Fatalf("found %d parts, want 2", len(fl.parts))
	}
	want := map[string]int{"id": 3, "notes": 4, "aol": 8, "quoted": 11, "slew": 12, "gbw": 13}
	for k, w := range want {
		if g := fl.parts[0].keys[k]; g != w {
			t.Errorf("key %q at line %d, want %d", k, g, w)
		}
	}
	if _, ok := fl.parts[0].keys["typ"]; ok {
		t.Error("a key inside a table was taken for a part key")
	}
	if fl.parts[1].line != 15 || fl.parts[1].keys["id"] != 16 {
		t.Errorf("second part at %d, id at %d; want 15, 16", fl.parts[1].line, fl.parts[1].keys["id"])
	}
}

func TestSuggest(t *testing.T) {
	tests := []struct {
		got, want string
	}{
		{"slewrate", "slew"},
		{"slw", "slew"},
		{"gwb", "gbw"},
		{"vos_drft", "vos_drift"},
		{"input", "input_cm"},
		{"packagse", "packages"},
		{"CMOS", "cmos"},
		{"zzzzzz", ""},
	}
	known := append(append([]string{}, partKeys...), techs...)
	for _, tc := range tests {
		t.Run(tc.got, func(t *testing.T) {
			if s := suggest(tc.got, known); s != tc.want {
				t.Errorf("suggest(%q) = %q, want %q", tc.got, s, tc.want)
			}
		})
	}
}

func TestEditDistance(t *testing.T) {
	// Worked examples of edit distance (from memory: the classic kitten →
	// sitting needs 3 edits; "ca" → "abc" is 3 in the optimal-string-
	// alignment variant, which may not edit a swapped pair again).
	tests := []struct {
		a, b string
		want int
	}{{"kitten", "sitting", 3}, {"", "abc", 3}, {"flaw", "lawn", 2}, {"same", "same", 0}, {"µa", "ua", 1},
		{"tpy", "typ", 1}, {"ca", "abc", 3}}
	for _, tc := range tests {
		t.Run(tc.a+"/"+tc.b, func(t *testing.T) {
			if d := EditDistance(tc.a, tc.b); d != tc.want {
				t.Errorf("got %d, want %d", d, tc.want)
			}
		})
	}
}

func TestProblemRender(t *testing.T) {
	tests := []struct {
		name string
		p    Problem
		want string
	}{
		{"full", Problem{Pos{"a.toml", 7}, "xq4", 1, "slew", errors.New("bad")}, `a.toml:7: part "xq4": field "slew": bad`},
		{"no id", Problem{Pos{"a.toml", 7}, "", 3, "id", errors.New("missing")}, `a.toml:7: part #3: field "id": missing`},
		{"file only", Problem{Pos: Pos{File: "a.toml"}, Err: errors.New("cannot read")}, `a.toml: cannot read`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.p.Error(); got != tc.want {
				t.Errorf("got %s, want %s", got, tc.want)
			}
		})
	}
}

func TestProblemsUnwrapFindsUnitError(t *testing.T) {
	_, err := Decode("x.toml", []byte("[[part]]\nid = \"a\"\nslew = { typ = \"1 MHz\" }\n"))
	var ue *UnitError
	if !errors.As(err, &ue) || ue.Want != VoltPerSecond {
		t.Fatalf("errors.As found no slew-rate *UnitError in %v", err)
	}
}

// FuzzDecode feeds arbitrary bytes to the decoder: it must never panic,
// every failure must be a Problems with a message, and every part it
// accepts must pass Validate again.
func FuzzDecode(f *testing.F) {
	seeds, _ := filepath.Glob("../testdata/*/*.toml")
	for _, s := range seeds {
		if b, err := os.ReadFile(s); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte("[[part]]\nid = \"a\"\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		parts, err := Decode("fuzz.toml", data)
		if err != nil {
			var ps Problems
			if !errors.As(err, &ps) || len(ps) == 0 {
				t.Fatalf("error %T %v is not a non-empty Problems", err, err)
			}
			for _, p := range ps {
				if p.Err == nil || p.Error() == "" {
					t.Fatalf("empty problem %#v", p)
				}
			}
		}
		for _, p := range parts {
			if ps := validate(p, 0, nil); len(ps) > 0 {
				t.Fatalf("accepted part fails Validate: %v", ps)
			}
		}
		// Pieces of one and two parts read a file exactly as one piece does.
		text := string(data)
		if Prescan(text) != nil {
			return
		}
		lines, plain := scanHeaders(text)
		if !plain {
			lines = scanLines(text)
		}
		want, _, _ := decodeText("fuzz.toml", text, scanLines(text))
		for _, per := range []int{1, 2} {
			if got, ok := decodeInPieces("fuzz.toml", text, lines, per, 2, nil); ok && !reflect.DeepEqual(got, want) {
				t.Fatalf("pieces of %d: %d parts, one piece: %d, or they differ", per, len(got), len(want))
			}
		}
	})
}

// TestDecodeLinesPastStrings checks that problems after multi-line strings
// (which hold header-like lines) and arrays holding such strings point at
// the right lines; the lines are counted by hand from the text.
func TestDecodeLinesPastStrings(t *testing.T) {
	text := `[[part]]
id = "a"
notes = """
quoted: \"""
[[part]]
id = "fake"
"""
packages = ["soic8", """
[[part]]""", '''
[[part]]''']
slewx = "1 V/us"
[[part]]
id = "b"
datasheet = '''
[[part]]
'''
gbww = "1 MHz"
`
	_, err := Decode("c.toml", []byte(text))
	var probs Problems
	if !errors.As(err, &probs) {
		t.Fatalf("got %v, want problems", err)
	}
	want := map[string]int{"slewx": 11, "gbww": 17}
	for _, p := range probs {
		if w, ok := want[p.Field]; ok {
			if p.Pos.Line != w {
				t.Errorf("%s: line %d, want %d", p.Field, p.Pos.Line, w)
			}
			delete(want, p.Field)
		}
	}
	for f := range want {
		t.Errorf("no problem reported for %s in %v", f, probs)
	}
}
