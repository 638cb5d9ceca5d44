package infer

import "math"

// studentTQuantile returns the |t| with df degrees of freedom (finite, > 0)
// whose two-sided p-value is p (0 < p ≤ 1): the root of
// StudentTTwoSidedP(t, df) = p, found by Halley's method (Newton's with a
// second-derivative correction) on log p as a function of log t. In those
// coordinates the tail of the t distribution is a straight line
// (p ∝ t^−df), so the iteration converges from the far tail as well as
// from the centre. It starts from the Cornish–Fisher expansion of t in the
// normal quantile z of p, −Φ⁻¹(p/2), which the caller passes in
// (Abramowitz & Stegun 1964, 26.7.5), good in the
// centre, or, when that is more than 10% off in p and the other is nearer,
// from the leading term of the tail,
// p ≈ 2 c df^((df−1)/2) t^−df with c = Γ((df+1)/2) / (√(df π) Γ(df/2)),
// good far out. df = 1 and 2 have
// closed forms (A&S 26.7.3, 26.7.4 rearranged):
//
//	df = 1:  t = cot(π p / 2)
//	df = 2:  t = (1 − p) √(2 / (p (2 − p)))
//
// It reports false when the iteration does not settle, and the caller then
// uses gonum's inverse incomplete beta.
func studentTQuantile(p, z, df float64) (float64, bool) {
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
	cf := cornishFisher(z, df)
	// The Cornish–Fisher start is taken unless it is off by more than 10%
	// in p (small df, far tail) and the tail start is nearer; its tail
	// value then serves the first step.
	t := cf
	q, _ := StudentTTwoSidedP(cf, df)
	if !(cf > 0) || !(math.Abs(math.Log(q)-logP) < 0.1) {
		qt, _ := StudentTTwoSidedP(tail, df)
		if !(cf > 0) || math.Abs(math.Log(qt)-logP) < math.Abs(math.Log(q)-logP) {
			t, q = tail, qt
		}
	}
	for i := range 60 {
		if i > 0 {
			q, _ = StudentTTwoSidedP(t, df)
		}
		if !(q > 0) || math.IsInf(t, 0) || math.IsNaN(t) {
			return 0, false
		}
		// d log p / d log t = −2 t f(t) / p, with f the density.
		logQ := math.Log(q)
		logF := logC - (df+1)/2*math.Log1p(t*t/df)
		slope := -2 * t * math.Exp(logF-logQ)
		step := (logQ - logP) / slope
		// Halley's correction, with the second derivative in the same
		// coordinates, s (1 + t f'(t)/f(t)) − s² for slope s, where
		// t f'/f = −(df + 1) t² / (df + t²): the error after the step is
		// of the order of the cube of the one before.
		curv := slope*(1-(df+1)*t*t/(df+t*t)) - slope*slope
		if d := 1 - step*curv/(2*slope); d > 0.5 && d < 2 {
			step /= d
		}
		// Keep each step within a factor of e either way.
		step = math.Max(-1, math.Min(1, step))
		t *= math.Exp(-step)
		// A step below 1e-6 leaves an error of the order of 1e-18, far
		// below the tail function's own accuracy (about 1e-12 at very
		// large df, where the steps stop shrinking), so t is not checked
		// again: near the centre and at large df the Cornish–Fisher start
		// is that close, and one tail value does.
		if math.Abs(step) < 1e-6 {
			return t, true
		}
	}
	return 0, false
}
