package regress

import (
	"fmt"
	"math"

	"coefaudit/infer"
	"gonum.org/v1/gonum/mat"
)

// DifferenceVariance returns the variance of the difference of two
// coefficients from their joint covariance matrix,
//
//	Var(θ_i − θ_j) = C_ii + C_jj − 2 C_ij,
//
// with i and j indices into the matrix (for a Fit, use SlopeIndex). It
// returns ErrIndex for an index out of range and ErrNegativeVariance when
// the result is negative beyond rounding (a matrix that is not a
// covariance matrix); a result negative only by rounding is returned as 0.
func DifferenceVariance(cov mat.Symmetric, i, j int) (float64, error) {
	n := cov.SymmetricDim()
	if i < 0 || j < 0 || i >= n || j >= n {
		return math.NaN(), fmt.Errorf("difference of coefficients %d and %d of %d: %w", i, j, n, ErrIndex)
	}
	cii, cjj, cij := cov.At(i, i), cov.At(j, j), cov.At(i, j)
	v := cii + cjj - 2*cij
	if v < 0 {
		if v < -1e-12*(math.Abs(cii)+math.Abs(cjj)) {
			return math.NaN(), fmt.Errorf("Var(θ%d − θ%d) = %v: %w", i, j, v, ErrNegativeVariance)
		}
		v = 0
	}
	return v, nil
}

// Difference is a Wald test and confidence interval for the difference of
// two coefficients of one model.
type Difference struct {
	// Estimate is θ_i − θ_j and SE its standard error √Var(θ_i − θ_j).
	Estimate, SE float64
	// Statistic is Estimate/SE; DF its degrees of freedom (+Inf: a z test).
	Statistic, DF float64
	// P is the two-sided p-value.
	P float64
	// Level is the confidence level (0.95 for 95%); Lower and Upper the
	// interval Estimate ∓ crit·SE.
	Level, Lower, Upper float64
}

// TestDifference tests θ_i = θ_j for coefficients est with covariance
// matrix cov:
//
//	d = θ_i − θ_j,   SE = √(C_ii + C_jj − 2 C_ij),   T = d/SE,
//	p = 2 P(T_df > |T|),   CI = d ∓ t_(1−α/2, df) SE,
//
// with the normal distribution when df is +Inf (e.g. the delta-method
// covariance of standardized coefficients) and Student's t with the
// residual df for the classical covariance of OLS coefficients [1]. level is
// a proportion (0.95).
//
// Errors: those of DifferenceVariance, infer.ErrProbability for a level
// outside (0, 1), infer.ErrDegreesOfFreedom for df ≤ 0, ErrIndex when est
// and cov differ in size.
//
// [1] Wooldridge JM (2013). Introductory Econometrics: A Modern Approach,
// 5th ed., §4.4 (testing a single linear combination of the parameters;
// section number from memory). South-Western.
func TestDifference(est []float64, cov mat.Symmetric, i, j int, df, level float64) (*Difference, error) {
	if len(est) != cov.SymmetricDim() {
		return nil, fmt.Errorf("difference test: %d estimates, %d×%d covariance: %w",
			len(est), cov.SymmetricDim(), cov.SymmetricDim(), ErrIndex)
	}
	v, err := DifferenceVariance(cov, i, j)
	if err != nil {
		return nil, fmt.Errorf("difference test: %w", err)
	}
	crit, err := infer.StudentTCriticalValue(level, df)
	if err != nil {
		return nil, fmt.Errorf("difference test: %w", err)
	}
	d := &Difference{Estimate: est[i] - est[j], SE: math.Sqrt(v), DF: df, Level: level}
	d.Statistic = d.Estimate / d.SE
	d.P, err = infer.StudentTTwoSidedP(d.Statistic, df)
	if err != nil {
		return nil, fmt.Errorf("difference test: %w", err)
	}
	if d.SE == 0 {
		d.Statistic = math.Copysign(math.Inf(1), d.Estimate)
		d.P = 0
		if d.Estimate == 0 {
			d.Statistic, d.P = math.NaN(), math.NaN()
		}
	}
	d.Lower, d.Upper = d.Estimate-crit*d.SE, d.Estimate+crit*d.SE
	return d, nil
}
