package catalog

import (
	"bytes"
	"fmt"
	"io/fs"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/opsift/opsift/data"
)

// withoutPlaces returns copies of parts with Pos and Lines cleared, which
// depend on the file rather than the part.
func withoutPlaces(parts []*Part) []Part {
	out := make([]Part, len(parts))
	for i, p := range parts {
		out[i] = *p
		out[i].Pos, out[i].Lines = Pos{}, nil
	}
	return out
}

// roundTrip encodes parts and decodes the result.
func roundTrip(t *testing.T, parts []*Part) []*Part {
	t.Helper()
	var buf bytes.Buffer
	if err := Encode(&buf, parts); err != nil {
		t.Fatal(err)
	}
	back, err := Decode("encoded.toml", buf.Bytes())
	if err != nil {
		t.Fatalf("encoded catalog does not decode: %v\n%s", err, buf.String())
	}
	return back
}

func TestEncodeRoundTrip(t *testing.T) {
	var sets []struct {
		name  string
		parts []*Part
	}
	b, err := os.ReadFile("../testdata/catalog/contract.toml")
	if err != nil {
		t.Fatal(err)
	}
	contract, err := Decode("contract.toml", b)
	if err != nil {
		t.Fatal(err)
	}
	sets = append(sets, struct {
		name  string
		parts []*Part
	}{"contract", contract})
	names, _ := fs.Glob(data.Catalog, "*.toml")
	for _, n := range names {
		b, err := fs.ReadFile(data.Catalog, n)
		if err != nil {
			t.Fatal(err)
		}
		ps, err := Decode(n, b)
		if err != nil {
			t.Fatalf("demo catalog %s: %v", n, err)
		}
		sets = append(sets, struct {
			name  string
			parts []*Part
		}{"demo/" + n, ps})
	}
	sets = append(sets, struct {
		name  string
		parts []*Part
	}{"synthetic", synthParts(200, 1)})
	for _, s := range sets {
		t.Run(s.name, func(t *testing.T) {
			back := roundTrip(t, s.parts)
			if got, want := withoutPlaces(back), withoutPlaces(s.parts); !reflect.DeepEqual(got, want) {
				for i := range want {
					if i < len(got) && !reflect.DeepEqual(got[i], want[i]) {
						t.Fatalf("part %d changed:\n got %+v\nwant %+v", i, got[i], want[i])
					}
				}
				t.Fatalf("got %d parts, want %d", len(got), len(want))
			}
		})
	}
}

func TestEncodeText(t *testing.T) {
	p := &Part{ID: "ab-1", Name: `Quote " and \ backslash`, Tech: TechCMOS, Channels: 1,
		Packages: []string{"sot23-5"}, Lifecycle: LifecycleActive, UnitCost: Some(0.25),
		Supply: Span{Some(1.8), Some(5.5)}, GBW: Spec{Typ: Some(10e6), Min: Some(7e5)},
		Slew: Spec{Typ: Some(0.5e6), Source: SourceGraph}, CLoad: Some(100e-12)}
	var buf bytes.Buffer
	if err := Encode(&buf, []*Part{p}); err != nil {
		t.Fatal(err)
	}
	want := `[[part]]
id = "ab-1"
name = "Quote \" and \\ backslash"
tech = "cmos"
channels = 1
packages = ["sot23-5"]
lifecycle = "active"
unit_cost = 0.25
supply = { min = "1.8 V", max = "5.5 V" }
gbw = { typ = "10 MHz", min = "700 kHz" }
slew = { typ = "0.5 V/us", source = "graph" }
cload = "100 pF"
`
	if got := buf.String(); got != want {
		t.Errorf("got\n%s\nwant\n%s", got, want)
	}
}

func TestExact(t *testing.T) {
	tests := []struct {
		v    float64
		dim  Dim
		want string
	}{
		{0.5e6, VoltPerSecond, "0.5 V/us"},
		{13823, VoltPerSecond, "0.013823 V/us"},
		{1234567.891, VoltPerSecond, "1234567.891 V/s"}, // more than six figures: plain SI
		{0.009, Volt, "9 mV"},
		{0.009000000000000001, Volt, "0.009000000000000001 V"}, // one step above 0.009: no short prefixed text
		{250e-9, Ampere, "250 nA"},
		{7e-3, Volt, "7 mV"},
		{10e3, Ohm, "10 kOhm"},
		{35e-9, VoltNoise, "35 nV/rtHz"},
		{7e-6, VoltPerKelvin, "7 uV/K"},
		{-40, Celsius, "-40 C"},
		{100, Decibel, "100 dB"},
		{0, Volt, "0 V"},
		{-1.5, Volt, "-1.5 V"},
		{0.05, Ratio, "0.05"},
	}
	for _, tc := range tests {
		t.Run(tc.want, func(t *testing.T) {
			if got := Exact(tc.v, tc.dim); got != tc.want {
				t.Errorf("Exact(%g) = %q, want %q", tc.v, got, tc.want)
			}
		})
	}
}

// TestExactReadsBack checks Exact against Parse on random values spread
// over 40 decades in every dimension a catalog uses.
func TestExactReadsBack(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for _, d := range []Dim{Volt, Ampere, Hertz, VoltPerSecond, Ohm, Second, Farad, Celsius,
		Decibel, Ratio, VoltNoise, CurrentNoise, VoltPerKelvin, Dimensionless} {
		for range 2000 {
			v := math.Pow(10, r.Float64()*40-20) * (r.Float64() + 0.5)
			if r.IntN(2) == 0 {
				v = -v
			}
			s := Exact(v, d)
			got, err := Parse(s, d)
			if err != nil || got != v {
				t.Fatalf("Exact(%v, %v) = %q reads back as %v, %v", v, d, s, got, err)
			}
		}
	}
}

// synthParts makes n valid parts with varied, awkward figures.
func synthParts(n int, seed uint64) []*Part {
	r := rand.New(rand.NewPCG(seed, seed+1))
	techs := []Tech{TechBipolar, TechCMOS, TechJFET, TechBiCMOS}
	var parts []*Part
	for i := range n {
		gbw := math.Pow(10, 4+r.Float64()*4)
		slew := gbw * (0.1 + r.Float64())
		vos := math.Pow(10, -6+r.Float64()*3)
		p := &Part{
			ID: fmt.Sprintf("syn-%05d", i), Name: fmt.Sprintf("Synthetic part %d, \"quoted\" ±", i),
			Tech: techs[i%4], Channels: 1 << (i % 3), Packages: []string{"soic8", "msop8"}[:1+i%2],
			Pinout: "dual-a", Lifecycle: []Lifecycle{LifecycleActive, LifecycleNRND, LifecycleObsolete}[i%3],
			UnitCost: Some(r.Float64() * 3), Temp: [2]Opt{Some(-40), Some(85 + float64(i%3)*20)},
			Supply:   Span{Some(1.8 + r.Float64()), Some(5.5 + r.Float64()*30)},
			InputCM:  Headroom{Low: Some(-0.1 * r.Float64()), High: Some(-1.5 * r.Float64())},
			Output:   Swing{Low: Some(0.05 * r.Float64()), High: Some(-0.05 * r.Float64()), Load: Some(2e3 + r.Float64()*1e4)},
			GBW:      Spec{Typ: Some(gbw), Min: Some(gbw * 0.7), MinOT: Some(gbw * 0.6)},
			Slew:     Spec{Typ: Some(slew), Source: SourceGraph},
			Aol:      Spec{Typ: Some(90 + r.Float64()*30)},
			Vos:      Spec{Typ: Some(vos), Max: Some(vos * 3), MaxOT: Some(vos * 4)},
			Ib:       Spec{Typ: Some(1e-12 * (1 + r.Float64())), Max: Some(1e-9), Source: SourceEstimate},
			En:       Spec{Typ: Some(1e-9 * (5 + r.Float64()*50))},
			Iq:       Spec{Typ: Some(1e-4 * (1 + r.Float64())), Max: Some(1e-3)},
			Iout:     Spec{Typ: Some(0.02 + r.Float64()*0.03)},
			VdiffMax: Some(0.7 + r.Float64()*30), CLoad: Some(1e-10 * (1 + r.Float64())),
			Cin: Some(1e-12 * (1 + 5*r.Float64())), Notes: "line one\nline two\ttab",
		}
		parts = append(parts, p)
	}
	return parts
}

func TestSynthPartsValid(t *testing.T) {
	for _, p := range synthParts(100, 3) {
		if ps := validate(p, 0, nil); len(ps) > 0 {
			t.Fatalf("synthetic part invalid: %v", ps)
		}
	}
}

// writeSynth writes an n-part catalog file and returns its path.
func writeSynth(tb testing.TB, n int) string {
	tb.Helper()
	var buf bytes.Buffer
	if err := Encode(&buf, synthParts(n, 7)); err != nil {
		tb.Fatal(err)
	}
	f := filepath.Join(tb.TempDir(), "synth.toml")
	if err := os.WriteFile(f, buf.Bytes(), 0o644); err != nil {
		tb.Fatal(err)
	}
	return f
}

// writeSynthDir writes an n-part catalog as files of at most perFile parts
// in a directory (one file of 10k parts is past the 4 MiB cap) and returns
// the directory.
func writeSynthDir(tb testing.TB, n, perFile int) string {
	tb.Helper()
	dir := tb.TempDir()
	parts := synthParts(n, 7)
	for i := 0; i < len(parts); i += perFile {
		var buf bytes.Buffer
		if err := Encode(&buf, parts[i:min(i+perFile, len(parts))]); err != nil {
			tb.Fatal(err)
		}
		f := filepath.Join(dir, fmt.Sprintf("synth-%03d.toml", i/perFile))
		if err := os.WriteFile(f, buf.Bytes(), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	return dir
}

func BenchmarkLoad(b *testing.B) {
	for _, n := range []int{1000, 10000} {
		f := writeSynthDir(b, n, 2500)
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				c, err := Load(PathLayer(f))
				if err != nil || len(c.Parts) != n {
					b.Fatalf("%d parts, %v", len(c.Parts), err)
				}
			}
		})
	}
}

func BenchmarkEncode10k(b *testing.B) {
	parts := synthParts(10000, 7)
	b.ReportAllocs()
	for b.Loop() {
		var buf bytes.Buffer
		if err := Encode(&buf, parts); err != nil {
			b.Fatal(err)
		}
	}
}
