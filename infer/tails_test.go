package infer

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// TestTwoSidedTailsTo1e300 checks two-sided p-values far into the tails, to
// 1e-12 relative, against closed forms (Abramowitz & Stegun 1964, 26.7.3 for
// Student's t with 1 and 2 df; 26.2.12, the asymptotic series of the normal
// tail, summed to its smallest term).
func TestTwoSidedTailsTo1e300(t *testing.T) {
	for _, tt := range []float64{1.5, 10, 1e3, 1e6, 1e10, 1e50, 1e150, 1e299} {
		// df = 1 (Cauchy): p = (2/π) atan(1/|t|).
		p1, _ := StudentTTwoSidedP(tt, 1)
		if w := 2 / math.Pi * math.Atan(1/tt); relErr(p1, w) > 1e-12 {
			t.Errorf("StudentTTwoSidedP(%g, 1) = %g, want %g", tt, p1, w)
		}
		// df = 2: p = 1 − |t|/√(2 + t²) = 2/(s(s + |t|)), s = √(2 + t²), written with
		// u = √2/|t| so that t² cannot overflow: p = u²/(√(1+u²)(√(1+u²)+1)).
		u := math.Sqrt2 / tt
		r := math.Sqrt(1 + u*u)
		p2, _ := StudentTTwoSidedP(tt, 2)
		if w := u * u / (r * (r + 1)); w > 1e-300 && relErr(p2, w) > 1e-12 {
			t.Errorf("StudentTTwoSidedP(%g, 2) = %g, want %g", tt, p2, w)
		}
	}
	for _, z := range []float64{8, 12, 20, 30, 37} {
		// Q(z) = φ(z)/z Σ (−1)^k (2k−1)!!/z^{2k}, summed while the terms shrink.
		phi := math.Exp(-z*z/2) / math.Sqrt(2*math.Pi)
		sum, term := 1.0, 1.0
		for k := 1; k < 200; k++ {
			next := -term * float64(2*k-1) / (z * z)
			if math.Abs(next) >= math.Abs(term) {
				break
			}
			term = next
			sum += term
		}
		want := 2 * phi / z * sum
		if got := NormalTwoSidedP(z); relErr(got, want) > 1e-12 {
			t.Errorf("NormalTwoSidedP(%v) = %.16g, asymptotic series %.16g", z, got, want)
		}
	}
	// The quantile inverts the tail down to p = 1e-300.
	for _, p := range []float64{1e-20, 1e-100, 1e-200, 1e-300} {
		z, err := NormalZFromTwoSidedP(p)
		if err != nil {
			t.Fatal(err)
		}
		if back := NormalTwoSidedP(z); relErr(back, p) > 1e-12 {
			t.Errorf("NormalTwoSidedP(NormalZFromTwoSidedP(%g)) = %g", p, back)
		}
	}
	// Moderate values agree with gonum's Student t CDF, which is accurate there
	// (LIBRARY-NOTES.md).
	for _, c := range []struct{ t, df float64 }{{0.3, 5}, {2.1, 12}, {4, 30}, {0.01, 3}} {
		got, _ := StudentTTwoSidedP(c.t, c.df)
		st := 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: c.df}.CDF(-c.t)
		if relErr(got, st) > 1e-12 {
			t.Errorf("StudentTTwoSidedP(%v, %v) = %.15g, gonum %.15g", c.t, c.df, got, st)
		}
	}
}
