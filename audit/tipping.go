package audit

import (
	"fmt"
	"math"
	"strconv"

	"coefaudit/extract"
	"coefaudit/infer"
	"coefaudit/infer/regress"

	"gonum.org/v1/gonum/mat"
)

// tipping is where a claim tested over every admissible correlation of its
// two estimates turns: the correlation at which the difference is exactly
// significant at the printed values, and, where the sample's correlation
// table gives the model's predictors, the estimates' correlation it
// implies.
type tipping struct {
	rho float64
	// above is true when the difference is significant for correlations
	// above rho (false: below, for a second estimate reflected for a
	// claim about magnitude).
	above bool
	// implied is the estimates' correlation the predictors' correlations
	// imply (NaN when not known), and from names where it came from.
	implied float64
	from    string
}

// tippingOf finds where the claim's verdict turns, at the printed values.
// It reports false when the verdict is the same at every admissible
// correlation.
func (a *auditor) tippingOf(r *ClaimResult, c1, c2 *extract.Coefficient, rc1, rc2 *extract.Reconstructed, df float64) (tipping, bool) {
	rho, ok, err := infer.TippingCorrelation(rc1.Estimate-rc2.Estimate, rc1.SE, rc2.SE, df, r.Alpha)
	if err != nil || !ok {
		return tipping{}, false
	}
	tp := tipping{rho: rho, above: true, implied: math.NaN()}
	if r.reflected {
		// The test ran on −θ2, whose correlation with θ1 is −ρ.
		tp.rho, tp.above = -rho, false
	}
	tp.implied, tp.from = a.impliedEstimateCorr(r, c1, c2)
	return tp, true
}

// impliedEstimateCorr is the sampling correlation of two coefficients of
// one model implied by the predictors' correlations in the sample's table
// (regress.CoefficientCorrelation), and the table's name; NaN when the
// table does not give every predictor of the model.
func (a *auditor) impliedEstimateCorr(r *ClaimResult, c1, c2 *extract.Coefficient) (float64, string) {
	src := a.corrOf(c1.Study, c1.Group)
	if src == nil || r.Relation != SameModel || !extract.IsRegressionMeasure(r.Measure) {
		return math.NaN(), ""
	}
	preds := a.predictorsOf(modelOf(c1))
	i, j := indexOf(preds, c1.Predictor), indexOf(preds, c2.Predictor)
	if i < 0 || j < 0 || !src.has(preds...) {
		return math.NaN(), ""
	}
	rxx := mat.NewSymDense(len(preds), nil)
	for x := range preds {
		rxx.SetSym(x, x, 1)
		for y := x + 1; y < len(preds); y++ {
			p, ok := src.corr(preds[x], preds[y])
			if !ok {
				return math.NaN(), ""
			}
			rxx.SetSym(x, y, p.Value)
		}
	}
	rho, err := regress.CoefficientCorrelation(rxx, i, j)
	if err != nil {
		return math.NaN(), ""
	}
	src.used = true // for the note, if not for the test
	return rho, src.name
}

// note says where the verdict turns, and what the table implies.
func (tp tipping) note(r *ClaimResult) string {
	side := "above"
	if !tp.above {
		side = "below"
	}
	// Said briefly: a literature of same-sample claims carries it on
	// nearly every row.
	s := "At the printed values the difference is significant at α = " + FormatAlpha(r.Alpha) + " only if the estimates correlate " +
		side + " " + formatTippingCorr(tp.rho) + " (the tipping correlation)."
	if math.IsNaN(tp.implied) {
		return s
	}
	sig := tp.implied > tp.rho
	if !tp.above {
		sig = tp.implied < tp.rho
	}
	verdict := "not significant"
	if sig {
		verdict = "significant"
	}
	return s + fmt.Sprintf(" The correlation table (%s) gives the model's predictors: for two coefficients of one OLS model the sampling correlation is minus the predictors' partial correlation, here %s (exact for unstandardized coefficients, an approximation for standardized ones), at which the difference is %s.",
		tp.from, FormatFixed(tp.implied, 2), verdict)
}

// formatTippingCorr writes a tipping correlation with two decimals, but
// with as many more decimals (up to 6) as it takes to tell it from ±1:
// two estimates with nearly equal SEs tip near 1, and "above 1.00" would
// name no correlation at all.
func formatTippingCorr(x float64) string {
	s := FormatFixed(x, 2) // two decimals, as papers print correlations
	for d := 3; d <= 6 && math.Abs(x) < 1; d++ {
		if v, _ := strconv.ParseFloat(s, 64); math.Abs(v) < 1 {
			break
		}
		s = strconv.FormatFloat(x, 'f', d, 64)
	}
	return s
}
