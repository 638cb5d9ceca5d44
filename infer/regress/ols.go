package regress

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// CollinearityLimit is the condition number of the centred, unit-length
// scaled predictor matrix beyond which OLS refuses the fit with ErrCollinear.
// At 1e13 a coefficient can keep only about 16 − 13 = 3 digits against a
// perturbation of the data in its last digit, and exact collinearity shows
// up as 1e15 or more. NIST's Filip, the hardest file of the StRD, has a
// condition number of 3.8e9 on this scale and is fitted to about 8 digits
// (see ols_nist_test.go).
const CollinearityLimit = 1e13

// ConditionWarning is the condition number above which OLS adds a warning:
// from here on, digits of the coefficients depend on digits of the data
// that a paper or a CSV export may not have kept.
const ConditionWarning = 1e8

// Options configures OLS.
type Options struct {
	// NoIntercept fits y = X b through the origin. R² is then the uncentred
	// 1 − RSS/Σy² (as NIST certifies for NoInt1 and NoInt2).
	NoIntercept bool
}

// Fit is an ordinary least-squares fit.
type Fit struct {
	// N is the number of observations and Predictors the number of
	// predictors (not counting the intercept).
	N, Predictors int
	// Intercept reports whether the model has an intercept.
	Intercept bool
	// Coefficients holds the intercept first (when fitted), then one slope
	// per predictor in the order given; SlopeIndex maps a predictor to its
	// position here.
	Coefficients []float64
	// StandardErrors are the classical OLS standard errors,
	// √(s² [(XᵀX)⁻¹]_jj), in the order of Coefficients.
	StandardErrors []float64
	// Covariance is the classical covariance matrix s² (XᵀX)⁻¹ of
	// Coefficients.
	Covariance *mat.SymDense
	// Standardized holds β_j = b_j s_xj / s_y, one per predictor (no
	// intercept), with sample standard deviations (divisor n − 1).
	Standardized []float64
	// StandardizedSE is the "standard method" standard error of β_j,
	// SE(b_j) s_xj / s_y, which treats s_x and s_y as fixed (see
	// SummaryFit.StandardizedDeltaCov for the random-regressor version).
	StandardizedSE []float64
	// PredictorMeans and PredictorSDs are the sample means and standard
	// deviations of the predictors; OutcomeMean and OutcomeSD those of y.
	PredictorMeans, PredictorSDs []float64
	OutcomeMean, OutcomeSD       float64
	// RSS is the residual sum of squares, ResidualDF = N − len(Coefficients)
	// and ResidualSD = √(RSS/ResidualDF).
	RSS        float64
	ResidualDF int
	ResidualSD float64
	// RSquared is 1 − RSS/Σ(y − ȳ)² (1 − RSS/Σy² without an intercept).
	RSquared float64
	// ConditionNumber is the 2-norm condition number of the centred (with
	// an intercept), unit-length scaled predictor matrix.
	ConditionNumber float64
	// Warnings lists non-fatal problems: ill-conditioning, a refinement that
	// did not settle.
	Warnings []string
}

// SlopeIndex returns the position in Coefficients (and in the rows of
// Covariance) of predictor j: j+1 with an intercept, j without.
func (f *Fit) SlopeIndex(j int) int {
	if f.Intercept {
		return j + 1
	}
	return j
}

// OLS fits y on the predictors x (one slice per predictor, all of len(y))
// by ordinary least squares,
//
//	b = argmin ‖y − b₀ − X b‖²,   Cov(b) = s² (XᵀX)⁻¹,   s² = RSS/(n − p),
//
// with p the number of coefficients. X is never multiplied out into XᵀX and
// nothing is inverted: the predictors are centred (with an intercept) and
// scaled to unit length, factorized by Householder QR, and the solution and
// each column of (XᵀX)⁻¹ are refined against the original data with
// residuals computed in twice the working precision [1, 2]. On the NIST
// StRD linear-regression files this gives at least 13 correct digits in
// coefficients and SEs except on Filip (7.9 and 8.6), where the rounding of
// the data to binary already limits what any method can recover; plain QR
// without the refinement gave 6.8 digits on Wampler5 and 8.9 on Wampler4
// (measured; see ols_nist_test.go).
//
// Errors: ErrNoPredictors, ErrLengthMismatch, ErrNotFinite,
// ErrTooFewObservations (n must exceed p), ErrConstantOutcome (with an
// intercept, y without variance), and a *PredictorError wrapping
// ErrConstantPredictor or ErrCollinear (condition number above
// CollinearityLimit) naming the predictor.
//
// [1] Björck Å (1967). Iterative refinement of linear least squares
// solutions I. BIT 7:257–278.
// [2] Golub GH, Van Loan CF (2013). Matrix Computations, 4th ed., §5.3.
// Johns Hopkins University Press.
func OLS(y []float64, x [][]float64, opts Options) (*Fit, error) {
	if len(x) == 0 {
		return nil, fmt.Errorf("ols: %w", ErrNoPredictors)
	}
	n := len(y)
	if err := checkColumns(y, x); err != nil {
		return nil, fmt.Errorf("ols: %w", err)
	}
	intercept := !opts.NoIntercept
	p := len(x)
	if intercept {
		p++
	}
	if n <= p {
		return nil, fmt.Errorf("ols: %d observations for %d coefficients: %w", n, p, ErrTooFewObservations)
	}
	yMean := accurateMean(y)
	yss := centredSumOfSquares(y, yMean)
	if intercept && yss == 0 {
		return nil, fmt.Errorf("ols: %w", ErrConstantOutcome)
	}
	ls, constant := newLeastSquares(x, intercept)
	if constant >= 0 {
		return nil, fmt.Errorf("ols: %w", &PredictorError{Index: constant, Err: ErrConstantPredictor})
	}
	cond, worst := ls.condition()
	if cond > CollinearityLimit {
		return nil, fmt.Errorf("ols: %w", &PredictorError{Index: worst, Condition: cond, Err: ErrCollinear})
	}

	fit := &Fit{N: n, Predictors: len(x), Intercept: intercept, ConditionNumber: cond}
	if cond > ConditionWarning {
		fit.Warnings = append(fit.Warnings, fmt.Sprintf(
			"predictors are nearly collinear (condition number %.3g): coefficients are sensitive to the last digits of the data", cond))
	}
	theta, _, ok := ls.augmentedSolve(y, nil)
	if !ok {
		fit.Warnings = append(fit.Warnings, "iterative refinement of the coefficients did not settle; they may have lost digits")
	}
	fit.Coefficients = theta

	// RSS from residuals recomputed in twice the working precision, so that
	// an exact fit gives exactly 0.
	res, g := make([]float64, n), make([]float64, p)
	ls.residuals(y, nil, theta, make([]float64, n), res, g)
	var rss twiceFloat
	for _, v := range res {
		rss.addProduct(v, v)
	}
	fit.RSS = rss.value()
	fit.ResidualDF = n - p
	s2 := fit.RSS / float64(fit.ResidualDF)
	fit.ResidualSD = math.Sqrt(s2)
	if intercept {
		fit.RSquared = 1 - fit.RSS/yss
	} else {
		var sy twiceFloat
		for _, v := range y {
			sy.addProduct(v, v)
		}
		fit.RSquared = 1 - fit.RSS/sy.value()
	}

	// Column j of (XᵀX)⁻¹ solves [I X; Xᵀ 0][r; z] = [0; −e_j].
	inv := mat.NewDense(p, p, nil)
	rhs := make([]float64, p)
	settled := true
	for j := 0; j < p; j++ {
		rhs[j] = -1
		z, _, ok := ls.augmentedSolve(nil, rhs)
		rhs[j] = 0
		settled = settled && ok
		inv.SetCol(j, z)
	}
	if !settled {
		fit.Warnings = append(fit.Warnings, "iterative refinement of the covariance matrix did not settle; standard errors may have lost digits")
	}
	fit.Covariance = mat.NewSymDense(p, nil)
	fit.StandardErrors = make([]float64, p)
	for i := 0; i < p; i++ {
		for j := i; j < p; j++ {
			fit.Covariance.SetSym(i, j, s2*(inv.At(i, j)+inv.At(j, i))/2)
		}
		fit.StandardErrors[i] = math.Sqrt(fit.Covariance.At(i, i))
	}

	fit.OutcomeMean = yMean
	fit.OutcomeSD = math.Sqrt(yss / float64(n-1))
	fit.PredictorMeans = make([]float64, len(x))
	fit.PredictorSDs = make([]float64, len(x))
	fit.Standardized = make([]float64, len(x))
	fit.StandardizedSE = make([]float64, len(x))
	for j, col := range x {
		m := accurateMean(col)
		fit.PredictorMeans[j] = m
		fit.PredictorSDs[j] = math.Sqrt(centredSumOfSquares(col, m) / float64(n-1))
		ratio := fit.PredictorSDs[j] / fit.OutcomeSD
		fit.Standardized[j] = fit.Coefficients[fit.SlopeIndex(j)] * ratio
		fit.StandardizedSE[j] = fit.StandardErrors[fit.SlopeIndex(j)] * ratio
	}
	return fit, nil
}

// checkColumns checks lengths and finiteness of the outcome and predictors.
func checkColumns(y []float64, x [][]float64) error {
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("outcome row %d: %w", i, ErrNotFinite)
		}
	}
	for j, col := range x {
		if len(col) != len(y) {
			return fmt.Errorf("predictor %d has %d values, outcome %d: %w", j, len(col), len(y), ErrLengthMismatch)
		}
		for i, v := range col {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Errorf("predictor %d row %d: %w", j, i, ErrNotFinite)
			}
		}
	}
	return nil
}
