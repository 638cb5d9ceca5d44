package bootstrap

import (
	"math"
	"testing"
)

// binomialBand99 returns the central acceptance region [lo, hi] of a
// Binomial(n, p) count at the 99% level: the largest lo with P(X < lo) ≤
// 0.005 and the smallest hi with P(X > hi) ≤ 0.005 (pmf from log-gamma).
func binomialBand99(n int, p float64) (lo, hi int) {
	pmf := func(k int) float64 {
		lg := func(x float64) float64 { v, _ := math.Lgamma(x); return v }
		return math.Exp(lg(float64(n+1)) - lg(float64(k+1)) - lg(float64(n-k+1)) +
			float64(k)*math.Log(p) + float64(n-k)*math.Log1p(-p))
	}
	below := 0.0
	for lo = 0; below+pmf(lo) <= 0.005; lo++ {
		below += pmf(lo)
	}
	above := 0.0
	for hi = n; above+pmf(hi) <= 0.005; hi-- {
		above += pmf(hi)
	}
	return lo, hi
}

// TestCoverage: 200 data sets of n = 100 from a model whose truth is set
// here — three predictors with pairwise correlation 0.3, b = (0.5, 0.2,
// 0.3), unit error variance, so σ_y² = bᵀRb + 1 and the population
// standardized difference is θ = (b₁ − b₂)/σ_y — each bootstrapped with 999
// resamples (fixed seeds). The number of 95% intervals covering θ must lie
// in the 99% binomial band of Binomial(200, 0.95), for the BCa and the
// percentile intervals and for the delta-method interval beside them.
func TestCoverage(t *testing.T) {
	const datasets, n, resamples = 200, 100, 999
	b := []float64{0.5, 0.2, 0.3}
	rho := 0.3
	vy := 1.0
	for i := range b {
		for j := range b {
			c := rho
			if i == j {
				c = 1
			}
			vy += b[i] * b[j] * c
		}
	}
	truth := (b[0] - b[1]) / math.Sqrt(vy)
	var bca, pct, bc, delta int
	for d := 0; d < datasets; d++ {
		data := simulateData(uint64(1000+d), n, b, rho)
		res, err := CompareCoefficients(data, Options{Outcome: 0, Predictors: []int{1, 2, 3}, Compare: [2]int{1, 2},
			Resamples: resamples, Seed: uint64(d)})
		if err != nil {
			t.Fatalf("data set %d: CompareCoefficients error: %v", d, err)
		}
		covers := func(lo, hi float64) int {
			if lo <= truth && truth <= hi {
				return 1
			}
			return 0
		}
		bca += covers(res.BCa.Lower, res.BCa.Upper)
		bc += covers(res.BC.Lower, res.BC.Upper)
		pct += covers(res.Percentile.Lower, res.Percentile.Upper)
		delta += covers(res.Delta.Lower, res.Delta.Upper)
	}
	lo, hi := binomialBand99(datasets, 0.95)
	t.Logf("coverage of θ = %.4f in %d data sets: BCa %d, BC %d, percentile %d, delta %d (99%% band %d–%d)",
		truth, datasets, bca, bc, pct, delta, lo, hi)
	for _, c := range []struct {
		name  string
		count int
	}{{"BCa", bca}, {"percentile", pct}, {"delta-method", delta}} {
		if c.count < lo || c.count > hi {
			t.Errorf("%s intervals covered θ in %d of %d data sets, want %d to %d", c.name, c.count, datasets, lo, hi)
		}
	}
}
