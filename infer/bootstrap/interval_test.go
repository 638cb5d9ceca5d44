package bootstrap

import (
	"math"
	"testing"
)

// Values below are hand arithmetic from the stated definitions; normal
// probabilities and quantiles were computed with Python 3's math.erfc
// (Φ(z) = erfc(−z/√2)/2; Φ⁻¹ by bisection on it): Φ⁻¹(0.6) = 0.2533471,
// Φ⁻¹(0.975) = 1.959964, Φ(−1.4532698) = 0.07307443, Φ(2.4666582) =
// 0.99318098.

func TestReplicateQuantile(t *testing.T) {
	sorted := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9} // B = 9, so h = 10u
	tests := []struct {
		u       float64
		want    float64
		clamped bool
	}{
		{0.5, 5, false},    // h = 5
		{0.25, 2.5, false}, // h = 2.5: halfway between the 2nd and 3rd
		{0.1, 1, false},    // h = 1: the smallest
		{0.05, 1, true},    // h = 0.5 < 1
		{0.9, 9, false},    // h = 9: the largest
		{0.97, 9, true},    // h = 9.7 > B
	}
	for _, tt := range tests {
		got, clamped := replicateQuantile(sorted, tt.u)
		if math.Abs(got-tt.want) > 1e-15 || clamped != tt.clamped {
			t.Errorf("replicateQuantile(1..9, %v) = %v, %v, want %v, %v", tt.u, got, clamped, tt.want, tt.clamped)
		}
	}
}

func TestBiasCorrectionTies(t *testing.T) {
	tests := []struct {
		name     string
		sorted   []float64
		estimate float64
		want     float64
	}{
		// two below, two ties counted ½ each: p = (2 + 1)/5 = 0.6
		{"ties count one half", []float64{1, 2, 3, 3, 4}, 3, 0.2533471},
		{"half below", []float64{1, 2, 4, 5}, 3, 0},
		{"all above", []float64{4, 5}, 3, math.Inf(-1)},
		{"all below", []float64{1, 2}, 3, math.Inf(1)},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := biasCorrection(tt.sorted, tt.estimate)
			if !(got == tt.want || math.Abs(got-tt.want) < 1e-7) {
				t.Errorf("biasCorrection(%v, %v) = %v, want %v", tt.sorted, tt.estimate, got, tt.want)
			}
		})
	}
}

func TestBCaLevels(t *testing.T) {
	// ẑ0 = 0, â = 0: the percentile levels.
	lo, hi, ok := bcaLevels(0, 0, 0.95)
	if !ok || math.Abs(lo-0.025) > 1e-15 || math.Abs(hi-0.975) > 1e-15 {
		t.Errorf("bcaLevels(0, 0, 0.95) = %v, %v, %v, want 0.025, 0.975, true", lo, hi, ok)
	}
	// BC with ẑ0 = 0.2533471: α₁ = Φ(2·0.2533471 − 1.959964) = Φ(−1.4532698)
	// = 0.07307443 and α₂ = Φ(2.4666582) = 0.99318098 (the 7-digit z_0.975
	// leaves ~1e-8).
	lo, hi, ok = bcaLevels(0.2533471, 0, 0.95)
	if !ok || math.Abs(lo-0.07307443) > 2e-8 || math.Abs(hi-0.99318098) > 2e-8 {
		t.Errorf("bcaLevels(0.2533471, 0, 0.95) = %v, %v, want 0.07307443, 0.99318098", lo, hi)
	}
	// â = 1 makes 1 − â(ẑ0 + z) ≤ 0 at the upper end.
	if _, _, ok := bcaLevels(0, 1, 0.95); ok {
		t.Error("bcaLevels(0, 1, 0.95) ok = true, want false")
	}
}

func TestPValues(t *testing.T) {
	// 10 replicates, 3 at or below 0: p = 2(1 + 3)/11 = 8/11.
	reps := []float64{-2, -1, 0, 1, 2, 3, 4, 5, 6, 7}
	if got := percentileP(reps); math.Abs(got-8.0/11) > 1e-15 {
		t.Errorf("percentileP = %v, want 8/11", got)
	}
	// all positive: the floor 2/(B + 1)
	if got := percentileP([]float64{1, 2, 3}); math.Abs(got-0.5) > 1e-15 {
		t.Errorf("percentileP(all positive) = %v, want 2/4", got)
	}
	// ẑ0 = 0, â = 0: p = 2 min(u, 1 − u) with u = (2 + ½)/10 = 0.25 → 0.5.
	p, floored, ok := bcaP(reps, 0, 0)
	if !ok || floored || math.Abs(p-0.5) > 1e-12 {
		t.Errorf("bcaP(ẑ0 = 0, â = 0) = %v, %v, %v, want 0.5, false, true", p, floored, ok)
	}
	// 0 beyond all replicates: u floored at 1/(2B).
	if _, floored, _ := bcaP([]float64{1, 2, 3, 4}, 0, 0); !floored {
		t.Error("bcaP(all positive) floored = false, want true")
	}
}

func TestAcceleration(t *testing.T) {
	// θ_(i) = 1, 2, 3, 10: mean 4, deviations θ̄ − θ_(i) = 3, 2, 1, −6;
	// Σd² = 50, Σd³ = −180, â = −180/(6·50^1.5) = −0.08485281.
	a, used := acceleration([]float64{1, 2, math.NaN(), 3, 10})
	if used != 4 || math.Abs(a-(-180/(6*math.Pow(50, 1.5)))) > 1e-15 {
		t.Errorf("acceleration = %v (%d used), want −0.08485281 (4 used)", a, used)
	}
	if a, _ := acceleration([]float64{2, 2, 2}); a != 0 {
		t.Errorf("acceleration(equal values) = %v, want 0", a)
	}
}
