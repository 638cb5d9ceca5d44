package regress

import (
	"errors"
	"fmt"
)

// Sentinel errors. Callers tell cases apart with errors.Is; the errors
// returned carry context around these.
var (
	// ErrTooFewObservations: the model has no residual degrees of freedom
	// left (OLS needs more rows than parameters; a regression from summary
	// statistics needs n > p + 1).
	ErrTooFewObservations = errors.New("too few observations")
	// ErrNoPredictors: the model has no predictor.
	ErrNoPredictors = errors.New("no predictors")
	// ErrLengthMismatch: the variables do not all have the same length.
	ErrLengthMismatch = errors.New("variables have different lengths")
	// ErrNotFinite: a value is NaN or infinite.
	ErrNotFinite = errors.New("value is not finite")
	// ErrConstantPredictor: a predictor has no variance (or, without an
	// intercept, is identically zero). Returned inside a *PredictorError.
	ErrConstantPredictor = errors.New("predictor is constant")
	// ErrCollinear: a predictor is (numerically) a linear combination of
	// the others. Returned inside a *PredictorError.
	ErrCollinear = errors.New("predictor is collinear with the other predictors")
	// ErrConstantOutcome: the outcome has no variance, so R² and the
	// standardized coefficients are undefined.
	ErrConstantOutcome = errors.New("outcome is constant")
	// ErrNotCorrelationMatrix: a correlation matrix is not square, not
	// symmetric, has a diagonal other than 1 or an entry outside [−1, 1].
	ErrNotCorrelationMatrix = errors.New("not a correlation matrix")
	// ErrNotPositiveDefinite: a correlation matrix is not positive definite
	// (its smallest eigenvalue is ≤ 0, or too small to solve with).
	// Returned inside a *NotPositiveDefiniteError.
	ErrNotPositiveDefinite = errors.New("correlation matrix is not positive definite")
	// ErrBadSummary: standard deviations or means given for a regression
	// from summary statistics have the wrong length or impossible values.
	ErrBadSummary = errors.New("invalid summary statistics")
	// ErrIndex: a coefficient index is out of range.
	ErrIndex = errors.New("coefficient index out of range")
	// ErrNegativeVariance: a covariance matrix gives a negative variance for
	// a difference (it is not positive semi-definite).
	ErrNegativeVariance = errors.New("covariance matrix gives a negative variance")
)

// PredictorError reports a predictor that makes the model unidentifiable, so
// that a caller can name the column. Err is ErrConstantPredictor or
// ErrCollinear.
type PredictorError struct {
	// Index is the position of the predictor among the predictors passed
	// (0-based, not counting the intercept; for a regression from summary
	// statistics, 0 is the first predictor, i.e. variable 1 of the matrix).
	Index int
	// Condition is the 2-norm condition number of the centred, unit-length
	// scaled predictor matrix (for ErrCollinear; 0 otherwise).
	Condition float64
	// Err is the sentinel.
	Err error
}

// Error names the predictor, the problem and, for collinearity, the
// condition number.
func (e *PredictorError) Error() string {
	if e.Condition > 0 {
		return fmt.Sprintf("predictor %d: %v (condition number %.3g)", e.Index, e.Err, e.Condition)
	}
	return fmt.Sprintf("predictor %d: %v", e.Index, e.Err)
}

// Unwrap returns the sentinel.
func (e *PredictorError) Unwrap() error { return e.Err }

// NotPositiveDefiniteError reports a correlation matrix that cannot be a
// correlation matrix of real data, with its smallest eigenvalue (from
// mat.EigenSym) so the caller can say how far off it is — a table printed to
// two decimals is often slightly indefinite.
type NotPositiveDefiniteError struct {
	// MinEigenvalue is the smallest eigenvalue of the matrix.
	MinEigenvalue float64
}

// Error gives the smallest eigenvalue.
func (e *NotPositiveDefiniteError) Error() string {
	return fmt.Sprintf("%v (smallest eigenvalue %.3g)", ErrNotPositiveDefinite, e.MinEigenvalue)
}

// Unwrap returns ErrNotPositiveDefinite.
func (e *NotPositiveDefiniteError) Unwrap() error { return ErrNotPositiveDefinite }
