package audit

import (
	"fmt"
	"math"

	"coefaudit/infer"
)

// adjustWithinStudies adds Holm and Benjamini–Hochberg adjusted p-values to
// every claim with a p, the family being the claims of one study.
func adjustWithinStudies(claims []ClaimResult) {
	if oneStudy(claims) {
		// A streamed batch passes one study's run: no map is needed, and
		// the indices stay on the stack for a paper's usual handful.
		var buf [64]int
		idx := buf[:0]
		for i := range claims {
			if adjustable(&claims[i]) {
				idx = append(idx, i)
			}
		}
		adjustFamily(claims, idx)
		return
	}
	families := map[string][]int{}
	var order []string
	for i := range claims {
		c := &claims[i]
		if !adjustable(c) {
			continue
		}
		if _, ok := families[c.Study]; !ok {
			order = append(order, c.Study)
		}
		families[c.Study] = append(families[c.Study], i)
	}
	for _, study := range order {
		adjustFamily(claims, families[study])
	}
}

func oneStudy(claims []ClaimResult) bool {
	for i := 1; i < len(claims); i++ {
		if claims[i].Study != claims[0].Study {
			return false
		}
	}
	return true
}

// adjustable says whether a claim takes part in its study's adjustment.
func adjustable(c *ClaimResult) bool { return c.P.Known() && c.decided }

// adjustFamily adjusts the p-values of claims[idx], one study's family.
func adjustFamily(claims []ClaimResult, idx []int) {
	if len(idx) == 0 {
		return
	}
	var buf [64]float64
	p := buf[:0]
	for _, i := range idx {
		p = append(p, float64(claims[i].P))
	}
	holm := infer.HolmAdjust(p)
	bh := infer.BenjaminiHochbergAdjust(p)
	adjusted := make([]AdjustedPValues, len(idx)) // one allocation per family
	for k, i := range idx {
		adjusted[k] = AdjustedPValues{Holm: Number(holm[k]), BH: Number(bh[k])}
		claims[i].AdjustedP = &adjusted[k]
		claims[i].family = len(idx)
	}
}

// settle decides the claim's outcome with the p the options ask for. With an
// adjustment the ends of the p range are scaled by the claim's own
// adjustment factor (adjusted p / p), which keeps the family's order fixed —
// an approximation when rounding could reorder the study's p-values.
func (r *ClaimResult) settle(adjust string) {
	if r.decided {
		p, pr := float64(r.P), r.dec.pr
		if q, ok := r.AdjustedP.By(adjust); ok && p > 0 {
			f := float64(q) / p
			r.Notes = append(r.Notes, fmt.Sprintf("The outcome uses the %s-adjusted p = %s, adjusted over the %d claims of the study that have a p (the raw p is %s).",
				adjustName(adjust), formatP(float64(q)), r.family, formatP(p)))
			p = float64(q)
			pr = infer.Range{Lo: math.Min(1, pr.Lo*f), Hi: math.Min(1, pr.Hi*f)}
		}
		r.decide(p, pr)
	}
	if r.conflict {
		r.Outcome = Conflict
		if dc := &r.dec; r.decided {
			r.Notes[dc.verdictNote] = r.outcomeNote(dc.dir, dc.used)
		}
	}
}

func adjustName(a string) string {
	if a == AdjustBH {
		return "Benjamini–Hochberg"
	}
	return "Holm"
}
