package plot

import (
	"math"
	"path/filepath"
	"strings"
	"testing"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/internal/golden"
)

// checkGolden compares got (and a final newline) with testdata/name; go
// test -update rewrites it.
func checkGolden(t *testing.T, name, got string) {
	t.Helper()
	golden.Check(t, filepath.Join("testdata", name), []byte(got+"\n"))
}

// waves are two periods of a 20 kHz, 5 V sine about 6 V (the ideal) and
// the triangle a slew-limited amp makes of it (3.5 V peak), 100 µs.
func waves() (sine, tri Series) {
	var x, y, z []float64
	for i := 0; i <= 400; i++ {
		t := float64(i) * 100e-6 / 400
		ph := 2 * math.Pi * 20e3 * t
		x = append(x, t)
		y = append(y, 6+5*math.Sin(ph))
		z = append(z, 6+3.5*2/math.Pi*math.Asin(math.Sin(ph)))
	}
	return Series{Name: "ideal", X: x, Y: y, Mark: Marker}, Series{Name: "out", X: x, Y: z}
}

// checkBlock: the block is exactly height lines of at most width runes.
func checkBlock(t *testing.T, got string, width, height int) {
	t.Helper()
	lines := strings.Split(got, "\n")
	if len(lines) != height {
		t.Errorf("%d lines, want %d:\n%s", len(lines), height, got)
	}
	for i, l := range lines {
		if n := len([]rune(l)); n > width {
			t.Errorf("line %d is %d runes, want ≤ %d: %q", i, n, width, l)
		}
	}
}

func TestGolden(t *testing.T) {
	sine, tri := waves()
	opts := Options{XDim: catalog.Second, YDim: catalog.Volt}
	for _, tc := range []struct {
		name          string
		width, height int
		series        []Series
	}{
		{"sine_60x12", 60, 12, []Series{{Name: "sine", X: sine.X, Y: sine.Y}}},
		{"sine_40x8", 40, 8, []Series{{Name: "sine", X: sine.X, Y: sine.Y}}},
		{"triangle_60x12", 60, 12, []Series{{Name: "triangle", X: tri.X, Y: tri.Y, Mark: Dotted}}},
		{"triangle_40x8", 40, 8, []Series{{Name: "triangle", X: tri.X, Y: tri.Y, Mark: Dotted}}},
		{"overlay_60x12", 60, 12, []Series{tri, sine}},
		{"overlay_40x8", 40, 8, []Series{tri, sine}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := Render(tc.width, tc.height, tc.series, opts)
			checkBlock(t, got, tc.width, tc.height)
			checkGolden(t, tc.name+".golden", got)
		})
	}
}

// TestAxes: the labels are the data's ends in engineering units.
func TestAxes(t *testing.T) {
	sine, _ := waves()
	got := Render(60, 12, []Series{sine}, Options{XDim: catalog.Second, YDim: catalog.Volt})
	for _, want := range []string{"11 V ┤", "1 V ┤", "6 V ┤", "0 s", "50 µs", "100 µs", "· ·  ideal", "└───"} {
		if !strings.Contains(got, want) {
			t.Errorf("plot lacks %q:\n%s", want, got)
		}
	}
}

// TestShapes: a rising ramp fills the bottom-left and top-right cells, a
// Solid line leaves no gap in any column, and Dotted sets fewer dots.
func TestShapes(t *testing.T) {
	ramp := Series{X: []float64{0, 1}, Y: []float64{0, 1}}
	got := strings.Split(Render(12, 6, []Series{ramp}, Options{NoLegend: true}), "\n")
	plotStart := func(line string) []rune { // the cells after the axis
		r := []rune(line)
		for i, c := range r {
			if c == '┤' || c == '│' {
				return r[i+1:]
			}
		}
		return nil
	}
	top, bottom := plotStart(got[0]), plotStart(got[3])
	if len(top) == 0 || top[len(top)-1] == ' ' || len(bottom) == 0 || bottom[0] == ' ' || top[0] != ' ' {
		t.Errorf("ramp from bottom-left to top-right drawn as:\n%s", strings.Join(got, "\n"))
	}
	dots := func(s string) int {
		n := 0
		for _, r := range s {
			if r >= brailleBase && r <= brailleBase+0xff {
				for b := r - brailleBase; b != 0; b &= b - 1 {
					n++
				}
			}
		}
		return n
	}
	sine, _ := waves()
	sine.Mark = Solid
	solid := Render(40, 10, []Series{sine}, Options{NoLegend: true})
	sine.Mark = Dotted
	dot := Render(40, 10, []Series{sine}, Options{NoLegend: true})
	if ds, dd := dots(solid), dots(dot); !(dd < ds/2) {
		t.Errorf("dotted has %d dots, solid %d: want dotted sparser than half", dd, ds)
	}
	// Every column of the solid plot has at least one dot.
	rows := strings.Split(solid, "\n")[:8]
	start := strings.IndexRune(rows[0], '┤')
	for c := 0; c < 40-len([]rune(rows[0][:start]))-1; c++ {
		any := false
		for _, r := range rows {
			rr := []rune(r)
			k := len([]rune(r[:start])) + 1 + c
			if k < len(rr) && rr[k] != ' ' {
				any = true
			}
		}
		if !any {
			t.Errorf("solid sine: column %d has no dot:\n%s", c, solid)
			break
		}
	}
}

// TestDegenerate: no input makes it panic, and each gives a block that fits.
func TestDegenerate(t *testing.T) {
	nan := math.NaN()
	flat := Series{Name: "flat", X: []float64{0, 1, 2}, Y: []float64{3, 3, 3}}
	tests := []struct {
		name          string
		width, height int
		series        []Series
		want          string
	}{
		{"no series", 40, 8, nil, "no data to plot"},
		{"empty series", 40, 8, []Series{{Name: "e"}}, "no data to plot"},
		{"all NaN", 40, 8, []Series{{X: []float64{nan, 1}, Y: []float64{1, nan}}}, "no data to plot"},
		{"infinities", 40, 8, []Series{{X: []float64{0, 1}, Y: []float64{math.Inf(1), math.Inf(-1)}}}, "no data to plot"},
		{"flat", 40, 8, []Series{flat}, "3.3 V"},
		{"flat zero", 40, 8, []Series{{X: []float64{0, 1}, Y: []float64{0, 0}}}, "1 V"},
		{"single point", 40, 8, []Series{{X: []float64{5}, Y: []float64{1}}}, "1.1 V"},
		{"NaN gap", 40, 8, []Series{{X: []float64{0, 1, 2, 3}, Y: []float64{0, nan, 1, 2}}}, "2 V"},
		{"uneven lengths", 40, 8, []Series{{X: []float64{0, 1, 2}, Y: []float64{0, 1}}}, "1 V"},
		{"tiny", 5, 2, []Series{flat}, "plot"},
		{"zero size", 0, 0, []Series{flat}, ""},
		{"one line", 40, 1, []Series{flat}, "plot area too small"},
		{"fixed range", 40, 8, []Series{flat}, "10 V"},
		{"fixed x range", 40, 8, []Series{flat}, "1.5 s"},
		{"bad fixed range", 40, 8, []Series{flat}, "3.3 V"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			o := Options{YDim: catalog.Volt, XDim: catalog.Second}
			switch tc.name {
			case "fixed range":
				o.YMin, o.YMax = -10, 10
			case "fixed x range":
				o.XMin, o.XMax = -1, 4 // the flat series spans 0 … 2 s; the middle label is 1.5 s
			case "bad fixed range":
				o.YMin, o.YMax = math.Inf(-1), math.NaN()
			}
			got := Render(tc.width, tc.height, tc.series, o)
			if !strings.Contains(got, tc.want) {
				t.Errorf("got\n%s\nwant it to contain %q", got, tc.want)
			}
			for _, l := range strings.Split(got, "\n") {
				if n := len([]rune(l)); n > tc.width {
					t.Errorf("line %q is %d runes, want ≤ %d", l, n, tc.width)
				}
			}
		})
	}
}

// TestStyle: the style wraps the series' cells and legend sample only.
func TestStyle(t *testing.T) {
	sine, tri := waves()
	tri.Style = func(s string) string { return "<" + s + ">" }
	got := Render(40, 8, []Series{tri, sine}, Options{})
	if !strings.Contains(got, "<⠒⠒⠒⠒> out") {
		t.Errorf("legend sample not styled:\n%s", got)
	}
	plain := Render(40, 8, []Series{{Name: tri.Name, X: tri.X, Y: tri.Y}, sine}, Options{})
	strip := strings.NewReplacer("<", "", ">", "").Replace(got)
	if strip != plain {
		t.Errorf("styled plot minus the style differs from the plain one:\n%s\n%s", strip, plain)
	}
}

// BenchmarkRender is a 2000-point waveform and its ideal at 80×16, the
// size of the preview command's plot.
func BenchmarkRender(b *testing.B) {
	var x, y, z []float64
	for i := 0; i < 2000; i++ {
		t := float64(i) / 2000
		x = append(x, t)
		y = append(y, math.Sin(10*math.Pi*t))
		z = append(z, 0.8*math.Sin(10*math.Pi*t))
	}
	s := []Series{{Name: "out", X: x, Y: z}, {Name: "ideal", X: x, Y: y, Mark: Marker}}
	for b.Loop() {
		_ = Render(80, 16, s, Options{XDim: catalog.Second, YDim: catalog.Volt})
	}
}
