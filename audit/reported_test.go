package audit

import (
	"errors"
	"math"
	"strings"
	"testing"

	"coefaudit/extract"
)

func TestParseReported(t *testing.T) {
	const none = -1.0 // a field not given
	tests := []struct {
		name           string
		in             string
		est, lo, hi    float64
		level, se, p   float64
		pBound         extract.Bound
		estimateDigits int
	}{
		{"square brackets", "0.41 [0.30, 0.52]", 0.41, 0.30, 0.52, 95, none, none, extract.Absent, 2},
		{"round brackets with to", "0.18 (0.05 to 0.31)", 0.18, 0.05, 0.31, 95, none, none, extract.Absent, 2},
		{"level in the interval", "0.41 (90% CI 0.30–0.52)", 0.41, 0.30, 0.52, 90, none, none, extract.Absent, 2},
		{"no space before bracket", "0.41(0.30-0.52)", 0.41, 0.30, 0.52, 95, none, none, extract.Absent, 2},
		{"SE after a comma", "0.41, SE 0.05", 0.41, none, none, 95, 0.05, none, extract.Absent, 2},
		{"SE in brackets", "0.41 (SE = 0.05)", 0.41, none, none, 95, 0.05, none, extract.Absent, 2},
		{"SE with a colon", "0.410 (se: 0.050)", 0.41, none, none, 95, 0.05, none, extract.Absent, 3},
		{"p after a comma", "0.41, p = .003", 0.41, none, none, 95, none, 0.003, extract.Exact, 2},
		{"p bound without spaces", "0.41,p<.001", 0.41, none, none, 95, none, 0.001, extract.Below, 2},
		{"interval and p", "0.41 [0.30, 0.52], p = .001", 0.41, 0.30, 0.52, 95, none, 0.001, extract.Exact, 2},
		{"SE and p in one bracket", "0.41 (SE 0.05; p = .003)", 0.41, none, none, 95, 0.05, 0.003, extract.Exact, 2},
		{"decimal commas", "−0,41 (−0,52; −0,30)", -0.41, -0.52, -0.30, 95, none, none, extract.Absent, 2},
		{"decimal comma SE", "0,41, SE 0,05", 0.41, none, none, 95, 0.05, none, extract.Absent, 2},
		{"leading point and stars", ".41** [.30, .52]", 0.41, 0.30, 0.52, 95, none, none, extract.Absent, 2},
		{"ratio", "1.85 (1.20 to 2.85)", 1.85, 1.20, 2.85, 95, none, none, extract.Absent, 2},
		{"ns", "0.12 (ns)", 0.12, none, none, 95, none, none, extract.NotSignificant, 2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, err := ParseReported(tt.in)
			if err != nil {
				t.Fatalf("ParseReported(%q) error %v", tt.in, err)
			}
			check := func(what string, p extract.Printed, want float64) {
				t.Helper()
				switch {
				case want == none && p.Present():
					t.Errorf("ParseReported(%q) %s = %v, want none", tt.in, what, p.Value)
				case want != none && (!p.IsExact() || math.Abs(p.Value-want) > 1e-12):
					t.Errorf("ParseReported(%q) %s = %v (%v), want %v", tt.in, what, p.Value, p.Bound, want)
				}
			}
			check("estimate", r.Estimate, tt.est)
			check("ci low", r.CI.Low, tt.lo)
			check("ci high", r.CI.High, tt.hi)
			check("se", r.SE, tt.se)
			if r.Level != tt.level {
				t.Errorf("ParseReported(%q) level = %v, want %v", tt.in, r.Level, tt.level)
			}
			if r.P.Bound != tt.pBound || (tt.p != none && math.Abs(r.P.Value-tt.p) > 1e-12) {
				t.Errorf("ParseReported(%q) p = %v (%v), want %v (%v)", tt.in, r.P.Value, r.P.Bound, tt.p, tt.pBound)
			}
			if int(r.Estimate.Decimals) != tt.estimateDigits {
				t.Errorf("ParseReported(%q) estimate decimals = %d, want %d", tt.in, r.Estimate.Decimals, tt.estimateDigits)
			}
		})
	}
}

func TestParseReportedErrors(t *testing.T) {
	tests := []struct{ name, in, want string }{
		{"empty", "  ", "empty"},
		{"two statistics", "0.41, t = 2.1, t = 2.2", "statistic is given twice"},
		{"z with df", "0.41, z(120) = 2.1", "no df"},
		{"not a number", "abc [0.1, 0.2]", "the estimate"},
		{"plus-minus", "0.41 ± 0.05", "±"},
		{"two intervals", "0.41 [0.30, 0.52] (0.1 to 0.2)", "two intervals"},
		{"two SEs", "0.41, SE 0.05, SE 0.06", "SE is given twice"},
		{"unknown part", "0.41 foo", `"foo" is not an interval`},
		{"half an interval", "0.41 (0.30 to)", "not a confidence interval"},
		{"reversed interval", "0.41 [0.52, 0.30]", "reversed"},
		{"p above 1", "0.41, p = 1.3", "cannot exceed 1"},
		{"SE zero", "0.41, SE 0", "positive"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseReported(tt.in) // "0.41" alone is accepted, see TestIssue17PrintedForms
			if err == nil || !errors.Is(err, ErrReported) || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("ParseReported(%q) error = %v, want ErrReported saying %q", tt.in, err, tt.want)
			}
		})
	}
}

// TestIssue17PrintedForms: the forms people paste from a paper. Each
// reading is set against the same estimate written the long way.
func TestIssue17PrintedForms(t *testing.T) {
	tests := []struct {
		in, measure         string
		est, se, stat, df   float64
		p                   float64
		pBound              extract.Bound
		starsAsP, onlyFirst bool
	}{
		{in: "b = 0.41, SE = 0.12", measure: "b", est: 0.41, se: 0.12},
		{in: "B = 0.41 (SE 0.12)", measure: "b", est: 0.41, se: 0.12},
		{in: "β = .34, p < .01", measure: "beta", est: 0.34, p: 0.01, pBound: extract.Below},
		{in: "beta: .34, p = .004", measure: "beta", est: 0.34, p: 0.004, pBound: extract.Exact},
		{in: "OR 1.80 (1.21–2.68)", measure: "or", est: 1.80},
		{in: "HR = 0.81 [0.70, 0.94]", measure: "hr", est: 0.81},
		{in: "0.41, t(120) = 3.2", est: 0.41, stat: 3.2, df: 120},
		{in: "b = 0.41, t(120) = 3.2, p = .002", measure: "b", est: 0.41, stat: 3.2, df: 120, p: 0.002, pBound: extract.Exact},
		{in: "0.41 (t = 3.2)", est: 0.41, stat: 3.2},
		{in: "0.41, z = 2.05", est: 0.41, stat: 2.05},
		// Stars alone are the p bound they state (p < .05, .01, .001).
		{in: "0.41***", est: 0.41, p: 0.001, pBound: extract.Below, starsAsP: true},
		{in: "β = .21*", measure: "beta", est: 0.21, p: 0.05, pBound: extract.Below, starsAsP: true},
		// Stars beside an interval are not read as p.
		{in: ".41** [.30, .52]", est: 0.41},
		{in: "r = .45", measure: "r", est: 0.45, onlyFirst: true},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			r, err := ParseReported(tt.in)
			if err != nil {
				t.Fatalf("ParseReported(%q) error %v", tt.in, err)
			}
			if r.Measure != tt.measure || r.Estimate.Value != tt.est {
				t.Errorf("ParseReported(%q) measure %q estimate %v, want %q %v", tt.in, r.Measure, r.Estimate.Value, tt.measure, tt.est)
			}
			if tt.se != 0 && r.SE.Value != tt.se || tt.stat != 0 && r.Stat.Value != tt.stat || tt.df != 0 && r.DF.Value != tt.df {
				t.Errorf("ParseReported(%q) SE %v stat %v df %v, want %v %v %v", tt.in, r.SE.Value, r.Stat.Value, r.DF.Value, tt.se, tt.stat, tt.df)
			}
			if tt.p != 0 && (r.P.Bound != tt.pBound || math.Abs(r.P.Value-tt.p) > 1e-12) || tt.p == 0 && r.P.Present() {
				t.Errorf("ParseReported(%q) p %v (%v), want %v (%v)", tt.in, r.P.Value, r.P.Bound, tt.p, tt.pBound)
			}
			if r.PFromStars != tt.starsAsP || r.OnlyEstimate() != tt.onlyFirst {
				t.Errorf("ParseReported(%q) PFromStars %v OnlyEstimate %v, want %v %v", tt.in, r.PFromStars, r.OnlyEstimate(), tt.starsAsP, tt.onlyFirst)
			}
		})
	}
}
