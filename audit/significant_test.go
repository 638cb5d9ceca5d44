package audit

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

// TestSignificantMatchesStrconv checks appendSignificant, for every
// precision it takes, against strconv's 'g' format, the
// reference its quick path must equal byte for byte: random doubles of every magnitude and of a report's magnitudes,
// short decimals, their neighbouring doubles, the decades' edges, values
// that round up into the next decade, and exact ties. It also checks that
// the quick path is taken where it should be, so that the comparison is not
// only of strconv with itself.
func TestSignificantMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(20261202, 8))
	tenth := 0.1 // a variable, so that tenth+0.2 is formed in float64, not exactly as a constant
	next := func(x float64) []float64 {
		return []float64{x, math.Nextafter(x, math.Inf(1)), math.Nextafter(x, math.Inf(-1))}
	}
	var xs []float64
	for range 100000 {
		d := rng.IntN(8)
		m := float64(rng.Int64N([]int64{10, 1000, 1e6, 1e10, 1e12}[rng.IntN(5)]))
		x := m / math.Pow(10, float64(d))
		if rng.IntN(2) == 0 {
			x = -x
		}
		xs = append(xs, next(x)...)
		xs = append(xs, math.Float64frombits(rng.Uint64()), rng.NormFloat64()*math.Pow(10, float64(rng.IntN(30)-15)),
			rng.Float64(), rng.ExpFloat64()*1e-3)
	}
	for e := -6; e <= 11; e++ {
		p := math.Pow(10, float64(e))
		xs = append(xs, next(p)...)
		xs = append(xs, next(-p)...)
		xs = append(xs, next(p*(1-5e-11))...) // rounds up into the next decade
		xs = append(xs, next(p*9.9999999995)...)
	}
	// Exact ties at the tenth digit: k + 1/2 over a power of two, scaled.
	for _, x := range []float64{1234567890.5, 123456789.25, 0.5, 0.125, 1.0000000005, 2.0000000005} {
		xs = append(xs, next(x)...)
	}
	xs = append(xs, 0, math.Copysign(0, -1), 1, -1, 0.05, tenth+0.2, 9999999999, 9999999999.5, 1e10, 10000000001,
		999999999.9, 99999999.99, 123456.7891, 5e-324, math.MaxFloat64)
	for _, x := range xs {
		if !Number(x).Known() {
			continue // written as NA or ∞
		}
		for prec := 1; prec <= 10; prec++ {
			if got, want := string(appendSignificant(nil, x, prec)), strconv.FormatFloat(x, 'g', prec, 64); got != want {
				t.Fatalf("appendSignificant(%v, %d) = %q, want %q", x, prec, got, want)
			}
		}
	}
	for _, c := range []struct {
		x     float64
		quick bool
	}{{0.05, true}, {95, true}, {-0.0001, true}, {1.25, true}, {9999999999, true}, {0.6014352834, true},
		{-0.2121123358, true}, {1.0 / 3, true}, {tenth + 0.2, true}, {0.00005, false}, {1e10, false},
		{9999999999.5, false}, {1234567890.5, false}, {0, false}, {math.Inf(1), false}} {
		if _, ok := appendSignificantQuick(nil, c.x, 10); ok != c.quick {
			t.Errorf("appendSignificantQuick(%v, 10) taken = %v, want %v", c.x, ok, c.quick)
		}
	}
	for _, c := range []struct {
		x     float64
		quick bool
	}{{0.05, true}, {-0.2121123358, true}, {9999, true}, {9999.4, true}, {9999.6, false}, {12345, false}, {0.00005, false}} {
		if _, ok := appendSignificantQuick(nil, c.x, 4); ok != c.quick {
			t.Errorf("appendSignificantQuick(%v, 4) taken = %v, want %v", c.x, ok, c.quick)
		}
	}
}

// TestThreeDecimalsMatchesStrconv checks appendThreeDecimals against
// strconv's 'f' format with three decimals: p-values, their neighbouring
// doubles, exact ties (0.0625 is 62.5 thousandths), and values outside the
// quick range.
func TestThreeDecimalsMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(20261202, 3))
	xs := []float64{0, math.Copysign(0, -1), 0.0005, 0.0015, 0.0625, 0.1875, 0.9995, 1, 999.9995, 1000, 1000.0001, -0.001,
		1e-300, math.NaN(), math.Inf(1)}
	for range 200000 {
		x := []float64{rng.Float64(), rng.Float64() * 1000, float64(rng.IntN(2001)) / 2000, rng.ExpFloat64() * 1e-3}[rng.IntN(4)]
		xs = append(xs, x, math.Nextafter(x, 2000), math.Nextafter(x, -1))
	}
	for _, x := range xs {
		if got, want := string(appendThreeDecimals(nil, x)), strconv.FormatFloat(x, 'f', 3, 64); got != want {
			t.Fatalf("appendThreeDecimals(%v) = %q, want %q", x, got, want)
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
				buf = appendSignificant(buf[:0], bc.xs[i%len(bc.xs)], 10)
			}
		})
		b.Run(bc.name+"-strconv", func(b *testing.B) {
			var buf []byte
			for i := range b.N {
				buf = strconv.AppendFloat(buf[:0], bc.xs[i%len(bc.xs)], 'g', 10, 64)
			}
		})
	}
}

// FuzzCSVNumber compares appendSignificant with strconv's 'g' format, at
// ten digits and at the precision the input picks, on any double, from its bits or as a decimal scaled by a power of
// ten (where the ties and the decade edges are).
func FuzzCSVNumber(f *testing.F) {
	for _, x := range []float64{0.05, 1234567890.5, 9999999999.5, 0.0001, 123.456, -0.6014352834} {
		f.Add(math.Float64bits(x), int64(0), int8(0), uint8(4))
	}
	f.Add(uint64(0), int64(12345678905), int8(-10), uint8(10))
	f.Fuzz(func(t *testing.T, bits uint64, mantissa int64, exp int8, prec uint8) {
		p := 1 + int(prec%10)
		for _, x := range []float64{math.Float64frombits(bits), float64(mantissa) * math.Pow(10, float64(exp%24))} {
			if !Number(x).Known() {
				continue
			}
			if got, want := string(appendSignificant(nil, x, 10)), strconv.FormatFloat(x, 'g', 10, 64); got != want {
				t.Fatalf("appendSignificant(%v, 10) = %q, want %q", x, got, want)
			}
			if got, want := string(appendSignificant(nil, x, p)), strconv.FormatFloat(x, 'g', p, 64); got != want {
				t.Fatalf("appendSignificant(%v, %d) = %q, want %q", x, p, got, want)
			}
		}
	})
}
