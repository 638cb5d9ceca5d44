package meta

import (
	"math"
	"testing"
)

// The bracketing fallback must find the same maximum as Fisher scoring:
// both solve U(τ²) = 0. Data: the interlaboratory example of Kacker RN
// (2004), Metrologia 41(3):132–136 (citation from memory), y and v as given
// in statsmodels' statsmodels/stats/tests/results/results_meta.py
// (SECONDARY), and an invented boundary case.
func TestREMLBracketingAgreesWithScoring(t *testing.T) {
	tests := []struct {
		name    string
		studies []Study
	}{
		{"Kacker 2004", []Study{{"1", 61.0, 0.2025}, {"2", 61.4, 1.21}, {"3", 62.21, 0.09}, {"4", 62.3, 0.2025},
			{"5", 62.34, 0.3844}, {"6", 62.6, 0.5625}, {"7", 62.7, 0.0676}, {"8", 62.84, 0.0225}, {"9", 65.9, 1.8225}}},
		{"boundary", []Study{{"a", 0.10, 0.04}, {"b", 0.12, 0.05}, {"c", 0.09, 0.03}}},
		{"wide", []Study{{"a", -5, 1e-4}, {"b", 5, 1e-4}, {"c", 0, 1e-4}}},
	}
	o := DefaultREMLOptions()
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			fs, err := remlFisherScoring(tt.studies, tau2DL(tt.studies), o)
			if err != nil {
				t.Fatalf("remlFisherScoring(%s) error: %v", tt.name, err)
			}
			br, err := remlBracketing(tt.studies, o)
			if err != nil {
				t.Fatalf("remlBracketing(%s) error: %v", tt.name, err)
			}
			if math.Abs(fs.Tau2-br.Tau2) > 1e-9*math.Max(1, fs.Tau2) {
				t.Errorf("remlBracketing(%s) = %.12g, want Fisher scoring's %.12g", tt.name, br.Tau2, fs.Tau2)
			}
			if !br.UsedFallback {
				t.Errorf("remlBracketing(%s).UsedFallback = false, want true", tt.name)
			}
		})
	}
}

// Fisher scoring started far from the maximum must still get there (step
// halving and the projection onto τ² ≥ 0 do the work).
func TestREMLScoringFromPoorStart(t *testing.T) {
	studies := []Study{{"a", -1, 0.01}, {"b", 2, 0.02}, {"c", 0.5, 0.05}}
	o := DefaultREMLOptions()
	ref, err := remlFisherScoring(studies, tau2DL(studies), o)
	if err != nil {
		t.Fatalf("remlFisherScoring(DL start) error: %v", err)
	}
	for _, start := range []float64{0, 1e-8, 100, 1e6} {
		got, err := remlFisherScoring(studies, start, o)
		if err != nil {
			t.Fatalf("remlFisherScoring(start %v) error: %v", start, err)
		}
		if math.Abs(got.Tau2-ref.Tau2) > 1e-9*math.Max(1, ref.Tau2) {
			t.Errorf("remlFisherScoring(start %v) = %.12g, want %.12g", start, got.Tau2, ref.Tau2)
		}
	}
}

func TestBracketRoot(t *testing.T) {
	tests := []struct {
		name   string
		f      func(float64) float64
		lo, hi float64
		want   float64
	}{
		// Hand-derived roots.
		{"sqrt 2", func(x float64) float64 { return 2 - x*x }, 0, 2, math.Sqrt2},
		{"steep exponential", func(x float64) float64 { return 1 - math.Exp(20*(x-1)) }, 0, 3, 1},
		{"flat cubic", func(x float64) float64 { return -math.Pow(x-0.3, 3) }, 0, 1, 0.3},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := bracketRoot(tt.f, tt.lo, tt.hi, tt.f(tt.lo), tt.f(tt.hi), 1e-13, 500)
			if !r.converged || math.Abs(r.x-tt.want) > 1e-9 {
				t.Errorf("bracketRoot(%s) = %v (converged %v), want %v", tt.name, r.x, r.converged, tt.want)
			}
		})
	}
}
