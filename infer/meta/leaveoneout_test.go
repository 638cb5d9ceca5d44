package meta_test

import (
	"errors"
	"math"
	"testing"

	"coefaudit/infer/meta"
)

// The range of the leave-one-out REML estimates for BCG log RR on the ratio
// scale: "range 0.452 to 0.533" in a demo manuscript made with metafor
// (github.com/Aperivue/medsci-skills, demo/02_metafor_bcg/manuscript/
// manuscript.md; SECONDARY, low authority, 3 decimals).
func TestLeaveOneOutBCG(t *testing.T) {
	rows, err := meta.LeaveOneOut(bcgLogRiskRatios(), meta.Options{})
	if err != nil {
		t.Fatalf("LeaveOneOut(BCG log RR) error: %v", err)
	}
	if len(rows) != 13 {
		t.Fatalf("LeaveOneOut(BCG log RR) has %d rows, want 13", len(rows))
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, r := range rows {
		lo = math.Min(lo, math.Exp(r.Pooled.Estimate))
		hi = math.Max(hi, math.Exp(r.Pooled.Estimate))
	}
	checkValue(t, "min exp(LeaveOneOut estimate)", lo, 0.452, 5e-4)
	checkValue(t, "max exp(LeaveOneOut estimate)", hi, 0.533, 5e-4)
}

// Each row must be the analysis of the other studies: compared with the
// package's own single-set functions run on the reduced data, for both
// estimators.
func TestLeaveOneOutMatchesReducedFits(t *testing.T) {
	studies := kackerStudies()
	for _, method := range []meta.Tau2Method{meta.RestrictedMaximumLikelihood, meta.DerSimonianLaird} {
		rows, err := meta.LeaveOneOut(studies, meta.Options{Method: method, Level: 0.9})
		if err != nil {
			t.Fatalf("LeaveOneOut(Kacker, %v) error: %v", method, err)
		}
		for i, r := range rows {
			rest := append(append([]meta.Study(nil), studies[:i]...), studies[i+1:]...)
			re, err := meta.FitRandomEffects(rest, method, meta.Options{Level: 0.9})
			if err != nil {
				t.Fatalf("FitRandomEffects(without %d) error: %v", i, err)
			}
			het, err := meta.CochranQ(rest)
			if err != nil {
				t.Fatalf("CochranQ(without %d) error: %v", i, err)
			}
			if r.Omitted != i || r.Label != studies[i].Label {
				t.Errorf("LeaveOneOut row %d omits %d %q, want %d %q", i, r.Omitted, r.Label, i, studies[i].Label)
			}
			checkValue(t, "LeaveOneOut().Tau2", r.Tau2, re.Tau2, 1e-12)
			checkValue(t, "LeaveOneOut().Pooled.Estimate", r.Pooled.Estimate, re.Wald.Estimate, 1e-12)
			checkValue(t, "LeaveOneOut().Pooled.Low", r.Pooled.Low, re.Wald.Low, 1e-12)
			checkValue(t, "LeaveOneOut().I2", r.I2, het.I2, 1e-12)
		}
	}
	// Omitting Kacker's outlying lab 9 (65.9, far above the rest) must
	// lower both the heterogeneity (I² 0.677 with it, TestCochranQ) and the
	// estimate (62.390 with it, TestRandomEffectsWaldDerSimonianLaird).
	rows, err := meta.LeaveOneOut(studies, meta.Options{})
	if err != nil {
		t.Fatalf("LeaveOneOut(Kacker) error: %v", err)
	}
	if rows[8].I2 >= 0.677 || rows[8].Pooled.Estimate >= 62.39 {
		t.Errorf("LeaveOneOut(Kacker) without lab 9 = I2 %v, estimate %v; want both lower", rows[8].I2, rows[8].Pooled.Estimate)
	}
}

func TestLeaveOneOutTooFew(t *testing.T) {
	_, err := meta.LeaveOneOut([]meta.Study{{"a", 0, 0.1}, {"b", 1, 0.1}}, meta.Options{})
	if !errors.Is(err, meta.ErrTooFewStudies) {
		t.Errorf("LeaveOneOut(2 studies) error = %v, want %v", err, meta.ErrTooFewStudies)
	}
}
