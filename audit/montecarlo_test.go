package audit

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"coefaudit/extract"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// paperSim simulates papers that each report one regression of y on three
// correlated predictors, y = .3 x1 + .3 x2 + .2 x3 + e with unit-variance
// predictors, corr(x1,x2) = .3 and corr(x1,x3) = corr(x2,x3) = .2: the
// population standardized coefficients of x1 and x2 are equal, so the
// claim "x1's effect is the larger" is a true null. Each paper prints as
// papers do: the standardized coefficients to two decimals (with their
// 95% intervals when withCI), the correlation table to two decimals, n.
type paperSim struct {
	n      int
	withCI bool
	table  bool
}

// input builds the papers' workbook: one study per paper, its claim
// "first-larger" or "second-larger" by a coin, as a paper would claim a
// direction whatever the truth.
func (s paperSim) input(rng *rand.Rand, papers int) *extract.Input {
	in := &extract.Input{}
	vars := []string{"y", "x1", "x2", "x3"}
	data := mat.NewDense(s.n, 4, nil)
	for k := range papers {
		study := "paper " + strconv.Itoa(k+1)
		for i := range s.n {
			z12, z3 := rng.NormFloat64(), rng.NormFloat64()
			// x1, x2 share √.3 of a common factor (corr .3); x3 correlates .2 with
			// each through the same factor: .2 = √.3·a with a = .2/√.3.
			a := 0.2 / math.Sqrt(0.3)
			x1 := math.Sqrt(0.3)*z12 + math.Sqrt(0.7)*rng.NormFloat64()
			x2 := math.Sqrt(0.3)*z12 + math.Sqrt(0.7)*rng.NormFloat64()
			x3 := a*z12 + math.Sqrt(1-a*a)*z3
			y := 0.3*x1 + 0.3*x2 + 0.2*x3 + rng.NormFloat64()
			data.SetRow(i, []float64{y, x1, x2, x3})
		}
		var r mat.SymDense
		stat.CorrelationMatrix(&r, data, nil)
		// Sample standardized coefficients: Rxx β = r_xy.
		rxx := mat.NewSymDense(3, nil)
		rxy := mat.NewVecDense(3, nil)
		for i := range 3 {
			rxy.SetVec(i, r.At(0, i+1))
			for j := i; j < 3; j++ {
				rxx.SetSym(i, j, r.At(i+1, j+1))
			}
		}
		var beta mat.VecDense
		var inv mat.Dense
		if err := inv.Inverse(rxx); err != nil {
			panic(err)
		}
		beta.MulVec(&inv, rxy)
		r2 := mat.Dot(&beta, rxy)
		for j := range 3 {
			c := extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: 2 + 3*k + j},
				Study: study, Label: vars[j+1], Measure: extract.MeasureBeta, Outcome: "y", Predictor: vars[j+1],
				Model: "m", Estimate: mustParse(fmt.Sprintf("%.2f", beta.AtVec(j))), CILevel: 95, N: mustParse(strconv.Itoa(s.n))}
			if s.withCI {
				// The classical SE of a standardized coefficient (Cohen et al.
				// 2003, eq. 3.6.1; from memory): √((1 − R²)/(n − k − 1) · P_jj), P = Rxx⁻¹.
				se := math.Sqrt((1 - r2) / float64(s.n-4) * inv.At(j, j))
				c.CI = extract.Interval{Low: mustParse(fmt.Sprintf("%.2f", beta.AtVec(j)-1.96*se)),
					High: mustParse(fmt.Sprintf("%.2f", beta.AtVec(j)+1.96*se))}
			}
			in.Coefficients = append(in.Coefficients, c)
		}
		published := extract.PublishedFirstLarger
		if rng.IntN(2) == 0 {
			published = extract.PublishedSecondLarger
		}
		in.Claims = append(in.Claims, claim(study, "c", 2+k, "x1", "x2", published, "unstated"))
		if s.table {
			t := extract.CorrelationTable{Position: extract.Position{Sheet: "table " + study}, Name: study, Study: study, Variables: vars}
			for i := range 4 {
				row := make([]extract.Printed, 4)
				for j := range 4 {
					row[j] = mustParse(fmt.Sprintf("%.2f", r.At(i, j)))
				}
				t.R = append(t.R, row)
				t.N = append(t.N, mustParse(strconv.Itoa(s.n)))
				t.SD, t.Mean = append(t.SD, extract.Printed{}), append(t.Mean, extract.Printed{})
			}
			in.Tables = append(in.Tables, t)
		}
	}
	return in
}

func mustParse(s string) extract.Printed {
	p, err := extract.ParseNumber(s)
	if err != nil {
		panic(err)
	}
	return p
}

// rates audits the papers and returns the share whose test shows a
// difference (p < α at the printed values), the share called reversed,
// and the share decided significant by the bounds of p alone.
func rates(t *testing.T, in *extract.Input) (differ, reversed, boundSig float64, method string) {
	t.Helper()
	rep := Audit(in, DefaultOptions)
	n := float64(len(rep.Claims))
	for _, c := range rep.Claims {
		method = c.Method
		if c.P.Known() && float64(c.P) < c.Alpha {
			differ++
		}
		if c.Outcome == Reversed {
			reversed++
		}
		if float64(c.PRange[1]) < c.Alpha {
			boundSig++
		}
	}
	return differ / n, reversed / n, boundSig / n, method
}

// band is the upper limit of a binomial rate p over m trials at 3.3 SDs
// (two-sided 0.001), the tolerance of these checks.
func band(p float64, m int) float64 { return 3.3 * math.Sqrt(p*(1-p)/float64(m)) }

// TestIssue17MonteCarloNull: papers simulated under a true null, as
// described on paperSim. With the table the delta-method z test's rate of
// "differ" is within a binomial band of α at n = 1000 (its rate at n = 100
// is logged); reversed stays at or below α/2 (one tail of the test; it
// was about half the claims when an opposite point estimate was called
// reversed); with no table, the admissible range calls no more than α of
// the claims significant by its bounds. Fixed seeds.
func TestIssue17MonteCarloNull(t *testing.T) {
	const papers, alpha = 600, 0.05
	rng := rand.New(rand.NewPCG(17, 2026))
	for _, s := range []paperSim{{n: 1000, withCI: false, table: true}, {n: 1000, withCI: true, table: true}} {
		differ, reversed, _, method := rates(t, s.input(rng, papers))
		if method != "z-delta-from-correlation-table" {
			t.Fatalf("%+v: method %q", s, method)
		}
		t.Logf("n = %d, CIs %v, table: differ %.3f, reversed %.3f", s.n, s.withCI, differ, reversed)
		if math.Abs(differ-alpha) > band(alpha, papers) {
			t.Errorf("%+v: rate of differ %.3f, want %.2f ± %.3f", s, differ, alpha, band(alpha, papers))
		}
		if reversed > alpha/2+band(alpha/2, papers) {
			t.Errorf("%+v: rate of reversed %.3f, want at most %.3f + %.3f", s, reversed, alpha/2, band(alpha/2, papers))
		}
	}
	differ, reversed, _, _ := rates(t, paperSim{n: 100, table: true}.input(rng, papers))
	t.Logf("n = 100, table: differ %.3f, reversed %.3f (the delta method is anticonservative at small n)", differ, reversed)

	_, _, boundSig, method := rates(t, paperSim{n: 1000, withCI: true}.input(rng, papers))
	if method != "admissible-range" {
		t.Fatalf("no table: method %q", method)
	}
	t.Logf("n = 1000, CIs, no table: significant by the bounds %.3f", boundSig)
	if boundSig > alpha+band(alpha, papers) {
		t.Errorf("no table: significant by the bounds %.3f, want at most %.2f", boundSig, alpha)
	}
}
