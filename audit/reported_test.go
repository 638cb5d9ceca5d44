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
		{"estimate only", "0.41", "only an estimate"},
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
			_, err := ParseReported(tt.in)
			if err == nil || !errors.Is(err, ErrReported) || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("ParseReported(%q) error = %v, want ErrReported saying %q", tt.in, err, tt.want)
			}
		})
	}
}
