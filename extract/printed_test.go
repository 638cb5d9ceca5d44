package extract

import (
	"math"
	"testing"
)

// HalfUnit takes 10^−d from a table for the usual decimals; each entry must
// be the float64 math.Pow(10, −d) of the Go standard library returns, so
// that no rounding interval moves by a bit.
func TestHalfUnitTable(t *testing.T) {
	for d := -1; d <= 40; d++ {
		p := Printed{Value: 1, Decimals: int32(d), Bound: Exact}
		want := 0.5 * math.Pow(10, -float64(d))
		if d < 0 {
			want = 0
		}
		if got := p.HalfUnit(); math.Float64bits(got) != math.Float64bits(want) {
			t.Errorf("Printed{Decimals: %d}.HalfUnit() = %v (bits %x), want 0.5*math.Pow(10, %d) = %v (bits %x)",
				d, got, math.Float64bits(got), -d, want, math.Float64bits(want))
		}
	}
}
