package audit

import (
	"math"
	"strings"
	"testing"

	"coefaudit/extract"
	"coefaudit/infer"
)

// width95 is 2 z_0.975, the width of a 95% normal interval in SEs.
const width95 = 2 * 1.959963984540054

func TestRoundingRanges(t *testing.T) {
	tests := []struct {
		name             string
		c1, c2           coefSpec
		published        string
		wantLo, wantHi   float64
		tol              float64 // relative
		wantOutcome      string
		wantIndetermined bool
	}{
		// Robust. 0.42 [0.30, 0.54] vs 0.18 [0.05, 0.31], two decimals: d ∈ [0.415 − 0.185,
		// 0.425 − 0.175] = [0.23, 0.25]; SE₁ ∈ [0.230, 0.250]/width95 = [0.05867, 0.06378],
		// SE₂ ∈ [0.250, 0.270]/width95 = [0.06378, 0.06888]; SE(d) ∈ [0.08666, 0.09387];
		// z ∈ [0.23/0.09387, 0.25/0.08666] = [2.450, 2.885]: p ∈ [0.0039, 0.0143], below .05
		// throughout.
		{"robust", coefSpec{label: "x", measure: "b", group: "g", est: "0.42", lo: "0.30", hi: "0.54"},
			coefSpec{label: "y", measure: "b", group: "h", est: "0.18", lo: "0.05", hi: "0.31"},
			"first-larger", infer.NormalTwoSidedP(0.25 / math.Hypot(0.230/width95, 0.250/width95)),
			infer.NormalTwoSidedP(0.23 / math.Hypot(0.250/width95, 0.270/width95)), 1e-9, Consistent, false},
		// Decided inside the rounding. 0.5 [0.3, 0.7] vs 0.2 [0.0, 0.4], one decimal:
		// d ∈ [0.2, 0.4]; each SE ∈ [0.30, 0.50]/width95; SE(d) ∈ [0.1082, 0.1804];
		// z ∈ [0.2/0.1804, 0.4/0.1082] = [1.109, 3.696]: p ∈ [0.0002, 0.267], across .05.
		{"decided by rounding", coefSpec{label: "x", measure: "beta", group: "g", est: "0.5", lo: "0.3", hi: "0.7"},
			coefSpec{label: "y", measure: "beta", group: "h", est: "0.2", lo: "0.0", hi: "0.4"},
			"differ", infer.NormalTwoSidedP(0.4 / math.Hypot(0.30/width95, 0.30/width95)),
			infer.NormalTwoSidedP(0.2 / math.Hypot(0.50/width95, 0.50/width95)), 1e-9, Indeterminate, true},
		// Printed SEs: 2.90 (SE 1.00) vs 0.00 (SE 1.00), two decimals: d ∈ [2.89, 2.91],
		// SE(d) ∈ [√2·0.995, √2·1.005] = [1.4072, 1.4213]; z ∈ [2.0334, 2.0680]:
		// p ∈ [0.0386, 0.0420]: robust.
		{"printed SEs", coefSpec{label: "x", measure: "md", group: "g", est: "2.90", se: "1.00"},
			coefSpec{label: "y", measure: "md", group: "h", est: "0.00", se: "1.00"},
			"differ", infer.NormalTwoSidedP(2.91 / (math.Sqrt2 * 0.995)), infer.NormalTwoSidedP(2.89 / (math.Sqrt2 * 1.005)), 1e-9, Consistent, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := auditOne(t, tt.c1, tt.c2, tt.published, "test")
			if relDiff(float64(r.PRange[0]), tt.wantLo) > tt.tol || relDiff(float64(r.PRange[1]), tt.wantHi) > tt.tol {
				t.Errorf("p range %v, want [%.6g, %.6g]", r.PRange, tt.wantLo, tt.wantHi)
			}
			if r.Outcome != tt.wantOutcome {
				t.Errorf("outcome %s, want %s", r.Outcome, tt.wantOutcome)
			}
			if got := strings.Contains(strings.Join(r.Notes, " "), "on both sides of α"); got != tt.wantIndetermined {
				t.Errorf("rounding note present = %v, want %v: %q", got, tt.wantIndetermined, r.Notes)
			}
		})
	}
}

func TestBasisNotes(t *testing.T) {
	// Annals of the Rheumatic Diseases, Table 3 "Comparing relative risks in two risk
	// groups", COBRA trial (table page ard.bmj.com/highwire/markup/174036; the
	// article's authors and title were not visible, so it is not identified): log RR
	// −0.7765 (SE 0.4081) vs −0.3567 (SE 0.1692), printed "p = 0.17" for the
	// difference. That p is one-sided: the two-sided p, 0.342, is derived here from the
	// printed values (d = −0.4198, SE(d) = 0.4418, z = −0.950, normal two-sided; the
	// one-sided p is 0.171); not a published value.
	c1 := coefficient("S", 2, coefSpec{label: "low", measure: "other", group: "low", est: "-0.7765", se: "0.4081"})
	c2 := coefficient("S", 3, coefSpec{label: "high", measure: "other", group: "high", est: "-0.3567", se: "0.1692"})
	cl := claim("S", "cobra", 2, "low", "high", "no-difference", "test")
	cl.PublishedP = printed("0.17")
	rep := Audit(&extract.Input{Coefficients: []extract.Coefficient{c1, c2}, Claims: []extract.Claim{cl}}, DefaultOptions)
	notes := strings.Join(rep.Claims[0].Notes, " ")
	if !strings.Contains(notes, "disagrees") || !strings.Contains(notes, "one-sided") {
		t.Errorf("a one-sided published p is not noted: %q", notes)
	}
	if math.Abs(float64(rep.Claims[0].P)-0.342) > 0.001 {
		t.Errorf("p = %v, want 0.342", rep.Claims[0].P)
	}

	// Overlap with unequal margins: 0.50 [0.40, 0.60] vs 0.20 [−0.10, 0.50]; the facing
	// arms are 0.10 and 0.30, a factor of 3 — beyond the rule's factor of 2.
	r := auditOne(t, coefSpec{label: "x", measure: "b", group: "g", est: "0.50", lo: "0.40", hi: "0.60", n: "50"},
		coefSpec{label: "y", measure: "b", group: "h", est: "0.20", lo: "-0.10", hi: "0.50", n: "8"}, "no-difference", "overlap")
	notes = strings.Join(r.Notes, " ")
	for _, want := range []string{"factor of 3.00", "n of y is 8, below 10", "rule of eye"} {
		if !strings.Contains(notes, want) {
			t.Errorf("overlap note lacks %q: %q", want, notes)
		}
	}
	// The example of Gelman A, Stern H (2006), The American Statistician
	// 60(4):328–331 (see TestAuditPublishedExamples): 25 (SE 10) has p 0.0124,
	// 10 (SE 10) p 0.3173, normal two-sided, derived here; not published values.
	r = auditOne(t, coefSpec{label: "a", measure: "other", group: "g1", est: "25", se: "10"},
		coefSpec{label: "b", measure: "other", group: "g2", est: "10", se: "10"}, "differ", "significance-split")
	notes = strings.Join(r.Notes, " ")
	if !strings.Contains(notes, "a: p = .012, significant") || !strings.Contains(notes, "b: p = .317, not significant") {
		t.Errorf("significance-split note: %q", notes)
	}
	if r.Outcome != Unsupported {
		t.Errorf("significance-split outcome = %s, want unsupported", r.Outcome)
	}
}

// TestSignificanceSplitPrintedP checks the significance-split note for an
// estimate whose SE came from its printed p: it states that p, so a p
// printed as α is not significant (p < α is the rule), and a bound "< x"
// is stated as a bound, significant only when x ≤ α. The other side, 10
// (SE 10), from the example of Gelman & Stern (2006), The American
// Statistician 60(4):328–331, has p 0.3173 (normal two-sided, derived here;
// not a published value).
func TestSignificanceSplitPrintedP(t *testing.T) {
	other := coefSpec{label: "b", measure: "other", group: "g2", est: "10", se: "10"}
	tests := []struct {
		name string
		p    extract.Printed
		want string
	}{
		{"p printed as alpha", printed("0.050"), "a: p = .050, not significant"},
		{"p just below alpha", printed("0.049"), "a: p = .049, significant"},
		{"bound below alpha", extract.Printed{Value: 0.001, Text: "<0.001", Decimals: 3, Bound: extract.Below}, "a: p < .001, significant"},
		{"bound at alpha", extract.Printed{Value: 0.05, Text: "<.05", Decimals: 2, Bound: extract.Below}, "a: p < .05, significant"},
		{"bound above alpha", extract.Printed{Value: 0.1, Text: "<0.10", Decimals: 2, Bound: extract.Below}, "a: p < .1, not known whether significant"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			c1 := coefficient("S", 2, coefSpec{label: "a", measure: "other", group: "g1", est: "25"})
			c1.P = tt.p
			c2 := coefficient("S", 3, other)
			cl := claim("S", "c", 2, "a", "b", "differ", "significance-split")
			rep := Audit(&extract.Input{Coefficients: []extract.Coefficient{c1, c2}, Claims: []extract.Claim{cl}}, DefaultOptions)
			notes := strings.Join(rep.Claims[0].Notes, " ")
			if !strings.Contains(notes, tt.want) || !strings.Contains(notes, "b: p = .317, not significant") {
				t.Errorf("significance-split note lacks %q: %q", tt.want, notes)
			}
		})
	}
}
