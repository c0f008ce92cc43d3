package sim

import "testing"

// Benchmarks of one preview (defaults: 25 periods at 400 points, or an
// oscillator's 9 edges) per stage. The target is well under 20 ms so a
// preview can follow the cursor.
func benchRun(b *testing.B, c Circuit, a Amp, in Input) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Run(c, a, in, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

var benchAmp = Amp{Aol: 1e5, GBW: 1e6, SlewRise: 0.5e6, VOL: -5, VOH: 5}

func BenchmarkRunFollower(b *testing.B) {
	benchRun(b, Follower{}, benchAmp, Input{Shape: Sine, Peak: 1, Freq: 120e3})
}

func BenchmarkRunNonInverting(b *testing.B) {
	benchRun(b, NonInverting{Rf: 9e3, Rg: 1e3}, benchAmp, Input{Shape: Sine, Peak: 0.7, Freq: 5e3})
}

func BenchmarkRunInverting(b *testing.B) {
	benchRun(b, Inverting{Rf: 10e3, Rin: 1e3}, benchAmp, Input{Shape: Square, Peak: 0.2, Freq: 10e3, Rise: 100e-9})
}

func BenchmarkRunComparator(b *testing.B) {
	benchRun(b, Comparator{Threshold: 0.2}, benchAmp, Input{Shape: Sine, Peak: 1, Freq: 2e3})
}

func BenchmarkRunRelaxation(b *testing.B) {
	benchRun(b, Relaxation{R: 10e3, C: 1.517e-9, R1: 10e3, R2: 10e3}, benchAmp, Input{})
}

func BenchmarkRunSallenKey(b *testing.B) {
	benchRun(b, SallenKeyLowPass{R1: 10e3, R2: 10e3, C1: 2.25e-9, C2: 1.125e-9}, benchAmp, Input{Shape: Sine, Peak: 2, Freq: 12e3})
}

func BenchmarkRunTransimpedance(b *testing.B) {
	benchRun(b, Transimpedance{Rf: 1e6, Cf: 1e-12, Cin: 10e-12}, benchAmp, Input{Shape: Step, Peak: 2e-6, At: 2e-6})
}
