package correlation

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"coefaudit/infer"
)

// ErrCorrelationRange is returned for a correlation that is NaN or does not
// lie strictly between −1 and 1. A correlation of exactly ±1 is refused too:
// its Fisher z is infinite, and as a correlation between two of the other
// variables it makes their correlation matrix singular.
var ErrCorrelationRange = errors.New("correlation must lie strictly between -1 and 1")

// ErrSampleSize is returned for a sample size below 4: the variance of
// Fisher's z, 1/(n − 3), needs n > 3.
var ErrSampleSize = errors.New("sample size must be at least 4")

// ErrNotPositiveDefinite is returned when the correlations of the three (or
// four) variables cannot all hold in one sample: their correlation matrix
// is not positive definite. Printed correlations that are rounded, or were
// computed with pairwise deletion, can do this.
var ErrNotPositiveDefinite = errors.New("correlation matrix is not positive definite")

// Method identifiers, stable across versions so that reports and tests can
// refer to them.
const (
	// MethodFisherZ is the z test of the difference of two Fisher z values
	// from independent samples.
	MethodFisherZ = "fisher-z"
	// MethodZouCI is Zou's (2007) interval for ρ1 − ρ2; it gives no
	// statistic and no p-value.
	MethodZouCI = "zou-ci"
	// MethodWilliamsT is Williams' (1959) t for overlapping correlations.
	MethodWilliamsT = "williams-t"
	// MethodSteigerZ is Steiger's (1980) z on Fisher z values, with the
	// compared correlations pooled under the null hypothesis.
	MethodSteigerZ = "steiger-z"
	// MethodMengRosenthalRubinZ is the z of Meng, Rosenthal & Rubin (1992)
	// for overlapping correlations.
	MethodMengRosenthalRubinZ = "mrr-z"
	// MethodPearsonFilonZ is the Pearson–Filon (1898) z on raw correlations
	// for non-overlapping correlations.
	MethodPearsonFilonZ = "pearson-filon-z"
	// MethodZPF is the Pearson–Filon statistic on Fisher z values (Dunn &
	// Clark 1969; named ZPF by Raghunathan, Rosenthal & Rubin 1996).
	MethodZPF = "zpf"
)

// Design names, as carried in Comparison.Design.
const (
	DesignIndependent    = "independent"
	DesignOverlapping    = "overlapping"
	DesignNonOverlapping = "non-overlapping"
)

// Result is one method applied to one pair of correlations, testing
// H0: ρ1 = ρ2 against a two-sided alternative.
type Result struct {
	// Method is one of the Method identifiers.
	Method string
	// Estimate is the quantity the statistic is built on: r1 − r2 for the
	// tests on raw correlations (williams-t, pearson-filon-z, zou-ci) and
	// z1 − z2, the difference of Fisher z values, for the others.
	Estimate float64
	// SE is the standard error of Estimate that the statistic uses, so that
	// Stat = Estimate/SE; NaN for zou-ci.
	SE float64
	// Stat is the test statistic: Student's t for williams-t, a standard
	// normal z otherwise; NaN for zou-ci, which is an interval only.
	Stat float64
	// DF is the t statistic's degrees of freedom (n − 3), NaN for a z.
	DF float64
	// P is the two-sided p-value of Stat; NaN for zou-ci.
	P float64
	// Difference is r1 − r2 on the correlation scale.
	Difference float64
	// CI is the confidence interval for ρ1 − ρ2 at Level. None of the tests
	// defines an interval for ρ1 − ρ2 of its own, so every Result of a
	// design carries Zou's (2007) interval for that design.
	CI [2]float64
	// Level is the confidence level of CI as a proportion (0.95).
	Level float64
	// Warnings lists problems that did not stop the computation.
	Warnings []string
}

// Comparison gathers the methods of one design for one pair of
// correlations.
type Comparison struct {
	// Design is DesignIndependent, DesignOverlapping or DesignNonOverlapping.
	Design string
	// Primary is the method the design calls for; the entry points document
	// the choice.
	Primary Result
	// Alternatives are the other published methods of the design, in a
	// fixed order, Zou's interval last.
	Alternatives []Result
	// Difference is r1 − r2.
	Difference float64
	// CI is Zou's (2007) interval for ρ1 − ρ2 at Level.
	CI [2]float64
	// Level is the confidence level of CI as a proportion.
	Level float64
}

// checkCorrelation refuses NaN and |r| ≥ 1.
func checkCorrelation(name string, r float64) error {
	if !(r > -1 && r < 1) {
		return fmt.Errorf("correlation %s = %v: %w", name, r, ErrCorrelationRange)
	}
	return nil
}

// checkSampleSize refuses n < 4.
func checkSampleSize(name string, n int) error {
	if n < 4 {
		return fmt.Errorf("sample size %s = %d: %w", name, n, ErrSampleSize)
	}
	return nil
}

// criticalValue is z_(1−α/2) for a level in (0, 1); the error wraps
// infer.ErrProbability.
func criticalValue(level float64) (float64, error) {
	c, err := infer.NormalCriticalValue(level)
	if err != nil {
		return math.NaN(), fmt.Errorf("interval for a difference of correlations: %w", err)
	}
	return c, nil
}

// checkPositiveDefinite4 factorizes the 4×4 correlation matrix of j, k, h,
// m. On failure the message gives the smallest eigenvalue, which tells the
// reader how far the printed correlations are from a possible matrix.
func checkPositiveDefinite4(s NonOverlapping) error {
	// Order j, k, h, m. Both triangles are filled on purpose:
	// mat.NewSymDense reads only the upper one, and a full matrix stays
	// right whichever triangle a later reader assumes.
	data := []float64{
		1, s.JK, s.JH, s.JM,
		s.JK, 1, s.KH, s.KM,
		s.JH, s.KH, 1, s.HM,
		s.JM, s.KM, s.HM, 1,
	}
	sym := mat.NewSymDense(4, data)
	var chol mat.Cholesky
	if chol.Factorize(sym) {
		return nil
	}
	var eig mat.EigenSym
	if eig.Factorize(sym, false) {
		vals := eig.Values(nil)
		return fmt.Errorf("correlations of j, k, h, m (smallest eigenvalue %.4g): %w", vals[0], ErrNotPositiveDefinite)
	}
	return fmt.Errorf("correlations of j, k, h, m: %w", ErrNotPositiveDefinite)
}

// fisherIntervals returns the Fisher intervals of two correlations with
// sample sizes n1 and n2 at critical value c.
func fisherIntervals(r1 float64, n1 int, r2 float64, n2 int, c float64) (ci1, ci2 [2]float64) {
	return fisherInterval(r1, n1, c), fisherInterval(r2, n2, c)
}

// fisherInterval is tanh(atanh r ± c/√(n − 3)).
func fisherInterval(r float64, n int, c float64) [2]float64 {
	z := math.Atanh(r)
	h := c / math.Sqrt(float64(n-3))
	return [2]float64{math.Tanh(z - h), math.Tanh(z + h)}
}

// zouInterval combines the Fisher intervals (l1, u1) of r1 and (l2, u2) of
// r2, whose sampling correlation is c, into Zou's (2007) interval for
// ρ1 − ρ2:
//
//	L = r1 − r2 − √[(r1 − l1)² + (u2 − r2)² − 2c (r1 − l1)(u2 − r2)]
//	U = r1 − r2 + √[(u1 − r1)² + (r2 − l2)² − 2c (u1 − r1)(r2 − l2)]
//
// A negative radicand can only come from rounding (|c| ≤ 1 makes both
// non-negative); it is set to 0 with a warning.
func zouInterval(r1, r2 float64, ci1, ci2 [2]float64, c float64) ([2]float64, []string) {
	var warnings []string
	d := r1 - r2
	a1, b2 := r1-ci1[0], ci2[1]-r2
	b1, a2 := ci1[1]-r1, r2-ci2[0]
	lo := a1*a1 + b2*b2 - 2*c*a1*b2
	hi := b1*b1 + a2*a2 - 2*c*b1*a2
	if lo < 0 || hi < 0 {
		warnings = append(warnings, fmt.Sprintf(
			"Zou interval: a negative variance term (%.3g, %.3g) was set to 0; sampling correlation %.6g", lo, hi, c))
		lo, hi = math.Max(lo, 0), math.Max(hi, 0)
	}
	return [2]float64{d - math.Sqrt(lo), d + math.Sqrt(hi)}, warnings
}

// zTest completes a normal test of estimate/se; a non-positive or NaN
// variance gives a NaN statistic and a warning instead of an error, so that
// the other methods of a design still report.
func zTest(method string, estimate, variance, difference float64, ci [2]float64, level float64) Result {
	res := Result{Method: method, Estimate: estimate, DF: math.NaN(),
		Difference: difference, CI: ci, Level: level}
	if !(variance > 0) || math.IsInf(variance, 0) {
		res.SE, res.Stat, res.P = math.NaN(), math.NaN(), math.NaN()
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"%s: the sampling variance %.4g is not positive; no statistic", method, variance))
		return res
	}
	res.SE = math.Sqrt(variance)
	res.Stat = estimate / res.SE
	res.P = infer.NormalTwoSidedP(res.Stat)
	return res
}

// intervalResult is the Result of Zou's interval: no statistic, no p.
func intervalResult(difference float64, ci [2]float64, level float64, warnings []string) Result {
	return Result{Method: MethodZouCI, Estimate: difference, SE: math.NaN(),
		Stat: math.NaN(), DF: math.NaN(), P: math.NaN(),
		Difference: difference, CI: ci, Level: level,
		Warnings: append([]string(nil), warnings...)}
}
