package audit

import (
	"strings"
	"testing"
)

// TestAuditStudyTinySample follows an n of 2 from a paired CSV through
// extract.Open, Run and so AuditStudy (runFile). A mean difference's
// interval with n = 2 would need a t quantile with n − 2 = 0 df, which does
// not exist (Student 1908): the claim is incomplete and its note says why,
// naming n. With the
// SE printed no quantile is needed: the claim is tested (two independent
// estimates, z = (0.50 − 0.10)/√(0.10² + 0.10²) = 2.83, p = 0.0047 < 0.05,
// so "differ" is consistent) and the notes warn about the n.
func TestAuditStudyTinySample(t *testing.T) {
	const text = "study,claim,published,measure,first_label,first_group,first_estimate,first_ci,first_se,first_n,second_label,second_group,second_estimate,second_se\n" +
		"S,interval,differ,md,a,girls,0.50,0.10 to 0.90,,2,b,boys,0.10,0.10\n" +
		"S,printed se,differ,md,c,girls,0.50,,0.10,2,d,boys,0.10,0.10\n"
	runs, _ := runFile(t, text, DefaultOptions)
	got := map[string]ClaimResult{}
	for _, run := range runs {
		for _, c := range run.Claims {
			got[c.Claim] = c
		}
	}
	tests := []struct {
		claim, outcome, note string
	}{
		{"interval", Incomplete, "a: no standard error can be reconstructed: n = 2 leaves n − 2 = 0 df for a mean difference, so its interval cannot be read on a t basis"},
		{"printed se", Consistent, "c: n = 2: a sample of 2 or fewer leaves no df for an SE on a t basis; check the printed n"},
	}
	for _, tt := range tests {
		c, ok := got[tt.claim]
		if !ok {
			t.Errorf("claim %q not audited", tt.claim)
			continue
		}
		notes := strings.Join(c.Notes, "\n")
		if c.Outcome != tt.outcome || !strings.Contains(notes, tt.note) {
			t.Errorf("claim %q: outcome %s, notes:\n%s\nwant %s with a note saying %q", tt.claim, c.Outcome, notes, tt.outcome, tt.note)
		}
	}
}
