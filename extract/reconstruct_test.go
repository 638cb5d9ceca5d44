package extract

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// num builds an exact printed number for these tests: the value and its
// count of decimals as written.
func num(s string) Printed {
	if s == "" {
		return Printed{}
	}
	dec := 0
	if i := strings.IndexByte(s, '.'); i >= 0 {
		dec = len(s) - i - 1
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		panic(err)
	}
	return Printed{Value: v, Decimals: int32(dec), Bound: Exact, Text: s}
}

func TestReconstructSources(t *testing.T) {
	tests := []struct {
		name       string
		c          Coefficient
		modelSize  int
		wantSE     float64
		tol        float64 // relative
		wantFrom   string
		wantScale  string
		wantDF     float64 // NaN for the normal
		wantInNote string
	}{
		// Woodward (2019) Heart 105:1701, Table 4: women RR 2.15 (1.33 to 3.47): "The two
		// equations for SE give the results 0.244228 and 0.245045, which average out to
		// 0.244637" (computed there with 1.96; we use 1.959964). The two halves differ by
		// less than the rounding of 2.15 and 1.33 explains, so no asymmetry is noted.
		{"Woodward 2019 ratio interval",
			Coefficient{Label: "women", Measure: MeasureRR, Estimate: num("2.15"), CI: Interval{Low: num("1.33"), High: num("3.47")}},
			0, 0.244637, 3e-5, "ci_low, ci_high (normal)", ScaleLog, math.NaN(), ""},
		// Constructed: 0.30 (0.05, 0.45) has halves 0.25 and 0.15, beyond any rounding;
		// the SE is the mean, 0.40/3.919928, and the halves give 0.25/1.959964 and 0.15/1.959964.
		{"asymmetric interval",
			Coefficient{Label: "boot", Measure: MeasureB, Estimate: num("0.30"), CI: Interval{Low: num("0.05"), High: num("0.45")}},
			0, 0.40 / 3.919928, 1e-6, "ci_low, ci_high, mean of the two half-widths (normal)", ScaleAsPrinted, math.NaN(),
			"boot: asymmetric interval (SE 0.1276 from the lower half, 0.07653 from the upper); the SE is their mean"},
		// Altman & Bland (2011) BMJ 343:d2090: "P=0.032", Est 17, SE 7.940 via the note's
		// polynomial; the exact normal quantile gives 17/2.1444 (PUBLISHED-VALUES §1.1).
		{"Altman Bland 2011 from p",
			Coefficient{Label: "zinc", Measure: MeasureMD, Estimate: num("17"), P: num("0.032")},
			0, 7.940, 0.002, "estimate, p (normal)", ScaleAsPrinted, math.NaN(), ""},
		// Cochrane Handbook 5.1 §7.7.3.3 (SECONDARY): groups of 25 and 22, so t with 45 df;
		// P = 0.008 and 3.8 give SE 1.37. Here df is derived from n = 47 as n − 2.
		{"Cochrane df from n for a mean difference",
			Coefficient{Label: "md", Measure: MeasureMD, Estimate: num("3.8"), P: num("0.008"), N: num("47")},
			0, 1.37, 0.005, "estimate, p (t, df 45)", ScaleAsPrinted, 45, "n − 2"},
		// NIST Longley (certified B6 = 1829.15146461355, SE 455.478499142212, df 9 = 16 − 6 − 1):
		// the t interval DERIVED in PUBLISHED-VALUES §1.4 gives back the SE when df is derived
		// from n = 16 and the 6 listed coefficients of the model.
		{"Longley df from n and model size",
			Coefficient{Label: "B6", Measure: MeasureB, Estimate: num("1829.15146461355"), CI: Interval{Low: num("798.7875153"), High: num("2859.515414")}, N: num("16")},
			6, 455.478499142212, 1e-8, "ci_low, ci_high (t, df 9)", ScaleAsPrinted, 9, "n − k − 1"},
		// Fisher (1921): the SE of atanh(r) is 1/√(n − 3): n = 103 gives 0.1.
		{"correlation on the Fisher z scale",
			Coefficient{Label: "r", Measure: MeasureR, Estimate: num("0.40"), N: num("103")},
			0, 0.1, 1e-15, "n (Fisher z)", ScaleFisherZ, math.NaN(), ""},
		// The same interval printed in one ci cell names that cell.
		{"interval in one cell",
			Coefficient{Label: "b", Measure: MeasureB, Estimate: num("0.42"), CI: Interval{Low: num("0.30"), High: num("0.54"), OneCell: true}},
			0, 0.24 / 3.919928, 1e-6, "ci (normal)", ScaleAsPrinted, math.NaN(), ""},
		{"printed SE",
			Coefficient{Label: "b", Measure: MeasureB, Estimate: num("0.31"), SE: num("0.07")},
			0, 0.07, 0, "se", ScaleAsPrinted, math.NaN(), ""},
		// SE = estimate/t = 0.50/2.50.
		{"statistic",
			Coefficient{Label: "b", Measure: MeasureB, Estimate: num("0.50"), Stat: num("2.50")},
			0, 0.2, 1e-12, "estimate, stat", ScaleAsPrinted, math.NaN(), ""},
		// Standard normal table: the two-sided 0.001 point is 3.2905.
		{"p bound gives the largest SE",
			Coefficient{Label: "b", Measure: MeasureB, Estimate: num("0.25"), P: Printed{Value: 0.001, Decimals: 3, Bound: Below, Text: "p < .001"}},
			0, 0.25 / 3.2905, 2e-5, "estimate, p bound (normal)", ScaleAsPrinted, math.NaN(), "largest"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tt.c.CILevel = 95
			rc, err := Reconstruct(&tt.c, tt.modelSize)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(rc.SE-tt.wantSE) > tt.tol*tt.wantSE+1e-15 {
				t.Errorf("SE = %.7g, want %.7g", rc.SE, tt.wantSE)
			}
			if rc.SEFrom != tt.wantFrom || rc.Scale != tt.wantScale {
				t.Errorf("SEFrom %q scale %q, want %q %q", rc.SEFrom, rc.Scale, tt.wantFrom, tt.wantScale)
			}
			if !(math.IsNaN(tt.wantDF) && math.IsNaN(rc.DF)) && rc.DF != tt.wantDF {
				t.Errorf("DF = %v, want %v", rc.DF, tt.wantDF)
			}
			if tt.wantInNote != "" && !strings.Contains(strings.Join(rc.Notes, " "), tt.wantInNote) {
				t.Errorf("notes %q lack %q", rc.Notes, tt.wantInNote)
			}
			if !(rc.SERange.Lo <= rc.SE && rc.SE <= rc.SERange.Hi) || !(rc.EstimateRange.Lo <= rc.Estimate && rc.Estimate <= rc.EstimateRange.Hi) {
				t.Errorf("point outside its rounding range: SE %v in %v, estimate %v in %v", rc.SE, rc.SERange, rc.Estimate, rc.EstimateRange)
			}
		})
	}
}

func TestReconstructRoundingRanges(t *testing.T) {
	// Hand computation: 0.5 (0.3, 0.7) printed to one decimal. The limits lie in
	// [0.25, 0.35] and [0.65, 0.75], so the width lies in [0.30, 0.50] and the SE in
	// [0.30, 0.50]/3.919928 = [0.07653, 0.12755]; the estimate in [0.45, 0.55]. The
	// half-widths at the printed values (0.2/1.96 each) lie inside.
	c := Coefficient{Label: "x", Measure: MeasureBeta, Estimate: num("0.5"), CI: Interval{Low: num("0.3"), High: num("0.7")}, CILevel: 95}
	rc, err := Reconstruct(&c, 0)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(rc.SERange.Lo-0.30/3.919928) > 1e-6 || math.Abs(rc.SERange.Hi-0.50/3.919928) > 1e-6 {
		t.Errorf("SE range %v, want [0.07653, 0.12755]", rc.SERange)
	}
	if math.Abs(rc.EstimateRange.Lo-0.45) > 1e-12 || math.Abs(rc.EstimateRange.Hi-0.55) > 1e-12 {
		t.Errorf("estimate range %v, want [0.45, 0.55]", rc.EstimateRange)
	}
	// The asymmetric 0.30 (0.05, 0.45): halves 0.25/1.959964 = 0.12755 and
	// 0.15/1.959964 = 0.07653 widen the range beyond the rounding of the width.
	c = Coefficient{Label: "boot", Measure: MeasureB, Estimate: num("0.30"), CI: Interval{Low: num("0.05"), High: num("0.45")}, CILevel: 95}
	rc, _ = Reconstruct(&c, 0)
	if rc.SERange.Lo > 0.15/1.959964+1e-9 || rc.SERange.Hi < 0.25/1.959964-1e-9 {
		t.Errorf("asymmetric SE range %v does not cover both half-widths [0.07653, 0.12755]", rc.SERange)
	}
}

func TestReconstructFailures(t *testing.T) {
	tests := []struct {
		name string
		c    Coefficient
		want string
	}{
		{"nothing but the estimate", Coefficient{Label: "x", Measure: MeasureB, Estimate: num("0.2")}, "no SE, interval"},
		{"ns only", Coefficient{Label: "x", Measure: MeasureB, Estimate: num("0.2"), P: Printed{Bound: NotSignificant, Text: "ns", Decimals: -1}}, `"ns"`},
		{"no estimate", Coefficient{Label: "x", Measure: MeasureB, SE: num("0.1")}, "no estimate"},
		{"ratio of zero", Coefficient{Label: "x", Measure: MeasureOR, Estimate: num("0"), SE: num("0.1")}, "log scale"},
		{"zero estimate with a statistic", Coefficient{Label: "x", Measure: MeasureB, Estimate: num("-0.00"), Stat: num("-0.04")}, "printed as -0.00, so estimate/statistic gives an SE of 0"},
		{"ratio of one with a statistic", Coefficient{Label: "x", Measure: MeasureOR, Estimate: num("1.00"), Stat: num("0.3")}, "1.00, 0 on the log scale"},
		{"zero estimate with a p", Coefficient{Label: "x", Measure: MeasureB, Estimate: num("0.00"), P: num("0.97")}, "fixes no scale"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Reconstruct(&tt.c, 0)
			if err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("Reconstruct error = %v, want one containing %q", err, tt.want)
			}
		})
	}
}

// SEFrom is built with strconv, not fmt; it must be the very string
// fmt.Sprintf("%s (t, df %g)", …) gives, as the Go standard library's fmt
// documents %g for a float64: the shortest representation, %e for large
// exponents, %f otherwise, which is strconv.FormatFloat(x, 'g', -1, 64).
func TestNamedQuantileMatchesFmt(t *testing.T) {
	dfs := []float64{1e21, 0.5, 568, 1e-7, 1e20, 1e-4, 1e-5, 1e5, 1e6, 123456789, 1.5, 45.5, 0.1 + 0.2,
		math.MaxFloat64, math.SmallestNonzeroFloat64, math.Inf(1), math.Inf(-1), 0, math.Copysign(0, -1), 1, 9, 24, 99.75}
	rng := rand.New(rand.NewPCG(3, 5))
	for range 20000 {
		if x := math.Float64frombits(rng.Uint64()); !math.IsNaN(x) {
			dfs = append(dfs, x)
		}
		dfs = append(dfs, float64(1+rng.IntN(10_000_000)), float64(rng.IntN(100_000))/float64([]int{1, 10, 100, 1000}[rng.IntN(4)]))
	}
	whats := []string{"ci_low, ci_high", "ci", "estimate, p", "estimate, p bound",
		"ci_low, ci_high, mean of the two half-widths", "ci, mean of the two half-widths"}
	// Whole df up to maxNamedDF are named from a slot once made: each is
	// asked for twice, the second time from the slot.
	dfs = append(dfs, 1, 2, 30, 30, maxNamedDF, maxNamedDF, maxNamedDF+1, maxNamedDF+1)
	for _, df := range dfs {
		if got, want := strconv.FormatFloat(df, 'g', -1, 64), fmt.Sprintf("%g", df); got != want {
			t.Fatalf("strconv.FormatFloat(%v, 'g', -1, 64) = %q, want fmt's %%g %q", df, got, want)
		}
		for _, what := range whats {
			if got, want := namedQuantile(what, df), fmt.Sprintf("%s (t, df %g)", what, df); got != want {
				t.Fatalf("namedQuantile(%q, %v) = %q, want %q", what, df, got, want)
			}
		}
	}
	for _, what := range append(whats, "other") {
		if got, want := namedQuantile(what, math.NaN()), fmt.Sprintf("%s (%s)", what, "normal"); got != want {
			t.Errorf("namedQuantile(%q, NaN) = %q, want %q", what, got, want)
		}
	}
}

// Reconstruct's SEFrom, through every path that names a quantile, against
// the strings as fmt built them before: "%s (%s)" of the source and
// "normal" or "t, df %g".
func TestReconstructSEFromAsFormatted(t *testing.T) {
	withDF := func(c Coefficient, df string) Coefficient {
		if df != "" {
			c.DF = num(df)
		}
		return c
	}
	type source struct {
		name string
		c    Coefficient
		from string // the source as fmt was given it
	}
	// Constructed values: 0.50 (0.30, 0.70) is symmetric, 0.30 (0.05,
	// 0.45) is not beyond any rounding (see TestReconstructSources).
	sources := []source{
		{"interval", Coefficient{Label: "x", Measure: MeasureB, Estimate: num("0.50"), CI: Interval{Low: num("0.30"), High: num("0.70")}}, "ci_low, ci_high"},
		{"one cell", Coefficient{Label: "x", Measure: MeasureB, Estimate: num("0.50"), CI: Interval{Low: num("0.30"), High: num("0.70"), OneCell: true}}, "ci"},
		{"asymmetric", Coefficient{Label: "x", Measure: MeasureB, Estimate: num("0.30"), CI: Interval{Low: num("0.05"), High: num("0.45")}}, "ci_low, ci_high, mean of the two half-widths"},
		{"asymmetric one cell", Coefficient{Label: "x", Measure: MeasureMD, Estimate: num("0.30"), CI: Interval{Low: num("0.05"), High: num("0.45"), OneCell: true}}, "ci, mean of the two half-widths"},
		{"p", Coefficient{Label: "x", Measure: MeasureMD, Estimate: num("17"), P: num("0.032")}, "estimate, p"},
		{"p bound", Coefficient{Label: "x", Measure: MeasureB, Estimate: num("0.25"), P: Printed{Value: 0.001, Decimals: 3, Bound: Below, Text: "p < .001"}}, "estimate, p bound"},
	}
	dfs := []string{"", "1", "9", "24", "45.5", "568", "99.75", "1000", "123456", "1000000", "2.5"}
	ns := []string{"", "16", "47", "570", "1000003"}
	for _, s := range sources {
		for _, df := range dfs {
			for _, n := range ns {
				c := withDF(s.c, df)
				if n != "" {
					c.N = num(n)
				}
				c.CILevel = 95
				rc, err := Reconstruct(&c, 3)
				if err != nil {
					t.Fatalf("%s, df %q, n %q: %v", s.name, df, n, err)
				}
				tName := "normal"
				if !math.IsNaN(rc.DF) {
					tName = fmt.Sprintf("t, df %g", rc.DF)
				}
				if want := fmt.Sprintf("%s (%s)", s.from, tName); rc.SEFrom != want {
					t.Errorf("%s, df %q, n %q: SEFrom = %q, want %q", s.name, df, n, rc.SEFrom, want)
				}
			}
		}
	}
}
