package audit

import (
	"strings"
	"testing"

	"coefaudit/extract"
)

// TestIssue17OutcomeWords: an opposite point estimate without a significant
// difference was labelled reversed, and "larger" mixed sign and magnitude.
// Reversed now needs the test to show the opposite direction at α; the
// recomputed verdict of a claim about magnitude is in the same words.
// Numbers constructed; arithmetic in each comment.
func TestIssue17OutcomeWords(t *testing.T) {
	tests := []struct {
		name           string
		c1, c2         coefSpec
		published      string
		rho            string
		wantOutcome    string
		wantRecomputed string
		wantNote       string
	}{
		// d = 0.20 − 0.28 = −0.08, SE(d) = 0.141, p 0.57.
		{"opposite point estimate", coefSpec{label: "x", measure: "b", group: "g", est: "0.20", se: "0.10"},
			coefSpec{label: "y", measure: "b", group: "h", est: "0.28", se: "0.10"}, extract.PublishedFirstLarger, "",
			Unsupported, extract.PublishedNoDifference, "point estimates point the other way"},
		// |−0.60| vs |0.20|: the reflected difference −0.60 − (−0.20) = −0.40, SE 0.141,
		// z −2.83, p 0.005: the first is significantly the stronger.
		{"first-stronger, opposite signs", coefSpec{label: "x", measure: "b", group: "g", est: "-0.60", se: "0.10"},
			coefSpec{label: "y", measure: "b", group: "h", est: "0.20", se: "0.10"}, extract.PublishedFirstStronger, "",
			Consistent, extract.PublishedFirstStronger, "opposite signs"},
		// One model, printed estimate_corr 0.5. Reflecting the second turns it to −0.5:
		// d = 0.50 − 0.20 = 0.30, Var = 0.01 + 0.01 + 2·0.5·0.01 = 0.03, SE 0.173, t 1.73,
		// p ≈ 0.08: not significant. Without the reflection Var = 0.01 and t = 3.
		{"magnitude with estimate_corr", coefSpec{label: "x", measure: "b", group: "all", model: "m", est: "0.50", se: "0.10"},
			coefSpec{label: "y", measure: "b", group: "all", model: "m", est: "-0.20", se: "0.10"}, extract.PublishedFirstStronger, "0.5",
			Unsupported, extract.PublishedNoDifference, "opposite signs"},
		// Signed: −0.60 is significantly below 0.20, the recomputed verdict is
		// second-larger.
		{"signed recomputed", coefSpec{label: "x", measure: "b", group: "g", est: "-0.60", se: "0.10"},
			coefSpec{label: "y", measure: "b", group: "h", est: "0.20", se: "0.10"}, extract.PublishedFirstLarger, "",
			Reversed, extract.PublishedSecondLarger, "opposite direction at α"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			cl := claim("S", "c", 2, tt.c1.label, tt.c2.label, tt.published, "test")
			cl.EstimateCorr = printed(tt.rho)
			in := &extract.Input{
				Coefficients: []extract.Coefficient{coefficient("S", 2, tt.c1), coefficient("S", 3, tt.c2)},
				Claims:       []extract.Claim{cl},
			}
			r := Audit(in, DefaultOptions).Claims[0]
			if r.Outcome != tt.wantOutcome || r.Recomputed != tt.wantRecomputed {
				t.Errorf("outcome %s, recomputed %s; want %s, %s; p %v; notes %q", r.Outcome, r.Recomputed,
					tt.wantOutcome, tt.wantRecomputed, r.P, r.Notes)
			}
			if !strings.Contains(strings.Join(r.Notes, " "), tt.wantNote) {
				t.Errorf("notes %q lack %q", r.Notes, tt.wantNote)
			}
		})
	}
}

// TestIssue17MagnitudeReflectsTheVariable: reversing the scoring of a
// predictor turns the sign of its coefficient and of its correlations and
// nothing else, so a claim about magnitude on the reflected table must be
// tested exactly as the signed claim on the original one: for a model
// rebuilt from the table and for two dependent correlations.
func TestIssue17MagnitudeReflectsTheVariable(t *testing.T) {
	flip := func(tab extract.CorrelationTable, k int) extract.CorrelationTable {
		for i := range tab.R {
			if i != k {
				tab.R[i][k], tab.R[k][i] = negated(tab.R[i][k]), negated(tab.R[k][i])
			}
		}
		return tab
	}
	t.Run("rebuilt model", func(t *testing.T) {
		run := func(b2, published string, tab extract.CorrelationTable) ClaimResult {
			in := &extract.Input{
				Coefficients: []extract.Coefficient{beta(t, "b1", "x1", "", ".45", "", 2), beta(t, "b2", "x2", "", b2, "", 3)},
				Claims:       []extract.Claim{claim("S", "c", 2, "b1", "b2", published, "unstated")},
				Tables:       []extract.CorrelationTable{tab},
			}
			return Audit(in, DefaultOptions).Claims[0]
		}
		signed := run(".12", extract.PublishedFirstLarger, rebuildTable(""))
		magnitude := run("−.12", extract.PublishedFirstStronger, flip(rebuildTable(""), 2))
		if signed.Outcome != Consistent || relDiff(float64(magnitude.P), float64(signed.P)) > 1e-9 ||
			relDiff(float64(magnitude.Difference), float64(signed.Difference)) > 1e-9 || magnitude.Outcome != Consistent {
			t.Errorf("magnitude on the reflected table: p %v d %v %s; signed on the original: p %v d %v %s",
				magnitude.P, magnitude.Difference, magnitude.Outcome, signed.P, signed.Difference, signed.Outcome)
		}
		if float64(magnitude.Second.Estimate) > 0 {
			t.Errorf("the second estimate is shown reflected: %v", magnitude.Second.Estimate)
		}
	})
	t.Run("dependent correlations", func(t *testing.T) {
		// r(y,x1) = .50 against r(y,x2) = .30 with r(x1,x2) = .40: Williams' t.
		run := func(r2, published string, tab extract.CorrelationTable) ClaimResult {
			c1, c2 := rCoef("r1", "y", "x1", 0, 2), rCoef("r2", "y", "x2", 0, 3)
			c1.Group, c2.Group = "", ""
			c1.Estimate, c2.Estimate = printed("0.50"), printed(r2)
			in := &extract.Input{Coefficients: []extract.Coefficient{c1, c2}, Tables: []extract.CorrelationTable{tab},
				Claims: []extract.Claim{claim("S", "c", 2, "r1", "r2", published, "unstated")}}
			return Audit(in, DefaultOptions).Claims[0]
		}
		signed := run("0.30", extract.PublishedFirstLarger, rebuildTable(""))
		magnitude := run("-0.30", extract.PublishedFirstStronger, flip(rebuildTable(""), 2))
		if signed.Method != "williams-t" || relDiff(float64(magnitude.P), float64(signed.P)) > 1e-9 ||
			magnitude.Outcome != signed.Outcome || magnitude.Recomputed != extract.PublishedFirstStronger {
			t.Errorf("magnitude on the reflected table: %s p %v %s %s; signed on the original: %s p %v %s",
				magnitude.Method, magnitude.P, magnitude.Outcome, magnitude.Recomputed, signed.Method, signed.P, signed.Outcome)
		}
	})
}

// TestIssue17OppositeWithUnknownCovariance: one model, covariance unknown,
// the estimates against the published direction: 0.10 (SE 0.10) against
// 0.25 (SE 0.05), d = −0.15. At ρ = −1 SE(d) = 0.15 and z = −1 (no
// difference); at ρ = 1 SE(d) = 0.05 and z = −3 (the opposite direction).
// Whatever was not printed, the published verdict falls: unsupported (the
// milder word), not indeterminate.
func TestIssue17OppositeWithUnknownCovariance(t *testing.T) {
	in := &extract.Input{
		Coefficients: []extract.Coefficient{
			coefficient("S", 2, coefSpec{label: "x", measure: "b", group: "all", model: "m", est: "0.10", se: "0.10"}),
			coefficient("S", 3, coefSpec{label: "y", measure: "b", group: "all", model: "m", est: "0.25", se: "0.05"})},
		Claims: []extract.Claim{claim("S", "c", 2, "x", "y", extract.PublishedFirstLarger, "test")},
	}
	r := Audit(in, DefaultOptions).Claims[0]
	notes := strings.Join(r.Notes, " ")
	if r.Outcome != Unsupported || !strings.Contains(notes, "never the published one") || strings.Contains(notes, "not significant") {
		t.Errorf("outcome %s, p range %v; want unsupported; notes %q", r.Outcome, r.PRange, r.Notes)
	}
}
