package correlation_test

import (
	"math"
	"strings"
	"testing"

	"coefaudit/infer/correlation"
)

// overlappingMethod adapts the overlapping functions to one table.
type overlappingMethod func(rjk, rjh, rkh float64, n int, level float64) (correlation.Result, error)

var overlappingMethods = map[string]overlappingMethod{
	correlation.MethodWilliamsT:           correlation.WilliamsT,
	correlation.MethodSteigerZ:            correlation.SteigerZ,
	correlation.MethodMengRosenthalRubinZ: correlation.MengRosenthalRubinZ,
	correlation.MethodZouCI:               correlation.ZouOverlappingCI,
}

func TestOverlappingMethods(t *testing.T) {
	// No worked example of Steiger (1980), Meng, Rosenthal & Rubin (1992) or
	// Zou (2007) could be read in any copy seen, so the rows marked DERIVED
	// are not published values: they are derived here, in double precision
	// and printed to 4 decimals, from the formulas of Williams' t (Steiger
	// JH (1980). Tests for comparing elements of a correlation matrix.
	// Psychological Bulletin 87(2):245–251, eq. 7), Steiger's pooled Z (same
	// paper, with Dunn OJ, Clark V (1969), JASA 64:366–377), Meng X-L,
	// Rosenthal R, Rubin DB (1992). Comparing correlated correlation
	// coefficients. Psychological Bulletin 111(1):172–175, and Zou GY
	// (2007). Toward using confidence intervals to compare correlations.
	// Psychological Methods 12(4):399–413 (citations and formulas from
	// memory, not checked against the papers), applied to invented inputs
	// (n = 100, r12 = .50, r13 = .30, r23 = .40).
	//
	// The Howell row is SECONDARY: the example of Howell DC, Statistical
	// Methods for Psychology (6th ed., 2007), p. 262 — r12 = .80, r13 = .72,
	// r23 = .89, N = 26 — with Williams' t = 1.361, df 23, p = .187, as
	// reproduced on the CBU statistics wiki page "FAQ/Will"
	// (imaging.mrc-cbu.cam.ac.uk/statswiki/FAQ/Will); the book's own page
	// was not seen.
	tests := []struct {
		name          string
		method        string
		rjk, rjh, rkh float64
		n             int
		stat, df, p   float64
		lo, hi        float64
		tolStat, tolP float64
		tolCI         float64
	}{
		{"Williams DERIVED", correlation.MethodWilliamsT, 0.5, 0.3, 0.4, 100, 2.0650, 97, 0.0416, 0.0080, 0.3928, 5e-5, 5e-5, 5e-5},
		{"Steiger DERIVED", correlation.MethodSteigerZ, 0.5, 0.3, 0.4, 100, 2.0349, nan, 0.0419, 0.0080, 0.3928, 5e-5, 5e-5, 5e-5},
		{"MRR DERIVED", correlation.MethodMengRosenthalRubinZ, 0.5, 0.3, 0.4, 100, 2.0274, nan, 0.0426, 0.0080, 0.3928, 5e-5, 5e-5, 5e-5},
		{"Zou DERIVED", correlation.MethodZouCI, 0.5, 0.3, 0.4, 100, nan, nan, nan, 0.0080, 0.3928, 0, 0, 5e-5},
		{"Williams Howell p262 SECONDARY", correlation.MethodWilliamsT, 0.80, 0.72, 0.89, 26, 1.361, 23, 0.187, nan, nan, 0.0005, 0.0005, 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := overlappingMethods[tt.method](tt.rjk, tt.rjh, tt.rkh, tt.n, 0.95)
			if err != nil {
				t.Fatalf("%s(%v, %v, %v, %d) error: %v", tt.method, tt.rjk, tt.rjh, tt.rkh, tt.n, err)
			}
			if got.Method != tt.method {
				t.Errorf("%s(...).Method = %q", tt.method, got.Method)
			}
			if !sameOrBothNaN(got.Stat, tt.stat, tt.tolStat) || !sameOrBothNaN(got.P, tt.p, tt.tolP) {
				t.Errorf("%s(%v, %v, %v, %d) Stat, P = %.5f, %.5f, want %v, %v",
					tt.method, tt.rjk, tt.rjh, tt.rkh, tt.n, got.Stat, got.P, tt.stat, tt.p)
			}
			if !sameOrBothNaN(got.DF, tt.df, 0) {
				t.Errorf("%s(...).DF = %v, want %v", tt.method, got.DF, tt.df)
			}
			if !withinUnlessNaN(got.CI[0], tt.lo, tt.tolCI) || !withinUnlessNaN(got.CI[1], tt.hi, tt.tolCI) {
				t.Errorf("%s(%v, %v, %v, %d).CI = (%.5f, %.5f), want (%v, %v)",
					tt.method, tt.rjk, tt.rjh, tt.rkh, tt.n, got.CI[0], got.CI[1], tt.lo, tt.hi)
			}
			if !math.IsNaN(tt.stat) && !within(got.Stat, got.Estimate/got.SE, 1e-12) {
				t.Errorf("%s(...).Stat = %v, want Estimate/SE = %v", tt.method, got.Stat, got.Estimate/got.SE)
			}
		})
	}
}

// sameOrBothNaN is within, and also true when both are NaN.
func sameOrBothNaN(got, want, tol float64) bool {
	if math.IsNaN(want) {
		return math.IsNaN(got)
	}
	return within(got, want, tol)
}

func TestOverlappingSamplingCorrelation(t *testing.T) {
	// Zou's c = 0.331868 for the invented r12 = .50, r13 = .30, r23 = .40,
	// derived here from Zou's (2007) formula for c (from memory; equal to
	// Dunn & Clark's unpooled s); not a published value.
	if got := correlation.OverlappingSamplingCorrelation(0.5, 0.3, 0.4); !within(got, 0.331868, 5e-7) {
		t.Errorf("OverlappingSamplingCorrelation(0.5, 0.3, 0.4) = %.7f, want 0.331868", got)
	}
	// The Dunn–Clark form used here must agree with the general
	// Pearson–Filon covariance of r_jk and r_hm (pearsonFilonPsi) with h
	// set to j, on correlation matrices drawn at random.
	for i, m := range randomCorrelationMatrices(200, 3, 11) {
		want := pearsonFilonPsi(m, 0, 1, 0, 2) / ((1 - m[0][1]*m[0][1]) * (1 - m[0][2]*m[0][2]))
		got := correlation.OverlappingSamplingCorrelation(m[0][1], m[0][2], m[1][2])
		if !within(got, want, 1e-12) {
			t.Fatalf("matrix %d: OverlappingSamplingCorrelation(%v, %v, %v) = %v, want %v",
				i, m[0][1], m[0][2], m[1][2], got, want)
		}
	}
}

func TestOverlappingSymmetry(t *testing.T) {
	// Exchanging k and h exchanges the compared correlations: every
	// statistic changes sign and Zou's interval is mirrored. A limit taken
	// from the wrong side of a Fisher interval breaks the mirror.
	a, err := correlation.CompareOverlapping(0.62, 0.21, 0.35, 57, 0.90)
	if err != nil {
		t.Fatal(err)
	}
	b, err := correlation.CompareOverlapping(0.21, 0.62, 0.35, 57, 0.90)
	if err != nil {
		t.Fatal(err)
	}
	ra := append([]correlation.Result{a.Primary}, a.Alternatives...)
	rb := append([]correlation.Result{b.Primary}, b.Alternatives...)
	for i := range ra {
		if !sameOrBothNaN(rb[i].Stat, -ra[i].Stat, 1e-12) || !sameOrBothNaN(rb[i].P, ra[i].P, 1e-12) {
			t.Errorf("%s: swapped Stat, P = %v, %v, want %v, %v", ra[i].Method, rb[i].Stat, rb[i].P, -ra[i].Stat, ra[i].P)
		}
	}
	if !within(b.CI[0], -a.CI[1], 1e-12) || !within(b.CI[1], -a.CI[0], 1e-12) {
		t.Errorf("CompareOverlapping(0.21, 0.62, ...).CI = %v, want the mirror of %v", b.CI, a.CI)
	}
}

func TestCompareOverlapping(t *testing.T) {
	c, err := correlation.CompareOverlapping(0.5, 0.3, 0.4, 100, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{correlation.MethodSteigerZ, correlation.MethodMengRosenthalRubinZ, correlation.MethodZouCI}
	if c.Design != correlation.DesignOverlapping || c.Primary.Method != correlation.MethodWilliamsT || len(c.Alternatives) != len(want) {
		t.Fatalf("CompareOverlapping(...) Design %q, Primary %q, %d alternatives, want %q, %q, %d",
			c.Design, c.Primary.Method, len(c.Alternatives), correlation.DesignOverlapping, correlation.MethodWilliamsT, len(want))
	}
	for i, m := range want {
		if c.Alternatives[i].Method != m || c.Alternatives[i].CI != c.CI {
			t.Errorf("CompareOverlapping(...).Alternatives[%d] = %q with CI %v, want %q with %v",
				i, c.Alternatives[i].Method, c.Alternatives[i].CI, m, c.CI)
		}
	}
	// Invented inputs; Williams t = 2.0650 and Zou (0.0080, 0.3928) are
	// derived here (see TestOverlappingMethods), not published values.
	if !within(c.Primary.Stat, 2.0650, 5e-5) || !within(c.CI[0], 0.0080, 5e-5) || !within(c.CI[1], 0.3928, 5e-5) {
		t.Errorf("CompareOverlapping(0.5, 0.3, 0.4, 100) Stat, CI = %.5f, %v, want 2.0650, (0.0080, 0.3928)", c.Primary.Stat, c.CI)
	}
	if c.Primary.CI != c.CI || !within(c.Difference, 0.2, 1e-15) {
		t.Errorf("CompareOverlapping(...) Primary.CI %v, Difference %v, want %v, 0.2", c.Primary.CI, c.Difference, c.CI)
	}
}

func TestMengRosenthalRubinCap(t *testing.T) {
	// f = (1 − r_kh)/(2(1 − r̄²)) = 1.8/0.38 > 1 here, so f is set to 1
	// and the Result says so; then h = 1 and Z = (z_jk − z_jh)√((n − 3)/(2(1 − r_kh))).
	got, err := correlation.MengRosenthalRubinZ(0.9, -0.9, -0.8, 40, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if len(got.Warnings) == 0 || !strings.Contains(got.Warnings[0], "f = ") {
		t.Errorf("MengRosenthalRubinZ(0.9, -0.9, -0.8, 40).Warnings = %q, want the cap of f", got.Warnings)
	}
	want := (math.Atanh(0.9) - math.Atanh(-0.9)) * math.Sqrt(37/(2*1.8))
	if !within(got.Stat, want, 1e-12) {
		t.Errorf("MengRosenthalRubinZ(0.9, -0.9, -0.8, 40).Stat = %v, want %v", got.Stat, want)
	}
}
