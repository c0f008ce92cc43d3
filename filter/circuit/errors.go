package circuit

import (
	"fmt"
	"math"
)

// DomainError reports an argument outside the range where a formula is
// defined, e.g. an allowed gain error of 1.5 or thresholds outside the
// output swing.
type DomainError struct {
	Func  string  // formula, lower case, e.g. "astable high time"
	Param string  // argument name, e.g. "vth"
	Value float64 // the value given
	Want  string  // what was expected, e.g. "vtl < vth < voh"
}

// Error formats the failure as "FUNC: PARAM = VALUE, want WANT".
func (e *DomainError) Error() string {
	return fmt.Sprintf("%s: %s = %g, want %s", e.Func, e.Param, e.Value, e.Want)
}

func domainErr(fn, param string, v float64, want string) error {
	return &DomainError{Func: fn, Param: param, Value: v, Want: want}
}

// positive reports whether v is a finite number above zero (false for NaN).
func positive(v float64) bool {
	return v > 0 && !math.IsInf(v, 1)
}
