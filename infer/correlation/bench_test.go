package correlation_test

import (
	"testing"

	"coefaudit/infer/correlation"
)

// The audit calls these once per claim, and again for every corner of the
// rounding box of the printed correlations, so they should stay cheap.

func BenchmarkCompareIndependent(b *testing.B) {
	for b.Loop() {
		if _, err := correlation.CompareIndependent(0.5, 100, 0.3, 120, 0.95); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkCompareOverlapping(b *testing.B) {
	for b.Loop() {
		if _, err := correlation.CompareOverlapping(0.5, 0.3, 0.4, 100, 0.95); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkCompareNonOverlapping(b *testing.B) {
	for b.Loop() {
		if _, err := correlation.CompareNonOverlapping(derivedNonOverlapping, 100, 0.95); err != nil {
			b.Fatal(err)
		}
	}
}
