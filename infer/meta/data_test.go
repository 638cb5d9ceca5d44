package meta_test

import (
	"fmt"
	"math"

	"coefaudit/infer/meta"
)

// bcgCounts are the 13 BCG vaccine trials as (a, n1, c, n2): TB cases
// among the vaccinated, number vaccinated, TB cases among the unvaccinated,
// number unvaccinated. Source: Colditz GA et al. (1994). Efficacy of BCG
// vaccine in the prevention of tuberculosis: meta-analysis of the published
// literature. JAMA 271(9):698-702 (citation from memory; an open dataset,
// also Table I of van Houwelingen, Arends & Stijnen 2002, Stat Med
// 21:589-624).
var bcgCounts = [13][4]float64{
	{4, 123, 11, 139}, {6, 306, 29, 303}, {3, 231, 11, 220}, {62, 13598, 248, 12867},
	{33, 5069, 47, 5808}, {180, 1541, 372, 1451}, {8, 2545, 10, 629}, {505, 88391, 499, 88391},
	{29, 7499, 45, 7277}, {17, 1716, 65, 1665}, {186, 50634, 141, 27338}, {5, 2498, 3, 2341},
	{27, 16913, 29, 17854},
}

// bcgLogRiskRatios returns y_i = ln RR_i with v_i = 1/a − 1/n1 + 1/c − 1/n2.
func bcgLogRiskRatios() []meta.Study {
	out := make([]meta.Study, len(bcgCounts))
	for i, t := range bcgCounts {
		a, n1, c, n2 := t[0], t[1], t[2], t[3]
		out[i] = meta.Study{
			Label:    fmt.Sprintf("trial %d", i+1),
			Effect:   math.Log((a / n1) / (c / n2)),
			Variance: 1/a - 1/n1 + 1/c - 1/n2,
		}
	}
	return out
}

// bcgLogOddsRatios returns y_i = ln OR_i with v_i = 1/a + 1/b + 1/c + 1/d.
func bcgLogOddsRatios() []meta.Study {
	out := make([]meta.Study, len(bcgCounts))
	for i, t := range bcgCounts {
		a, b, c, d := t[0], t[1]-t[0], t[2], t[3]-t[2]
		out[i] = meta.Study{
			Label:    fmt.Sprintf("trial %d", i+1),
			Effect:   math.Log((a * d) / (b * c)),
			Variance: 1/a + 1/b + 1/c + 1/d,
		}
	}
	return out
}

// kackerStudies is the interlaboratory example of Kacker RN (2004).
// Combining information from interlaboratory evaluations using a random
// effects model. Metrologia 41(3):132-136 (citation from memory); y and v as
// given with R metafor's results in statsmodels' test results file
// statsmodels/stats/tests/results/results_meta.py (SECONDARY; Kacker's own
// table was not seen).
func kackerStudies() []meta.Study {
	y := []float64{61.0, 61.4, 62.21, 62.3, 62.34, 62.6, 62.7, 62.84, 65.9}
	v := []float64{0.2025, 1.2100, 0.0900, 0.2025, 0.3844, 0.5625, 0.0676, 0.0225, 1.8225}
	out := make([]meta.Study, len(y))
	for i := range y {
		out[i] = meta.Study{Label: fmt.Sprintf("lab %d", i+1), Effect: y[i], Variance: v[i]}
	}
	return out
}
