package regress

import (
	"errors"
	"math"
	"testing"

	"coefaudit/infer"
	"gonum.org/v1/gonum/mat"
)

func TestDifferenceVariance(t *testing.T) {
	// Var(a − b) = 4 + 9 − 2·1.5 = 10 (hand arithmetic).
	cov := mat.NewSymDense(3, []float64{4, 1.5, 0, 1.5, 9, 0, 0, 0, 1})
	tests := []struct {
		name string
		cov  mat.Symmetric
		i, j int
		want float64
		err  error
	}{
		{"a − b", cov, 0, 1, 10, nil},
		{"b − a", cov, 1, 0, 10, nil},
		{"same coefficient", cov, 2, 2, 0, nil},
		{"index out of range", cov, 0, 3, math.NaN(), ErrIndex},
		{"negative index", cov, -1, 0, math.NaN(), ErrIndex},
		{"not a covariance matrix", mat.NewSymDense(2, []float64{1, 2, 2, 1}), 0, 1, math.NaN(), ErrNegativeVariance},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := DifferenceVariance(tt.cov, tt.i, tt.j)
			if !errors.Is(err, tt.err) {
				t.Fatalf("DifferenceVariance(%d, %d) error = %v, want %v", tt.i, tt.j, err, tt.err)
			}
			if tt.err == nil && math.Abs(got-tt.want) > 1e-15 {
				t.Errorf("DifferenceVariance(%d, %d) = %v, want %v", tt.i, tt.j, got, tt.want)
			}
		})
	}
}

// TestTestDifferenceNormal: with df = +Inf the test is a z test. Inputs
// chosen by hand: SE(d) = √(0.01 + 0.01 − 2·0.0036) = √0.0128 = 0.1131371
// and d = 0.22174461 = 1.959964 × 0.11313708, where 1.959964 is the standard
// normal 97.5% point (any normal table), so z = 1.959964, p = 0.05 and the
// lower 95% limit is 0 to the digits given.
func TestTestDifferenceNormal(t *testing.T) {
	cov := mat.NewSymDense(2, []float64{0.01, 0.0036, 0.0036, 0.01})
	res, err := TestDifference([]float64{0.52174461, 0.3}, cov, 0, 1, math.Inf(1), 0.95)
	if err != nil {
		t.Fatalf("TestDifference error: %v", err)
	}
	se := math.Sqrt(0.0128)
	if math.Abs(res.SE-se) > 1e-15 || math.Abs(res.Statistic-0.22174461/se) > 1e-12 {
		t.Errorf("TestDifference = (SE %v, z %v), want (%v, %v)", res.SE, res.Statistic, se, 0.22174461/se)
	}
	if math.Abs(res.P-0.05) > 1e-7 || math.Abs(res.Lower) > 1e-8 {
		t.Errorf("TestDifference p = %v, lower = %v, want ≈ 0.05 and ≈ 0", res.P, res.Lower)
	}
	for _, bad := range []struct {
		name      string
		df, level float64
		err       error
	}{
		{"level 95 not 0.95", math.Inf(1), 95, infer.ErrProbability},
		{"df 0", 0, 0.95, infer.ErrDegreesOfFreedom},
	} {
		t.Run(bad.name, func(t *testing.T) {
			if _, err := TestDifference([]float64{1, 0}, cov, 0, 1, bad.df, bad.level); !errors.Is(err, bad.err) {
				t.Errorf("TestDifference(df %v, level %v) error = %v, want %v", bad.df, bad.level, err, bad.err)
			}
		})
	}
	if _, err := TestDifference([]float64{1}, cov, 0, 1, 10, 0.95); !errors.Is(err, ErrIndex) {
		t.Errorf("TestDifference(1 estimate, 2×2 covariance) error = %v, want %v", err, ErrIndex)
	}
}
