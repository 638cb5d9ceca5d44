package regress

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// SummaryCollinearityLimit is the condition number of the predictors'
// correlation matrix Rxx beyond which FromSummary refuses with ErrCollinear.
// Rxx is the cross-product of the centred, scaled design, so its condition
// number is the square of the design's; at 1e12 a solve keeps about 4
// digits, more than a table printed to two or three decimals carries.
const SummaryCollinearityLimit = 1e12

// correlationTolerance is how far a diagonal element may be from 1, or two
// mirror elements from each other, before the matrix is rejected: rounding
// of a computed matrix, not of a printed one (a printed table is symmetric
// by construction).
const correlationTolerance = 1e-10

// Summary is what a paper's correlation table gives for a regression.
type Summary struct {
	// Correlation is the (p+1)×(p+1) correlation matrix of (outcome,
	// predictor 1, …, predictor p): the outcome is variable 0.
	Correlation mat.Matrix
	// SDs are the standard deviations (divisor n − 1) in the same order;
	// nil when the table gives none, and then only standardized results
	// are computed.
	SDs []float64
	// Means are the means in the same order; nil when not given. They are
	// only used, with SDs, for the intercept.
	Means []float64
	// N is the sample size.
	N int
}

// SummaryFit is a regression reconstructed from summary statistics.
type SummaryFit struct {
	// N is the sample size and Predictors the number p of predictors.
	N, Predictors int
	// Standardized holds β = Rxx⁻¹ r_xy.
	Standardized []float64
	// RSquared is r_xyᵀ β; ResidualDF is N − p − 1.
	RSquared   float64
	ResidualDF int
	// StandardizedCov is the "standard method" (fixed-regressor) covariance
	// of β, (1 − R²)/(N − p − 1) · Rxx⁻¹, which equals Cov(b) s_x s_xᵀ/s_y²;
	// StandardizedSE its square-rooted diagonal.
	StandardizedCov *mat.SymDense
	StandardizedSE  []float64
	// StandardizedDeltaCov is the normal-theory delta-method covariance of β
	// for random regressors (see StandardizedDeltaCovariance);
	// StandardizedDeltaSE its square-rooted diagonal.
	StandardizedDeltaCov *mat.SymDense
	StandardizedDeltaSE  []float64

	// The unstandardized results exist only when SDs were given
	// (Unstandardized is then true).
	Unstandardized bool
	// Intercept reports whether Coefficients starts with the intercept
	// (SDs and Means given).
	Intercept bool
	// Coefficients are b_j = β_j s_y/s_xj, after the intercept
	// b₀ = ȳ − Σ b_j x̄_j when there is one.
	Coefficients []float64
	// StandardErrors and Covariance are the classical OLS ones,
	// s² (XᵀX)⁻¹, in the order of Coefficients.
	StandardErrors []float64
	Covariance     *mat.SymDense
	// ResidualSD is s = s_y √((N − 1)(1 − R²)/(N − p − 1)).
	ResidualSD float64
	// ConditionNumber is the condition number of Rxx (λmax/λmin).
	ConditionNumber float64
	// Warnings lists non-fatal problems.
	Warnings []string
}

// SlopeIndex returns the position of predictor j in Coefficients and in the
// rows of Covariance.
func (f *SummaryFit) SlopeIndex(j int) int {
	if f.Intercept {
		return j + 1
	}
	return j
}

// FromSummary reconstructs the OLS regression of variable 0 on variables
// 1..p from their correlation matrix R, optional SDs and means, and n:
//
//	β = Rxx⁻¹ r_xy                      (solved by Cholesky of Rxx)
//	R² = r_xyᵀ β,   df = n − p − 1
//	b_j = β_j s_y / s_xj,   b₀ = ȳ − Σ b_j x̄_j
//	s² = (n − 1) s_y² (1 − R²) / df
//	Cov(b) = s² (X_cᵀX_c)⁻¹ = s_y² (1 − R²)/df · D⁻¹ Rxx⁻¹ D⁻¹,  D = diag(s_x)
//	Var(b₀) = s²/n + x̄ᵀ Cov(b) x̄,   Cov(b₀, b) = −Cov(b) x̄
//
// X_cᵀX_c = (n − 1) D Rxx D is the centred cross-product matrix, so these are
// exactly s² (XᵀX)⁻¹ for the design with an intercept, written in the
// centred form that does not cancel; Rxx⁻¹ is obtained by Cholesky solves,
// never by inverting a matrix. The covariance of the standardized
// coefficients is given both by the standard (fixed-regressor) method [1]
// and by the normal-theory delta method for random regressors [2, 3].
//
// Errors: ErrNotCorrelationMatrix (not square, not symmetric, diagonal not
// 1, |r| > 1, not finite), *NotPositiveDefiniteError (carrying the smallest
// eigenvalue), ErrTooFewObservations (n ≤ p + 1), ErrBadSummary (SDs or
// means of the wrong length, SDs not positive, means without SDs), and a
// *PredictorError wrapping ErrCollinear when Rxx's condition number exceeds
// SummaryCollinearityLimit.
//
// [1] Cohen J, Cohen P, West SG, Aiken LS (2003). Applied Multiple
// Regression/Correlation Analysis for the Behavioral Sciences, 3rd ed.,
// p. 86. Erlbaum.
// [2] Yuan K-H, Chan W (2011). Biases and standard errors of standardized
// regression coefficients. Psychometrika 76(4):670–690.
// [3] Jones JA, Waller NG (2013). Computing confidence intervals for
// standardized regression coefficients. Psychological Methods
// 18(4):435–453.
func FromSummary(s Summary) (*SummaryFit, error) {
	r, err := checkCorrelation(s.Correlation)
	if err != nil {
		return nil, fmt.Errorf("regression from summary statistics: %w", err)
	}
	q := r.SymmetricDim()
	p := q - 1
	if s.N <= p+1 {
		return nil, fmt.Errorf("regression from summary statistics: n = %d with %d predictors (need n > p + 1): %w",
			s.N, p, ErrTooFewObservations)
	}
	if err := checkSDsAndMeans(s, q); err != nil {
		return nil, fmt.Errorf("regression from summary statistics: %w", err)
	}

	var full mat.Cholesky
	if !full.Factorize(r) {
		return nil, fmt.Errorf("regression from summary statistics: %w",
			&NotPositiveDefiniteError{MinEigenvalue: smallestEigenvalue(r)})
	}
	rxx := mat.NewSymDense(p, nil)
	rxy := mat.NewVecDense(p, nil)
	for i := 0; i < p; i++ {
		rxy.SetVec(i, r.At(i+1, 0))
		for j := i; j < p; j++ {
			rxx.SetSym(i, j, r.At(i+1, j+1))
		}
	}
	var chol mat.Cholesky
	cond := conditionOfSymmetric(rxx)
	if !chol.Factorize(rxx) || cond > SummaryCollinearityLimit {
		return nil, fmt.Errorf("regression from summary statistics: %w",
			&PredictorError{Index: weakestPivot(rxx), Condition: cond, Err: ErrCollinear})
	}

	fit := &SummaryFit{N: s.N, Predictors: p, ResidualDF: s.N - p - 1, ConditionNumber: cond}
	if cond > 1e8 {
		fit.Warnings = append(fit.Warnings, fmt.Sprintf(
			"predictors are nearly collinear (condition number of their correlation matrix %.3g): rounding of the printed correlations moves the coefficients", cond))
	}
	var beta mat.VecDense
	if err := chol.SolveVecTo(&beta, rxy); err != nil {
		return nil, fmt.Errorf("regression from summary statistics: solving for β: %w", err)
	}
	fit.Standardized = make([]float64, p)
	for j := range fit.Standardized {
		fit.Standardized[j] = beta.AtVec(j)
	}
	fit.RSquared = mat.Dot(rxy, &beta)
	unexplained := 1 - fit.RSquared
	if !(unexplained > 0) {
		return nil, fmt.Errorf("regression from summary statistics: R² = %v: %w",
			fit.RSquared, &NotPositiveDefiniteError{MinEigenvalue: smallestEigenvalue(r)})
	}

	rinv, err := inverseBySolves(&chol, p)
	if err != nil {
		return nil, fmt.Errorf("regression from summary statistics: %w", err)
	}
	df := float64(fit.ResidualDF)
	fit.StandardizedCov = mat.NewSymDense(p, nil)
	fit.StandardizedCov.ScaleSym(unexplained/df, rinv)
	fit.StandardizedSE = sqrtDiagonal(fit.StandardizedCov)
	fit.StandardizedDeltaCov = standardizedDeltaCov(r, fit.Standardized, rinv, s.N)
	fit.StandardizedDeltaSE = sqrtDiagonal(fit.StandardizedDeltaCov)

	if s.SDs != nil {
		unstandardize(fit, s, rinv)
	}
	return fit, nil
}

// unstandardize adds the coefficients in the variables' units.
func unstandardize(fit *SummaryFit, s Summary, rinv *mat.SymDense) {
	p, sy := fit.Predictors, s.SDs[0]
	fit.Unstandardized = true
	fit.Intercept = s.Means != nil
	df := float64(fit.ResidualDF)
	s2 := float64(s.N-1) * sy * sy * (1 - fit.RSquared) / df
	fit.ResidualSD = math.Sqrt(s2)
	slopes := make([]float64, p)
	covb := mat.NewSymDense(p, nil)
	for i := 0; i < p; i++ {
		slopes[i] = fit.Standardized[i] * sy / s.SDs[i+1]
		for j := i; j < p; j++ {
			covb.SetSym(i, j, sy*sy*(1-fit.RSquared)/df*rinv.At(i, j)/(s.SDs[i+1]*s.SDs[j+1]))
		}
	}
	if !fit.Intercept {
		fit.Coefficients = slopes
		fit.Covariance = covb
		fit.StandardErrors = sqrtDiagonal(covb)
		return
	}
	xbar := mat.NewVecDense(p, s.Means[1:])
	var cx mat.VecDense
	cx.MulVec(covb, xbar)
	var b0 twiceFloat
	b0.add(s.Means[0])
	for j, b := range slopes {
		b0.addProduct(-b, s.Means[j+1])
	}
	fit.Coefficients = append([]float64{b0.value()}, slopes...)
	cov := mat.NewSymDense(p+1, nil)
	cov.SetSym(0, 0, s2/float64(s.N)+mat.Dot(xbar, &cx))
	for i := 0; i < p; i++ {
		cov.SetSym(0, i+1, -cx.AtVec(i))
		for j := i; j < p; j++ {
			cov.SetSym(i+1, j+1, covb.At(i, j))
		}
	}
	fit.Covariance = cov
	fit.StandardErrors = sqrtDiagonal(cov)
}

// checkCorrelation validates a correlation matrix and returns it as a
// SymDense with both triangles as given (after the symmetry check).
func checkCorrelation(m mat.Matrix) (*mat.SymDense, error) {
	if m == nil {
		return nil, fmt.Errorf("no correlation matrix: %w", ErrNotCorrelationMatrix)
	}
	rows, cols := m.Dims()
	if rows != cols {
		return nil, fmt.Errorf("%d×%d matrix is not square: %w", rows, cols, ErrNotCorrelationMatrix)
	}
	if rows < 2 {
		return nil, fmt.Errorf("%d×%d matrix has no predictor: %w", rows, cols, ErrNoPredictors)
	}
	r := mat.NewSymDense(rows, nil)
	for i := 0; i < rows; i++ {
		for j := 0; j < rows; j++ {
			v := m.At(i, j)
			switch {
			case math.IsNaN(v) || math.IsInf(v, 0):
				return nil, fmt.Errorf("entry (%d, %d) = %v: %w", i, j, v, ErrNotCorrelationMatrix)
			case i == j && math.Abs(v-1) > correlationTolerance:
				return nil, fmt.Errorf("diagonal entry (%d, %d) = %v, not 1: %w", i, j, v, ErrNotCorrelationMatrix)
			case math.Abs(v) > 1:
				return nil, fmt.Errorf("entry (%d, %d) = %v outside [−1, 1]: %w", i, j, v, ErrNotCorrelationMatrix)
			case math.Abs(v-m.At(j, i)) > correlationTolerance:
				return nil, fmt.Errorf("entries (%d, %d) = %v and (%d, %d) = %v differ: %w",
					i, j, v, j, i, m.At(j, i), ErrNotCorrelationMatrix)
			}
			if j >= i {
				if i == j {
					v = 1
				}
				r.SetSym(i, j, v)
			}
		}
	}
	return r, nil
}

// checkSDsAndMeans validates the optional SDs and means.
func checkSDsAndMeans(s Summary, q int) error {
	if s.SDs == nil {
		if s.Means != nil {
			return fmt.Errorf("means without standard deviations: %w", ErrBadSummary)
		}
		return nil
	}
	if len(s.SDs) != q {
		return fmt.Errorf("%d standard deviations for %d variables: %w", len(s.SDs), q, ErrBadSummary)
	}
	for i, v := range s.SDs {
		if !(v > 0) || math.IsInf(v, 0) {
			return fmt.Errorf("standard deviation %d = %v: %w", i, v, ErrBadSummary)
		}
	}
	if s.Means != nil {
		if len(s.Means) != q {
			return fmt.Errorf("%d means for %d variables: %w", len(s.Means), q, ErrBadSummary)
		}
		for i, v := range s.Means {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Errorf("mean %d = %v: %w", i, v, ErrBadSummary)
			}
		}
	}
	return nil
}

// smallestEigenvalue returns the smallest eigenvalue of a symmetric matrix
// (NaN if the decomposition fails).
func smallestEigenvalue(a mat.Symmetric) float64 {
	var eig mat.EigenSym
	if !eig.Factorize(a, false) {
		return math.NaN()
	}
	return eig.Values(nil)[0] // ascending
}

// conditionOfSymmetric returns λmax/λmin of a symmetric matrix, +Inf when it
// is singular or indefinite.
func conditionOfSymmetric(a mat.Symmetric) float64 {
	var eig mat.EigenSym
	if !eig.Factorize(a, false) {
		return math.Inf(1)
	}
	v := eig.Values(nil)
	if v[0] <= 0 {
		return math.Inf(1)
	}
	return v[len(v)-1] / v[0]
}

// weakestPivot returns the predictor with the smallest pivot of an
// unpivoted Cholesky-like elimination of Rxx: the pivot of variable j is
// 1 − R² of j on the variables before it, so the smallest names the
// predictor best explained by the others.
func weakestPivot(rxx *mat.SymDense) int {
	p := rxx.SymmetricDim()
	a := mat.NewDense(p, p, nil)
	a.Copy(rxx)
	worst, small := p-1, math.Inf(1)
	for j := 0; j < p; j++ {
		d := a.At(j, j)
		if d < small {
			worst, small = j, d
		}
		if !(d > 0) {
			break
		}
		for i := j + 1; i < p; i++ {
			f := a.At(i, j) / d
			for k := j + 1; k < p; k++ {
				a.Set(i, k, a.At(i, k)-f*a.At(j, k))
			}
		}
	}
	return worst
}

// inverseBySolves returns A⁻¹ from the Cholesky factor of A by solving
// A Z = I, symmetrized.
func inverseBySolves(chol *mat.Cholesky, p int) (*mat.SymDense, error) {
	id := mat.NewDiagDense(p, nil)
	for i := 0; i < p; i++ {
		id.SetDiag(i, 1)
	}
	var z mat.Dense
	if err := chol.SolveTo(&z, id); err != nil {
		return nil, fmt.Errorf("solving with the predictors' correlation matrix: %w", err)
	}
	out := mat.NewSymDense(p, nil)
	for i := 0; i < p; i++ {
		for j := i; j < p; j++ {
			out.SetSym(i, j, (z.At(i, j)+z.At(j, i))/2)
		}
	}
	return out, nil
}

// sqrtDiagonal returns the square roots of a covariance matrix's diagonal.
func sqrtDiagonal(c mat.Symmetric) []float64 {
	n := c.SymmetricDim()
	out := make([]float64, n)
	for i := range out {
		out[i] = math.Sqrt(c.At(i, i))
	}
	return out
}

// SummarizeData returns the Summary of raw data: the correlation matrix,
// SDs (divisor n − 1) and means of (y, x₁, …, x_p), computed with centred
// two-pass sums. It is what a paper's correlation table would have printed,
// unrounded, and lets callers feed raw data to FromSummary (e.g. for the
// delta-method covariance of standardized coefficients).
//
// Errors: ErrNoPredictors, ErrLengthMismatch, ErrNotFinite,
// ErrTooFewObservations (fewer than 2 rows), ErrConstantOutcome and a
// *PredictorError wrapping ErrConstantPredictor for a variable without
// variance.
func SummarizeData(y []float64, x [][]float64) (Summary, error) {
	if len(x) == 0 {
		return Summary{}, fmt.Errorf("summarizing data: %w", ErrNoPredictors)
	}
	if err := checkColumns(y, x); err != nil {
		return Summary{}, fmt.Errorf("summarizing data: %w", err)
	}
	n := len(y)
	if n < 2 {
		return Summary{}, fmt.Errorf("summarizing data: %d rows: %w", n, ErrTooFewObservations)
	}
	vars := append([][]float64{y}, x...)
	q := len(vars)
	means, ss := make([]float64, q), make([]float64, q)
	for i, v := range vars {
		means[i] = accurateMean(v)
		ss[i] = centredSumOfSquares(v, means[i])
		if ss[i] == 0 {
			if i == 0 {
				return Summary{}, fmt.Errorf("summarizing data: %w", ErrConstantOutcome)
			}
			return Summary{}, fmt.Errorf("summarizing data: %w", &PredictorError{Index: i - 1, Err: ErrConstantPredictor})
		}
	}
	r := mat.NewSymDense(q, nil)
	sds := make([]float64, q)
	for a := 0; a < q; a++ {
		sds[a] = math.Sqrt(ss[a] / float64(n-1))
		r.SetSym(a, a, 1)
		for b := a + 1; b < q; b++ {
			var acc twiceFloat
			for i := 0; i < n; i++ {
				acc.addProduct(vars[a][i]-means[a], vars[b][i]-means[b])
			}
			r.SetSym(a, b, math.Max(-1, math.Min(1, acc.value()/math.Sqrt(ss[a]*ss[b]))))
		}
	}
	return Summary{Correlation: r, SDs: sds, Means: means, N: n}, nil
}
