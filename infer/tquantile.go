package infer

import "math"

// studentTQuantile returns the |t| with df degrees of freedom (finite, > 0)
// whose two-sided p-value is p (0 < p ≤ 1): the root of
// StudentTTwoSidedP(t, df) = p, found by Newton's method on
// log p as a function of log t. In those coordinates the tail of the t
// distribution is a straight line (p ∝ t^−df), so the iteration converges
// from the far tail as well as from the centre. It starts from the
// Cornish–Fisher expansion of t in the normal quantile z (Abramowitz &
// Stegun 1964, 26.7.5), good in the centre, or, when that is more than 10%
// off in p and the other is nearer, from the leading term of the tail,
// p ≈ 2 c df^((df−1)/2) t^−df with c = Γ((df+1)/2) / (√(df π) Γ(df/2)),
// good far out. df = 1 and 2 have
// closed forms (A&S 26.7.3, 26.7.4 rearranged):
//
//	df = 1:  t = cot(π p / 2)
//	df = 2:  t = (1 − p) √(2 / (p (2 − p)))
//
// It reports false when the iteration does not settle, and the caller then
// uses gonum's inverse incomplete beta.
func studentTQuantile(p, df float64) (float64, bool) {
	switch df {
	case 1:
		return 1 / math.Tan(math.Pi*p/2), true
	case 2:
		return (1 - p) * math.Sqrt(2/(p*(2-p))), true
	}
	if p == 1 {
		return 0, true
	}
	lgA, _ := math.Lgamma((df + 1) / 2)
	lgB, _ := math.Lgamma(df / 2)
	logC := lgA - lgB - 0.5*math.Log(df*math.Pi) // log of the density at 0
	logP := math.Log(p)
	// The tail start, in logs so that p = 1e-300 does not overflow t.
	tail := math.Exp((math.Ln2 + logC + (df+1)/2*math.Log(df) - math.Log(df) - logP) / df)
	z := -unitNormal.Quantile(p / 2)
	z2 := z * z
	cf := z * (1 + (z2+1)/(4*df) + ((5*z2+16)*z2+3)/(96*df*df) +
		(((3*z2+19)*z2+17)*z2-15)/(384*df*df*df))
	// The Cornish–Fisher start is taken unless it is off by more than 10%
	// in p (small df, far tail) and the tail start is nearer; its tail
	// value then serves the first Newton step.
	t := cf
	q, _ := StudentTTwoSidedP(cf, df)
	if !(cf > 0) || !(math.Abs(math.Log(q)-logP) < 0.1) {
		qt, _ := StudentTTwoSidedP(tail, df)
		if !(cf > 0) || math.Abs(math.Log(qt)-logP) < math.Abs(math.Log(q)-logP) {
			t, q = tail, qt
		}
	}
	prev := math.Inf(1)
	for i := range 60 {
		if i > 0 {
			q, _ = StudentTTwoSidedP(t, df)
		}
		if !(q > 0) || math.IsInf(t, 0) || math.IsNaN(t) {
			return 0, false
		}
		// d log p / d log t = −2 t f(t) / p, with f the density.
		logF := logC - (df+1)/2*math.Log1p(t*t/df)
		slope := -2 * t * math.Exp(logF-math.Log(q))
		step := (math.Log(q) - logP) / slope
		// Keep each step within a factor of e either way.
		step = math.Max(-1, math.Min(1, step))
		t *= math.Exp(-step)
		// Convergence is quadratic, so after a step below 1e-12 the error
		// is at the level of the tail function's own rounding, which keeps
		// later steps from shrinking further.
		// With very large df the tail function itself is good to only
		// about 1e-12, and the steps stop shrinking above that: a step
		// that fails to halve the last, once both are small, is that
		// floor.
		if math.Abs(step) < 1e-12 || (math.Abs(step) < 1e-9 && math.Abs(step) > prev/2) {
			return t, true
		}
		prev = math.Abs(step)
	}
	return 0, false
}
