package audit

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"

	"coefaudit/extract"
	"coefaudit/infer"
	"coefaudit/infer/regress"

	"gonum.org/v1/gonum/mat"
)

// roundingCorners is how many corners of a table's rounding box are
// evaluated, besides the printed values, for the p range of a regression
// rebuilt from it. A table of p predictors has (p+1)p/2 correlations, too
// many corners to visit all; the sample is drawn with a fixed seed so that
// the report does not change from run to run.
const roundingCorners = 256

// modelKey identifies a fitted model: study, group, model.
type modelKey [3]string

func modelOf(c *extract.Coefficient) modelKey { return modelKey{c.Study, c.Group, c.Model} }

// regressionFromTable rebuilds the model behind two coefficients from the
// sample's correlation table (OLS from summary statistics) and tests their
// difference with the rebuilt covariance: a t test with the residual df for
// unstandardized coefficients, a z test with the delta-method covariance for
// standardized ones. It reports false when the table lacks what is needed.
//
// The printed coefficients are then checked against the rebuilt ones
// (checkPrinted): an estimate outside the rebuilt one's rounding is a
// conflict, stars that disagree with the rebuilt p a problem, and a printed
// SE or interval is said to agree or not.
func (a *auditor) regressionFromTable(r *ClaimResult, c1, c2 *extract.Coefficient, rc1, rc2 *extract.Reconstructed, src *corrSource) bool {
	key := modelOf(c1)
	preds := a.predictorsOf(key)
	outcome := c1.Outcome
	if outcome == "" || c1.Predictor == "" || c2.Predictor == "" || outcome != c2.Outcome {
		r.Notes = append(r.Notes, "To rebuild the model from the correlation table, both coefficients need the same outcome and their predictors named.")
		src.tried(fmt.Sprintf("claim %s: its coefficients do not both name the same outcome and their predictors", r.Claim))
		return false
	}
	vars := append([]string{outcome}, preds...)
	var missing []string
	for _, v := range vars {
		if !src.has(v) {
			missing = append(missing, v)
		}
	}
	if len(missing) > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("The model cannot be rebuilt from %s: it lacks %s.", src.name, strings.Join(missing, ", ")))
		src.tried(fmt.Sprintf("claim %s: the model needs %s", r.Claim, strings.Join(missing, ", ")))
		return false
	}
	n := src.n
	if math.IsNaN(n) && c1.N.IsExact() {
		n = c1.N.Value
	}
	if math.IsNaN(n) {
		r.Notes = append(r.Notes, fmt.Sprintf("The model cannot be rebuilt from %s: no n is printed.", src.name))
		src.tried(fmt.Sprintf("claim %s: no n is printed", r.Claim))
		return false
	}
	unstd := r.Measure == extract.MeasureB
	table, err := newModelTable(src, vars, unstd)
	if err != nil {
		r.Notes = append(r.Notes, fmt.Sprintf("The model cannot be rebuilt from %s: %v.", src.name, err))
		src.tried(fmt.Sprintf("claim %s: %v", r.Claim, err))
		return false
	}
	i, j := indexOf(preds, c1.Predictor), indexOf(preds, c2.Predictor)
	if r.reflected {
		table.reflect(j + 1) // the outcome is variable 0
	}
	level := 1 - r.Alpha
	res, err := table.test(table.point(), int(n), i, j, unstd, level)
	if err != nil {
		var npd *regress.NotPositiveDefiniteError
		if errors.As(err, &npd) {
			r.Notes = append(r.Notes, fmt.Sprintf("The correlation table in %s is not positive definite (smallest eigenvalue %.3g): no sample can have these correlations, so the model cannot be rebuilt from it.", src.name, npd.MinEigenvalue))
		} else {
			r.Notes = append(r.Notes, fmt.Sprintf("The model cannot be rebuilt from %s: %v.", src.name, err))
		}
		src.tried(fmt.Sprintf("claim %s: %v", r.Claim, err))
		return false
	}
	src.used = true
	if unstd {
		r.Method = "t-from-correlation-table"
	} else {
		r.Method = "z-delta-from-correlation-table"
	}
	r.Difference = Number(res.diff.Estimate)
	r.DifferenceSE = Number(res.diff.SE)
	r.DifferenceCI = [2]Number{Number(res.diff.Lower), Number(res.diff.Upper)}
	r.Statistic = Number(res.diff.Statistic)
	r.DF = nan
	if !math.IsInf(res.diff.DF, 1) {
		r.DF = Number(res.diff.DF)
	}
	r.P = Number(res.diff.P)
	r.PoolEstimate, r.PoolSE, r.PoolScale = r.Difference, r.DifferenceSE, extract.ScaleAsPrinted
	r.First.Estimate, r.First.SE, r.First.SEFrom = Number(res.est[i]), Number(res.se[i]), "rebuilt from "+src.name
	r.Second.Estimate, r.Second.SE, r.Second.SEFrom = Number(r.signOf(true)*res.est[j]), Number(res.se[j]), "rebuilt from "+src.name
	kind := "classical OLS covariance, t with the residual df"
	if !unstd {
		kind = "normal-theory delta-method covariance of standardized coefficients (Yuan & Chan 2011; Jones & Waller 2013), z test"
	}
	r.Notes = append(r.Notes, fmt.Sprintf("The model of %s on %s was rebuilt from %s with n = %g (%s).", outcome, strings.Join(preds, ", "), src.name, n, kind))
	for _, w := range res.warnings {
		r.Notes = append(r.Notes, capitalize(w)+".")
	}
	if !unstd && n < 100 {
		r.Notes = append(r.Notes, fmt.Sprintf("With n = %g the delta-method z test of standardized coefficients rejects somewhat too often (about 7.6%% at α = .05 for n = 50 in this project's simulation); read a p near α with caution.", n))
	}

	// The rounding of the table and of the printed coefficients: the
	// printed values, then corners of the box drawn with a fixed seed.
	pr := infer.Point(res.diff.P)
	dr := infer.Point(res.diff.Estimate)
	box := newRebuiltBox(res)
	rng := rand.New(rand.NewPCG(uint64(len(vars)), uint64(n)))
	for range roundingCorners {
		g, err := table.test(table.corner(rng), int(n), i, j, unstd, level)
		if err != nil {
			continue
		}
		pr.Lo, pr.Hi = math.Min(pr.Lo, g.diff.P), math.Max(pr.Hi, g.diff.P)
		dr.Lo, dr.Hi = math.Min(dr.Lo, g.diff.Estimate), math.Max(dr.Hi, g.diff.Estimate)
		box.widen(g)
	}
	r.PRange = [2]Number{Number(pr.Lo), Number(pr.Hi)}
	r.classify(res.est[i], res.est[j], dr, pr, rangeGrid) // j reflected for magnitude
	if r.reflected {
		box.reflect(j)
	}
	a.checkPrinted(r, src, key, box, rebuiltCoef{c1, *rc1, i}, rebuiltCoef{c2, *rc2, j})
	return true
}

func indexOf(list []string, v string) int {
	for i, x := range list {
		if varKey(x) == varKey(v) {
			return i
		}
	}
	return -1
}

// modelTable is the part of a correlation table one model needs.
type modelTable struct {
	r        [][]extract.Printed
	sds      []extract.Printed
	unstd    bool
	printedN int
	// reflected marks variables whose scoring is reversed (their
	// correlations turn sign), for claims about magnitude; nil for none.
	reflected []bool
}

// reflect reverses the scoring of variable k.
func (t *modelTable) reflect(k int) {
	if t.reflected == nil {
		t.reflected = make([]bool, len(t.r))
	}
	t.reflected[k] = !t.reflected[k]
}

func newModelTable(src *corrSource, vars []string, unstd bool) (*modelTable, error) {
	t := &modelTable{unstd: unstd}
	idx := make([]int, len(vars))
	for k, v := range vars {
		idx[k] = src.index[varKey(v)]
	}
	t.r = make([][]extract.Printed, len(vars))
	for a := range vars {
		t.r[a] = make([]extract.Printed, len(vars))
		for b := range vars {
			if a == b {
				t.r[a][b] = extract.Printed{Value: 1, Bound: extract.Exact, Decimals: -1}
				continue
			}
			p := src.r[idx[a]][idx[b]]
			if !p.IsExact() {
				return nil, fmt.Errorf("the correlation of %s and %s is missing", vars[a], vars[b])
			}
			t.r[a][b] = p
		}
	}
	if unstd {
		for k, v := range vars {
			sd := src.sd[idx[k]]
			if !sd.IsExact() || sd.Value <= 0 {
				return nil, fmt.Errorf("the SD of %s is missing, so unstandardized coefficients cannot be rebuilt", v)
			}
			t.sds = append(t.sds, sd)
		}
	}
	return t, nil
}

// values are a correlation matrix and SDs to rebuild the model from.
type values struct {
	r   *mat.SymDense
	sds []float64
}

func (t *modelTable) point() values {
	return t.build(func(p extract.Printed) float64 { return p.Value })
}

// corner draws one corner of the rounding box of the table's numbers.
func (t *modelTable) corner(rng *rand.Rand) values {
	return t.build(func(p extract.Printed) float64 {
		lo, hi := p.RoundingInterval()
		if rng.IntN(2) == 0 {
			return lo
		}
		return hi
	})
}

func (t *modelTable) build(at func(extract.Printed) float64) values {
	q := len(t.r)
	m := mat.NewSymDense(q, nil)
	for a := 0; a < q; a++ {
		m.SetSym(a, a, 1)
		for b := a + 1; b < q; b++ {
			v := math.Max(-1, math.Min(1, at(t.r[a][b])))
			if t.reflected != nil && t.reflected[a] != t.reflected[b] {
				v = -v
			}
			m.SetSym(a, b, v)
		}
	}
	v := values{r: m}
	for _, sd := range t.sds {
		v.sds = append(v.sds, at(sd))
	}
	return v
}

// tableResult is one rebuilt model's test of two of its coefficients.
type tableResult struct {
	diff     *regress.Difference
	est, se  []float64
	df       float64 // +Inf for the z test of standardized coefficients
	warnings []string
}

func (t *modelTable) test(v values, n, i, j int, unstd bool, level float64) (tableResult, error) {
	s := regress.Summary{Correlation: v.r, N: n}
	if unstd {
		s.SDs = v.sds
	}
	fit, err := regress.FromSummary(s)
	if err != nil {
		return tableResult{}, err
	}
	res := tableResult{warnings: fit.Warnings}
	var cov *mat.SymDense
	df := math.Inf(1)
	if unstd {
		res.est, res.se, cov = fit.Coefficients, fit.StandardErrors, fit.Covariance
		i, j = fit.SlopeIndex(i), fit.SlopeIndex(j)
		df = float64(fit.ResidualDF)
		res.est, res.se = res.est[len(res.est)-fit.Predictors:], res.se[len(res.se)-fit.Predictors:]
	} else {
		res.est, res.se, cov = fit.Standardized, fit.StandardizedDeltaSE, fit.StandardizedDeltaCov
	}
	all := fit.Standardized
	if unstd {
		all = fit.Coefficients
	}
	res.df = df
	res.diff, err = regress.TestDifference(all, cov, i, j, df, level)
	return res, err
}
