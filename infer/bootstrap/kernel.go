package bootstrap

import (
	"math"
	"math/rand/v2"
)

// pivotTolerance: a Cholesky pivot of the resample's predictor
// cross-product matrix below this fraction of its diagonal element means
// 1 − R² of that predictor on the ones before it is < 1e-13 — the resample
// is degenerate (e.g. a predictor that took a single value in it) and its
// statistic is not computed.
const pivotTolerance = 1e-13

// varianceTolerance: a resample whose centred sum of squares of a variable
// is below this fraction of its sum of squares around the full-sample mean
// holds that variable constant (to rounding), and is degenerate.
const varianceTolerance = 1e-10

// kernel computes the compared difference from centred cross-products. All
// its buffers are allocated once per worker: O(q²) memory, no allocation per
// resample. Variable 0 is the outcome, 1..k the predictors.
type kernel struct {
	n, q, k      int
	cols         [][]float64 // data columns (outcome, predictors), not copied
	mean         []float64   // full-sample means the sums are taken around
	a, b         int         // compared predictors, 1-based variable positions
	standardized bool

	z     []float64 // one centred row
	sum   []float64 // Σ w_i z_i
	cross []float64 // packed upper triangle of Σ w_i z_i z_iᵀ
	m     []float64 // q×q centred cross-product matrix of the resample
	l     []float64 // k×k Cholesky factor
	coef  []float64 // k slopes
}

func newKernel(cols [][]float64, mean []float64, a, b int, standardized bool) *kernel {
	q := len(cols)
	k := q - 1
	return &kernel{
		n: len(cols[0]), q: q, k: k,
		cols: cols, mean: mean,
		a: a, b: b, standardized: standardized,
		z:     make([]float64, q),
		sum:   make([]float64, q),
		cross: make([]float64, q*(q+1)/2),
		m:     make([]float64, q*q),
		l:     make([]float64, k*k),
		coef:  make([]float64, k),
	}
}

// resample draws n row indices with rng.IntN(n) and accumulates the sums
// around the full-sample means, reading the rows straight from the data
// columns. Centring at the full-sample mean first keeps the sums free of
// cancellation: the resample mean differs from it by O(s/√n), and the
// correction Σ w z zᵀ − (Σ w z)(Σ w z)ᵀ/n is then a small adjustment.
func (kn *kernel) resample(rng *rand.Rand) {
	clear(kn.sum)
	clear(kn.cross)
	switch kn.q {
	case 3:
		kn.resample3(rng)
	case 4:
		kn.resample4(rng)
	case 5:
		kn.resample5(rng)
	case 6:
		kn.resample6(rng)
	default:
		kn.resampleAny(rng)
	}
}

// resampleAny is the general accumulation loop.
func (kn *kernel) resampleAny(rng *rand.Rand) {
	n, q := kn.n, kn.q
	z, sum, cross, mean := kn.z[:q], kn.sum[:q], kn.cross, kn.mean[:q]
	cols := kn.cols[:q]
	for range n {
		i := rng.IntN(n)
		for v, col := range cols {
			z[v] = col[i] - mean[v]
		}
		pos := 0
		for a, za := range z {
			sum[a] += za
			row := cross[pos : pos+q-a]
			for b, zb := range z[a:] {
				row[b] += za * zb
			}
			pos += q - a
		}
	}
}

// resample3 is resampleAny unrolled for an outcome and two predictors.
func (kn *kernel) resample3(rng *rand.Rand) {
	n := kn.n
	c0, c1, c2 := kn.cols[0][:n], kn.cols[1][:n], kn.cols[2][:n]
	m0, m1, m2 := kn.mean[0], kn.mean[1], kn.mean[2]
	var s0, s1, s2, p00, p01, p02, p11, p12, p22 float64
	for range n {
		i := rng.IntN(n)
		z0, z1, z2 := c0[i]-m0, c1[i]-m1, c2[i]-m2
		s0, s1, s2 = s0+z0, s1+z1, s2+z2
		p00, p01, p02 = p00+z0*z0, p01+z0*z1, p02+z0*z2
		p11, p12, p22 = p11+z1*z1, p12+z1*z2, p22+z2*z2
	}
	copy(kn.sum, []float64{s0, s1, s2})
	copy(kn.cross, []float64{p00, p01, p02, p11, p12, p22})
}

// resample4 is resampleAny unrolled for an outcome and three predictors.
func (kn *kernel) resample4(rng *rand.Rand) {
	n := kn.n
	c0, c1, c2, c3 := kn.cols[0][:n], kn.cols[1][:n], kn.cols[2][:n], kn.cols[3][:n]
	m0, m1, m2, m3 := kn.mean[0], kn.mean[1], kn.mean[2], kn.mean[3]
	var s [4]float64
	var p [10]float64
	for range n {
		i := rng.IntN(n)
		z0, z1, z2, z3 := c0[i]-m0, c1[i]-m1, c2[i]-m2, c3[i]-m3
		s[0], s[1], s[2], s[3] = s[0]+z0, s[1]+z1, s[2]+z2, s[3]+z3
		p[0], p[1], p[2], p[3] = p[0]+z0*z0, p[1]+z0*z1, p[2]+z0*z2, p[3]+z0*z3
		p[4], p[5], p[6] = p[4]+z1*z1, p[5]+z1*z2, p[6]+z1*z3
		p[7], p[8], p[9] = p[7]+z2*z2, p[8]+z2*z3, p[9]+z3*z3
	}
	copy(kn.sum, s[:])
	copy(kn.cross, p[:])
}

// resample5 is resampleAny unrolled for an outcome and four predictors.
func (kn *kernel) resample5(rng *rand.Rand) {
	n := kn.n
	c0, c1, c2, c3, c4 := kn.cols[0][:n], kn.cols[1][:n], kn.cols[2][:n], kn.cols[3][:n], kn.cols[4][:n]
	m0, m1, m2, m3, m4 := kn.mean[0], kn.mean[1], kn.mean[2], kn.mean[3], kn.mean[4]
	var s [5]float64
	var p [15]float64
	for range n {
		i := rng.IntN(n)
		z0, z1, z2, z3, z4 := c0[i]-m0, c1[i]-m1, c2[i]-m2, c3[i]-m3, c4[i]-m4
		s[0], s[1], s[2], s[3], s[4] = s[0]+z0, s[1]+z1, s[2]+z2, s[3]+z3, s[4]+z4
		p[0], p[1], p[2], p[3], p[4] = p[0]+z0*z0, p[1]+z0*z1, p[2]+z0*z2, p[3]+z0*z3, p[4]+z0*z4
		p[5], p[6], p[7], p[8] = p[5]+z1*z1, p[6]+z1*z2, p[7]+z1*z3, p[8]+z1*z4
		p[9], p[10], p[11] = p[9]+z2*z2, p[10]+z2*z3, p[11]+z2*z4
		p[12], p[13], p[14] = p[12]+z3*z3, p[13]+z3*z4, p[14]+z4*z4
	}
	copy(kn.sum, s[:])
	copy(kn.cross, p[:])
}

// resample6 is resampleAny unrolled for an outcome and five predictors (the
// benchmark's shape).
func (kn *kernel) resample6(rng *rand.Rand) {
	n := kn.n
	c0, c1, c2 := kn.cols[0][:n], kn.cols[1][:n], kn.cols[2][:n]
	c3, c4, c5 := kn.cols[3][:n], kn.cols[4][:n], kn.cols[5][:n]
	m0, m1, m2, m3, m4, m5 := kn.mean[0], kn.mean[1], kn.mean[2], kn.mean[3], kn.mean[4], kn.mean[5]
	var s [6]float64
	var p [21]float64
	for range n {
		i := rng.IntN(n)
		z0, z1, z2, z3, z4, z5 := c0[i]-m0, c1[i]-m1, c2[i]-m2, c3[i]-m3, c4[i]-m4, c5[i]-m5
		s[0], s[1], s[2], s[3], s[4], s[5] = s[0]+z0, s[1]+z1, s[2]+z2, s[3]+z3, s[4]+z4, s[5]+z5
		p[0], p[1], p[2], p[3], p[4], p[5] = p[0]+z0*z0, p[1]+z0*z1, p[2]+z0*z2, p[3]+z0*z3, p[4]+z0*z4, p[5]+z0*z5
		p[6], p[7], p[8], p[9], p[10] = p[6]+z1*z1, p[7]+z1*z2, p[8]+z1*z3, p[9]+z1*z4, p[10]+z1*z5
		p[11], p[12], p[13], p[14] = p[11]+z2*z2, p[12]+z2*z3, p[13]+z2*z4, p[14]+z2*z5
		p[15], p[16], p[17] = p[15]+z3*z3, p[16]+z3*z4, p[17]+z3*z5
		p[18], p[19], p[20] = p[18]+z4*z4, p[19]+z4*z5, p[20]+z5*z5
	}
	copy(kn.sum, s[:])
	copy(kn.cross, p[:])
}

// statistic turns packed sums (cross, sum) over count rows into the compared
// difference: the centred cross-product matrix is
//
//	M = Σ w z zᵀ − (Σ w z)(Σ w z)ᵀ / count,
//
// the slopes solve Mxx b = m_xy by Cholesky, and the difference is
// b_a √(M_aa/M_yy) − b_b √(M_bb/M_yy) (standardized; the n − 1 divisors
// cancel) or b_a − b_b. It returns NaN for a degenerate resample: a
// variable without variance in it, or predictors collinear in it.
func (kn *kernel) statistic(cross, sum []float64, count float64) float64 {
	q, k := kn.q, kn.k
	m := kn.m
	pos := 0
	for a := 0; a < q; a++ {
		for b := a; b < q; b++ {
			v := cross[pos] - sum[a]*sum[b]/count
			// A variable constant in the resample leaves only the rounding
			// of this subtraction, ~1e-16 of Σ w z²: compare with that
			// scale, not with v itself.
			if a == b && !(v > varianceTolerance*cross[pos]) {
				return math.NaN()
			}
			m[a*q+b], m[b*q+a] = v, v
			pos++
		}
	}
	// Cholesky of Mxx = L Lᵀ (lower triangle of l, row-major k×k).
	l := kn.l
	for j := 0; j < k; j++ {
		d := m[(j+1)*q+j+1]
		for c := 0; c < j; c++ {
			d -= l[j*k+c] * l[j*k+c]
		}
		if !(d > pivotTolerance*m[(j+1)*q+j+1]) {
			return math.NaN()
		}
		d = math.Sqrt(d)
		l[j*k+j] = d
		for i := j + 1; i < k; i++ {
			v := m[(i+1)*q+j+1]
			for c := 0; c < j; c++ {
				v -= l[i*k+c] * l[j*k+c]
			}
			l[i*k+j] = v / d
		}
	}
	// Solve L y = m_xy, then Lᵀ b = y.
	coef := kn.coef
	for i := 0; i < k; i++ {
		v := m[(i+1)*q]
		for c := 0; c < i; c++ {
			v -= l[i*k+c] * coef[c]
		}
		coef[i] = v / l[i*k+i]
	}
	for i := k - 1; i >= 0; i-- {
		v := coef[i]
		for c := i + 1; c < k; c++ {
			v -= l[c*k+i] * coef[c]
		}
		coef[i] = v / l[i*k+i]
	}
	ba, bb := coef[kn.a-1], coef[kn.b-1]
	if !kn.standardized {
		return ba - bb
	}
	return ba*math.Sqrt(m[kn.a*q+kn.a]/m[0]) - bb*math.Sqrt(m[kn.b*q+kn.b]/m[0])
}
