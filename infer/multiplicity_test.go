package infer

import (
	"math"
	"testing"
)

// The fifteen p-values of the worked example in Benjamini Y, Hochberg Y (1995).
// Controlling the false discovery rate: a practical and powerful approach to
// multiple testing. Journal of the Royal Statistical Society B 57(1):289–300,
// section 4 (data of Neuhaus et al. 1992): at q = 0.05 the step-up procedure
// rejects exactly the four smallest; Bonferroni rejects three. SECONDARY: the
// paper's own page was not seen; values and outcome as reproduced in the
// Examples of SciPy's documentation of scipy.stats.false_discovery_control
// (which also prints the BH-adjusted values 0.0015, 0.003, 0.035625 (4th),
// 0.0603 and 0.06385714 checked below) and quoted in several independent test
// suites.
var bh1995 = []float64{0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344,
	0.0459, 0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.000}

func TestMultiplicityPublishedExample(t *testing.T) {
	count := func(adj []float64, alpha float64, strict bool) int {
		n := 0
		for _, q := range adj {
			if q < alpha || (!strict && q == alpha) {
				n++
			}
		}
		return n
	}
	bh := BenjaminiHochbergAdjust(bh1995)
	if n := count(bh, 0.05, false); n != 4 {
		t.Errorf("BH rejects %d at q = .05, want 4 (Benjamini & Hochberg 1995 §4)", n)
	}
	holm := HolmAdjust(bh1995)
	// Holm by hand: 0.0001 ≤ .05/15, 0.0004 ≤ .05/14, 0.0019 ≤ .05/13, but
	// 0.0095 > .05/12 = 0.00417: three rejected, as many as Bonferroni.
	if n := count(holm, 0.05, true); n != 3 {
		t.Errorf("Holm rejects %d at .05, want 3", n)
	}
	// Adjusted values worked by hand from the definitions:
	// Holm: 15·0.0001, 14·0.0004, 13·0.0019, 12·0.0095.
	// BH: q(4) = 0.0095·15/4; q(5) = min over j ≥ 5 of 15 p(j)/j = 0.0201·3 = 0.0603;
	// q(6) = q(7) = 0.0298·15/7 = 0.063857; q(1) = min(0.0015, 0.003) = 0.0015.
	tests := []struct {
		name      string
		got, want float64
	}{
		{"holm 1", holm[0], 0.0015}, {"holm 2", holm[1], 0.0056}, {"holm 3", holm[2], 0.0247}, {"holm 4", holm[3], 0.114},
		{"holm last", holm[14], 1},
		{"bh 1", bh[0], 0.0015}, {"bh 2", bh[1], 0.003}, {"bh 4", bh[3], 0.035625}, {"bh 5", bh[4], 0.0603},
		{"bh 6", bh[5], 0.0298 * 15 / 7}, {"bh 7", bh[6], 0.0298 * 15 / 7}, {"bh last", bh[14], 1},
	}
	for _, tt := range tests {
		if math.Abs(tt.got-tt.want) > 1e-12 {
			t.Errorf("%s = %.6g, want %.6g", tt.name, tt.got, tt.want)
		}
	}
}

func TestMultiplicityOrderAndNaN(t *testing.T) {
	// The adjustment follows the input order and leaves NaN out of the family
	// (m = 2 here: Holm 2·0.01 and max(0.02, 1·0.04)).
	p := []float64{0.04, math.NaN(), 0.01}
	holm := HolmAdjust(p)
	if !math.IsNaN(holm[1]) || math.Abs(holm[0]-0.04) > 1e-15 || math.Abs(holm[2]-0.02) > 1e-15 {
		t.Errorf("HolmAdjust(%v) = %v, want [0.04 NaN 0.02]", p, holm)
	}
	bh := BenjaminiHochbergAdjust(p)
	if !math.IsNaN(bh[1]) || math.Abs(bh[0]-0.04) > 1e-15 || math.Abs(bh[2]-0.02) > 1e-15 {
		t.Errorf("BenjaminiHochbergAdjust(%v) = %v, want [0.04 NaN 0.02]", p, bh)
	}
	if len(HolmAdjust(nil)) != 0 {
		t.Error("HolmAdjust(nil) should be empty")
	}
}
