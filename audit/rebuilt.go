package audit

import (
	"fmt"
	"math"

	"coefaudit/extract"
	"coefaudit/infer"
)

// rebuiltBox holds what a model rebuilt from a correlation table gives for
// each predictor's coefficient: at the printed table, and its range over
// the corners of the table's rounding box.
type rebuiltBox struct {
	est, se, p   []float64
	estLo, estHi []float64
	seLo, seHi   []float64
	pLo, pHi     []float64
}

func newRebuiltBox(res tableResult) *rebuiltBox {
	b := &rebuiltBox{est: clone(res.est), se: clone(res.se), p: res.ownP()}
	b.estLo, b.estHi = clone(b.est), clone(b.est)
	b.seLo, b.seHi = clone(b.se), clone(b.se)
	b.pLo, b.pHi = clone(b.p), clone(b.p)
	return b
}

func clone(x []float64) []float64 { return append([]float64(nil), x...) }

// widen takes one corner's model into the ranges.
func (b *rebuiltBox) widen(g tableResult) {
	p := g.ownP()
	for k := range g.est {
		b.estLo[k], b.estHi[k] = math.Min(b.estLo[k], g.est[k]), math.Max(b.estHi[k], g.est[k])
		b.seLo[k], b.seHi[k] = math.Min(b.seLo[k], g.se[k]), math.Max(b.seHi[k], g.se[k])
		b.pLo[k], b.pHi[k] = math.Min(b.pLo[k], p[k]), math.Max(b.pHi[k], p[k])
	}
}

// reflect turns coefficient k back to the sign the paper printed, after a
// test of magnitude reflected its predictor.
func (b *rebuiltBox) reflect(k int) {
	b.est[k] = -b.est[k]
	b.estLo[k], b.estHi[k] = -b.estHi[k], -b.estLo[k]
}

// ownP is each coefficient's own two-sided p against 0: Student's t with
// the residual df, or the normal for the delta-method SEs of standardized
// coefficients.
func (res tableResult) ownP() []float64 {
	p := make([]float64, len(res.est))
	for k := range res.est {
		var err error
		p[k], err = infer.StudentTTwoSidedP(res.est[k]/res.se[k], res.df)
		if err != nil {
			p[k] = math.NaN()
		}
	}
	return p
}

// rebuiltCoef is a claim's coefficient with what its printed numbers give
// and its index among the rebuilt model's predictors. It holds rc by
// value: a pointer here would take every claim's reconstructed
// coefficients to the heap, the rare claim rebuilt from a table or not
// (BenchmarkAuditMillion in package report, -benchmem).
type rebuiltCoef struct {
	c  *extract.Coefficient
	rc extract.Reconstructed
	k  int
}

// checkPrinted sets the printed coefficients beside the rebuilt ones: an
// estimate outside the rebuilt one's range (over the table's rounding)
// makes the claim a conflict; stars whose p bound the rebuilt p cannot
// meet, and a printed SE or interval, are noted (a printed SE that
// disagrees is not a conflict: papers print SEs of other estimators). Each
// disagreement is also a problem of the coefficient, listed once however
// many claims use it.
func (a *auditor) checkPrinted(r *ClaimResult, src *corrSource, key modelKey, b *rebuiltBox, coefs ...rebuiltCoef) {
	stars := a.modelStars(key)
	for _, pc := range coefs {
		c, k := pc.c, pc.k
		lo, hi := c.Estimate.RoundingInterval()
		if hi < b.estLo[k]-1e-12 || lo > b.estHi[k]+1e-12 {
			msg := fmt.Sprintf("coefficient %s is printed as %s, but the correlation table (%s) gives %s (between %s and %s within its rounding): the table and the coefficient disagree beyond rounding, or the model had covariates the table does not show",
				c.Label, c.Estimate.Text, src.name, r.FormatEstimate(b.est[k]), r.FormatEstimate(b.estLo[k]), r.FormatEstimate(b.estHi[k]))
			r.Notes = append(r.Notes, capitalize(msg)+".")
			r.conflict = true
			a.addRebuiltProblem(c, "estimate", msg)
		}
		if msg := starsDisagree(c, stars, b.pLo[k], b.pHi[k]); msg != "" {
			r.Notes = append(r.Notes, capitalize(msg)+".")
			a.addRebuiltProblem(c, "estimate", msg)
		}
		if pc.rc.SEFrom == "" || math.IsNaN(pc.rc.SE) {
			r.Notes = append(r.Notes, fmt.Sprintf("Coefficient %s: no SE, interval or p was printed; its SE (%s) is the rebuilt model's.", c.Label, r.FormatEstimate(b.se[k])))
			continue
		}
		agree := "agrees with"
		if pc.rc.SERange.Hi < b.seLo[k]*(1-1e-9) || pc.rc.SERange.Lo > b.seHi[k]*(1+1e-9) {
			agree = "does not agree with"
		}
		r.Notes = append(r.Notes, fmt.Sprintf("Coefficient %s: the SE from its printed %s (%s, %s to %s within rounding) %s the rebuilt SE %s (%s to %s within the table's rounding); the test uses the rebuilt model.",
			c.Label, pc.rc.SEFrom, r.FormatEstimate(pc.rc.SE), r.FormatEstimate(pc.rc.SERange.Lo), r.FormatEstimate(pc.rc.SERange.Hi), agree,
			r.FormatEstimate(b.se[k]), r.FormatEstimate(b.seLo[k]), r.FormatEstimate(b.seHi[k])))
	}
}

// starsDisagree says how a coefficient's stars disagree with its rebuilt p
// (between pLo and pHi over the table's rounding), or "". Stars are read as
// p bounds (extract.StarsPBound); a coefficient with fewer stars than
// another of its model (most, the most any coefficient of the model has)
// also says its p is not below the next bound.
func starsDisagree(c *extract.Coefficient, most int, pLo, pHi float64) string {
	s := int(c.Estimate.Stars)
	if s == 0 && most == 0 {
		return ""
	}
	if bound, ok := extract.StarsPBound(s); ok && pLo >= bound {
		return fmt.Sprintf("coefficient %s is printed with %d star(s), p < %s, but the model rebuilt from the correlation table gives p from %s to %s",
			c.Label, s, FormatAlpha(bound), FormatP(pLo), FormatP(pHi))
	}
	if s < most {
		if next, ok := extract.StarsPBound(s + 1); ok && pHi < next {
			return fmt.Sprintf("coefficient %s is printed with %d star(s) where its model marks p < %s with %d, but the model rebuilt from the correlation table gives p from %s to %s",
				c.Label, s, FormatAlpha(next), s+1, FormatP(pLo), FormatP(pHi))
		}
	}
	return ""
}

// modelStars is the most stars any coefficient of a model is printed with.
func (a *auditor) modelStars(key modelKey) int {
	most := 0
	for _, c := range a.modelCoefs[key] {
		most = max(most, int(c.Estimate.Stars))
	}
	return most
}

// addRebuiltProblem lists a problem of a coefficient found by a rebuilt
// model once, however many claims find it.
func (a *auditor) addRebuiltProblem(c *extract.Coefficient, column, msg string) {
	for _, p := range a.rebuilt[c] {
		if p.Message == msg {
			return
		}
	}
	if a.rebuilt == nil {
		a.rebuilt = map[*extract.Coefficient][]Problem{}
	}
	a.rebuilt[c] = append(a.rebuilt[c], problemAt(c.Position, column, msg))
}
