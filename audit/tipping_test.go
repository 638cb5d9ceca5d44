package audit

import (
	"math"
	"strings"
	"testing"

	"coefaudit/extract"
)

// TestIssue17TippingCorrelation: a claim indeterminate only because the
// estimates' correlation was not printed says where the verdict flips,
// and what the predictors' correlations in the table imply.
func TestIssue17TippingCorrelation(t *testing.T) {
	// 0.31 (SE 0.07) vs 0.12 (SE 0.05), no df: the tipping correlation is
	// (0.0049 + 0.0025 − (0.19/1.959964)²)/(2·0.07·0.05) = −0.2853 (see
	// infer.TestTippingCorrelation for the arithmetic).
	coefs := func() []extract.Coefficient {
		c := []extract.Coefficient{
			coefficient("S", 2, coefSpec{label: "x", measure: "b", group: "all", model: "m", est: "0.31", se: "0.07"}),
			coefficient("S", 3, coefSpec{label: "y", measure: "b", group: "all", model: "m", est: "0.12", se: "0.05"}),
		}
		c[0].Outcome, c[0].Predictor = "y", "x1"
		c[1].Outcome, c[1].Predictor = "y", "x2"
		return c
	}
	// The table gives the two predictors but not the outcome, so the model
	// cannot be rebuilt; with two predictors the estimates' correlation is
	// −r12 = −0.40, below the tipping correlation: not significant there.
	tab := corrTable("S", "all", []string{"x1", "x2"}, [][]float64{{1, .40}, {.40, 1}}, 200, nil)
	tests := []struct {
		name     string
		tables   []extract.CorrelationTable
		wantNote string
	}{
		{"no table", nil, "correlate above -0.29"},
		{"predictors in the table", []extract.CorrelationTable{tab}, "here -0.40 (exact for unstandardized coefficients, an approximation for standardized ones), at which the difference is not significant"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in := &extract.Input{Coefficients: coefs(), Tables: tt.tables,
				Claims: []extract.Claim{claim("S", "c", 2, "x", "y", "first-larger", "test")}}
			r := Audit(in, DefaultOptions).Claims[0]
			if r.Outcome != Indeterminate || len(r.TippingCorr) != 1 || math.Abs(float64(r.TippingCorr[0])+0.2853) > 5e-4 {
				t.Fatalf("outcome %s, tipping_corr %v; want indeterminate, [−0.2853]; notes %q", r.Outcome, r.TippingCorr, r.Notes)
			}
			if !strings.Contains(strings.Join(r.Notes, " "), tt.wantNote) {
				t.Errorf("notes %q lack %q", r.Notes, tt.wantNote)
			}
		})
	}
	// Decided at every correlation: no tipping correlation.
	in := &extract.Input{Coefficients: coefs(), Claims: []extract.Claim{claim("S", "c", 2, "x", "y", "first-larger", "test")}}
	in.Coefficients[1].Estimate = printed("-0.12")
	if r := Audit(in, DefaultOptions).Claims[0]; r.TippingCorr != nil {
		t.Errorf("decided claim has tipping_corr %v", r.TippingCorr)
	}
}

// TestFormatTippingCorr: a tipping correlation that rounds to ±1.00 at two
// decimals gets the decimals that tell it from ±1. 0.243 (SE 0.6014) vs
// 0.32 (SE 0.5994) at α = .05 tip at ρ = (s₁² + s₂² − (0.077/1.959964)²)/
// (2·s₁·s₂) = 0.99786 (the formula of infer.TippingCorrelation, worked by
// hand).
func TestFormatTippingCorr(t *testing.T) {
	s1, s2, d := 0.6014, 0.5994, 0.077
	rho := (s1*s1 + s2*s2 - math.Pow(d/1.959964, 2)) / (2 * s1 * s2)
	for _, tc := range []struct {
		rho  float64
		want string
	}{
		{rho, "0.998"},
		{-0.2853, "-0.29"},
		{-0.999996, "-0.999996"},
		{-0.9999996, "-1.000000"}, // beyond 6 decimals: as close as it is printed
		{0.004, "0.00"},
	} {
		if got := formatTippingCorr(tc.rho); got != tc.want {
			t.Errorf("formatTippingCorr(%v) = %q, want %q", tc.rho, got, tc.want)
		}
	}
}
