package meta_test

import (
	"math"
	"testing"
)

// closeTo reports whether got is within tol of want (absolute), treating
// two NaNs or two equal infinities as equal.
func closeTo(got, want, tol float64) bool {
	if math.IsNaN(want) {
		return math.IsNaN(got)
	}
	if math.IsInf(want, 0) {
		return got == want
	}
	return math.Abs(got-want) <= tol
}

// checkValue fails the test when got is not within tol of want.
func checkValue(t *testing.T, call string, got, want, tol float64) {
	t.Helper()
	if !closeTo(got, want, tol) {
		t.Errorf("%s = %.12g, want %.12g (tol %g)", call, got, want, tol)
	}
}
