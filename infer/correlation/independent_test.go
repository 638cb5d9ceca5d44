package correlation_test

import (
	"math"
	"testing"

	"coefaudit/infer/correlation"
)

// within reports whether got is within tol of want.
func within(got, want, tol float64) bool { return math.Abs(got-want) <= tol }

// nan marks a table value that a row does not check.
var nan = math.NaN()

// withinUnlessNaN is within, but true when want is nan (not checked).
func withinUnlessNaN(got, want, tol float64) bool { return math.IsNaN(want) || within(got, want, tol) }

func TestFisherZ(t *testing.T) {
	// Textbook example: the page headed "CHAPTER 15 Introducing Correlation
	// and Regression", p. 205, prints z1 = 0.424 for r = 0.4 and z2 = 0.693
	// for r = 0.6 (read as page text; the book's title, authors and year are
	// not shown on the page, so the book is not identified). Lane DM,
	// HyperStat Online, "Confidence Interval, Difference between Independent
	// Correlations" (pages 1–3 of 4, davidmlane.com/hyperstat/B8712.html,
	// B28800.html, B29605.html) prints z' = 0.62 for r = 0.55 and 0.45 for
	// r = 0.42. Tolerances are half a unit in the printed place.
	tests := []struct {
		name    string
		r, want float64
		tol     float64
	}{
		{"textbook p205 r=0.4", 0.4, 0.424, 0.0005},
		{"textbook p205 r=0.6", 0.6, 0.693, 0.0005},
		{"Lane HyperStat r=0.55", 0.55, 0.62, 0.005},
		{"Lane HyperStat r=0.42", 0.42, 0.45, 0.005},
		{"zero", 0, 0, 0},
		{"odd function r=-0.6", -0.6, -0.693, 0.0005},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := correlation.FisherZ(tt.r)
			if err != nil {
				t.Fatalf("FisherZ(%v) error: %v", tt.r, err)
			}
			if !within(got, tt.want, tt.tol) {
				t.Errorf("FisherZ(%v) = %.6f, want %.6f ± %g", tt.r, got, tt.want, tt.tol)
			}
		})
	}
}

func TestFisherCI(t *testing.T) {
	// Derived here from the Fisher interval tanh(atanh r ± z/√(n − 3)),
	// double precision; not published values. Applied to:
	//   Lane DM, HyperStat Online (see TestFisherZ): r = 0.55, n = 80 →
	//        (0.3757, 0.6867); r = 0.42, n = 75 → (0.2134, 0.5907);
	//   the cd4 data of DiCiccio TJ, Efron B (1996). Bootstrap confidence
	//        intervals. Statistical Science 11(3):189–228 (data transcription
	//        SECONDARY, as quoted at stats.stackexchange.com/questions/109861;
	//        r = 0.7231654 computed here from the 20 pairs), n = 20:
	//        90% (0.4741, 0.8651), 95% (0.4127, 0.8831).
	// (The paper's own "(0.47, 0.86)" is the exact interval under
	// bivariate normality, another method, so it is not a check here.)
	tests := []struct {
		name   string
		r      float64
		n      int
		level  float64
		lo, hi float64
		tol    float64
	}{
		{"Lane females DERIVED", 0.55, 80, 0.95, 0.3757, 0.6867, 5e-5},
		{"Lane males DERIVED", 0.42, 75, 0.95, 0.2134, 0.5907, 5e-5},
		{"cd4 90% DERIVED", 0.7231654, 20, 0.90, 0.4741, 0.8651, 5e-5},
		{"cd4 95% DERIVED", 0.7231654, 20, 0.95, 0.4127, 0.8831, 5e-5},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := correlation.FisherCI(tt.r, tt.n, tt.level)
			if err != nil {
				t.Fatalf("FisherCI(%v, %d, %v) error: %v", tt.r, tt.n, tt.level, err)
			}
			if !within(got[0], tt.lo, tt.tol) || !within(got[1], tt.hi, tt.tol) {
				t.Errorf("FisherCI(%v, %d, %v) = (%.5f, %.5f), want (%.4f, %.4f) ± %g",
					tt.r, tt.n, tt.level, got[0], got[1], tt.lo, tt.hi, tt.tol)
			}
		})
	}
}

func TestFisherZTest(t *testing.T) {
	// Published and derived values for two independent correlations. The
	// rows marked DERIVED are derived here from Fisher's z test, (z1 − z2)
	// with SE √(1/(n1 − 3) + 1/(n2 − 3)) and a normal two-sided P, double
	// precision; they are not published values.
	//   Textbook p. 205 (unidentified book, see TestFisherZ): r 0.6 (N 150)
	//   vs 0.4 (N 100): difference of z 0.269, SE 0.131. The book subtracts
	//   the rounded z values (0.693 − 0.424); the unrounded difference is
	//   0.26954, hence the tolerance of 0.001 on that row.
	//   DERIVED for the same example: 0.2695, SE 0.1308, z = 2.0602,
	//   P = 0.0394.
	//   Lane DM, HyperStat Online (see TestFisherZ): difference of z' 0.17,
	//   SE 0.164. DERIVED for it: 0.1707, SE 0.1639, z = 1.0412, P = 0.2978.
	//   DERIVED for invented inputs r 0.50 (n 100) vs 0.30 (n 120): z =
	//   1.7462, P = 0.0808.
	tests := []struct {
		name          string
		r1            float64
		n1            int
		r2            float64
		n2            int
		estimate, se  float64
		tolEst, tolSE float64
		stat, p       float64
	}{
		{"textbook p205 printed", 0.6, 150, 0.4, 100, 0.269, 0.131, 0.001, 0.0005, nan, nan},
		{"textbook p205 DERIVED", 0.6, 150, 0.4, 100, 0.2695, 0.1308, 5e-5, 5e-5, 2.0602, 0.0394},
		{"Lane HyperStat printed", 0.55, 80, 0.42, 75, 0.17, 0.164, 0.005, 0.0005, nan, nan},
		{"Lane HyperStat DERIVED", 0.55, 80, 0.42, 75, 0.1707, 0.1639, 5e-5, 5e-5, 1.0412, 0.2978},
		{"section 3.4 DERIVED", 0.5, 100, 0.3, 120, nan, nan, 0, 0, 1.7462, 0.0808},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := correlation.FisherZTest(tt.r1, tt.n1, tt.r2, tt.n2, 0.95)
			if err != nil {
				t.Fatalf("FisherZTest(%v, %d, %v, %d) error: %v", tt.r1, tt.n1, tt.r2, tt.n2, err)
			}
			if got.Method != correlation.MethodFisherZ || !math.IsNaN(got.DF) {
				t.Errorf("FisherZTest(...) Method, DF = %q, %v, want %q, NaN", got.Method, got.DF, correlation.MethodFisherZ)
			}
			if !withinUnlessNaN(got.Estimate, tt.estimate, tt.tolEst) || !withinUnlessNaN(got.SE, tt.se, tt.tolSE) {
				t.Errorf("FisherZTest(%v, %d, %v, %d) Estimate, SE = %.5f, %.5f, want %v ± %g, %v ± %g",
					tt.r1, tt.n1, tt.r2, tt.n2, got.Estimate, got.SE, tt.estimate, tt.tolEst, tt.se, tt.tolSE)
			}
			// The DERIVED statistics and p-values are printed to 4 decimals.
			if !withinUnlessNaN(got.Stat, tt.stat, 5e-5) || !withinUnlessNaN(got.P, tt.p, 5e-5) {
				t.Errorf("FisherZTest(%v, %d, %v, %d) Stat, P = %.5f, %.5f, want %v, %v",
					tt.r1, tt.n1, tt.r2, tt.n2, got.Stat, got.P, tt.stat, tt.p)
			}
			if !within(got.Stat, got.Estimate/got.SE, 1e-12) {
				t.Errorf("FisherZTest(...) Stat = %v, want Estimate/SE = %v", got.Stat, got.Estimate/got.SE)
			}
		})
	}
}

func TestFisherZTestLaneLimits(t *testing.T) {
	// Lane DM, HyperStat Online, "Confidence Interval, Difference between
	// Independent Correlations" (see TestFisherZ) prints the 95% limits of
	// z1' − z2' as −0.15 and 0.49; they are Estimate ± 1.96 SE on the z
	// scale. Its next step, tanh of those limits (−0.15, 0.45), is not an
	// interval for ρ1 − ρ2, which is why Result.CI is Zou's interval
	// instead: (−0.1139, 0.3778), derived here from Zou's (2007) interval
	// (formula from memory; see TestZouIndependentCI) applied to Lane's
	// data; not a published value.
	got, err := correlation.FisherZTest(0.55, 80, 0.42, 75, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := got.Estimate-1.959964*got.SE, got.Estimate+1.959964*got.SE
	if !within(lo, -0.15, 0.005) || !within(hi, 0.49, 0.005) {
		t.Errorf("FisherZTest(0.55, 80, 0.42, 75) z-scale limits = (%.4f, %.4f), want (-0.15, 0.49)", lo, hi)
	}
	if !within(got.CI[0], -0.1139, 5e-5) || !within(got.CI[1], 0.3778, 5e-5) {
		t.Errorf("FisherZTest(0.55, 80, 0.42, 75).CI = (%.5f, %.5f), want (-0.1139, 0.3778)", got.CI[0], got.CI[1])
	}
}

func TestZouIndependentCI(t *testing.T) {
	// Derived here, double precision, from the interval of Zou GY (2007).
	// Toward using confidence intervals to compare correlations.
	// Psychological Methods 12(4):399–413 (volume and pages from memory; the
	// formula, independent case c = 0, is from memory and was not checked
	// against the paper), applied to:
	//   invented inputs r 0.50 (n 100) vs 0.30 (n 120) → (−0.0250, 0.4184);
	//   Lane's HyperStat 0.55 (n 80) vs 0.42 (n 75) → (−0.1139, 0.3778).
	// Not published values: Zou's own three examples could not be read in
	// any copy seen.
	tests := []struct {
		name   string
		r1     float64
		n1     int
		r2     float64
		n2     int
		lo, hi float64
	}{
		{"section 3.4 DERIVED", 0.5, 100, 0.3, 120, -0.0250, 0.4184},
		{"Lane DERIVED", 0.55, 80, 0.42, 75, -0.1139, 0.3778},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := correlation.ZouIndependentCI(tt.r1, tt.n1, tt.r2, tt.n2, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			if !within(got.CI[0], tt.lo, 5e-5) || !within(got.CI[1], tt.hi, 5e-5) {
				t.Errorf("ZouIndependentCI(%v, %d, %v, %d, 0.95).CI = (%.5f, %.5f), want (%.4f, %.4f)",
					tt.r1, tt.n1, tt.r2, tt.n2, got.CI[0], got.CI[1], tt.lo, tt.hi)
			}
			if got.Method != correlation.MethodZouCI || !math.IsNaN(got.Stat) || !math.IsNaN(got.P) {
				t.Errorf("ZouIndependentCI(...) Method, Stat, P = %q, %v, %v, want %q, NaN, NaN",
					got.Method, got.Stat, got.P, correlation.MethodZouCI)
			}
			if !within(got.Difference, tt.r1-tt.r2, 1e-15) {
				t.Errorf("ZouIndependentCI(...).Difference = %v, want %v", got.Difference, tt.r1-tt.r2)
			}
		})
	}
}

func TestCompareIndependent(t *testing.T) {
	c, err := correlation.CompareIndependent(0.5, 100, 0.3, 120, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if c.Design != correlation.DesignIndependent || c.Primary.Method != correlation.MethodFisherZ {
		t.Errorf("CompareIndependent(...) Design, Primary = %q, %q, want %q, %q",
			c.Design, c.Primary.Method, correlation.DesignIndependent, correlation.MethodFisherZ)
	}
	if len(c.Alternatives) != 1 || c.Alternatives[0].Method != correlation.MethodZouCI {
		t.Fatalf("CompareIndependent(...).Alternatives = %+v, want one zou-ci", c.Alternatives)
	}
	// Invented inputs; z = 1.7462 and Zou (−0.0250, 0.4184) are derived here
	// (see TestFisherZTest and TestZouIndependentCI), not published values.
	if !within(c.Primary.Stat, 1.7462, 5e-5) || !within(c.CI[0], -0.0250, 5e-5) || !within(c.CI[1], 0.4184, 5e-5) {
		t.Errorf("CompareIndependent(0.5, 100, 0.3, 120) Stat, CI = %.5f, (%.5f, %.5f), want 1.7462, (-0.0250, 0.4184)",
			c.Primary.Stat, c.CI[0], c.CI[1])
	}
	if c.Primary.CI != c.CI || c.Alternatives[0].CI != c.CI || c.Difference != 0.5-0.3 || c.Level != 0.95 {
		t.Errorf("CompareIndependent(...) CIs %v, %v, %v, Difference %v, Level %v disagree",
			c.Primary.CI, c.Alternatives[0].CI, c.CI, c.Difference, c.Level)
	}
}
