package audit

import (
	"coefaudit/extract"
	"coefaudit/infer"
)

// A claim about magnitude ("the first effect is the stronger") compares
// |θ1| with |θ2|. When the two estimates have the same sign that is the
// signed comparison, turned for negative estimates. When their signs are
// opposite, |θ1| − |θ2| = ±(θ1 + θ2): the test is of the sum, which is the
// difference of θ1 and the reflected −θ2. Reflecting a variable (reversing
// its scoring) turns the sign of its coefficient, of its correlations and of
// every covariance with it, so each test of this package runs unchanged on
// the reflected second estimate: an independent z test, the printed
// sampling correlation with its sign turned, the admissible range (which is
// symmetric in the correlation), a model rebuilt from a table with the
// second predictor reflected, and dependent correlations with the second
// correlation's own variable reflected.

// reflectsSecond reports whether a claim about magnitude compares
// estimates of opposite sign (on the analysis scale: log for ratios), so
// that its second estimate is reflected before the test.
func reflectsSecond(published string, e1, e2 float64) bool {
	return extract.IsMagnitudeVerdict(published) && e1*e2 < 0
}

// reflect turns the sign of a reconstructed estimate, its rounding range
// and its interval; its SE is unchanged.
func reflect(rc *extract.Reconstructed) {
	rc.Estimate = -rc.Estimate
	rc.EstimateRange = infer.Range{Lo: -rc.EstimateRange.Hi, Hi: -rc.EstimateRange.Lo}
	rc.CI = [2]float64{-rc.CI[1], -rc.CI[0]}
}

// negated is a printed number with its sign turned; its rounding is the
// same.
func negated(p extract.Printed) extract.Printed {
	p.Value = -p.Value
	return p
}

// signOf is −1 for the reflected second estimate of a claim, 1 otherwise.
func (r *ClaimResult) signOf(second bool) float64 {
	if second && r.reflected {
		return -1
	}
	return 1
}

const reflectedNote = "The two estimates have opposite signs, so their magnitudes are compared by testing the first against the second with its sign turned (|first| − |second| = ±(first + second)); the difference shown is that one."
