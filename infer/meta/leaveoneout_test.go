package meta_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
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

// Each row must be the analysis of the other studies, the slow way: the
// package's own single-set functions run on the reduced data, for both
// estimators, on published data sets, a seeded random one and one whose
// τ² sits at the boundary 0. DerSimonian–Laird and Q have closed forms and
// must agree to rounding; REML, warm-started and evaluated by series in
// the fast way, must reach the same root of the score as the cold start.
func TestLeaveOneOutMatchesReducedFits(t *testing.T) {
	sets := []struct {
		name    string
		studies []meta.Study
	}{
		{"Kacker 2004", kackerStudies()},
		{"BCG log RR", bcgLogRiskRatios()},
		{"BCG log OR", bcgLogOddsRatios()},
		{"random 40", randomStudies(40, 0.04, 7)},
		{"homogeneous", randomStudies(12, 0, 3)},
	}
	for _, set := range sets {
		studies := set.studies
		for _, method := range []meta.Tau2Method{meta.RestrictedMaximumLikelihood, meta.DerSimonianLaird} {
			rows, err := meta.LeaveOneOut(studies, meta.Options{Method: method, Level: 0.9})
			if err != nil {
				t.Fatalf("LeaveOneOut(%s, %v) error: %v", set.name, method, err)
			}
			tol := 1e-11
			for i, r := range rows {
				rest := append(append([]meta.Study(nil), studies[:i]...), studies[i+1:]...)
				re, err := meta.FitRandomEffects(rest, method, meta.Options{Level: 0.9})
				if err != nil {
					t.Fatalf("FitRandomEffects(%s without %d) error: %v", set.name, i, err)
				}
				het, err := meta.CochranQ(rest)
				if err != nil {
					t.Fatalf("CochranQ(%s without %d) error: %v", set.name, i, err)
				}
				if r.Omitted != i || r.Label != studies[i].Label {
					t.Errorf("LeaveOneOut(%s) row %d omits %d %q, want %d %q", set.name, i, r.Omitted, r.Label, i, studies[i].Label)
				}
				call := fmt.Sprintf("LeaveOneOut(%s, %v) without %d", set.name, method, i)
				checkValue(t, call+".Tau2", r.Tau2, re.Tau2, tol*math.Max(1, re.Tau2))
				checkValue(t, call+".Pooled.Estimate", r.Pooled.Estimate, re.Wald.Estimate, tol*math.Max(1, math.Abs(re.Wald.Estimate)))
				checkValue(t, call+".Pooled.SE", r.Pooled.SE, re.Wald.SE, tol*math.Max(1, re.Wald.SE))
				checkValue(t, call+".Pooled.Low", r.Pooled.Low, re.Wald.Low, tol*math.Max(1, math.Abs(re.Wald.Low)))
				checkValue(t, call+".Q", r.Q, het.Q, 1e-12*math.Max(1, het.Q))
				checkValue(t, call+".I2", r.I2, het.I2, 1e-12)
			}
		}
	}
	studies := kackerStudies()
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

// randomStudies draws k invented studies with true effects N(0.3, tau2)
// and within-study variances between 0.01 and 0.09, from a fixed seed.
func randomStudies(k int, tau2 float64, seed uint64) []meta.Study {
	rng := rand.New(rand.NewPCG(seed, 11))
	out := make([]meta.Study, k)
	for i := range out {
		v := 0.01 + 0.08*rng.Float64()
		out[i] = meta.Study{Label: fmt.Sprintf("s%d", i+1), Effect: 0.3 + math.Sqrt(tau2)*rng.NormFloat64() + math.Sqrt(v)*rng.NormFloat64(), Variance: v}
	}
	return out
}
