package audit

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

// TestCSVNumberMatchesStrconv checks appendCSVNumber against strconv's 'g'
// format with ten digits, the reference its short-decimal path must equal
// byte for byte: short decimals of every scale it tries, their neighbouring
// doubles, whole numbers around 10^10, and random doubles of every
// magnitude. It also checks that the short path is taken where it should
// be, so that the comparison is not only of strconv with itself.
func TestCSVNumberMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(20261202, 8))
	tenth := 0.1 // a variable, so that tenth+0.2 is formed in float64, not exactly as a constant

	var xs []float64
	for range 200000 {
		d := rng.IntN(6) // one more decimal than the short path tries
		m := float64(rng.Int64N([]int64{10, 1000, 1e6, 1e10, 1e12}[rng.IntN(5)]))
		x := m / math.Pow(10, float64(d))
		if rng.IntN(2) == 0 {
			x = -x
		}
		xs = append(xs, x, math.Nextafter(x, math.Inf(1)), math.Nextafter(x, math.Inf(-1)))
		xs = append(xs, math.Float64frombits(rng.Uint64()), rng.NormFloat64()*math.Pow(10, float64(rng.IntN(30)-15)))
	}
	xs = append(xs, 0, math.Copysign(0, -1), 1, -1, 0.05, tenth+0.2, 1e-4, 1.5e-4, 9.9999e-5, 9999999999, 1e10, 10000000001,
		999999999.9, 99999999.99, 123456.7891, 5e-324, math.MaxFloat64, math.Inf(1), math.Inf(-1))
	for _, x := range xs {
		if !Number(x).Known() {
			continue // written empty
		}
		got := string(appendCSVNumber(nil, Number(x)))
		if want := strconv.FormatFloat(x, 'g', 10, 64); got != want {
			t.Fatalf("appendCSVNumber(%v) = %q, want %q", x, got, want)
		}
	}
	for _, c := range []struct {
		x     float64
		short bool
	}{{0.05, true}, {95, true}, {-0.0001, true}, {1.25, true}, {9999999999, true}, {123456.7891, true},
		{0.00005, false}, {1e10, false}, {tenth + 0.2, false}, {0.12345, false}, {1.0 / 3, false}, {0, false}} {
		if _, ok := appendShortDecimal(nil, c.x); ok != c.short {
			t.Errorf("appendShortDecimal(%v) taken = %v, want %v", c.x, ok, c.short)
		}
	}
}

// BenchmarkCSVNumber times the numbers of a report row: short ones (df,
// α, a printed estimate) and computed ones.
func BenchmarkCSVNumber(b *testing.B) {
	for _, bc := range []struct {
		name string
		xs   []float64
	}{{"short", []float64{0.05, 95, 1, 0.243}}, {"long", []float64{0.6014352834, -0.2121123358, 0.9526304642, 1.935402685}}} {
		b.Run(bc.name, func(b *testing.B) {
			var buf []byte
			for i := range b.N {
				buf = appendCSVNumber(buf[:0], Number(bc.xs[i%len(bc.xs)]))
			}
		})
	}
}
