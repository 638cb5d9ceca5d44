package infer

import (
	"fmt"
	"math"
)

// TippingCorrelation returns the sampling correlation ρ* of two estimates
// at which the test of their difference d (see CorrelatedDifference) is
// exactly at the level alpha: with c the two-sided critical value (t with
// df when df is finite, the normal otherwise),
//
//	|d| / √(SE1² + SE2² − 2ρ* SE1 SE2) = c
//	⇒ ρ* = (SE1² + SE2² − (d/c)²) / (2 SE1 SE2).
//
// Var(d) falls as ρ rises, so the difference is significant for every
// correlation above ρ* and not below it. ok is false when ρ* lies outside
// (−1, 1): the verdict is then the same at every admissible correlation.
// It fails with ErrStandardError for SEs that are not positive and finite,
// and with the errors of CriticalValue for alpha outside (0, 1).
//
// The variance of a difference is the textbook one (Altman & Bland 2003,
// BMJ 326:219, with the covariance term); solving it for ρ is algebra.
func TippingCorrelation(d, se1, se2, df, alpha float64) (rho float64, ok bool, err error) {
	if !validSE(se1) || !validSE(se2) {
		return math.NaN(), false, fmt.Errorf("standard errors %.4g and %.4g: %w", se1, se2, ErrStandardError)
	}
	c, err := CriticalValue(1-alpha, df)
	if err != nil {
		return math.NaN(), false, err
	}
	v := (d / c) * (d / c)
	rho = (se1*se1 + se2*se2 - v) / (2 * se1 * se2)
	return rho, rho > -1 && rho < 1, nil
}
