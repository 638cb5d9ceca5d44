package regress

import (
	"fmt"

	"gonum.org/v1/gonum/mat"
)

// StandardizedDeltaCovariance returns the normal-theory delta-method
// covariance matrix of the standardized coefficients β̂ for random
// regressors, from the summary statistics s (only the correlation matrix and
// n are used; SDs and means may be nil). It is FromSummary's
// StandardizedDeltaCov.
//
// Derivation (analytic Jacobian, no numerical differentiation). Write S for
// the covariance matrix of (y, x), b = Sxx⁻¹ s_xy and β_j = b_j √(s_jj/s_yy).
// For a symmetric perturbation dS, dβ_j = tr(G_j dS) with the symmetric
// gradient (c_j = √(s_jj/s_yy), a_j = row j of Sxx⁻¹, index 0 = y)
//
//	G_j = c_j · [ −b_j/(2 s_yy)   a_jᵀ/2                                 ]
//	            [  a_j/2          −(a_j bᵀ + b a_jᵀ)/2 + b_j/(2 s_jj) e_j e_jᵀ ]
//
// (from db = Sxx⁻¹(ds_xy − dSxx b) and d log c_j = (ds_jj/s_jj − ds_yy/s_yy)/2).
// Under multivariate normality the asymptotic covariance of vech(S) is
// 2 D⁺(Σ⊗Σ)D⁺ᵀ/n [1, 2], i.e. Cov(dS_ab, dS_cd) = (σ_ac σ_bd + σ_ad σ_bc)/n,
// so that
//
//	Cov(β̂_j, β̂_k) = J Γ Jᵀ = (2/n) tr(G_j Σ G_k Σ).
//
// β is unchanged by rescaling the variables, and so is this covariance, so
// it is evaluated at the correlation matrix (all s = 1, b = β). The divisor is
// the sample size n, as in [3]; the diagonal agrees with the closed form
// given there (checked in the tests), and for one predictor it reduces to
// (1 − r²)²/n, the large-sample variance of a correlation.
//
// Errors: as FromSummary.
//
// [1] Browne MW (1984). Asymptotically distribution-free methods for the
// analysis of covariance structures. British Journal of Mathematical and
// Statistical Psychology 37:62–83.
// [2] Magnus JR, Neudecker H (1999). Matrix Differential Calculus with
// Applications in Statistics and Econometrics, rev. ed. Wiley.
// [3] Yuan K-H, Chan W (2011). Biases and standard errors of standardized
// regression coefficients. Psychometrika 76(4):670–690.
// [4] Jones JA, Waller NG (2013). Computing confidence intervals for
// standardized regression coefficients. Psychological Methods
// 18(4):435–453.
func StandardizedDeltaCovariance(s Summary) (*mat.SymDense, error) {
	s.SDs, s.Means = nil, nil
	fit, err := FromSummary(s)
	if err != nil {
		return nil, fmt.Errorf("delta-method covariance: %w", err)
	}
	return fit.StandardizedDeltaCov, nil
}

// standardizedDeltaCov evaluates (2/n) tr(G_j R G_k R) at the correlation
// matrix r (outcome first), with β and Rxx⁻¹ already computed.
func standardizedDeltaCov(r *mat.SymDense, beta []float64, rinv *mat.SymDense, n int) *mat.SymDense {
	q := r.SymmetricDim()
	p := q - 1
	gr := make([]*mat.Dense, p) // G_j R
	g := mat.NewDense(q, q, nil)
	for j := 0; j < p; j++ {
		g.Zero()
		g.Set(0, 0, -beta[j]/2)
		for k := 0; k < p; k++ {
			a := rinv.At(j, k)
			g.Set(0, k+1, a/2)
			g.Set(k+1, 0, a/2)
			for l := 0; l < p; l++ {
				g.Set(k+1, l+1, -(a*beta[l]+rinv.At(j, l)*beta[k])/2)
			}
		}
		g.Set(j+1, j+1, g.At(j+1, j+1)+beta[j]/2)
		gr[j] = mat.NewDense(q, q, nil)
		gr[j].Mul(g, r)
	}
	cov := mat.NewSymDense(p, nil)
	for j := 0; j < p; j++ {
		for k := j; k < p; k++ {
			var tr twiceFloat
			for a := 0; a < q; a++ {
				for b := 0; b < q; b++ {
					tr.addProduct(gr[j].At(a, b), gr[k].At(b, a))
				}
			}
			cov.SetSym(j, k, 2*tr.value()/float64(n))
		}
	}
	return cov
}
