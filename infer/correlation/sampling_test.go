package correlation_test

import (
	"math"
	"math/rand/v2"
)

// pearsonFilonPsi is the large-sample n·Cov(r_jk, r_hm) of two sample
// correlations of a multivariate normal population with correlation matrix
// m, in the general form that covers shared indices:
//
//	ψ = ½ ρjk ρhm (ρjh² + ρjm² + ρkh² + ρkm²) + ρjh ρkm + ρjm ρkh
//	    − (ρjk ρjh ρjm + ρkj ρkh ρkm + ρhj ρhk ρhm + ρmj ρmk ρmh).
//
// Source: Steiger JH (1980), Psychological Bulletin 87:245–251, eq. 3,
// after Pearson & Filon (1898) — written from memory, not re-read. It is
// written here independently of the package's two special forms (Dunn &
// Clark's for a shared variable, the product form for none), and the tests
// check that the three agree on random matrices: a slip in any one of them
// would show. With j = h, k = m it gives (1 − ρjk²)², the variance of r.
func pearsonFilonPsi(m [][]float64, j, k, h, q int) float64 {
	r := func(a, b int) float64 { return m[a][b] }
	return 0.5*r(j, k)*r(h, q)*(r(j, h)*r(j, h)+r(j, q)*r(j, q)+r(k, h)*r(k, h)+r(k, q)*r(k, q)) +
		r(j, h)*r(k, q) + r(j, q)*r(k, h) -
		(r(j, k)*r(j, h)*r(j, q) + r(k, j)*r(k, h)*r(k, q) + r(h, j)*r(h, k)*r(h, q) + r(q, j)*r(q, k)*r(q, h))
}

// randomCorrelationMatrices returns count random p×p correlation matrices:
// the correlations of 2p standard normal columns mixed by a random matrix,
// so that they are positive definite and spread over (−1, 1).
func randomCorrelationMatrices(count, p int, seed uint64) [][][]float64 {
	rng := rand.New(rand.NewPCG(seed, 0x5eed))
	out := make([][][]float64, count)
	for c := range out {
		a := make([][]float64, p)
		for i := range a {
			a[i] = make([]float64, 2*p)
			for j := range a[i] {
				a[i][j] = rng.NormFloat64()
			}
		}
		cov := make([][]float64, p)
		for i := range cov {
			cov[i] = make([]float64, p)
			for j := range cov[i] {
				for l := range a[i] {
					cov[i][j] += a[i][l] * a[j][l]
				}
			}
		}
		m := make([][]float64, p)
		for i := range m {
			m[i] = make([]float64, p)
			for j := range m[i] {
				m[i][j] = cov[i][j] / math.Sqrt(cov[i][i]*cov[j][j])
			}
			m[i][i] = 1
		}
		out[c] = m
	}
	return out
}
