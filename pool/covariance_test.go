package pool_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/infer/meta"
	"coefaudit/pool"
)

// TestIssue17PoolKeepsRounding: a claim indeterminate for the rounding of
// its printed numbers alone has a known difference and SE, and is pooled.
// Before, every indeterminate claim was left out, which selects studies by
// how close their p is to α. The pooled values must then be those of the
// Kacker (2004) data with the claim added, computed by meta directly.
func TestIssue17PoolKeepsRounding(t *testing.T) {
	claims := kackerClaims("interlab", 2)
	claims = append(claims, pooled("R", 30, extract.MeasureB, extract.ScaleAsPrinted, 62.1, 0.3, audit.Indeterminate, "interlab"))
	tp := poolOne(t, claims, pool.Options{Method: pool.DL})
	if tp.K != 10 || len(tp.LeftOut) != 0 {
		t.Fatalf("Pool(with a claim indeterminate for rounding) K = %d, left out %+v; want 10 and none", tp.K, tp.LeftOut)
	}
	studies := make([]meta.Study, len(claims))
	for i, c := range claims {
		studies[i] = meta.StudyFromStandardError(c.Study, float64(c.PoolEstimate), float64(c.PoolSE))
	}
	re, err := meta.FitRandomEffects(studies, meta.DerSimonianLaird, meta.Options{})
	if err != nil {
		t.Fatal(err)
	}
	checkAll(t, []check{{"DL estimate", float64(tp.Random.Estimate), re.Wald.Estimate, 1e-12}})
}

// TestIssue17PoolCovariance: a claim whose SE is only bounded (its two
// estimates share a sample whose covariance was not printed) is left out
// of the main result by default, with no sensitivity analysis; with a
// stated correlation ρ it is pooled beside the main result with
// SE² = SE1² + SE2² − 2ρ SE1 SE2 (the variance of a difference, as in
// Altman & Bland 2003, BMJ 326:219, with the covariance term), and at the
// bound with SE1 + SE2. The main result stays that of the other claims.
func TestIssue17PoolCovariance(t *testing.T) {
	const topic = "interlab"
	claims := append(kackerClaims(topic, 2),
		bounded("B1", 40, extract.MeasureB, extract.ScaleAsPrinted, 63.5, 0.3, 0.4, topic),
		bounded("B2", 41, extract.MeasureB, extract.ScaleAsPrinted, 61.2, 0.5, 0.2, topic),
		// Another measure: left out for that, even in the sensitivity analysis.
		bounded("B3", 42, extract.MeasureBeta, extract.ScaleAsPrinted, 0.2, 0.1, 0.1, topic))
	main := poolOne(t, claims, pool.Options{Method: pool.DL})
	if main.K != 9 || main.Sensitivity != nil || len(main.LeftOut) != 3 {
		t.Fatalf("Pool(default) K %d, sensitivity %v, left out %d; want 9, none, 3", main.K, main.Sensitivity, len(main.LeftOut))
	}
	// Kacker's DL estimate (see TestPoolLeftOut).
	checkAll(t, []check{{"DL without the bounded claims", float64(main.Random.Estimate), 62.3901386044504, 1e-9}})
	if !strings.Contains(main.LeftOut[0].Reason, "--covariance") || !strings.Contains(main.LeftOut[2].Reason, "standardized") {
		t.Errorf("Pool(default) reasons %q, %q; want --covariance named, and the other measure", main.LeftOut[0].Reason, main.LeftOut[2].Reason)
	}
	tests := []struct {
		name     string
		cov      string
		se1, se2 float64 // the SEs of B1 and B2 under the assumption
	}{
		{"rho 0.5", "0.5", math.Sqrt(0.09 + 0.16 - 2*0.5*0.3*0.4), math.Sqrt(0.25 + 0.04 - 2*0.5*0.5*0.2)},
		{"rho -0.2", "−0.2", math.Sqrt(0.09 + 0.16 + 2*0.2*0.3*0.4), math.Sqrt(0.25 + 0.04 + 2*0.2*0.5*0.2)},
		{"bound", "bound", 0.7, 0.7},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			pc, err := pool.ParseCovariance(tt.cov)
			if err != nil {
				t.Fatal(err)
			}
			tp := poolOne(t, claims, pool.Options{Method: pool.DL, Covariance: pc})
			if tp.K != 9 || float64(tp.Random.Estimate) != float64(main.Random.Estimate) {
				t.Errorf("Pool(%s) main K %d estimate %v; want the default's 9, %v", tt.cov, tp.K, tp.Random.Estimate, main.Random.Estimate)
			}
			s := tp.Sensitivity
			if s == nil || s.K != 11 || len(s.Added) != 2 || s.Random == nil {
				t.Fatalf("Pool(%s) sensitivity %+v, want 11 claims with 2 added", tt.cov, s)
			}
			checkAll(t, []check{{"SE of B1", float64(s.Added[0].SE), tt.se1, 1e-15}, {"SE of B2", float64(s.Added[1].SE), tt.se2, 1e-15}})
			studies := make([]meta.Study, 0, 11)
			for _, c := range claims[:9] {
				studies = append(studies, meta.StudyFromStandardError(c.Study, float64(c.PoolEstimate), float64(c.PoolSE)))
			}
			studies = append(studies, meta.StudyFromStandardError("B1", 63.5, tt.se1), meta.StudyFromStandardError("B2", 61.2, tt.se2))
			re, err := meta.FitRandomEffects(studies, meta.DerSimonianLaird, meta.Options{})
			if err != nil {
				t.Fatal(err)
			}
			checkAll(t, []check{{"sensitivity DL", float64(s.Random.Estimate), re.Wald.Estimate, 1e-12},
				{"sensitivity HKSJ low", float64(s.HKSJ.CI[0]), re.HartungKnapp.Low, 1e-12},
				{"sensitivity tau2", float64(s.Tau2), re.Tau2, 1e-12}})
			if !strings.Contains(tp.LeftOut[0].Reason, "sensitivity analysis instead") {
				t.Errorf("Pool(%s) reason %q, want it to point to the sensitivity analysis", tt.cov, tp.LeftOut[0].Reason)
			}
		})
	}
}

func TestParseCovariance(t *testing.T) {
	for _, s := range []string{"", "omit", "OMIT", "bound", "0", "-1", "1", "0.35", "−0.5"} {
		if _, err := pool.ParseCovariance(s); err != nil {
			t.Errorf("ParseCovariance(%q) error: %v", s, err)
		}
	}
	for _, s := range []string{"1.5", "-2", "half", "NaN", "0.3x"} {
		if _, err := pool.ParseCovariance(s); !errors.Is(err, pool.ErrCovariance) {
			t.Errorf("ParseCovariance(%q) error = %v, want %v", s, err, pool.ErrCovariance)
		}
	}
	if _, err := pool.Run(&audit.Report{}, pool.Options{Covariance: pool.Covariance{Mode: "guess"}}); !errors.Is(err, pool.ErrCovariance) {
		t.Errorf("Pool(covariance guess) error = %v, want %v", err, pool.ErrCovariance)
	}
}

// TestIssue20PoolNotesNameReportedIntervals: three claims that agree more
// closely than their SEs predict give an HKSJ scale q < 1; the note must
// say so in terms of the Wald and HKSJ intervals the report gives, and
// never mention the modified (max(1, q)) interval it does not report,
// which meta's own warning names.
func TestIssue20PoolNotesNameReportedIntervals(t *testing.T) {
	claims := []audit.ClaimResult{
		pooled("A", 2, extract.MeasureB, extract.ScaleAsPrinted, 0.30, 0.1, audit.Consistent, "t"),
		pooled("B", 3, extract.MeasureB, extract.ScaleAsPrinted, 0.31, 0.1, audit.Consistent, "t"),
		pooled("C", 4, extract.MeasureB, extract.ScaleAsPrinted, 0.29, 0.1, audit.Consistent, "t"),
	}
	tp := poolOne(t, claims, pool.DefaultOptions)
	notes := strings.Join(tp.Notes, " ")
	if !strings.Contains(notes, "HKSJ interval is narrower than the Wald interval") {
		t.Errorf("Pool(q < 1) notes %q, want one saying the HKSJ interval is the narrower", tp.Notes)
	}
	for _, bad := range []string{"max(1, q)", "modified"} {
		if strings.Contains(notes, bad) {
			t.Errorf("Pool(q < 1) notes %q mention %q, an interval the report does not give", tp.Notes, bad)
		}
	}
}
