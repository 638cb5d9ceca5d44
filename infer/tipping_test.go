package infer

import (
	"math"
	"testing"
)

func TestTippingCorrelation(t *testing.T) {
	tests := []struct {
		name            string
		d, se1, se2, df float64
		want            float64
		wantOK          bool
		tol             float64
	}{
		// Hand arithmetic: d = 0.19, SEs 0.07 and 0.05, z = 1.959964 (the normal
		// 97.5% point): (d/z)² = 0.0093973, ρ* = (0.0049 + 0.0025 − 0.0093973)/0.007
		// = −0.28533.
		{"normal", 0.19, 0.07, 0.05, math.Inf(1), -0.28533, true, 5e-5},
		// Gelman & Stern (2006, The American Statistician 60:328): 25 (SE 10) and
		// 10 (SE 10): (15/1.959964)² = 58.572, ρ* = (200 − 58.572)/200 = 0.70714.
		{"Gelman Stern", 25 - 10, 10, 10, math.NaN(), 0.70714, true, 5e-5},
		// d = 1, SEs 0.1: (1/1.959964)² = 0.26032, ρ* = (0.02 − 0.26032)/0.02 =
		// −12.016, far below −1: significant at every correlation.
		{"always significant", 1, 0.1, 0.1, math.NaN(), -12.016, false, 5e-4},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, ok, err := TippingCorrelation(tt.d, tt.se1, tt.se2, tt.df, 0.05)
			if err != nil || ok != tt.wantOK || math.Abs(got-tt.want) > tt.tol {
				t.Errorf("TippingCorrelation(%v, %v, %v, %v) = %v, %v, %v; want %v, %v", tt.d, tt.se1, tt.se2, tt.df, got, ok, err, tt.want, tt.wantOK)
			}
			if !ok {
				return
			}
			// At ρ* the test sits exactly at α (a round trip through
			// CorrelatedDifference).
			res, err := CorrelatedDifference(tt.d, tt.se1, 0, tt.se2, got, tt.df, 0.95)
			if err != nil || math.Abs(res.P-0.05) > 1e-9 {
				t.Errorf("p at ρ* = %v (%v), want 0.05", res.P, err)
			}
		})
	}
	if _, _, err := TippingCorrelation(1, 0, 1, math.NaN(), 0.05); err == nil {
		t.Error("TippingCorrelation with SE 0: no error")
	}
}
