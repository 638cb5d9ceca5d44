package infer

import (
	"math"
	"testing"
)

func relErr(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

func TestCriticalValues(t *testing.T) {
	tests := []struct {
		name  string
		level float64
		df    float64
		want  float64
		tol   float64 // absolute: the source's printed precision
	}{
		// Cochrane Handbook 5.1 §7.7.3.2 (SECONDARY copy, PUBLISHED-VALUES.md §1.3):
		// 95%, 90%, 99% intervals are 3.92, 3.29, 5.15 SEs wide.
		{"normal 95%", 0.95, math.NaN(), 3.92 / 2, 0.005 / 2},
		{"normal 90%", 0.90, math.NaN(), 3.29 / 2, 0.005 / 2},
		{"normal 99%", 0.99, math.NaN(), 5.15 / 2, 0.005 / 2},
		// Same source: n = 25, "tinv(1−0.95, 25−1) = 2.0639".
		{"t 95% df 24", 0.95, 24, 2.0639, 0.00005},
		// Standard t tables (Fisher & Yates; any statistics textbook's table):
		// t(0.975, 9) = 2.262, t(0.995, 10) = 3.169, t(0.95, 30) = 1.697.
		{"t 95% df 9", 0.95, 9, 2.262, 0.0005},
		{"t 99% df 10", 0.99, 10, 3.169, 0.0005},
		{"t 90% df 30", 0.90, 30, 1.697, 0.0005},
		{"t infinite df is normal", 0.95, math.Inf(1), 1.959964, 5e-7},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := CriticalValue(tt.level, tt.df)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(got-tt.want) > tt.tol {
				t.Errorf("CriticalValue(%v, %v) = %.6f, want %.6f ± %g", tt.level, tt.df, got, tt.want, tt.tol)
			}
		})
	}
}

func TestTwoSidedPValues(t *testing.T) {
	// t = 50, df = 3: two-sided p 1.7617152041272e-05 (LIBRARY-NOTES.md, measured
	// against a reference library); closed form for df = 3 checks it independently:
	// P(T3 > t) = 1/2 − (1/π)[atan(u) + u/(1+u²)], u = t/√3 (Student t CDF for odd df,
	// Abramowitz & Stegun 1964, 26.7.3).
	u := 50 / math.Sqrt(3)
	closed := 2 * (0.5 - (math.Atan(u)+u/(1+u*u))/math.Pi)
	got, err := StudentTTwoSidedP(50, 3)
	if err != nil {
		t.Fatal(err)
	}
	if relErr(got, 1.7617152041272e-05) > 1e-12 {
		t.Errorf("StudentTTwoSidedP(50, 3) = %.15g, want 1.7617152041272e-05", got)
	}
	if relErr(got, closed) > 1e-8 {
		t.Errorf("StudentTTwoSidedP(50, 3) = %.15g, closed form %.15g", got, closed)
	}
	// Far normal tail against the asymptotic series of Abramowitz & Stegun
	// (1964) 26.2.12: Q(z) ≈ φ(z)/z · (1 − 1/z² + 3/z⁴ − 15/z⁶ + 105/z⁸),
	// whose truncation error at z = 20 is below 945/z¹⁰ ≈ 1e-10 relative.
	for _, z := range []float64{20, 30, 37} {
		phi := math.Exp(-z*z/2) / math.Sqrt(2*math.Pi)
		z2 := z * z
		series := phi / z * (1 - 1/z2 + 3/(z2*z2) - 15/(z2*z2*z2) + 105/(z2*z2*z2*z2))
		if got := NormalUpperTail(z); relErr(got, series) > 1e-9 {
			t.Errorf("NormalUpperTail(%v) = %.15g, asymptotic series %.15g", z, got, series)
		}
	}
	// Round trips: the quantile inverts the two-sided p.
	for _, p := range []float64{0.5, 0.05, 1e-4, 1e-12} {
		z, err := NormalZFromTwoSidedP(p)
		if err != nil {
			t.Fatal(err)
		}
		if back := NormalTwoSidedP(z); relErr(back, p) > 1e-9 {
			t.Errorf("NormalTwoSidedP(NormalZFromTwoSidedP(%g)) = %g", p, back)
		}
		tq, err := StudentTFromTwoSidedP(p, 12)
		if err != nil {
			t.Fatal(err)
		}
		if back, _ := StudentTTwoSidedP(tq, 12); relErr(back, p) > 1e-8 {
			t.Errorf("StudentTTwoSidedP(StudentTFromTwoSidedP(%g, 12), 12) = %g", p, back)
		}
	}
}

func TestFUpperTailIsAccurate(t *testing.T) {
	// LIBRARY-NOTES.md: at (200, 3, 100) the true upper tail is 4.1e-42 while
	// 1 − CDF returns 1.1e-16. Independent check: for d1 = 2 the F upper tail has
	// the closed form (1 + 2f/d2)^(−d2/2) (the F(2, d2) survival function).
	got, err := FUpperTail(200, 3, 100)
	if err != nil {
		t.Fatal(err)
	}
	if got > 1e-40 || got < 1e-43 {
		t.Errorf("FUpperTail(200, 3, 100) = %g, want about 4.1e-42", got)
	}
	for _, f := range []float64{0.5, 3, 40, 400} {
		want := math.Pow(1+2*f/30, -15)
		got, _ := FUpperTail(f, 2, 30)
		if relErr(got, want) > 1e-12 {
			t.Errorf("FUpperTail(%v, 2, 30) = %g, want %g", f, got, want)
		}
	}
	// Chi-square with 2 df: the upper tail is exp(−x/2) exactly.
	for _, x := range []float64{0.1, 5, 100, 1000} {
		got, _ := ChiSquareUpperTail(x, 2)
		if relErr(got, math.Exp(-x/2)) > 1e-12 {
			t.Errorf("ChiSquareUpperTail(%v, 2) = %g, want %g", x, got, math.Exp(-x/2))
		}
	}
}

func TestDistributionErrors(t *testing.T) {
	if _, err := StudentTTwoSidedP(2, 0); err == nil {
		t.Error("StudentTTwoSidedP(2, 0): want an error for df 0")
	}
	if _, err := NormalZFromTwoSidedP(0); err == nil {
		t.Error("NormalZFromTwoSidedP(0): want an error")
	}
	if _, err := NormalCriticalValue(1); err == nil {
		t.Error("NormalCriticalValue(1): want an error")
	}
	if _, err := FUpperTail(1, 0, 3); err == nil {
		t.Error("FUpperTail(1, 0, 3): want an error")
	}
}
