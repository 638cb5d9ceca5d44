package regress

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// CoefficientCorrelation returns the sampling correlation of the OLS
// coefficients of predictors i and j from the predictors' correlation
// matrix rxx alone. The coefficients' covariance is σ² (X'X)⁻¹, and with
// P = Rxx⁻¹ its correlations are
//
//	corr(b_i, b_j) = P_ij / √(P_ii P_jj) = −r_ij·rest,
//
// minus the partial correlation of x_i and x_j given the other predictors
// (for two predictors, −r_12). Neither σ², the SDs nor the outcome enter, so
// the value holds for unstandardized coefficients exactly; for standardized
// ones it is the classical approximation (their delta-method covariance adds
// terms in the β's).
//
// Errors: those of CheckCorrelationMatrix (a *NotPositiveDefiniteError for
// a matrix no data can have), and ErrIndex for i or j out of range or equal.
//
// References:
//
//	[1] Greene WH (2012). Econometric Analysis, 7th ed., §3.5 (the
//	    Frisch–Waugh result and partial correlation; section from memory).
func CoefficientCorrelation(rxx mat.Symmetric, i, j int) (float64, error) {
	p := rxx.SymmetricDim()
	if i < 0 || j < 0 || i >= p || j >= p || i == j {
		return math.NaN(), fmt.Errorf("coefficients %d and %d of %d: %w", i, j, p, ErrIndex)
	}
	if err := CheckCorrelationMatrix(rxx); err != nil {
		return math.NaN(), err
	}
	var chol mat.Cholesky
	chol.Factorize(rxx) // positive definite: checked above
	inv, err := inverseBySolves(&chol, p)
	if err != nil {
		return math.NaN(), err
	}
	return inv.At(i, j) / math.Sqrt(inv.At(i, i)*inv.At(j, j)), nil
}
