package correlation_test

import (
	"math"
	"strings"
	"testing"

	"coefaudit/infer/correlation"
)

// derivedNonOverlapping is an invented example (n = 100): r12 = .50,
// r34 = .30, r13 = .40, r14 = .20, r23 = .25, r24 = .35, with j, k, h, m
// numbered 1, 2, 3, 4. Its check values are derived here, not published.
var derivedNonOverlapping = correlation.NonOverlapping{JK: 0.5, HM: 0.3, JH: 0.4, JM: 0.2, KH: 0.25, KM: 0.35}

type nonOverlappingMethod func(s correlation.NonOverlapping, n int, level float64) (correlation.Result, error)

var nonOverlappingMethods = map[string]nonOverlappingMethod{
	correlation.MethodPearsonFilonZ: correlation.PearsonFilonZ,
	correlation.MethodZPF:           correlation.ZPF,
	correlation.MethodSteigerZ:      correlation.SteigerNonOverlappingZ,
	correlation.MethodZouCI:         correlation.ZouNonOverlappingCI,
}

func TestNonOverlappingMethods(t *testing.T) {
	// Derived here, in double precision, from the formulas of Pearson K,
	// Filon LNG (1898), Phil Trans R Soc A 191:229–311 (PF), Raghunathan TE,
	// Rosenthal R, Rubin DB (1996). Comparing correlated but nonoverlapping
	// correlations. Psychological Methods 1(2):178–183 (ZPF), and Zou GY
	// (2007), Psychological Methods 12(4):399–413 (formulas, and the
	// Pearson–Filon and Zou citations, from memory; not checked against the
	// papers), applied to the invented derivedNonOverlapping; not published
	// values: no worked example of Raghunathan et al. 1996 or Zou 2007 could
	// be read. PF Z = 1.8090 (P 0.0705); ZPF = 1.7834 (P 0.0745); Zou
	// (−0.0200, 0.4186). All to 4 decimals.
	tests := []struct {
		name    string
		method  string
		stat, p float64
		lo, hi  float64
	}{
		{"Pearson-Filon DERIVED", correlation.MethodPearsonFilonZ, 1.8090, 0.0705, -0.0200, 0.4186},
		{"ZPF DERIVED", correlation.MethodZPF, 1.7834, 0.0745, -0.0200, 0.4186},
		{"Zou DERIVED", correlation.MethodZouCI, nan, nan, -0.0200, 0.4186},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := nonOverlappingMethods[tt.method](derivedNonOverlapping, 100, 0.95)
			if err != nil {
				t.Fatalf("%s(%+v, 100) error: %v", tt.method, derivedNonOverlapping, err)
			}
			if got.Method != tt.method || !math.IsNaN(got.DF) {
				t.Errorf("%s(...) Method, DF = %q, %v, want %q, NaN", tt.method, got.Method, got.DF, tt.method)
			}
			if !sameOrBothNaN(got.Stat, tt.stat, 5e-5) || !sameOrBothNaN(got.P, tt.p, 5e-5) {
				t.Errorf("%s(%+v, 100) Stat, P = %.5f, %.5f, want %v, %v", tt.method, derivedNonOverlapping, got.Stat, got.P, tt.stat, tt.p)
			}
			if !within(got.CI[0], tt.lo, 5e-5) || !within(got.CI[1], tt.hi, 5e-5) {
				t.Errorf("%s(%+v, 100).CI = (%.5f, %.5f), want (%v, %v)", tt.method, derivedNonOverlapping, got.CI[0], got.CI[1], tt.lo, tt.hi)
			}
		})
	}
}

func TestNonOverlappingSamplingCorrelation(t *testing.T) {
	// Derived here from the nonoverlapping covariance ψ (Steiger 1980,
	// after Pearson & Filon 1898; formula from memory) applied to the
	// invented derivedNonOverlapping; not published values: ψ = 0.084125,
	// c = ψ/((1 − .25)(1 − .09)) = 0.123260.
	if got := correlation.NonOverlappingSamplingCorrelation(derivedNonOverlapping); !within(got, 0.123260, 5e-7) {
		t.Errorf("NonOverlappingSamplingCorrelation(%+v) = %.7f, want 0.123260", derivedNonOverlapping, got)
	}
	// The product form used by the package must agree with the general
	// Pearson–Filon covariance (pearsonFilonPsi) on random matrices.
	for i, m := range randomCorrelationMatrices(200, 4, 12) {
		s := correlation.NonOverlapping{JK: m[0][1], HM: m[2][3], JH: m[0][2], JM: m[0][3], KH: m[1][2], KM: m[1][3]}
		want := pearsonFilonPsi(m, 0, 1, 2, 3) / ((1 - s.JK*s.JK) * (1 - s.HM*s.HM))
		if got := correlation.NonOverlappingSamplingCorrelation(s); !within(got, want, 1e-12) {
			t.Fatalf("matrix %d: NonOverlappingSamplingCorrelation(%+v) = %v, want %v", i, s, got, want)
		}
	}
}

func TestPearsonFilonPsiVariance(t *testing.T) {
	// The general form reduces to the variance of one r, n·Var(r) = (1 − ρ²)²
	// (Fisher 1921; a textbook result), which checks the test helper itself.
	for _, m := range randomCorrelationMatrices(20, 3, 13) {
		want := (1 - m[0][1]*m[0][1]) * (1 - m[0][1]*m[0][1])
		if got := pearsonFilonPsi(m, 0, 1, 0, 1); !within(got, want, 1e-12) {
			t.Fatalf("pearsonFilonPsi(m, 0, 1, 0, 1) = %v, want (1 − r²)² = %v", got, want)
		}
	}
}

func TestSteigerNonOverlappingPooled(t *testing.T) {
	// Steiger's statistic is ZPF with the covariance taken at the pooled
	// r̄ = (r12 + r34)/2. Recompute it from the general covariance form with
	// r̄ in place of both compared correlations.
	s := derivedNonOverlapping
	rbar := (s.JK + s.HM) / 2
	m := [][]float64{
		{1, rbar, s.JH, s.JM},
		{rbar, 1, s.KH, s.KM},
		{s.JH, s.KH, 1, rbar},
		{s.JM, s.KM, rbar, 1},
	}
	sbar := pearsonFilonPsi(m, 0, 1, 2, 3) / ((1 - rbar*rbar) * (1 - rbar*rbar))
	want := (math.Atanh(s.JK) - math.Atanh(s.HM)) * math.Sqrt(97/(2-2*sbar))
	got, err := correlation.SteigerNonOverlappingZ(s, 100, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if !within(got.Stat, want, 1e-12) {
		t.Errorf("SteigerNonOverlappingZ(%+v, 100).Stat = %v, want %v", s, got.Stat, want)
	}
}

func TestNonOverlappingReducesToIndependent(t *testing.T) {
	// With every cross correlation 0 the two correlations are uncorrelated
	// (c = 0), so ZPF is Fisher's z test for two samples of n and Zou's
	// interval is the independent-samples one (Zou 2007 builds both from the
	// same formula with c = 0); Pearson–Filon is then
	// √n (r1 − r2)/√[(1 − r1²)² + (1 − r2²)²].
	s := correlation.NonOverlapping{JK: 0.45, HM: -0.2}
	const n = 60
	zpf, err := correlation.ZPF(s, n, 0.9)
	if err != nil {
		t.Fatal(err)
	}
	fz, err := correlation.FisherZTest(0.45, n, -0.2, n, 0.9)
	if err != nil {
		t.Fatal(err)
	}
	if !within(zpf.Stat, fz.Stat, 1e-12) || !within(zpf.CI[0], fz.CI[0], 1e-12) || !within(zpf.CI[1], fz.CI[1], 1e-12) {
		t.Errorf("ZPF(zero cross, %d) Stat, CI = %v, %v, want FisherZTest's %v, %v", n, zpf.Stat, zpf.CI, fz.Stat, fz.CI)
	}
	pf, err := correlation.PearsonFilonZ(s, n, 0.9)
	if err != nil {
		t.Fatal(err)
	}
	want := math.Sqrt(n) * 0.65 / math.Hypot(1-0.45*0.45, 1-0.04)
	if !within(pf.Stat, want, 1e-12) {
		t.Errorf("PearsonFilonZ(zero cross, %d).Stat = %v, want %v", n, pf.Stat, want)
	}
}

func TestCompareNonOverlapping(t *testing.T) {
	c, err := correlation.CompareNonOverlapping(derivedNonOverlapping, 100, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{correlation.MethodSteigerZ, correlation.MethodPearsonFilonZ, correlation.MethodZouCI}
	if c.Design != correlation.DesignNonOverlapping || c.Primary.Method != correlation.MethodZPF || len(c.Alternatives) != len(want) {
		t.Fatalf("CompareNonOverlapping(...) Design %q, Primary %q, %d alternatives, want %q, %q, %d",
			c.Design, c.Primary.Method, len(c.Alternatives), correlation.DesignNonOverlapping, correlation.MethodZPF, len(want))
	}
	for i, m := range want {
		if c.Alternatives[i].Method != m || c.Alternatives[i].CI != c.CI {
			t.Errorf("CompareNonOverlapping(...).Alternatives[%d] = %q with CI %v, want %q with %v",
				i, c.Alternatives[i].Method, c.Alternatives[i].CI, m, c.CI)
		}
	}
	// Invented inputs; ZPF = 1.7834 and Zou (−0.0200, 0.4186) are derived
	// here (see TestNonOverlappingMethods), not published values.
	if !within(c.Primary.Stat, 1.7834, 5e-5) || !within(c.CI[0], -0.0200, 5e-5) || !within(c.CI[1], 0.4186, 5e-5) {
		t.Errorf("CompareNonOverlapping(...) Stat, CI = %.5f, %v, want 1.7834, (-0.0200, 0.4186)", c.Primary.Stat, c.CI)
	}
	pf := c.Alternatives[1]
	if len(pf.Warnings) == 0 || !strings.Contains(pf.Warnings[0], "zpf") {
		t.Errorf("CompareNonOverlapping(...) pearson-filon-z Warnings = %q, want the small-sample caution", pf.Warnings)
	}
	if len(c.Primary.Warnings) != 0 {
		t.Errorf("CompareNonOverlapping(...) zpf Warnings = %q, want none", c.Primary.Warnings)
	}
}
