package circuit

import (
	"math"
	"testing"
)

func TestGains(t *testing.T) {
	// Ideal-op-amp gains (Sedra & Smith, Microelectronic Circuits, from memory),
	// worked by hand.
	tests := []struct {
		name string
		got  float64
		want float64
	}{
		{"noninverting 100k/10k", NonInvertingGain(100e3, 10e3), 11},
		{"noninverting follower (Rg open)", NonInvertingGain(10e3, math.Inf(1)), 1},
		{"inverting 47k/4.7k", InvertingGain(47e3, 4.7e3), 10},
		{"noise gain noninverting G=11", NoiseGainNonInverting(11), 11},
		{"noise gain inverting |G|=10", NoiseGainInverting(10), 11},
		{"noise gain inverting G=-1", NoiseGainInverting(-1), 2},
		// 1/(1/1k + 1/2k + 1/3k) = 6000/11 Ω.
		{"parallel 1k 2k 3k", Parallel(1e3, 2e3, 3e3), 6000.0 / 11},
		{"parallel equal", Parallel(10e3, 10e3), 5e3},
		{"parallel single", Parallel(4.7e3), 4.7e3},
		{"parallel with open", Parallel(10e3, math.Inf(1)), 10e3},
		{"parallel with short", Parallel(10e3, 0), 0},
		// 20·log10(1000) = 60 dB; 10^(-6/20) = 0.501187.
		{"dB of 1000", DB(1000), 60},
		{"from -6 dB", FromDB(-6), 0.5011872336},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			assertAbs(t, tt.name, tt.got, tt.want, 1e-9*math.Max(1, math.Abs(tt.want)))
		})
	}
}
