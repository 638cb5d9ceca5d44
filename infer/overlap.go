package infer

import (
	"fmt"
	"math"
)

// Overlap describes how two confidence intervals overlap, read the way
// Cumming & Finch (2005) read them.
type Overlap struct {
	// Proportion is the overlap of the two facing arms divided by the mean
	// of those two margins of error; negative for a gap between them.
	Proportion float64
	// ImpliedP is the two-sided p of the difference when each estimate's SE
	// is taken as its facing margin of error over the critical value of the
	// level, assuming independent estimates.
	ImpliedP float64
	// MarginRatio is the larger facing margin of error over the smaller.
	MarginRatio float64
	// RuleP05 reports whether the rule of eye says p ≤ .05: a proportion
	// overlap of at most one half.
	RuleP05 bool
	// RuleP01 reports whether the rule of eye says p ≤ .01: the intervals
	// at most touch (proportion ≤ 0).
	RuleP01 bool
}

// CIOverlap measures the overlap of two intervals (lo1, hi1) around e1 and
// (lo2, hi2) around e2, both at the same level (a proportion). The facing
// arms are the upper arm of the smaller estimate and the lower arm of the
// larger one:
//
//	overlap = hi_small − lo_large,  MOE = (arm_small + arm_large)/2,
//	proportion = overlap / MOE.
//
// The rule of eye — proportion ≤ .5 means p ≤ .05, ≤ 0 means p ≤ .01 — is
// meant for independent estimates with n ≥ 10 each and margins within a
// factor of 2 of each other; ImpliedP gives the p the geometry actually
// implies under those assumptions.
//
// References:
//
//	[1] Cumming G, Finch S (2005). Inference by eye: confidence intervals
//	    and how to read pictures of data. American Psychologist
//	    60(2):170–180.
func CIOverlap(e1, lo1, hi1, e2, lo2, hi2, level float64) (Overlap, error) {
	if !(lo1 <= e1 && e1 <= hi1 && lo1 < hi1) || !(lo2 <= e2 && e2 <= hi2 && lo2 < hi2) {
		return Overlap{}, fmt.Errorf("intervals (%v, %v) around %v and (%v, %v) around %v: %w",
			lo1, hi1, e1, lo2, hi2, e2, ErrInterval)
	}
	c, err := NormalCriticalValue(level)
	if err != nil {
		return Overlap{}, err
	}
	eS, hiS := e1, hi1
	eL, loL := e2, lo2
	if e1 > e2 {
		eS, hiS = e2, hi2
		eL, loL = e1, lo1
	}
	armS := hiS - eS
	armL := eL - loL
	if !(armS > 0 && armL > 0) {
		return Overlap{}, fmt.Errorf("an interval with a zero-length arm facing the other estimate: %w", ErrInterval)
	}
	moe := (armS + armL) / 2
	o := Overlap{
		Proportion:  (hiS - loL) / moe,
		MarginRatio: math.Max(armS, armL) / math.Min(armS, armL),
	}
	o.RuleP05 = o.Proportion <= 0.5
	o.RuleP01 = o.Proportion <= 0
	z := (eL - eS) / math.Hypot(armS/c, armL/c)
	o.ImpliedP = NormalTwoSidedP(z)
	return o, nil
}
