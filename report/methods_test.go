package report

import (
	"fmt"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
)

// TestMethodsText audits the example of Gelman & Stern (2006): 25 (SE 10)
// is significant (p = 0.0124) and 10 (SE 10) is not (p = 0.3173), but their
// difference, 15 (SE 14.14), has p = 0.289; a paper that reads a
// difference from the split is unsupported. The paragraph states the
// numbers and the outcome, and its caveats are every note but the one
// stating the verdict, which the paragraph has said already.
func TestMethodsText(t *testing.T) {
	coef := func(row int, label, group, est string) extract.Coefficient {
		return extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: row}, Study: "S", Label: label,
			Measure: extract.MeasureOther, Group: group, Estimate: printed(est), SE: printed("10"), CILevel: 95}
	}
	in := &extract.Input{Coefficients: []extract.Coefficient{coef(2, "a", "g1", "25"), coef(3, "b", "g2", "10")},
		Claims: []extract.Claim{{Position: extract.Position{Sheet: "claims", Row: 2}, Study: "S", Claim: "c", First: "a", Second: "b",
			Published: extract.PublishedDiffer, Basis: extract.BasisSignificanceSplit, Alpha: 0.05}}}
	c := audit.Audit(in, audit.DefaultOptions).Claims[0]
	m := methodsText(&c)
	for _, want := range []string{"Claim c (S, claims row 2)", "basis: significance-split", "The difference was 15", "p = .289",
		"Outcome: unsupported", "Caveats:", "Gelman & Stern"} {
		if !strings.Contains(m, want) {
			t.Errorf("methodsText() lacks %q: %q", want, m)
		}
	}
	verdict, ok := c.VerdictNote()
	if !ok {
		t.Fatal("the claim has no verdict note")
	}
	if strings.Contains(m, c.Notes[verdict]) {
		t.Errorf("methodsText() repeats the verdict note %q among its caveats", c.Notes[verdict])
	}
}

// TestIssue20MethodsTextCaveatsOnce: the methods paragraph used to repeat a
// note (the range of p, said once by the paragraph and again among the
// caveats) and to say of a row that could not be read that the paper
// printed too little. Each caveat now appears once, the range of p once,
// and an unreadable row says "Row N could not be read: …".
func TestIssue20MethodsTextCaveatsOnce(t *testing.T) {
	rep, _ := demoReport(t)
	unreadable := 0
	for i := range rep.Claims {
		c := &rep.Claims[i]
		m := methodsText(c)
		for _, n := range c.Notes {
			if k := strings.Count(m, n); k > 1 {
				t.Errorf("claim %s: the note %q appears %d times in %q", c.Claim, n, k, m)
			}
		}
		if k := strings.Count(m, "ranges from") + strings.Count(m, "stays below") + strings.Count(m, "stays at"); k > 1 {
			t.Errorf("claim %s: the range of p is stated %d times: %q", c.Claim, k, m)
		}
		if c.Unreadable {
			unreadable++
			want := fmt.Sprintf("Row %d could not be read: ", c.Row)
			if !strings.Contains(m, want) || strings.Contains(m, "Not enough was printed") {
				t.Errorf("claim %s: methods text %q, want %q and no word of too little printed", c.Claim, m, want)
			}
		}
	}
	if unreadable == 0 {
		t.Fatal("the demo has no unreadable claims row; the test needs one")
	}
}
