package bootstrap

import "math"

// fullSums returns Σ z_i and the packed upper triangle of Σ z_i z_iᵀ over
// all rows, z centred at the full-sample means.
func fullSums(kn *kernel) (sum, cross []float64) {
	q := kn.q
	sum, cross = make([]float64, q), make([]float64, q*(q+1)/2)
	z := kn.z
	for i := 0; i < kn.n; i++ {
		for v, col := range kn.cols {
			z[v] = col[i] - kn.mean[v]
		}
		pos := 0
		for a := 0; a < q; a++ {
			sum[a] += z[a]
			for b := a; b < q; b++ {
				cross[pos] += z[a] * z[b]
				pos++
			}
		}
	}
	return sum, cross
}

// jackknife returns θ_(i), the statistic with row i left out, for every
// row. Rather than n refits it downdates the full-sample sums by one row,
//
//	s_(i) = s − z_i,   C_(i) = C − z_i z_iᵀ,   M_(i) = C_(i) − s_(i) s_(i)ᵀ/(n − 1),
//
// O(q²) per row plus a k×k Cholesky solve. Rows are split among workers;
// each result is stored by row, so the output does not depend on workers.
func jackknife(proto *kernel, workers int) []float64 {
	n, q := proto.n, proto.q
	sum, cross := fullSums(proto)
	out := make([]float64, n)
	parallelFor(n, workers, func(start, end int) {
		kn := newKernel(proto.cols, proto.mean, proto.a, proto.b, proto.standardized)
		s, c := make([]float64, q), make([]float64, len(cross))
		z := kn.z
		for i := start; i < end; i++ {
			for v, col := range kn.cols {
				z[v] = col[i] - kn.mean[v]
			}
			pos := 0
			for a := 0; a < q; a++ {
				s[a] = sum[a] - z[a]
				for b := a; b < q; b++ {
					c[pos] = cross[pos] - z[a]*z[b]
					pos++
				}
			}
			out[i] = kn.statistic(c, s, float64(n-1))
		}
	})
	return out
}

// acceleration is the jackknife estimate of the BCa acceleration [1, 2],
//
//	â = Σ (θ̄ − θ_(i))³ / (6 [Σ (θ̄ − θ_(i))²]^{3/2}),   θ̄ = mean of θ_(i),
//
// over the rows whose leave-one-out statistic exists; it returns the number
// of rows used. â = 0 when all θ_(i) are equal.
//
// [1] Efron B (1987). Better bootstrap confidence intervals. Journal of the
// American Statistical Association 82(397):171–185.
// [2] DiCiccio TJ, Efron B (1996). Bootstrap confidence intervals.
// Statistical Science 11(3):189–228.
func acceleration(values []float64) (float64, int) {
	var total float64
	used := 0
	for _, v := range values {
		if !math.IsNaN(v) {
			total += v
			used++
		}
	}
	if used < 3 {
		return 0, used
	}
	mean := total / float64(used)
	var s2, s3 float64
	for _, v := range values {
		if !math.IsNaN(v) {
			d := mean - v
			s2 += d * d
			s3 += d * d * d
		}
	}
	if s2 == 0 {
		return 0, used
	}
	return s3 / (6 * math.Pow(s2, 1.5)), used
}
