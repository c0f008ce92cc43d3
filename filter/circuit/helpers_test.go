package circuit

import (
	"math"
	"testing"

	_ "github.com/opsift/opsift/internal/golden" // takes -update, so go test ./... -update runs here too
)

// assertRel fails unless got is within rel (a fraction) of want.
func assertRel(t *testing.T, name string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.10g, want %.10g (±%g relative)", name, got, want, rel)
	}
}

// assertAbs fails unless got is within abs of want.
func assertAbs(t *testing.T, name string, got, want, abs float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > abs {
		t.Errorf("%s = %.10g, want %.10g (±%g)", name, got, want, abs)
	}
}

// mustOK fails the test at once on a non-nil error.
func mustOK(t *testing.T, err error) {
	t.Helper()
	if err != nil {
		t.Fatalf("unexpected error: %v", err)
	}
}
