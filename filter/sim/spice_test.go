package sim

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"github.com/opsift/opsift/internal/golden"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"testing"
	"time"
)

// Agreement wanted between the Go model and ngspice running the same
// macromodel, and the drift allowed between the stored ngspice results and
// a live run. The issue asks for 2 %; the two integrators agree to about
// 1e-4, so 0.1 % is asked, which also catches regressions 2 % would let by.
const (
	spiceAgree      = 1e-3
	spiceAgreeFloor = 1e-3 // absolute, for slewing fractions near 0
	spiceDrift      = 1e-4
	spiceDriftFloor = 1e-5
)

type spiceCase struct {
	name string
	c    Circuit
	amp  Amp
	in   Input
}

// spiceCases span frequencies below and above full-power bandwidth
// (fp = SR/(2π·Vp) at the output) and slew rates from 0.5 to 1000 V/µs.
func spiceCases() []spiceCase {
	slow := Amp{Aol: 1e5, GBW: 1e6, SlewRise: 0.5e6, VOL: -5, VOH: 5}
	mid := Amp{Aol: 3e5, GBW: 10e6, SlewRise: 5e6, VOL: -10, VOH: 10}
	fast50 := Amp{Aol: 1e5, GBW: 20e6, SlewRise: 50e6, VOL: -5, VOH: 5}
	fast := Amp{Aol: 1e5, GBW: 200e6, SlewRise: 1000e6, VOL: -6, VOH: 6}
	single := Amp{Aol: 2e5, GBW: 5e6, SlewRise: 2e6, SlewFall: 1e6, VOL: 0.05, VOH: 4.9}
	sine := func(vp, f float64) Input { return Input{Shape: Sine, Peak: vp, Freq: f} }
	osc := Relaxation{R: 10e3, C: 1.517e-9, R1: 10e3, R2: 10e3}
	return []spiceCase{
		{"follower-sr0.5-f50k", Follower{}, slow, sine(1, 50e3)},                         // 0.63 fp
		{"follower-sr0.5-f120k", Follower{}, slow, sine(1, 120e3)},                       // 1.5 fp
		{"follower-sr0.5-f500k", Follower{}, slow, sine(1, 500e3)},                       // 6.3 fp, triangle
		{"noninv-g10-sr5-f100k", NonInverting{Rf: 9e3, Rg: 1e3}, mid, sine(0.5, 100e3)},  // 0.63 fp
		{"noninv-g10-sr5-f300k", NonInverting{Rf: 9e3, Rg: 1e3}, mid, sine(0.5, 300e3)},  // 1.9 fp
		{"follower-sr50-f1M", Follower{}, fast50, sine(5, 1e6)},                          // 0.63 fp
		{"follower-sr50-f3M", Follower{}, fast50, sine(5, 3e6)},                          // 1.9 fp
		{"noninv-g2-sr1000-f20M", NonInverting{Rf: 1e3, Rg: 1e3}, fast, sine(2.5, 20e6)}, // 0.63 fp
		{"noninv-g2-sr1000-f60M", NonInverting{Rf: 1e3, Rg: 1e3}, fast, sine(2.5, 60e6)}, // 1.9 fp
		{"inverting-clip-sr0.5", Inverting{Rf: 20e3, Rin: 10e3}, slow, sine(3.5, 2e3)},   // clips at ±5 V
		{"follower-single-asym", Follower{}, single, Input{Shape: Sine, Peak: 1.5, Freq: 300e3, Offset: 2.5}},
		{"sallenkey-sr0.5", SallenKeyLowPass{R1: 10e3, R2: 10e3, C1: 2.25e-9, C2: 1.125e-9}, slow, sine(2, 8e3)},
		{"relax-sr0.5", osc, slow, Input{}},
		{"relax-sr5", osc, Amp{Aol: 1e5, GBW: 10e6, SlewRise: 5e6, VOL: -5, VOH: 5}, Input{}},
		{"relax-sr1000", osc, Amp{Aol: 1e5, GBW: 100e6, SlewRise: 1000e6, VOL: -5, VOH: 5}, Input{}},
		// GBW-limited: fast slew, 1 MHz; the regeneration after each switch
		// sets the period (ideal 45.51 kHz).
		{"relax-gbw1M-sr1000", Relaxation{R: 10e3, C: 1e-9, R1: 10e3, R2: 10e3},
			Amp{Aol: 1e5, GBW: 1e6, SlewRise: 1000e6, VOL: -5, VOH: 5}, Input{}},
		// The clock of data/designs/pickup-counter-6v.toml (R 33 kΩ, C 10 nF,
		// R1 10 kΩ, R2 27 kΩ, β = 10/37, ±6 V levels) at its derived gbw
		// requirement for freq_error 5 %: it should run at 0.95·f0.
		{"relax-demo-clock", Relaxation{R: 33e3, C: 10e-9, R1: 10e3, R2: 27e3},
			Amp{Aol: 1e5, GBW: 410338.54, SlewRise: 1000e6, VOL: -6, VOH: 6}, Input{}},
		// The same clock at both derived limits, gbw and slew (1.2464 V/µs),
		// each of which alone spends freq_error 5 %: the two period
		// lengthenings overlap, so it runs slower than 0.95·f0 but not twice
		// as far off.
		{"relax-demo-clock-both", Relaxation{R: 33e3, C: 10e-9, R1: 10e3, R2: 27e3},
			Amp{Aol: 1e5, GBW: 410338.54, SlewRise: 1246429.21, VOL: -6, VOH: 6}, Input{}},
	}
}

// spiceStored is a results file under testdata/ngspice.
type spiceStored struct {
	Case      string        `json:"case"`
	Simulator string        `json:"simulator"`
	Measured  spiceMeasured `json:"measured"`
}

// initialState is the state Run starts the case from.
func initialState(t *testing.T, c Circuit, a Amp, in Input) vec {
	t.Helper()
	ap, err := a.params()
	if err != nil {
		t.Fatal(err)
	}
	st, err := c.stage(&ap)
	if err != nil {
		t.Fatal(err)
	}
	if st.kind == kindOscillator {
		return st.osc.init
	}
	src := newSource(in, 0)
	y, err := st.start(&ap, &src)
	if err != nil {
		t.Fatal(err)
	}
	return y
}

// TestNgspice compares the Go model with ngspice running the same
// behavioural macromodel (an independent integrator: variable-step Gear).
// Stored ngspice results make it run anywhere; with ngspice on PATH it
// re-runs ngspice and fails on drift; -update rewrites the stored files.
func TestNgspice(t *testing.T) {
	_, errLook := exec.LookPath("ngspice")
	live := errLook == nil
	if golden.Update() && !live {
		t.Fatal("-update needs ngspice on PATH")
	}
	dir := filepath.Join("testdata", "ngspice")
	for _, tc := range spiceCases() {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			deck, err := spiceNetlist(tc.name, tc.c, tc.amp, tc.in, initialState(t, tc.c, tc.amp, tc.in))
			if err != nil {
				t.Fatal(err)
			}
			cirPath := filepath.Join(dir, tc.name+".cir")
			resPath := filepath.Join(dir, tc.name+".json")
			var stored spiceStored
			if !golden.Update() {
				old, err := os.ReadFile(cirPath)
				if err != nil {
					t.Fatalf("%v (run go test -update with ngspice installed)", err)
				}
				if string(old) != deck.text {
					t.Fatalf("%s differs from the netlist the case generates; run go test -update with ngspice installed", cirPath)
				}
				raw, err := os.ReadFile(resPath)
				if err != nil {
					t.Fatal(err)
				}
				if err := json.Unmarshal(raw, &stored); err != nil {
					t.Fatalf("%s: %v", resPath, err)
				}
			}
			if live {
				got, sim, err := runSpice(t, deck)
				if err != nil {
					t.Fatal(err)
				}
				if golden.Update() {
					stored = spiceStored{Case: tc.name, Simulator: sim, Measured: got}
					writeStored(t, cirPath, resPath, deck.text, stored)
				} else {
					checkClose(t, "live ngspice output_pp vs stored", got.OutputPP, stored.Measured.OutputPP, spiceDrift, 0)
					checkClose(t, "live ngspice slewing_fraction vs stored", got.SlewingFraction, stored.Measured.SlewingFraction, spiceDrift, spiceDriftFloor)
					if stored.Measured.Frequency != nil && got.Frequency != nil {
						checkClose(t, "live ngspice frequency vs stored", *got.Frequency, *stored.Measured.Frequency, spiceDrift, 0)
					}
				}
			}
			w, err := Run(tc.c, tc.amp, tc.in, Options{})
			if err != nil {
				t.Fatal(err)
			}
			want := stored.Measured
			t.Logf("%s: output_pp go %.6g ngspice %.6g (%+.2g %%); slewing_fraction go %.6g ngspice %.6g",
				tc.name, w.Metrics.OutputPP, want.OutputPP, 100*(w.Metrics.OutputPP/want.OutputPP-1),
				w.Metrics.SlewingFraction, want.SlewingFraction)
			checkClose(t, "output_pp", w.Metrics.OutputPP, want.OutputPP, spiceAgree, 0)
			checkClose(t, "slewing_fraction", w.Metrics.SlewingFraction, want.SlewingFraction, spiceAgree, spiceAgreeFloor)
			if want.Frequency != nil {
				if w.Metrics.Frequency == nil {
					t.Fatal("no frequency from the Go model")
				}
				t.Logf("%s: frequency go %.7g ngspice %.7g (%+.2g %%)", tc.name, *w.Metrics.Frequency, *want.Frequency,
					100*(*w.Metrics.Frequency / *want.Frequency - 1))
				checkClose(t, "frequency", *w.Metrics.Frequency, *want.Frequency, spiceAgree, 0)
			}
		})
	}
}

// checkClose fails unless got is within rel (relative) or abs of want.
func checkClose(t *testing.T, what string, got, want, rel, abs float64) {
	t.Helper()
	if d := math.Abs(got - want); !(d <= rel*math.Abs(want) || d <= abs) {
		t.Errorf("%s = %.8g, want %.8g (within %g relative or %g absolute)", what, got, want, rel, abs)
	}
}

var spiceVersion = regexp.MustCompile(`ngspice-\d+`)

func runSpice(t *testing.T, deck spiceDeck) (spiceMeasured, string, error) {
	t.Helper()
	tmp := t.TempDir()
	if err := os.WriteFile(filepath.Join(tmp, "deck.cir"), []byte(deck.text), 0o644); err != nil {
		return spiceMeasured{}, "", err
	}
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, "ngspice", "-b", "deck.cir")
	cmd.Dir = tmp
	out, err := cmd.CombinedOutput()
	if err != nil {
		return spiceMeasured{}, "", fmt.Errorf("ngspice: %w\n%s", err, out)
	}
	raw, err := os.ReadFile(filepath.Join(tmp, deck.dataFile))
	if err != nil {
		return spiceMeasured{}, "", fmt.Errorf("ngspice wrote no data: %w\n%s", err, out)
	}
	d, err := parseSpiceData(raw)
	if err != nil {
		return spiceMeasured{}, "", fmt.Errorf("%s: %w", deck.dataFile, err)
	}
	m, err := d.measure(&deck)
	if err != nil {
		return m, "", err
	}
	sim := spiceVersion.FindString(string(out))
	if sim == "" {
		sim = "ngspice"
	}
	return m, sim, nil
}

func writeStored(t *testing.T, cirPath, resPath, netlist string, s spiceStored) {
	t.Helper()
	raw, err := json.MarshalIndent(s, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []struct {
		path string
		data []byte
	}{{cirPath, []byte(netlist)}, {resPath, append(raw, '\n')}} {
		if err := writeAtomic(f.path, f.data); err != nil {
			t.Fatal(err)
		}
	}
}

// writeAtomic writes through a temporary file in the same directory.
func writeAtomic(path string, data []byte) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), ".tmp-*")
	if err != nil {
		return err
	}
	_, werr := tmp.Write(data)
	cerr := tmp.Close()
	if err := errors.Join(werr, cerr); err != nil {
		os.Remove(tmp.Name())
		return err
	}
	return os.Rename(tmp.Name(), path)
}
