package audit

import (
	"fmt"
	"math"

	"coefaudit/infer"
)

// adjustFamily adds Holm and Benjamini–Hochberg adjusted p-values to every
// claim of one study that has a p; the family is those claims.
func adjustFamily(claims []ClaimResult) {
	idx := make([]int, 0, len(claims))
	p := make([]float64, 0, len(claims))
	for i := range claims {
		if c := &claims[i]; c.P.Known() && c.decided {
			idx = append(idx, i)
			p = append(p, float64(c.P))
		}
	}
	if len(idx) == 0 {
		return
	}
	holm := infer.HolmAdjust(p)
	bh := infer.BenjaminiHochbergAdjust(p)
	adjusted := make([]AdjustedPValues, len(idx)) // one allocation for the study's claims
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
			r.Notes = append(r.Notes, fmt.Sprintf("The outcome uses the %s-adjusted %s, adjusted over the %d claims of the study that have a p (the raw %s).",
				adjustName(adjust), PStatement(float64(q)), r.family, PStatement(p)))
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
