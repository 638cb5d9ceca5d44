package infer

import (
	"math"
	"testing"
)

// TestOverlapKnownRelations derives the relations for two independent 95%
// intervals of equal width that Cumming & Finch state as rules of eye
// (Cumming G, Finch S (2005). Inference by eye: confidence intervals and how to
// read pictures of data. American Psychologist 60(2):170–180). With SE s,
// margin m = 1.959964 s; an overlap of a proportion po of m puts the estimates
// (2 − po) m apart, so z = (2 − po) 1.959964/√2:
//
//	po = 0   (touching): z = 2.77181, p = 0.00557 (rule: "about .01")
//	po = 0.5 (half):     z = 2.07886, p = 0.03763 (rule: "about .05")
//	po = 2 − √2:         z = 1.959964, p = 0.05 exactly.
//
// The z and p values are derived here from the test for two independent
// estimates, z = d/√(s1² + s2²) (Altman DG, Bland JM (2003), BMJ 326:219),
// applied to intervals constructed to overlap by po (normal two-sided p); not
// published values. The rule wording is SECONDARY: a statistics-list post
// citing Cumming & Finch (2005), "half arm length overlap corresponds to
// p ≈ 0.05, touching arms correspond to p ≈ 0.01", seen in the web-text
// collection huggingface.co/datasets/nvidia/Nemotron-CC-Math-v1; the paper's
// own wording was not seen.
func TestOverlapKnownRelations(t *testing.T) {
	c := 1.959963984540054
	tests := []struct {
		name      string
		po        float64
		wantP     float64
		tol       float64
		rule05    bool
		rule01    bool
		wantRatio float64
	}{
		{"touching", 0, 0.00557, 5e-6, true, true, 1},
		{"half overlap", 0.5, 0.03763, 5e-6, true, false, 1},
		{"p exactly .05", 2 - math.Sqrt2, 0.05, 1e-12, false, false, 1},
		{"gap of a quarter margin", -0.25, NormalTwoSidedP(2.25 * c / math.Sqrt2), 1e-14, true, true, 1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := 0.1
			m := c * s
			e2 := (2 - tt.po) * m
			o, err := CIOverlap(0, -m, m, e2, e2-m, e2+m, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(o.Proportion-tt.po) > 1e-12 {
				t.Errorf("Proportion = %v, want %v", o.Proportion, tt.po)
			}
			if math.Abs(o.ImpliedP-tt.wantP) > tt.tol {
				t.Errorf("ImpliedP = %.6f, want %.6f", o.ImpliedP, tt.wantP)
			}
			if o.RuleP05 != tt.rule05 || o.RuleP01 != tt.rule01 {
				t.Errorf("rule flags = %v, %v; want %v, %v", o.RuleP05, o.RuleP01, tt.rule05, tt.rule01)
			}
			if math.Abs(o.MarginRatio-tt.wantRatio) > 1e-12 {
				t.Errorf("MarginRatio = %v", o.MarginRatio)
			}
		})
	}
}

func TestOverlapOrderAndUnequalMargins(t *testing.T) {
	// Ratio ρ = 2 of the SEs, intervals just touching: z = 1.959964 (1+ρ)/√(1+ρ²)
	// = 2.6296, p = 0.00855, derived here from the same two-estimate test (Altman
	// & Bland 2003, BMJ 326:219) applied to 95% intervals with SEs 0.1 and 0.2
	// that just touch (normal two-sided p); not a published value.
	c := 1.959963984540054
	m1, m2 := c*0.1, c*0.2
	e2 := m1 + m2
	for _, swap := range []bool{false, true} {
		var o Overlap
		var err error
		if swap {
			o, err = CIOverlap(e2, e2-m2, e2+m2, 0, -m1, m1, 0.95)
		} else {
			o, err = CIOverlap(0, -m1, m1, e2, e2-m2, e2+m2, 0.95)
		}
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(o.ImpliedP-0.00855) > 5e-6 || math.Abs(o.MarginRatio-2) > 1e-12 || math.Abs(o.Proportion) > 1e-12 {
			t.Errorf("swap %v: %+v, want p 0.00855, ratio 2, proportion 0", swap, o)
		}
	}
	if _, err := CIOverlap(0.5, 0.6, 0.9, 0, -1, 1, 0.95); err == nil {
		t.Error("estimate outside its interval: want an error")
	}
}
