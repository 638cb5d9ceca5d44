package regress

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// TestSameModelTestsCalibration simulates data whose truth is set here — two
// predictors with equal effects, so that H0: θ1 = θ2 holds — and checks that
// the two same-model tests the audit runs from a correlation table reject at
// α = .05 within a 99% binomial band, and that their 95% intervals cover the
// true difference 0 within the band, at n = 50 and n = 200:
//
//   - the t test of b1 − b2 with the classical OLS covariance (residual df);
//   - the z test of β1 − β2 with the normal-theory delta-method covariance.
//
// The predictors are correlated (ρ = .4) with unit variances, so β1 = β2
// too. The band is ±2.576 √(p(1−p)/R) around .05 and .95 with R replications.
//
// At n = 50 the delta-method z test is measurably liberal (7.6% rejections
// and 92.4% coverage here; with a t reference on the residual df, 6.8%): the
// normal-theory SE of standardized coefficients is a large-sample result
// (Yuan & Chan 2011 study its small-sample bias; Jones & Waller 2013 report
// below-nominal coverage at small n). So at n = 50 the test asserts that
// finding — a rate above nominal but below 10% — and the audit notes it for
// claims with n below 100; at n = 200 it must be within the band.
func TestSameModelTestsCalibration(t *testing.T) {
	const reps = 3000
	for _, n := range []int{50, 200} {
		rng := rand.New(rand.NewPCG(2026, uint64(n)))
		rejB, rejBeta, covB, covBeta := 0, 0, 0, 0
		y, x1, x2, x3 := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
		for range reps {
			for i := range n {
				z := rng.NormFloat64()
				x1[i] = math.Sqrt(0.4)*z + math.Sqrt(0.6)*rng.NormFloat64()
				x2[i] = math.Sqrt(0.4)*z + math.Sqrt(0.6)*rng.NormFloat64()
				x3[i] = rng.NormFloat64()
				y[i] = 0.3*x1[i] + 0.3*x2[i] + 0.2*x3[i] + rng.NormFloat64()
			}
			cols := [][]float64{y, x1, x2, x3}
			r := mat.NewSymDense(4, nil)
			sds := make([]float64, 4)
			for a := range cols {
				sds[a] = stat.StdDev(cols[a], nil)
				for b := a; b < 4; b++ {
					r.SetSym(a, b, stat.Correlation(cols[a], cols[b], nil))
				}
			}
			fit, err := FromSummary(Summary{Correlation: r, SDs: sds, N: n})
			if err != nil {
				t.Fatal(err)
			}
			db, err := TestDifference(fit.Coefficients, fit.Covariance, fit.SlopeIndex(0), fit.SlopeIndex(1), float64(fit.ResidualDF), 0.95)
			if err != nil {
				t.Fatal(err)
			}
			dz, err := TestDifference(fit.Standardized, fit.StandardizedDeltaCov, 0, 1, math.Inf(1), 0.95)
			if err != nil {
				t.Fatal(err)
			}
			if db.P < 0.05 {
				rejB++
			}
			if dz.P < 0.05 {
				rejBeta++
			}
			if db.Lower <= 0 && 0 <= db.Upper {
				covB++
			}
			if dz.Lower <= 0 && 0 <= dz.Upper {
				covBeta++
			}
		}
		half := 2.576 * math.Sqrt(0.05*0.95/reps)
		for _, c := range []struct {
			name  string
			count int
			want  float64
		}{{"t test of b, rejection", rejB, 0.05}, {"delta z test of beta, rejection", rejBeta, 0.05},
			{"t interval of b, coverage", covB, 0.95}, {"delta interval of beta, coverage", covBeta, 0.95}} {
			rate := float64(c.count) / reps
			liberalDelta := n < 100 && c.name[:5] == "delta"
			if liberalDelta {
				if excess := math.Abs(rate - c.want); excess < half || excess > 0.05 {
					t.Errorf("n = %d: %s %.4f: the known small-sample excess over %.2f should lie in [%.4f, 0.05]", n, c.name, rate, c.want, half)
				}
			} else if math.Abs(rate-c.want) > half {
				t.Errorf("n = %d: %s %.4f outside %.3f ± %.4f", n, c.name, rate, c.want, half)
			}
			t.Logf("n = %d: %s %.4f", n, c.name, rate)
		}
	}
}
