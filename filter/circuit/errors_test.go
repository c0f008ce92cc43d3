package circuit

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestErrorMessages(t *testing.T) {
	tests := []struct {
		name string
		err  error
		want string
	}{
		{"gain error out of range", second(GBWForGainError(1, 1e3, 1.5, math.Inf(1))), "gbw for gain error: eps = 1.5, want 0 < eps < 1"},
		{"threshold above output", second(HighTime(1e3, 1e-9, 5, 6, 1)), "astable high time: vth = 6, want vth < voh"},
		{"no full swing", second(AstablePeriodSlewLimited(1e3, 1e-9, 0, 0.5, -5, 5, 1e6)),
			"slew-limited astable period: slew rate 1e+06 V/s: output does not reach its level"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if tt.err == nil || !strings.HasPrefix(tt.err.Error(), tt.want) {
				t.Fatalf("error = %v, want it to start with %q", tt.err, tt.want)
			}
			if msg := tt.err.Error(); strings.ToLower(msg[:1]) != msg[:1] {
				t.Errorf("error %q should start in lower case", msg)
			}
		})
	}
	if err := second(AstablePeriodSlewLimited(1e3, 1e-9, 0, 0.5, -5, 5, 1e6)); !errors.Is(err, ErrNoFullSwing) {
		t.Errorf("errors.Is(%v, ErrNoFullSwing) = false", err)
	}
}
