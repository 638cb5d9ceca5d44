package audit

import (
	"fmt"
	"math"
	"strings"

	"coefaudit/extract"
	"coefaudit/infer"
	"coefaudit/infer/correlation"
)

// independentCorrelations replaces the generic difference of a claim
// comparing two correlations from independent samples by the Fisher z test
// with Zou's (2007) interval for ρ1 − ρ2 on the correlation scale.
func (a *auditor) independentCorrelations(r *ClaimResult, c1, c2 *extract.Coefficient, rc1, rc2 *extract.Reconstructed) {
	if math.IsNaN(rc1.N) || math.IsNaN(rc2.N) {
		r.Notes = append(r.Notes, "Without both n the correlations are compared on Fisher's z scale with SEs taken from their intervals, and no interval for ρ1 − ρ2 is given.")
		return
	}
	cmp, err := correlation.CompareIndependent(c1.Estimate.Value, int(rc1.N), r.signOf(true)*c2.Estimate.Value, int(rc2.N), 1-r.Alpha)
	if err != nil {
		r.Notes = append(r.Notes, "The Fisher z test could not be run: "+err.Error()+".")
		return
	}
	r.Method = cmp.Primary.Method
	setCorrelationComparison(r, cmp)
}

// setCorrelationComparison copies a correlation comparison into the result.
func setCorrelationComparison(r *ClaimResult, cmp correlation.Comparison) {
	r.Difference = Number(cmp.Difference)
	r.DifferenceCI = [2]Number{Number(cmp.CI[0]), Number(cmp.CI[1])}
	r.DifferenceSE = nan
	r.Statistic = Number(cmp.Primary.Stat)
	r.DF = Number(cmp.Primary.DF)
	r.P = Number(cmp.Primary.P)
	r.Scale = ScaleCorrelation
	r.Alternatives = nil
	// Pooling needs a difference with an SE: the Fisher z based test of the
	// design (fisher-z, steiger-z or zpf), whose z1 − z2 is near normal.
	r.PoolEstimate, r.PoolSE, r.PoolScale = nan, nan, ""
	pool := func(res *correlation.Result) {
		switch res.Method {
		case correlation.MethodFisherZ, correlation.MethodSteigerZ, correlation.MethodZPF:
			if !r.PoolSE.Known() {
				r.PoolEstimate, r.PoolSE, r.PoolScale = Number(res.Estimate), Number(res.SE), extract.ScaleFisherZ
			}
		}
	}
	pool(&cmp.Primary)
	for i := range cmp.Alternatives {
		alt := &cmp.Alternatives[i]
		pool(alt)
		r.Alternatives = append(r.Alternatives, Alternative{Method: alt.Method, Statistic: Number(alt.Stat), P: Number(alt.P)})
	}
	r.Notes = append(r.Notes, "The test ("+cmp.Primary.Method+") is built on the correlations as printed; the difference r1 − r2 and its interval (Zou 2007) are on the correlation scale.")
	for _, w := range cmp.Primary.Warnings {
		r.Notes = append(r.Notes, capitalize(w)+".")
	}
}

// dependentCorrelations compares two correlations from one sample, looking
// up the correlations they need in the sample's table. It reports false
// when the table lacks what the design needs.
func (a *auditor) dependentCorrelations(r *ClaimResult, c1, c2 *extract.Coefficient, src *corrSource) bool {
	j, k := c1.Outcome, c1.Predictor
	h, m := c2.Outcome, c2.Predictor
	if j == "" || k == "" || h == "" || m == "" {
		r.Notes = append(r.Notes, "A correlation's two variables (outcome and predictor columns) are needed to find the correlations between them in the table.")
		src.tried(fmt.Sprintf("claim %s: its correlations do not name their two variables", r.Claim))
		return false
	}
	n := src.n
	for _, c := range []*extract.Coefficient{c1, c2} {
		if c.N.IsExact() && (math.IsNaN(n) || c.N.Value < n) {
			n = c.N.Value
		}
	}
	if math.IsNaN(n) {
		r.Notes = append(r.Notes, fmt.Sprintf("No n is printed for the correlations or in %s.", src.name))
		src.tried(fmt.Sprintf("claim %s: no n is printed", r.Claim))
		return false
	}
	level := 1 - r.Alpha
	// Put the shared variable first: r(j,k) vs r(j,h).
	shared := ""
	for _, x := range []string{j, k} {
		for _, y := range []string{h, m} {
			if varKey(x) == varKey(y) {
				shared = x
			}
		}
	}
	if shared != "" {
		other := func(a, b string) string {
			if varKey(a) == varKey(shared) {
				return b
			}
			return a
		}
		k, hh := other(j, k), other(h, m)
		if varKey(k) == varKey(hh) {
			r.Notes = append(r.Notes, "The two correlations are the same pair of variables.")
			return false
		}
		pkh, ok := src.corr(k, hh)
		if !ok {
			r.Notes = append(r.Notes, fmt.Sprintf("The correlation of %s and %s is not in %s.", k, hh, src.name))
			src.tried(fmt.Sprintf("claim %s: it lacks the correlation of %s and %s", r.Claim, k, hh))
			return false
		}
		vals := []extract.Printed{c1.Estimate, c2.Estimate, pkh}
		if r.reflected {
			// Reflect hh, the second correlation's own variable.
			vals[1], vals[2] = negated(vals[1]), negated(vals[2])
		}
		eval := func(v []float64) (correlation.Comparison, error) {
			return correlation.CompareOverlapping(v[0], v[1], v[2], int(n), level)
		}
		return a.finishCorrelations(r, c1, c2, src, vals, eval, fmt.Sprintf("r(%s, %s) = %s from %s", k, hh, pkh.Text, src.name))
	}
	need := [][2]string{{j, h}, {j, m}, {k, h}, {k, m}}
	vals := []extract.Printed{c1.Estimate, c2.Estimate}
	var missing []string
	for _, pair := range need {
		p, ok := src.corr(pair[0], pair[1])
		if !ok {
			missing = append(missing, pair[0]+"–"+pair[1])
		}
		vals = append(vals, p)
	}
	if len(missing) > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("The correlations %s are not in %s.", strings.Join(missing, ", "), src.name))
		src.tried(fmt.Sprintf("claim %s: it lacks the correlations %s", r.Claim, strings.Join(missing, ", ")))
		return false
	}
	if r.reflected {
		// Reflect m: r(h,m), r(j,m) and r(k,m) turn sign.
		vals[1], vals[3], vals[5] = negated(vals[1]), negated(vals[3]), negated(vals[5])
	}
	eval := func(v []float64) (correlation.Comparison, error) {
		return correlation.CompareNonOverlapping(correlation.NonOverlapping{JK: v[0], HM: v[1], JH: v[2], JM: v[3], KH: v[4], KM: v[5]}, int(n), level)
	}
	return a.finishCorrelations(r, c1, c2, src, vals, eval, "the four cross correlations from "+src.name)
}

// finishCorrelations runs a dependent correlation comparison at the
// printed values and over a grid of the rounding box (each printed
// correlation at its two rounding limits and its printed value) for p_range.
func (a *auditor) finishCorrelations(r *ClaimResult, c1, c2 *extract.Coefficient, src *corrSource, vals []extract.Printed,
	eval func([]float64) (correlation.Comparison, error), used string) bool {
	point := make([]float64, len(vals))
	for i, v := range vals {
		point[i] = v.Value
	}
	cmp, err := eval(point)
	if err != nil {
		r.Notes = append(r.Notes, "The dependent correlations could not be compared: "+err.Error()+".")
		src.tried(fmt.Sprintf("claim %s: %v", r.Claim, err))
		return false
	}
	src.used = true
	r.Method = cmp.Primary.Method
	setCorrelationComparison(r, cmp)
	r.Notes = append(r.Notes, "The comparison uses "+used+".")
	pr := infer.Range{Lo: cmp.Primary.P, Hi: cmp.Primary.P}
	dr := infer.Range{Lo: cmp.Difference, Hi: cmp.Difference}
	grid := make([]float64, len(vals))
	var walk func(i int)
	walk = func(i int) {
		if i == len(vals) {
			g, err := eval(grid)
			if err != nil {
				return
			}
			pr.Lo, pr.Hi = math.Min(pr.Lo, g.Primary.P), math.Max(pr.Hi, g.Primary.P)
			dr.Lo, dr.Hi = math.Min(dr.Lo, g.Difference), math.Max(dr.Hi, g.Difference)
			return
		}
		lo, hi := vals[i].RoundingInterval()
		for _, x := range []float64{lo, vals[i].Value, hi} {
			grid[i] = x
			walk(i + 1)
			if lo == hi {
				break
			}
		}
	}
	walk(0)
	r.PRange = [2]Number{Number(pr.Lo), Number(pr.Hi)}
	r.classify(vals[0].Value, vals[1].Value, dr, pr, rangeGrid)
	return true
}
