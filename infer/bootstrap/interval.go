package bootstrap

import (
	"math"

	"coefaudit/infer"
	"gonum.org/v1/gonum/stat/distuv"
)

// unitNormal is constructed with Sigma 1 on purpose (a zero-value Normal
// returns wrong values; LIBRARY-NOTES.md).
var unitNormal = distuv.Normal{Mu: 0, Sigma: 1}

// normalCDF is Φ(z), through the complementary error function so that both
// tails keep their digits.
func normalCDF(z float64) float64 {
	if z > 0 {
		return 1 - infer.NormalUpperTail(z)
	}
	return infer.NormalUpperTail(-z)
}

// Interval is a bootstrap confidence interval.
type Interval struct {
	// Lower and Upper are the endpoints.
	Lower, Upper float64
	// LowerLevel and UpperLevel are the probabilities at which the sorted
	// replicates were read: α/2 and 1 − α/2 for the percentile interval,
	// the adjusted α₁ and α₂ for BC and BCa.
	LowerLevel, UpperLevel float64
	// Clamped reports that an endpoint fell beyond the most extreme
	// replicate and was set to it: the interval is then unreliable and more
	// resamples are needed.
	Clamped bool
}

// replicateQuantile reads the sorted replicates at probability u by the
// (B + 1)u rule with linear interpolation between order statistics —
// definition 6 of Hyndman & Fan [1], the convention of Davison & Hinkley
// [2, §5.2] for bootstrap percentiles. Below 1/(B + 1) or above
// B/(B + 1) it returns the extreme replicate and clamped = true.
//
// [1] Hyndman RJ, Fan Y (1996). Sample quantiles in statistical packages.
// The American Statistician 50(4):361–365.
// [2] Davison AC, Hinkley DV (1997). Bootstrap Methods and their
// Application. Cambridge University Press.
func replicateQuantile(sorted []float64, u float64) (value float64, clamped bool) {
	b := len(sorted)
	h := float64(b+1) * u
	switch {
	case math.IsNaN(h):
		return math.NaN(), true
	case h < 1:
		return sorted[0], true
	case h >= float64(b):
		return sorted[b-1], h > float64(b)
	}
	lo := int(h) // 1-based order statistic below h
	frac := h - float64(lo)
	return sorted[lo-1] + frac*(sorted[lo]-sorted[lo-1]), false
}

// intervalAt reads an interval at the probabilities (lo, hi).
func intervalAt(sorted []float64, lo, hi float64) Interval {
	l, cl := replicateQuantile(sorted, lo)
	u, cu := replicateQuantile(sorted, hi)
	return Interval{Lower: l, Upper: u, LowerLevel: lo, UpperLevel: hi, Clamped: cl || cu}
}

// biasCorrection is ẑ0 = Φ⁻¹(p̂), p̂ = (#{θ* < θ̂} + ½ #{θ* = θ̂})/B [1, 2].
// Ties are counted as one half: a statistic that takes few values
// (small n, discrete data) puts replicates exactly on θ̂, and counting
// them all below or all above would bias ẑ0 one way; with continuous data
// ties are practically impossible and the rule changes nothing. ±Inf when
// all replicates lie on one side.
//
// [1] Efron B (1987). Better bootstrap confidence intervals. Journal of the
// American Statistical Association 82(397):171–185.
// [2] DiCiccio TJ, Efron B (1996). Bootstrap confidence intervals.
// Statistical Science 11(3):189–228.
func biasCorrection(sorted []float64, estimate float64) float64 {
	below, ties := 0, 0
	for _, v := range sorted {
		if v < estimate {
			below++
		} else if v == estimate {
			ties++
		}
	}
	p := (float64(below) + 0.5*float64(ties)) / float64(len(sorted))
	switch p {
	case 0:
		return math.Inf(-1)
	case 1:
		return math.Inf(1)
	}
	return unitNormal.Quantile(p)
}

// bcaLevels returns the BCa probabilities [1]
//
//	α₁ = Φ(ẑ0 + (ẑ0 + z_{α/2})/(1 − â(ẑ0 + z_{α/2}))),
//	α₂ = Φ(ẑ0 + (ẑ0 + z_{1−α/2})/(1 − â(ẑ0 + z_{1−α/2}))),
//
// with â = 0 for BC. ok is false when ẑ0 is infinite or a denominator is not
// positive (the correction then has no meaning).
//
// [1] Efron B (1987). Better bootstrap confidence intervals. Journal of the
// American Statistical Association 82(397):171–185.
func bcaLevels(z0, a, level float64) (lo, hi float64, ok bool) {
	if math.IsInf(z0, 0) || math.IsNaN(z0) {
		return math.NaN(), math.NaN(), false
	}
	zc := -unitNormal.Quantile((1 - level) / 2) // z_{1−α/2}
	adjust := func(z float64) (float64, bool) {
		t := z0 + z
		den := 1 - a*t
		if !(den > 0) {
			return math.NaN(), false
		}
		return normalCDF(z0 + t/den), true
	}
	lo, okLo := adjust(-zc)
	hi, okHi := adjust(zc)
	return lo, hi, okLo && okHi
}

// percentileP is the two-sided bootstrap p-value for θ = 0,
//
//	p = min(1, 2 min(1 + #{θ* ≤ 0}, 1 + #{θ* ≥ 0}) / (B + 1)),
//
// twice the smaller tail proportion beyond 0, with the +1 counts that make a
// Monte Carlo p-value valid for finite B [1, §4.2] — it is never below
// 2/(B + 1). It corresponds to the smallest α at which the equal-tailed
// percentile interval excludes 0.
//
// [1] Davison AC, Hinkley DV (1997). Bootstrap Methods and their
// Application. Cambridge University Press (section number from memory).
func percentileP(replicates []float64) float64 {
	var le, ge int
	for _, v := range replicates {
		if v <= 0 {
			le++
		}
		if v >= 0 {
			ge++
		}
	}
	p := 2 * float64(1+min(le, ge)) / float64(len(replicates)+1)
	return math.Min(1, p)
}

// bcaP inverts the BCa interval: the two-sided p is the smallest α at which
// the (1 − α) BCa interval excludes 0 [1, §15.4]. With u = F̂(0), the share
// of replicates below 0 (ties one half), w = Φ⁻¹(u) − ẑ0, the BCa nominal
// quantile whose endpoint is 0 is z = w/(1 + â w) − ẑ0, and p = 2Φ(−|z|).
// u is kept within [1/(2B), 1 − 1/(2B)] (floored reports that it was), so a
// 0 beyond all replicates gives a p limited by B rather than 0. ok is false
// where the BCa map is not monotone (1 + â w ≤ 0) or ẑ0 is infinite.
//
// [1] Efron B, Tibshirani RJ (1993). An Introduction to the Bootstrap.
// Chapman & Hall (section number from memory).
func bcaP(sorted []float64, z0, a float64) (p float64, floored, ok bool) {
	if math.IsInf(z0, 0) || math.IsNaN(z0) {
		return math.NaN(), false, false
	}
	b := float64(len(sorted))
	below, ties := 0, 0
	for _, v := range sorted {
		if v < 0 {
			below++
		} else if v == 0 {
			ties++
		}
	}
	u := (float64(below) + 0.5*float64(ties)) / b
	if u < 0.5/b {
		u, floored = 0.5/b, true
	} else if u > 1-0.5/b {
		u, floored = 1-0.5/b, true
	}
	w := unitNormal.Quantile(u) - z0
	den := 1 + a*w
	if !(den > 0) {
		return math.NaN(), floored, false
	}
	z := w/den - z0
	return math.Min(1, 2*infer.NormalUpperTail(math.Abs(z))), floored, true
}
