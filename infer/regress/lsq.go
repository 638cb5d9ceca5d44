package regress

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

const (
	// maxRefinement bounds the refinement steps. On the NIST StRD files the
	// corrections reach rounding level in 2–4 steps.
	maxRefinement = 30
	// refinementTolerance: a correction below this (relative, in the scaled
	// coordinates) is rounding noise and the iteration stops.
	refinementTolerance = 4 * 0x1p-52
)

// leastSquares holds a model y ≈ A θ, where A is the full design (a column
// of ones when there is an intercept, then the predictors), together with a
// Householder QR factorization of the predictors after centring (when there
// is an intercept) and scaling each column to unit length. The factorization
// is used only as an approximate solver inside an iterative refinement of
// the augmented system (Björck 1967) whose residuals are computed from the
// original data in twice the working precision, so that the result is close
// to the exact least-squares solution for the data as given. Plain QR on the
// centred and scaled design loses about log10 of the condition number
// squared times the relative residual — several digits on Filip.
//
// References:
// Björck Å (1967). Iterative refinement of linear least squares solutions I.
// BIT 7:257–278.
// Golub GH, Van Loan CF (2013). Matrix Computations, 4th ed., §5.3. Johns
// Hopkins University Press.
type leastSquares struct {
	n, k      int
	intercept bool
	x         [][]float64 // predictor columns, not copied
	mean      []float64   // predictor means (0 without an intercept)
	scale     []float64   // length of each centred column
	qr        mat.QR
	r         *mat.Dense // the k×k triangular factor

	// work space for the approximate solves
	vecN *mat.VecDense
	vecK *mat.VecDense
	outN *mat.VecDense
	outK *mat.VecDense
	work []float64 // refinement vectors, shared by successive solves
}

// params is the number of coefficients, intercept included.
func (ls *leastSquares) params() int {
	if ls.intercept {
		return ls.k + 1
	}
	return ls.k
}

// newLeastSquares centres and scales the predictors and factorizes them.
// It returns the index of a predictor whose centred column is zero to
// rounding (a constant, or without an intercept an all-zero column), or −1.
func newLeastSquares(x [][]float64, intercept bool) (*leastSquares, int) {
	n, k := len(x[0]), len(x)
	ls := &leastSquares{n: n, k: k, intercept: intercept, x: x,
		mean: make([]float64, k), scale: make([]float64, k)}
	a := mat.NewDense(n, k, nil)
	for j, col := range x {
		m := 0.0
		if intercept {
			m = accurateMean(col)
		}
		ls.mean[j] = m
		ls.scale[j] = math.Sqrt(centredSumOfSquares(col, m))
		biggest := 0.0
		for _, v := range col {
			biggest = math.Max(biggest, math.Abs(v))
		}
		// Centring a constant leaves only the rounding of its mean: about
		// eps·|x| per row.
		if ls.scale[j] <= 8*0x1p-52*math.Sqrt(float64(n))*biggest || ls.scale[j] == 0 {
			return nil, j
		}
		for i, v := range col {
			a.Set(i, j, (v-m)/ls.scale[j])
		}
	}
	ls.qr.Factorize(a)
	full := mat.NewDense(n, k, nil)
	ls.qr.RTo(full)
	ls.r = mat.DenseCopyOf(full.Slice(0, k, 0, k))
	ls.vecN = mat.NewVecDense(n, nil)
	ls.outN = mat.NewVecDense(n, nil)
	ls.vecK = mat.NewVecDense(k, nil)
	ls.outK = mat.NewVecDense(k, nil)
	return ls, -1
}

// condition returns the 2-norm condition number of the centred, scaled
// predictor matrix (from the singular values of R) and the predictor whose
// diagonal element of R is smallest: in an unpivoted QR, |R_jj| is the
// distance of column j from the span of the columns before it, so that is
// the predictor best explained by the others.
func (ls *leastSquares) condition() (float64, int) {
	var svd mat.SVD
	if !svd.Factorize(ls.r, mat.SVDNone) {
		return math.Inf(1), ls.k - 1
	}
	sv := svd.Values(nil)
	worst, small := 0, math.Inf(1)
	for j := 0; j < ls.k; j++ {
		if d := math.Abs(ls.r.At(j, j)); d < small {
			worst, small = j, d
		}
	}
	if sv[len(sv)-1] == 0 {
		return math.Inf(1), worst
	}
	return sv[0] / sv[len(sv)-1], worst
}

// residuals computes, in twice the working precision,
//
//	f = b − r − A θ   and   g = c − Aᵀ r,
//
// the residuals of the augmented system [I A; Aᵀ 0][r; θ] = [b; c]. A nil
// b or c stands for zeros.
func (ls *leastSquares) residuals(b, c, theta, r, f, g []float64) {
	off := 0
	if ls.intercept {
		off = 1
	}
	for i := 0; i < ls.n; i++ {
		var acc twiceFloat
		if b != nil {
			acc.add(b[i])
		}
		acc.add(-r[i])
		if ls.intercept {
			acc.add(-theta[0])
		}
		for j, col := range ls.x {
			acc.addProduct(-col[i], theta[off+j])
		}
		f[i] = acc.value()
	}
	if ls.intercept {
		var acc twiceFloat
		if c != nil {
			acc.add(c[0])
		}
		for _, v := range r {
			acc.add(-v)
		}
		g[0] = acc.value()
	}
	for j, col := range ls.x {
		var acc twiceFloat
		if c != nil {
			acc.add(c[off+j])
		}
		for i, v := range col {
			acc.addProduct(-v, r[i])
		}
		g[off+j] = acc.value()
	}
}

// solve sets dst to the least-squares solution of A δ = w through the
// factorization: the slopes from the centred, scaled problem, the intercept
// from the means.
func (ls *leastSquares) solve(dst, w []float64) {
	wbar := 0.0
	if ls.intercept {
		wbar = accurateMean(w)
	}
	for i, v := range w {
		ls.vecN.SetVec(i, v-wbar)
	}
	// The condition number was checked before any solve; the error gonum
	// returns only repeats that check.
	_ = ls.qr.SolveVecTo(ls.outK, false, ls.vecN)
	off := 0
	if ls.intercept {
		off = 1
		dst[0] = wbar
	}
	for j := 0; j < ls.k; j++ {
		d := ls.outK.AtVec(j) / ls.scale[j]
		dst[off+j] = d
		if ls.intercept {
			dst[0] -= ls.mean[j] * d
		}
	}
}

// solveTransposed sets dst to the minimum-norm solution u of Aᵀ u = g:
// with an intercept, u = g₀/n + u_c where u_c solves X_cᵀ u_c = g_x − x̄ g₀.
func (ls *leastSquares) solveTransposed(dst, g []float64) {
	off, g0 := 0, 0.0
	if ls.intercept {
		off, g0 = 1, g[0]
	}
	for j := 0; j < ls.k; j++ {
		ls.vecK.SetVec(j, (g[off+j]-ls.mean[j]*g0)/ls.scale[j])
	}
	_ = ls.qr.SolveVecTo(ls.outN, true, ls.vecK)
	for i := range dst {
		dst[i] = ls.outN.AtVec(i) + g0/float64(ls.n)
	}
}

// mulA sets dst = A θ in working precision (only used for the update of r,
// whose error the next residual evaluation sees and corrects).
func (ls *leastSquares) mulA(dst, theta []float64) {
	off := 0
	if ls.intercept {
		off = 1
	}
	for i := range dst {
		s := 0.0
		if ls.intercept {
			s = theta[0]
		}
		for j, col := range ls.x {
			s += col[i] * theta[off+j]
		}
		dst[i] = s
	}
}

// coordinateScale is the length of the column of A that multiplies θ_j
// (√n for the intercept), so that corrections are compared on the scale of
// their effect on the fit.
func (ls *leastSquares) coordinateScale(j int) float64 {
	if ls.intercept {
		if j == 0 {
			return math.Sqrt(float64(ls.n))
		}
		j--
	}
	return ls.scale[j]
}

// augmentedSolve solves [I A; Aᵀ 0][r; θ] = [b; c] by iterative refinement.
// With c = 0 it is the least-squares fit of b (r its residual); with b = 0
// and c = −e_j, θ is column j of (AᵀA)⁻¹. Each step: f, g = residuals;
// u = A⁺ᵀ g (minimum norm); δθ = A⁺(f − u); δr = f − A δθ. It reports
// whether the corrections fell to rounding level.
func (ls *leastSquares) augmentedSolve(b, c []float64) (theta, r []float64, converged bool) {
	n, m := ls.n, ls.params()
	theta, r = make([]float64, m), make([]float64, n)
	if ls.work == nil {
		ls.work = make([]float64, 4*n+2*m)
	}
	f, u, w, ad := ls.work[:n], ls.work[n:2*n], ls.work[2*n:3*n], ls.work[3*n:4*n]
	g, dtheta := ls.work[4*n:4*n+m], ls.work[4*n+m:]
	for it := 0; it < maxRefinement; it++ {
		ls.residuals(b, c, theta, r, f, g)
		ls.solveTransposed(u, g)
		for i := range w {
			w[i] = f[i] - u[i]
		}
		ls.solve(dtheta, w)
		ls.mulA(ad, dtheta)
		for i := range r {
			r[i] += f[i] - ad[i]
		}
		step, size := 0.0, 0.0
		for j := range theta {
			theta[j] += dtheta[j]
			s := ls.coordinateScale(j)
			step = math.Max(step, math.Abs(dtheta[j])*s)
			size = math.Max(size, math.Abs(theta[j])*s)
		}
		if it > 0 && step <= refinementTolerance*size {
			return theta, r, true
		}
	}
	return theta, r, false
}
