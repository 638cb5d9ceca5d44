package regress

import (
	"fmt"

	"gonum.org/v1/gonum/mat"
)

// CheckCorrelationMatrix reports whether m can be the correlation matrix of
// real data: square, symmetric, unit diagonal, entries in [−1, 1], and
// positive definite (a Cholesky factorization exists). A matrix that is not
// positive definite gives a *NotPositiveDefiniteError carrying its smallest
// eigenvalue (mat.EigenSym), which says how far the printed, rounded
// correlations are from a possible matrix.
func CheckCorrelationMatrix(m mat.Matrix) error {
	r, err := checkCorrelation(m)
	if err != nil {
		return err
	}
	var chol mat.Cholesky
	if !chol.Factorize(r) {
		return fmt.Errorf("correlation matrix: %w", &NotPositiveDefiniteError{MinEigenvalue: smallestEigenvalue(r)})
	}
	return nil
}
