package audit

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"coefaudit/extract"
)

// printed builds a number as printed, for tests only: the value and the
// count of digits after the point. "" is a blank cell.
func printed(s string) extract.Printed {
	if s == "" {
		return extract.Printed{}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		panic(err)
	}
	dec := 0
	if i := strings.IndexByte(s, '.'); i >= 0 {
		dec = len(s) - i - 1
	}
	return extract.Printed{Value: v, Decimals: int32(dec), Bound: extract.Exact, Text: s}
}

type coefSpec struct {
	label, measure, group, model string
	est, lo, hi, se, p, n        string
}

func coefficient(study string, row int, c coefSpec) extract.Coefficient {
	return extract.Coefficient{
		Position: extract.Position{Sheet: "coefficients", Row: row},
		Study:    study, Label: c.label, Measure: c.measure, Group: c.group, Model: c.model,
		Estimate: printed(c.est), CI: extract.Interval{Low: printed(c.lo), High: printed(c.hi)},
		CILevel: 95, SE: printed(c.se), P: printed(c.p), N: printed(c.n),
	}
}

func claim(study, id string, row int, first, second, published, basis string) extract.Claim {
	return extract.Claim{Position: extract.Position{Sheet: "claims", Row: row}, Study: study, Claim: id,
		First: first, Second: second, Published: published, Basis: basis, Alpha: 0.05}
}

func auditOne(t *testing.T, c1, c2 coefSpec, published, basis string) ClaimResult {
	t.Helper()
	in := &extract.Input{
		Coefficients: []extract.Coefficient{coefficient("S", 2, c1), coefficient("S", 3, c2)},
		Claims:       []extract.Claim{claim("S", "c", 2, c1.label, c2.label, published, basis)},
	}
	rep := Audit(in, DefaultOptions)
	if len(rep.Claims) != 1 {
		t.Fatalf("Audit returned %d claims, want 1", len(rep.Claims))
	}
	return rep.Claims[0]
}

func TestAuditPublishedExamples(t *testing.T) {
	tests := []struct {
		name              string
		c1, c2            coefSpec
		published, basis  string
		wantOutcome       string
		wantD, wantSE     float64
		wantP, tolP       float64
		wantRecomputed    string
		wantMethod        string
		wantRelation      string
		wantNoteSubstring string
	}{
		// Altman DG, Bland JM (2003). Interaction revisited: the difference between
		// two estimates. BMJ 326:219, worked example: HRT and non-vertebral
		// fractures (data of Torgerson & Bell-Syer 2001, JAMA 285:2891–2897), RR
		// 0.67 (0.46–0.98) in women under 60 vs 0.88 (0.71–1.08, this CI from
		// memory) at 60 and over. d −0.2726 and SE 0.2206 as printed (SECONDARY:
		// OCR of the printed note on es.scribd.com, document 375349251); P 0.2165
		// derived here from the note's formula applied to those inputs, not a
		// published value. The paper's conclusion, no evidence that the effect
		// differs, is from memory (as are its printed z = −1.24 and P = 0.2).
		{"Altman Bland 2003", coefSpec{label: "under60", measure: "rr", group: "<60", est: "0.67", lo: "0.46", hi: "0.98"},
			coefSpec{label: "over60", measure: "rr", group: ">=60", est: "0.88", lo: "0.71", hi: "1.08"},
			"no-difference", "test", Consistent, -0.2726, 0.2206, 0.2165, 0.003, "no-difference", "independent-z", Independent, "log scale"},
		// Gelman A, Stern H (2006). The difference between "significant" and "not
		// significant" is not itself statistically significant. The American
		// Statistician 60(4):328–331: 25 (SE 10) significant, 10 (SE 10) not; the
		// difference 15 has "s.e. 14.1" and "z-score is only 1.1" (SECONDARY: a copy
		// of a first-person blog post, apparently Gelman's, at
		// 1-urlm.se/g/c/a/397088; the paper's own page was not seen). SE √200 =
		// 14.142, z 1.0607 and P 0.2888 (normal two-sided) are derived here; not
		// published values.
		{"Gelman Stern 2006", coefSpec{label: "a", measure: "other", group: "g1", est: "25", se: "10"},
			coefSpec{label: "b", measure: "other", group: "g2", est: "10", se: "10"},
			"differ", "significance-split", Unsupported, 15, 14.142, 0.2888, 0.0005, "no-difference", "independent-z", Independent, "does not test their difference"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := auditOne(t, tt.c1, tt.c2, tt.published, tt.basis)
			if r.Outcome != tt.wantOutcome {
				t.Errorf("outcome = %s, want %s; notes %q", r.Outcome, tt.wantOutcome, r.Notes)
			}
			if math.Abs(float64(r.Difference)-tt.wantD) > 5e-4*math.Max(1, math.Abs(tt.wantD)) {
				t.Errorf("difference = %v, want %v", r.Difference, tt.wantD)
			}
			if math.Abs(float64(r.DifferenceSE)-tt.wantSE) > 5e-4*math.Max(1, tt.wantSE) {
				t.Errorf("difference SE = %v, want %v", r.DifferenceSE, tt.wantSE)
			}
			if math.Abs(float64(r.P)-tt.wantP) > tt.tolP {
				t.Errorf("p = %v, want %v", r.P, tt.wantP)
			}
			if r.Recomputed != tt.wantRecomputed || r.Method != tt.wantMethod || r.Relation != tt.wantRelation {
				t.Errorf("recomputed %q, method %q, relation %q; want %q, %q, %q", r.Recomputed, r.Method, r.Relation,
					tt.wantRecomputed, tt.wantMethod, tt.wantRelation)
			}
			if !strings.Contains(strings.Join(r.Notes, " "), tt.wantNoteSubstring) {
				t.Errorf("notes %q lack %q", r.Notes, tt.wantNoteSubstring)
			}
		})
	}
}

// TestAuditOutcomes covers every outcome the independent design can give.
// The numbers are constructed; each case's arithmetic is in its comment.
func TestAuditOutcomes(t *testing.T) {
	tests := []struct {
		name             string
		c1, c2           coefSpec
		published, basis string
		want             string
	}{
		// SE = 0.24/3.92 = 0.0612 and 0.26/3.92 = 0.0663; d = 0.24, SE(d) 0.0903, z 2.66,
		// p 0.008, and within rounding p stays in [0.005, 0.012].
		{"consistent first-larger", coefSpec{label: "x", measure: "b", group: "g", est: "0.42", lo: "0.30", hi: "0.54"},
			coefSpec{label: "y", measure: "b", group: "h", est: "0.18", lo: "0.05", hi: "0.31"}, "first-larger", "test", Consistent},
		// d = 2.9, SE(d) = √(0.8² + 0.9²) = 1.204, z 2.41, p 0.016: the test shows a difference.
		{"missed", coefSpec{label: "x", measure: "md", group: "g", est: "4.1", se: "0.80"},
			coefSpec{label: "y", measure: "md", group: "h", est: "1.2", se: "0.90"}, "no-difference", "overlap", Missed},
		// The first is the smaller, 0.21 < 0.29, but not significantly: SEs
		// 0.18/3.92 = 0.046 each, SE(d) 0.065, z −1.23, p 0.22. An opposite
		// point estimate alone is unsupported, not reversed (issue 17).
		{"opposite point estimate, not significant", coefSpec{label: "x", measure: "beta", group: "g", est: ".21", lo: ".12", hi: ".30"},
			coefSpec{label: "y", measure: "beta", group: "h", est: ".29", lo: ".20", hi: ".38"}, "first-larger", "unstated", Unsupported},
		// d = 0.20 − 0.60 = −0.40, SE(d) = √(0.1² + 0.1²) = 0.141, z −2.83, p 0.005
		// (within rounding p stays below 0.01): the second is significantly larger.
		{"reversed", coefSpec{label: "x", measure: "b", group: "g", est: "0.200", se: "0.100"},
			coefSpec{label: "y", measure: "b", group: "h", est: "0.600", se: "0.100"}, "first-larger", "test", Reversed},
		// Both negative: −0.50 is the stronger; d = −0.30, SE(d) = √(0.1² + 0.1²) = 0.141,
		// z −2.12, p 0.034: the first is farther from zero, so first-stronger stands ...
		{"stronger negative", coefSpec{label: "x", measure: "b", group: "g", est: "-0.500", se: "0.100"},
			coefSpec{label: "y", measure: "b", group: "h", est: "-0.200", se: "0.100"}, "first-stronger", "test", Consistent},
		// ... while "larger" is signed: −0.50 is significantly below −0.20.
		{"larger is signed", coefSpec{label: "x", measure: "b", group: "g", est: "-0.500", se: "0.100"},
			coefSpec{label: "y", measure: "b", group: "h", est: "-0.200", se: "0.100"}, "first-larger", "test", Reversed},
		// Opposite signs: |0.50| vs |−0.20| is tested as 0.50 − 0.20 = 0.30 (the second
		// reflected), SE(d) 0.141, z 2.12, p 0.034: the first is the stronger.
		{"stronger, opposite signs", coefSpec{label: "x", measure: "b", group: "g", est: "0.500", se: "0.100"},
			coefSpec{label: "y", measure: "b", group: "h", est: "-0.200", se: "0.100"}, "first-stronger", "test", Consistent},
		// The same claim made of the second: |−0.20| is significantly weaker.
		{"second-stronger reversed", coefSpec{label: "x", measure: "b", group: "g", est: "0.500", se: "0.100"},
			coefSpec{label: "y", measure: "b", group: "h", est: "-0.200", se: "0.100"}, "second-stronger", "test", Reversed},
		// Odds ratios: 0.50 is farther from 1 than 1.20 on the log scale
		// (|ln 0.5| = 0.693 vs ln 1.2 = 0.182); SEs 0.05: d = 0.511, z 7.2.
		{"stronger ratio", coefSpec{label: "x", measure: "or", group: "g", est: "0.50", se: "0.05"},
			coefSpec{label: "y", measure: "or", group: "h", est: "1.20", se: "0.05"}, "first-stronger", "test", Consistent},
		// One decimal: d = 0.3 printed, in [0.2, 0.4]; SEs from [0.3, 0.7] lie in
		// [0.30/3.92, 0.50/3.92] = [0.077, 0.128], so SE(d) ∈ [0.108, 0.180] and p runs from
		// 2·Q(0.4/0.108) = 2e-4 to 2·Q(0.2/0.180) = 0.27, across 0.05.
		{"indeterminate by rounding", coefSpec{label: "x", measure: "beta", group: "g", est: "0.5", lo: "0.3", hi: "0.7"},
			coefSpec{label: "y", measure: "beta", group: "h", est: "0.2", lo: "0.0", hi: "0.4"}, "differ", "test", Indeterminate},
		// 0.35 is outside (0.38, 0.60) by more than the rounding (0.005 + 0.005).
		{"conflict", coefSpec{label: "x", measure: "beta", group: "g", est: "0.35", lo: "0.38", hi: "0.60"},
			coefSpec{label: "y", measure: "beta", group: "h", est: "0.12", lo: "0.02", hi: "0.22"}, "differ", "test", Conflict},
		// Nothing printed beyond the estimate.
		{"incomplete: no SE", coefSpec{label: "x", measure: "b", group: "g", est: "0.09"},
			coefSpec{label: "y", measure: "b", group: "h", est: "0.25", se: "0.05"}, "second-larger", "test", Incomplete},
		{"incomplete: measures differ", coefSpec{label: "x", measure: "md", group: "g", est: "2.3", se: "0.9"},
			coefSpec{label: "y", measure: "beta", group: "h", est: ".29", lo: ".20", hi: ".38"}, "differ", "test", Incomplete},
		// One model, covariance unknown. d = 0.43 with SE(d) at most 0.07 + 0.05 = 0.12
		// (ρ = −1, rounding aside): z ≥ 3.5, so every admissible correlation agrees.
		{"same model decided whatever the covariance", coefSpec{label: "x", measure: "b", group: "all", est: "0.31", se: "0.07"},
			coefSpec{label: "y", measure: "b", group: "all", est: "-0.12", se: "0.05"}, "first-larger", "test", Consistent},
		// d = 0.19: at ρ = −1 SE(d) = 0.12, z = 1.58, p = 0.11; at ρ = 1 SE(d) = 0.02,
		// z = 9.5: the verdict turns on the unprinted covariance.
		{"same model indeterminate without the covariance", coefSpec{label: "x", measure: "b", group: "all", est: "0.31", se: "0.07"},
			coefSpec{label: "y", measure: "b", group: "all", est: "0.12", se: "0.05"}, "first-larger", "test", Indeterminate},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := auditOne(t, tt.c1, tt.c2, tt.published, tt.basis)
			if r.Outcome != tt.want {
				t.Errorf("outcome = %s, want %s; p %v range %v; notes %q", r.Outcome, tt.want, r.P, r.PRange, r.Notes)
			}
			if len(r.Notes) == 0 {
				t.Error("no notes explain the outcome")
			}
		})
	}
}

func TestAuditKeepsEveryClaimInOrder(t *testing.T) {
	in := &extract.Input{
		Coefficients: []extract.Coefficient{
			coefficient("S", 2, coefSpec{label: "x", measure: "b", group: "g", est: "0.42", se: "0.06"}),
			coefficient("S", 3, coefSpec{label: "y", measure: "b", group: "h", est: "0.18", se: "0.07"}),
			coefficient("S", 4, coefSpec{label: "y", measure: "b", group: "h", est: "0.19", se: "0.07"}),
			coefficient("S", 5, coefSpec{label: "z", measure: "b", group: "h", est: "0.19", se: "0.07"}),
		},
	}
	in.Coefficients[3].Problems = []*extract.CellError{{Position: extract.Position{Sheet: "coefficients", Row: 5, Column: "ci"}, Err: extract.ErrMalformedInterval}}
	bad := claim("S", "bad", 3, "x", "z", "differ", "test")
	bad.Problems = []*extract.CellError{{Position: extract.Position{Sheet: "claims", Row: 3, Column: "alpha"}, Err: extract.ErrMalformedNumber}}
	in.Claims = []extract.Claim{
		claim("S", "ok", 2, "x", "z", "differ", "test"),
		bad,
		claim("S", "dup", 4, "x", "y", "differ", "test"),
		claim("S", "missing", 5, "x", "nope", "differ", "test"),
		claim("T", "other study", 6, "x", "S:z", "differ", "test"),
	}
	rep := Audit(in, DefaultOptions)
	if len(rep.Claims) != len(in.Claims) {
		t.Fatalf("%d results for %d claims", len(rep.Claims), len(in.Claims))
	}
	for i, c := range rep.Claims {
		if c.Row != in.Claims[i].Row || c.Claim != in.Claims[i].Claim {
			t.Errorf("result %d is row %d %q, want row %d %q", i, c.Row, c.Claim, in.Claims[i].Row, in.Claims[i].Claim)
		}
		if c.Outcome != Incomplete {
			t.Errorf("claim %q: outcome %s, want incomplete", c.Claim, c.Outcome)
		}
	}
	if rep.Summary.Claims != 5 || rep.Summary.Counts[Incomplete] != 5 {
		t.Errorf("summary %+v", rep.Summary)
	}
	if len(rep.Problems) != 2 {
		t.Errorf("problems = %v, want the two cell problems", rep.Problems)
	}
}
