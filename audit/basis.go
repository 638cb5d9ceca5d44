package audit

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"coefaudit/extract"
	"coefaudit/infer"
)

// basisNotes explains the claim the way the paper reached it: the overlap
// rule read properly, the significance split named for what it is, and a
// printed p for the difference set beside the recomputed one.
func basisNotes(r *ClaimResult, cl *extract.Claim, c1, c2 *extract.Coefficient, rc1, rc2 *extract.Reconstructed) {
	switch cl.Basis {
	case extract.BasisSignificanceSplit:
		r.Notes = append(r.Notes, significanceSplitNote(r, rc1, rc2))
	case extract.BasisOverlap:
		r.Notes = append(r.Notes, overlapNote(r, rc1, rc2))
	}
	if cl.PublishedP.Present() && r.P.Known() {
		if n := publishedPNote(r, cl.PublishedP); n != "" {
			r.Notes = append(r.Notes, n)
		}
	}
}

// ownP is an estimate's own two-sided p against 0. When its SE was taken
// from its printed p, that p is its own (recomputing it would give it back
// to within 1e-12, and a p printed as α would fall either side of α by the
// round-trip's noise); below is set when only a bound "< p" was printed.
func ownP(rc *extract.Reconstructed) (p float64, below bool) {
	if !math.IsNaN(rc.PrintedP) {
		return rc.PrintedP, rc.PBelow
	}
	p, err := infer.StudentTTwoSidedP(rc.Estimate/rc.SE, dfOrInf(rc.DF))
	if err != nil {
		return math.NaN(), false
	}
	return p, false
}

func dfOrInf(df float64) float64 {
	if math.IsNaN(df) {
		return math.Inf(1)
	}
	return df
}

func significanceSplitNote(r *ClaimResult, rc1, rc2 *extract.Reconstructed) string {
	return "The paper's verdict rests on one estimate being significant and the other not (here " + ownSignificance(r, rc1) + "; " + ownSignificance(r, rc2) +
		"). That does not test their difference: the difference between significant and not significant need not itself be significant (Gelman & Stern 2006). The test of the difference is given instead."
}

// ownSignificance says an estimate's own p and whether it is significant
// at the claim's α.
func ownSignificance(r *ClaimResult, rc *extract.Reconstructed) string {
	switch p, below := ownP(rc); {
	case below && p <= r.Alpha:
		return rc.Label + ": p < " + formatPBound(p) + ", significant"
	case below:
		return rc.Label + ": p < " + formatPBound(p) + ", not known whether significant"
	case math.IsNaN(p):
		return rc.Label + ": own p not known"
	case p < r.Alpha:
		return rc.Label + ": " + PStatement(p) + ", significant"
	default:
		return rc.Label + ": " + PStatement(p) + ", not significant"
	}
}

// overlapNote reads the two intervals as Cumming & Finch (2005) do and says
// whether the rule's conditions held: independent estimates, n of at least
// 10 in each, and margins of error within a factor of 2.
func overlapNote(r *ClaimResult, rc1, rc2 *extract.Reconstructed) string {
	if r.Overlap == nil {
		return "The paper read the overlap of the two intervals, but both intervals (at one level) are not in the input, so the overlap cannot be shown."
	}
	o := r.Overlap
	rule := "no difference (the intervals overlap by more than half the mean margin of error, p > .05)"
	switch {
	case float64(o.Proportion) <= 0:
		rule = "a difference at p ≤ .01 (the intervals at most touch)"
	case float64(o.Proportion) <= 0.5:
		rule = "a difference at p ≤ .05 (an overlap of at most half the mean margin of error)"
	}
	var unmet []string
	if r.Relation != Independent {
		unmet = append(unmet, "the estimates come from one sample, so the rule does not apply at all")
	}
	for _, rc := range [2]*extract.Reconstructed{rc1, rc2} {
		switch {
		case math.IsNaN(rc.N):
			unmet = append(unmet, "n of "+rc.Label+" is not printed, so n ≥ 10 cannot be checked")
		case rc.N < 10:
			unmet = append(unmet, fmt.Sprintf("n of %s is %g, below 10", rc.Label, rc.N))
		}
	}
	if o.marginRatio > 2 {
		unmet = append(unmet, "the margins of error differ by a factor of "+strconv.FormatFloat(o.marginRatio, 'f', 2, 64)+", more than 2")
	}
	conditions := "The rule's conditions hold (independent estimates, n ≥ 10 each, margins within a factor of 2)."
	if len(unmet) > 0 {
		conditions = "The rule's conditions do not all hold: " + strings.Join(unmet, "; ") + "."
	}
	return "The paper read the overlap of the two intervals. The proportion overlap is " + strconv.FormatFloat(float64(o.Proportion), 'f', 2, 64) +
		" of the mean margin of error, which implies p ≈ " + FormatP(float64(o.ImpliedP)) + " for independent estimates; the rule of eye (Cumming & Finch 2005) says " +
		rule + ". " + conditions + " The proper test of the difference decides the outcome."
}

// publishedPNote compares the paper's p for the difference with the
// recomputed one, and says when the printed value looks one-sided.
func publishedPNote(r *ClaimResult, pp extract.Printed) string {
	lo, hi := pBounds(pp)
	pr := infer.Range{Lo: float64(r.PRange[0]), Hi: float64(r.PRange[1])}
	if !r.PRange[0].Known() {
		pr = infer.Point(float64(r.P))
	}
	if hi >= pr.Lo && lo <= pr.Hi {
		return "The paper's p for the difference (" + pp.Text + ") agrees with the recomputed one."
	}
	oneSided := ""
	if hi >= pr.Lo/2 && lo <= pr.Hi/2 {
		oneSided = "; it matches a one-sided p, half the two-sided one"
	}
	return fmt.Sprintf("The paper's p for the difference (%s) disagrees with the recomputed %s (%s within rounding)%s.",
		pp.Text, PStatement(float64(r.P)), PSpan(pr.Lo, pr.Hi), oneSided)
}
