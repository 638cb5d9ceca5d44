package audit

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"coefaudit/extract"
	"coefaudit/infer"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// exact is a printed number taken as exact (decimals unknown, no rounding).
func exact(x float64) extract.Printed {
	return extract.Printed{Value: x, Decimals: -1, Bound: extract.Exact, Text: strconv.FormatFloat(x, 'g', -1, 64)}
}

func corrTable(study, group string, vars []string, r [][]float64, n float64, sds []float64) extract.CorrelationTable {
	t := extract.CorrelationTable{Position: extract.Position{Sheet: "table " + study}, Name: study, Study: study, Group: group, Variables: vars}
	for i := range vars {
		row := make([]extract.Printed, len(vars))
		for j := range vars {
			row[j] = exact(r[i][j])
		}
		t.R = append(t.R, row)
		t.N = append(t.N, exact(n))
		if sds != nil {
			t.SD = append(t.SD, exact(sds[i]))
		} else {
			t.SD = append(t.SD, extract.Printed{})
		}
		t.Mean = append(t.Mean, extract.Printed{})
	}
	return t
}

func rCoef(label, a, b string, r float64, row int) extract.Coefficient {
	return extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: row}, Study: "S", Label: label,
		Measure: extract.MeasureR, Outcome: a, Predictor: b, Group: "g", Estimate: exact(r), CILevel: 95, N: exact(100)}
}

func TestDependentCorrelationsFromTable(t *testing.T) {
	// Invented inputs, n = 100. The check values are derived here, in double
	// precision, from the formulas of Williams' t (Steiger JH (1980). Tests for
	// comparing elements of a correlation matrix. Psychological Bulletin
	// 87(2):245–251, eq. 7), ZPF (Raghunathan TE, Rosenthal R, Rubin DB (1996).
	// Comparing correlated but nonoverlapping correlations. Psychological Methods
	// 1(2):178–183) and Zou's interval (Zou GY (2007). Toward using confidence
	// intervals to compare correlations. Psychological Methods 12(4):399–413);
	// the Steiger citation, Zou's volume and pages and all three formulas are
	// from memory, not checked against the papers. They are not published
	// values: no worked example with numbers of Steiger 1980, Raghunathan et al.
	// 1996 or Zou 2007 could be read in any copy seen.
	// Overlapping r12 = .50 vs r13 = .30 with r23 = .40: Williams t = 2.0650 (P .0416),
	// Zou interval (0.0080, 0.3928).
	// Non-overlapping r12 = .50 vs r34 = .30 with r13 .40, r14 .20, r23 .25, r24 .35:
	// ZPF = 1.7834 (P .0745), Zou interval (−0.0200, 0.4186).
	vars := []string{"v1", "v2", "v3", "v4"}
	r := [][]float64{{1, .50, .40, .20}, {.50, 1, .25, .35}, {.40, .25, 1, .30}, {.20, .35, .30, 1}}
	in := &extract.Input{
		Coefficients: []extract.Coefficient{
			rCoef("r12", "v1", "v2", .50, 2), rCoef("r13", "v1", "v3", .40, 3), rCoef("r34", "v3", "v4", .30, 4),
		},
		Tables: []extract.CorrelationTable{corrTable("S", "g", vars, r, 100, nil)},
	}
	// For the overlapping case the table's r13 must be .30 and r23 .40: use a second
	// sample whose table has exactly the overlapping numbers above.
	vars3 := []string{"a", "b", "c"}
	r3 := [][]float64{{1, .50, .30}, {.50, 1, .40}, {.30, .40, 1}}
	in.Tables = append(in.Tables, corrTable("S", "h", vars3, r3, 100, nil))
	ab, ac := rCoef("rab", "a", "b", .50, 5), rCoef("rac", "a", "c", .30, 6)
	ab.Group, ac.Group = "h", "h"
	in.Coefficients = append(in.Coefficients, ab, ac)
	in.Claims = []extract.Claim{
		claim("S", "overlapping", 2, "rab", "rac", "differ", "test"),
		claim("S", "non-overlapping", 3, "r12", "r34", "differ", "test"),
	}
	rep := Audit(in, DefaultOptions)
	tests := []struct {
		method       string
		stat, p      float64
		ciLo, ciHi   float64
		wantOutcome  string
		wantPoolSets bool
	}{
		{"williams-t", 2.0650, 0.0416, 0.0080, 0.3928, Consistent, true},
		{"zpf", 1.7834, 0.0745, -0.0200, 0.4186, Unsupported, true},
	}
	for i, tt := range tests {
		c := rep.Claims[i]
		if c.Method != tt.method || c.Outcome != tt.wantOutcome {
			t.Errorf("%s: method %s outcome %s, want %s %s; notes %q", c.Claim, c.Method, c.Outcome, tt.method, tt.wantOutcome, c.Notes)
			continue
		}
		if math.Abs(float64(c.Statistic)-tt.stat) > 5e-5 || math.Abs(float64(c.P)-tt.p) > 5e-5 {
			t.Errorf("%s: statistic %.5f p %.5f, want %.4f %.4f", c.Claim, c.Statistic, c.P, tt.stat, tt.p)
		}
		if math.Abs(float64(c.DifferenceCI[0])-tt.ciLo) > 5e-5 || math.Abs(float64(c.DifferenceCI[1])-tt.ciHi) > 5e-5 {
			t.Errorf("%s: Zou CI %v, want (%v, %v)", c.Claim, c.DifferenceCI, tt.ciLo, tt.ciHi)
		}
		if c.PoolSE.Known() != tt.wantPoolSets {
			t.Errorf("%s: pool SE known = %v", c.Claim, c.PoolSE.Known())
		}
	}
}

// TestRegressionFromTableMatchesRawFit rebuilds a regression from the
// correlation table of simulated data and checks the test of two of its
// coefficients against an OLS fit of the raw data by gonum's QR (an outside
// reference: the raw-data covariance s²(XᵀX)⁻¹ from R⁻¹R⁻ᵀ).
func TestRegressionFromTableMatchesRawFit(t *testing.T) {
	const n = 300
	rng := rand.New(rand.NewPCG(7, 11))
	x1, x2, x3, y := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range n {
		z := rng.NormFloat64()
		x1[i] = z + rng.NormFloat64()
		x2[i] = 0.5*z + rng.NormFloat64()
		x3[i] = rng.NormFloat64()
		y[i] = 0.4*x1[i] + 0.3*x2[i] - 0.2*x3[i] + 2*rng.NormFloat64()
	}
	cols := [][]float64{y, x1, x2, x3}
	vars := []string{"y", "x1", "x2", "x3"}
	r := make([][]float64, 4)
	sds := make([]float64, 4)
	for i := range cols {
		r[i] = make([]float64, 4)
		for j := range cols {
			r[i][j] = stat.Correlation(cols[i], cols[j], nil)
		}
		sds[i] = stat.StdDev(cols[i], nil)
	}
	// Raw OLS with an intercept by QR.
	X := mat.NewDense(n, 4, nil)
	for i := range n {
		X.Set(i, 0, 1)
		X.Set(i, 1, x1[i])
		X.Set(i, 2, x2[i])
		X.Set(i, 3, x3[i])
	}
	var qr mat.QR
	qr.Factorize(X)
	var b mat.Dense
	if err := qr.SolveTo(&b, false, mat.NewDense(n, 1, y)); err != nil {
		t.Fatal(err)
	}
	var fitted mat.Dense
	fitted.Mul(X, &b)
	rss := 0.0
	for i := range n {
		e := y[i] - fitted.At(i, 0)
		rss += e * e
	}
	s2 := rss / float64(n-4)
	var R, Rinv, xtxInv mat.Dense
	qr.RTo(&R)
	if err := Rinv.Inverse(R.Slice(0, 4, 0, 4)); err != nil {
		t.Fatal(err)
	}
	xtxInv.Mul(&Rinv, Rinv.T())
	v := s2 * (xtxInv.At(1, 1) + xtxInv.At(2, 2) - 2*xtxInv.At(1, 2))
	wantD := b.At(1, 0) - b.At(2, 0)
	wantT := wantD / math.Sqrt(v)

	coef := func(label, pred string, k, row int) extract.Coefficient {
		return extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: row}, Study: "S", Label: label,
			Measure: extract.MeasureB, Outcome: "y", Predictor: pred, Group: "g", Model: "m", Estimate: exact(b.At(k, 0)),
			SE: exact(math.Sqrt(s2 * xtxInv.At(k, k))), CILevel: 95, N: exact(n)}
	}
	in := &extract.Input{
		Coefficients: []extract.Coefficient{coef("b1", "x1", 1, 2), coef("b2", "x2", 2, 3), coef("b3", "x3", 3, 4)},
		Claims:       []extract.Claim{claim("S", "c", 2, "b1", "b2", "differ", "test")},
		Tables:       []extract.CorrelationTable{corrTable("S", "g", vars, r, n, sds)},
	}
	rep := Audit(in, DefaultOptions)
	c := rep.Claims[0]
	if c.Method != "t-from-correlation-table" {
		t.Fatalf("method %s, notes %q", c.Method, c.Notes)
	}
	if relDiff(float64(c.Difference), wantD) > 1e-9 || relDiff(float64(c.Statistic), wantT) > 1e-9 || float64(c.DF) != n-4 {
		t.Errorf("rebuilt d %.12g t %.12g df %v; raw fit d %.12g t %.12g df %d", c.Difference, c.Statistic, c.DF, wantD, wantT, n-4)
	}
	if c.Outcome == Conflict {
		t.Errorf("printed coefficients equal to the raw fit were flagged as conflicting: %q", c.Notes)
	}
	// A printed coefficient that the table cannot give is a conflict.
	in.Coefficients[0].Estimate = exact(b.At(1, 0) + 0.5)
	if got := Audit(in, DefaultOptions).Claims[0].Outcome; got != Conflict {
		t.Errorf("coefficient 0.5 off the table's: outcome %s, want conflict", got)
	}
}

func relDiff(a, b float64) float64 { return math.Abs(a-b) / math.Max(math.Abs(b), 1e-300) }

func TestEstimateCorrAndAdmissible(t *testing.T) {
	// Hand computation: 0.31 (SE 0.07) vs 0.12 (SE 0.05), printed sampling
	// correlation 0.40: Var = 0.0049 + 0.0025 − 2·0.40·0.07·0.05 = 0.0046, SE 0.06782,
	// z = 0.19/0.06782 = 2.8014, p = 0.00509.
	c1 := coefficient("S", 2, coefSpec{label: "x", measure: "other", group: "all", est: "0.31", se: "0.07"})
	c2 := coefficient("S", 3, coefSpec{label: "y", measure: "other", group: "all", est: "0.12", se: "0.05"})
	cl := claim("S", "c", 2, "x", "y", "first-larger", "test")
	cl.EstimateCorr = printed("0.40")
	rep := Audit(&extract.Input{Coefficients: []extract.Coefficient{c1, c2}, Claims: []extract.Claim{cl}}, DefaultOptions)
	got := rep.Claims[0]
	if got.Method != "z-with-estimate-corr" || math.Abs(float64(got.DifferenceSE)-math.Sqrt(0.0046)) > 1e-12 ||
		math.Abs(float64(got.P)-0.00509) > 5e-5 || got.Outcome != Consistent {
		t.Errorf("estimate_corr: %s SE %v p %v outcome %s", got.Method, got.DifferenceSE, got.P, got.Outcome)
	}
	// The range over rounding is exact here (Var rises with each SE, as
	// 0.065 > 0.405·0.055 and 0.045 > 0.405·0.075): its ends are the corners
	// SE₁ 0.065, SE₂ 0.045, ρ 0.405 with d 0.18, and SE₁ 0.075, SE₂ 0.055,
	// ρ 0.395 with d 0.20 — hand computation below.
	vLo := 0.065*0.065 + 0.045*0.045 - 2*0.405*0.065*0.045
	vHi := 0.075*0.075 + 0.055*0.055 - 2*0.395*0.075*0.055
	wantLo := infer.NormalTwoSidedP(0.20 / math.Sqrt(vLo))
	wantHi := infer.NormalTwoSidedP(0.18 / math.Sqrt(vHi))
	if relDiff(float64(got.PRange[0]), wantLo) > 1e-9 || relDiff(float64(got.PRange[1]), wantHi) > 1e-9 {
		t.Errorf("p range %v, want [%v, %v]", got.PRange, wantLo, wantHi)
	}
}

func TestMultiplicityDecidesWhenAsked(t *testing.T) {
	// Three claims of one study with p about 0.03, 0.04 and 0.20 (SE 1, estimates
	// 2.17, 2.054 and 1.28 vs 0): Holm multiplies the smallest by 3, so 0.03 → 0.09 and
	// the first claim is no longer supported; without adjustment it is consistent.
	in := &extract.Input{}
	for i, e := range []string{"2.170", "2.054", "1.282"} {
		in.Coefficients = append(in.Coefficients,
			coefficient("S", 2+2*i, coefSpec{label: "a" + strconv.Itoa(i), measure: "other", group: "g" + strconv.Itoa(i), est: e, se: "1.000"}),
			coefficient("S", 3+2*i, coefSpec{label: "b" + strconv.Itoa(i), measure: "other", group: "h" + strconv.Itoa(i), est: "0.000", se: "0.001"}))
		in.Claims = append(in.Claims, claim("S", "c"+strconv.Itoa(i), 2+i, "a"+strconv.Itoa(i), "b"+strconv.Itoa(i), "differ", "test"))
	}
	raw := Audit(in, DefaultOptions)
	holm := Audit(in, Options{Adjust: AdjustHolm})
	if raw.Claims[0].Outcome != Consistent || holm.Claims[0].Outcome != Unsupported {
		t.Errorf("claim 0: raw %s (p %v), Holm %s (adjusted %v)", raw.Claims[0].Outcome, raw.Claims[0].P,
			holm.Claims[0].Outcome, holm.Claims[0].AdjustedP)
	}
	if q := float64(holm.Claims[0].AdjustedP.Holm); math.Abs(q-3*float64(raw.Claims[0].P)) > 1e-12 {
		t.Errorf("Holm-adjusted p %v, want 3 × %v", q, raw.Claims[0].P)
	}
}
