// Package approx is the tests' one approximate comparison of floating-point numbers. It
// is test support: only _test.go files import it.
package approx

import (
	"math"
	"testing"
)

// Equal reports whether got is within absTol of want, or within relTol of the larger of
// their magnitudes: |got − want| ≤ absTol or |got − want| ≤ relTol·max(|got|, |want|).
// Equal numbers (±Inf included) are equal whatever the tolerances; an infinity equals
// only itself, and NaN only NaN. Pass 0 for the tolerance that does not apply.
func Equal(got, want, absTol, relTol float64) bool {
	if got == want {
		return true
	}
	if math.IsNaN(got) || math.IsNaN(want) {
		return math.IsNaN(got) && math.IsNaN(want)
	}
	if math.IsInf(got, 0) || math.IsInf(want, 0) {
		return false
	}
	d := math.Abs(got - want)
	return d <= absTol || d <= relTol*math.Max(math.Abs(got), math.Abs(want))
}

// Check reports an error on t, naming the quantity, unless Equal(got, want, absTol,
// relTol).
func Check(t testing.TB, name string, got, want, absTol, relTol float64) {
	t.Helper()
	if !Equal(got, want, absTol, relTol) {
		t.Errorf("%s = %v, want %v (±%g absolute or ±%g relative)", name, got, want, absTol, relTol)
	}
}
