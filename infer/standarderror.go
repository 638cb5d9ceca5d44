package infer

import (
	"errors"
	"fmt"
	"math"
)

// ErrInterval is returned for an interval whose limits are reversed or equal.
var ErrInterval = errors.New("interval limits must satisfy low < high")

// ErrZeroEstimate is returned when an SE is wanted from a p-value or a test
// statistic and the estimate is 0, which fixes no scale.
var ErrZeroEstimate = errors.New("estimate is zero, so a p-value or statistic gives no standard error")

// ErrStatistic is returned for a test statistic of 0 or of the wrong sign.
var ErrStatistic = errors.New("test statistic must be non-zero and agree in sign with the estimate")

// CriticalValue returns the two-sided critical value of a confidence level
// (a proportion, 0.95 for 95%): z_(1−α/2) when df is NaN or +Inf,
// t_(1−α/2, df) otherwise.
//
// The t rule follows the Cochrane Handbook (Higgins & Green 2011, §7.7.3.2):
// an interval computed from a t distribution is 2·t wide in SEs, not
// 2·1.96; with about 60 or more per group the two agree closely.
func CriticalValue(level, df float64) (float64, error) {
	if math.IsNaN(df) || math.IsInf(df, 1) {
		return NormalCriticalValue(level)
	}
	return StudentTCriticalValue(level, df)
}

// StandardErrorFromCI returns the standard error implied by a confidence
// interval [low, high] at the given level, on the scale the interval is
// given in (take logs of ratio measures first):
//
//	SE = (high − low) / (2 c),  c = z_(1−α/2) or t_(1−α/2, df).
//
// Using the full width is the mean of the two half-widths, which is how an
// asymmetric interval is read; StandardErrorsFromHalfWidths gives the two
// readings separately.
//
// References:
//
//	[1] Altman DG, Bland JM (2011). How to obtain the P value from a
//	    confidence interval. BMJ 343:d2304.
//	[2] Higgins JPT, Green S, eds (2011). Cochrane Handbook for Systematic
//	    Reviews of Interventions 5.1, §7.7.3.2 and §7.7.7.3.
func StandardErrorFromCI(low, high, level, df float64) (float64, error) {
	if !(low < high) {
		return math.NaN(), fmt.Errorf("interval (%v, %v): %w", low, high, ErrInterval)
	}
	c, err := CriticalValue(level, df)
	if err != nil {
		return math.NaN(), err
	}
	return (high - low) / (2 * c), nil
}

// StandardErrorsFromHalfWidths returns the two standard errors an interval
// implies when each half is read on its own:
//
//	SE_low = (estimate − low)/c,  SE_high = (high − estimate)/c.
//
// They differ when the interval is asymmetric (bootstrap and profile
// intervals; a ratio measure on its printed scale). Woodward (2019, Heart
// 105:1701, Table 4) averages the two.
func StandardErrorsFromHalfWidths(estimate, low, high, level, df float64) (seLow, seHigh float64, err error) {
	if !(low < high) {
		return math.NaN(), math.NaN(), fmt.Errorf("interval (%v, %v): %w", low, high, ErrInterval)
	}
	c, err := CriticalValue(level, df)
	if err != nil {
		return math.NaN(), math.NaN(), err
	}
	return (estimate - low) / c, (high - estimate) / c, nil
}

// StandardErrorFromP returns the standard error implied by an estimate and
// its two-sided p-value against 0:
//
//	SE = |estimate| / q,  q = Φ⁻¹(1 − p/2) or t⁻¹_df(1 − p/2).
//
// This is step 2 of Altman & Bland (2011), with the exact quantile in place
// of their polynomial approximation.
//
// References:
//
//	[1] Altman DG, Bland JM (2011). How to obtain the confidence interval
//	    from a P value. BMJ 343:d2090.
func StandardErrorFromP(estimate, p, df float64) (float64, error) {
	if estimate == 0 {
		return math.NaN(), ErrZeroEstimate
	}
	var q float64
	var err error
	if math.IsNaN(df) || math.IsInf(df, 1) {
		q, err = NormalZFromTwoSidedP(p)
	} else {
		q, err = StudentTFromTwoSidedP(p, df)
	}
	if err != nil {
		return math.NaN(), err
	}
	if q == 0 {
		return math.Inf(1), nil
	}
	return math.Abs(estimate) / q, nil
}

// StandardErrorFromStatistic returns SE = estimate / stat for a printed t or
// z statistic. A statistic of the opposite sign to the estimate is taken as
// printed without its sign (papers often drop it) only when allowUnsigned is
// true; otherwise it is ErrStatistic.
func StandardErrorFromStatistic(estimate, stat float64, allowUnsigned bool) (float64, error) {
	if estimate == 0 {
		return math.NaN(), ErrZeroEstimate
	}
	if stat == 0 || math.IsNaN(stat) {
		return math.NaN(), ErrStatistic
	}
	if (estimate > 0) != (stat > 0) && !allowUnsigned {
		return math.NaN(), ErrStatistic
	}
	return math.Abs(estimate / stat), nil
}
