package infer

import (
	"errors"
	"fmt"
	"math"
)

// ErrStandardError is returned for a standard error that is not positive and finite.
var ErrStandardError = errors.New("standard error must be positive and finite")

// ErrCorrelation is returned for a sampling correlation outside [−1, 1].
var ErrCorrelation = errors.New("correlation must lie in [-1, 1]")

// Difference is the test of the difference between two estimates.
type Difference struct {
	// Estimate is first − second.
	Estimate float64
	// SE is the standard error of the difference.
	SE float64
	// Stat is Estimate/SE, a z statistic, or a t statistic when DF is finite.
	Stat float64
	// DF is the t test's degrees of freedom, NaN for a z test.
	DF float64
	// P is the two-sided p-value against a difference of 0.
	P float64
	// CI is the confidence interval of the difference at Level.
	CI [2]float64
	// Level is the confidence level as a proportion (0.95).
	Level float64
}

// IndependentDifference tests the difference between two estimates from
// independent samples:
//
//	d = E1 − E2,  SE(d) = √(SE1² + SE2²),  z = d / SE(d),
//	CI: d ± z_(1−α/2) SE(d).
//
// Ratio measures must be given on the log scale; the difference is then the
// log of the ratio of ratios.
//
// References:
//
//	[1] Altman DG, Bland JM (2003). Interaction revisited: the difference
//	    between two estimates. BMJ 326:219.
//	[2] Paternoster R, Brame R, Mazerolle P, Piquero A (1998). Using the
//	    correct statistical test for the equality of regression
//	    coefficients. Criminology 36(4):859–866.
func IndependentDifference(e1, se1, e2, se2, level float64) (Difference, error) {
	return CorrelatedDifference(e1, se1, e2, se2, 0, math.NaN(), level)
}

// CorrelatedDifference tests the difference between two estimates whose
// sampling correlation is rho (0 for independent samples):
//
//	Var(d) = SE1² + SE2² − 2 ρ SE1 SE2,
//
// with a t reference distribution when df is finite (two coefficients of one
// regression: the residual df) and the normal otherwise.
func CorrelatedDifference(e1, se1, e2, se2, rho, df, level float64) (Difference, error) {
	if !validSE(se1) || !validSE(se2) {
		return Difference{}, fmt.Errorf("standard errors %.4g and %.4g: %w", se1, se2, ErrStandardError)
	}
	if !(rho >= -1 && rho <= 1) {
		return Difference{}, fmt.Errorf("sampling correlation %v: %w", rho, ErrCorrelation)
	}
	v := se1*se1 + se2*se2 - 2*rho*se1*se2
	return DifferenceFromVariance(e1-e2, math.Max(v, 0), df, level)
}

// DifferenceFromVariance completes the test of a difference d whose sampling
// variance is v: Stat = d/√v with a t reference when df is finite, the normal
// otherwise, and the interval d ± c √v. A variance of 0 (two perfectly
// correlated estimates with equal SEs) gives an infinite statistic and p = 0
// unless d is also 0.
func DifferenceFromVariance(d, v, df, level float64) (Difference, error) {
	if !(v >= 0) || math.IsInf(v, 0) {
		return Difference{}, fmt.Errorf("variance of the difference %v: %w", v, ErrStandardError)
	}
	c, err := CriticalValue(level, df)
	if err != nil {
		return Difference{}, err
	}
	se := math.Sqrt(v)
	stat := d / se
	if se == 0 && d == 0 {
		stat = 0
	}
	res := Difference{Estimate: d, SE: se, Stat: stat, DF: df, Level: level,
		CI: [2]float64{d - c*se, d + c*se}}
	res.P, err = twoSidedP(stat, df)
	return res, err
}

// twoSidedP is the two-sided p-value of a z (df NaN or +Inf) or t statistic.
func twoSidedP(stat, df float64) (float64, error) {
	if math.IsNaN(df) || math.IsInf(df, 1) {
		return NormalTwoSidedP(stat), nil
	}
	return StudentTTwoSidedP(stat, df)
}

func validSE(se float64) bool { return se > 0 && !math.IsInf(se, 0) }

// Range is a closed interval [Lo, Hi] of values a quantity may take.
type Range struct{ Lo, Hi float64 }

// Point returns the degenerate range [x, x].
func Point(x float64) Range { return Range{x, x} }

// Contains reports whether x lies in [Lo, Hi].
func (r Range) Contains(x float64) bool { return x >= r.Lo && x <= r.Hi }

// DifferencePRange returns the smallest and largest two-sided p of d/SE
// when the difference d may be anywhere in dr and its standard error
// anywhere in ser:
//
//	|stat| ∈ [min|d| / max SE, max|d| / min SE],
//
// with min|d| = 0 when dr straddles 0 (p = 1 is then reachable) and
// p = 0 reachable when the SE may be 0 (two perfectly correlated
// estimates with equal SEs). The bound
// is exact when d and SE vary independently (SEs taken from printed
// intervals or printed SEs) and safe — never too narrow — when they share
// inputs (an SE taken from the estimate and its p or t).
func DifferencePRange(dr, ser Range, df float64) (Range, error) {
	if !(ser.Lo >= 0) || !(ser.Hi > 0) || ser.Hi < ser.Lo {
		return Range{}, fmt.Errorf("standard error range [%v, %v]: %w", ser.Lo, ser.Hi, ErrStandardError)
	}
	minAbs := math.Min(math.Abs(dr.Lo), math.Abs(dr.Hi))
	if dr.Contains(0) {
		minAbs = 0
	}
	maxAbs := math.Max(math.Abs(dr.Lo), math.Abs(dr.Hi))
	pHi, err := twoSidedP(minAbs/ser.Hi, df)
	if err != nil {
		return Range{}, err
	}
	zMax := math.Inf(1)
	if ser.Lo > 0 {
		zMax = maxAbs / ser.Lo
	}
	pLo := 0.0
	if !math.IsInf(zMax, 1) || maxAbs == 0 {
		if maxAbs == 0 {
			zMax = 0
		}
		pLo, err = twoSidedP(zMax, df)
		if err != nil {
			return Range{}, err
		}
	}
	return Range{pLo, pHi}, nil
}

// AdmissibleVarianceRange returns the range of Var(E1 − E2) over every
// admissible sampling correlation ρ ∈ [−1, 1] of two estimates with
// standard errors se1 and se2:
//
//	[(SE1 − SE2)², (SE1 + SE2)²],
//
// the first at ρ = 1, the second at ρ = −1. With nothing known of the
// covariance, every verdict reachable inside this range is possible.
func AdmissibleVarianceRange(se1, se2 float64) (Range, error) {
	if !validSE(se1) || !validSE(se2) {
		return Range{}, fmt.Errorf("standard errors %.4g and %.4g: %w", se1, se2, ErrStandardError)
	}
	return Range{(se1 - se2) * (se1 - se2), (se1 + se2) * (se1 + se2)}, nil
}
