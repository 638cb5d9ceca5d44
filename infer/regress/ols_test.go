package regress

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

func TestOLSErrors(t *testing.T) {
	y := []float64{1, 3, 2, 5, 4, 6, 8, 7}
	x1 := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	x2 := []float64{2, 1, 4, 3, 6, 5, 8, 9}
	constant := []float64{3, 3, 3, 3, 3, 3, 3, 3}
	zero := make([]float64, 8)
	sum := make([]float64, 8) // x1 + 2 x2, exactly representable
	for i := range sum {
		sum[i] = x1[i] + 2*x2[i]
	}
	tests := []struct {
		name      string
		y         []float64
		x         [][]float64
		opts      Options
		want      error
		predictor int // for *PredictorError; −1 otherwise
	}{
		{"no predictors", y, nil, Options{}, ErrNoPredictors, -1},
		{"length mismatch", y, [][]float64{x1[:7]}, Options{}, ErrLengthMismatch, -1},
		{"NaN in predictor", y, [][]float64{{1, 2, math.NaN(), 4, 5, 6, 7, 8}}, Options{}, ErrNotFinite, -1},
		{"Inf in outcome", []float64{1, 2, math.Inf(1), 4, 5, 6, 7, 8}, [][]float64{x1}, Options{}, ErrNotFinite, -1},
		{"n equals parameters", y[:3], [][]float64{x1[:3], x2[:3]}, Options{}, ErrTooFewObservations, -1},
		{"constant outcome", constant, [][]float64{x1}, Options{}, ErrConstantOutcome, -1},
		{"constant second predictor", y, [][]float64{x1, constant}, Options{}, ErrConstantPredictor, 1},
		{"zero column without intercept", y, [][]float64{x1, zero}, Options{NoIntercept: true}, ErrConstantPredictor, 1},
		{"third predictor is x1 + 2 x2", y, [][]float64{x1, x2, sum}, Options{}, ErrCollinear, 2},
		{"duplicate predictor", y, [][]float64{x2, x1, x2}, Options{}, ErrCollinear, 2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := OLS(tt.y, tt.x, tt.opts)
			if !errors.Is(err, tt.want) {
				t.Fatalf("OLS() error = %v, want %v", err, tt.want)
			}
			var pe *PredictorError
			if tt.predictor >= 0 {
				if !errors.As(err, &pe) {
					t.Fatalf("OLS() error = %v, want a *PredictorError", err)
				}
				if pe.Index != tt.predictor {
					t.Errorf("OLS() names predictor %d, want %d", pe.Index, tt.predictor)
				}
			}
		})
	}
}

// A constant column in a model without intercept is the intercept: the two
// parametrizations must agree (internal consistency, no external value).
func TestOLSConstantColumnIsIntercept(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 5))
	y, x := simulate(rng, 40, []float64{0.4, 0.3}, 0.2, []float64{10, -3, 7}, []float64{2, 1, 5})
	ones := make([]float64, 40)
	for i := range ones {
		ones[i] = 1
	}
	a, err := OLS(y, x, Options{})
	if err != nil {
		t.Fatalf("OLS error: %v", err)
	}
	b, err := OLS(y, append([][]float64{ones}, x...), Options{NoIntercept: true})
	if err != nil {
		t.Fatalf("OLS(no intercept, column of ones) error: %v", err)
	}
	for j := range a.Coefficients {
		if relativeDifference(b.Coefficients[j], a.Coefficients[j]) > 1e-13 ||
			relativeDifference(b.StandardErrors[j], a.StandardErrors[j]) > 1e-13 {
			t.Errorf("coefficient %d: %.15g (SE %.15g) through the origin with ones, want %.15g (SE %.15g)",
				j, b.Coefficients[j], b.StandardErrors[j], a.Coefficients[j], a.StandardErrors[j])
		}
	}
	if a.ResidualDF != b.ResidualDF {
		t.Errorf("ResidualDF = %d and %d, want equal", a.ResidualDF, b.ResidualDF)
	}
}

// Off-diagonal covariances and differences of Longley coefficients, derived
// here in exact rational arithmetic from the NIST StRD Longley data, with
// Var(b_i − b_j) = Var(b_i) + Var(b_j) − 2 Cov(b_i, b_j); not published values
// (NIST StRD certifies only the diagonal, as the SEs). Indices as in the NIST
// file.
func TestOLSLongleyDifferences(t *testing.T) {
	y, x := longley(t)
	fit, err := OLS(y, x, Options{})
	if err != nil {
		t.Fatalf("OLS(Longley) error: %v", err)
	}
	tests := []struct {
		name               string
		i, j               int
		cov, diff, se, tst float64
		seNoCov            float64
	}{
		{"b4 − b5", 4, 5, -0.009151328949, -0.9821227615, 0.3395955929, -2.892036, 0.3114843636},
		{"b2 − b5", 2, 5, -0.006308550135, 0.01528492636, 0.2546523899, 0.060023, 0.2285404546},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			// 10 significant digits printed; t to 7.
			if got := fit.Covariance.At(tt.i, tt.j); relativeDifference(got, tt.cov) > 1e-9 {
				t.Errorf("Cov(b%d, b%d) = %.12g, want %.10g", tt.i, tt.j, got, tt.cov)
			}
			res, err := TestDifference(fit.Coefficients, fit.Covariance, tt.i, tt.j, float64(fit.ResidualDF), 0.95)
			if err != nil {
				t.Fatalf("TestDifference error: %v", err)
			}
			if relativeDifference(res.Estimate, tt.diff) > 1e-9 || relativeDifference(res.SE, tt.se) > 1e-9 ||
				relativeDifference(res.Statistic, tt.tst) > 1e-5 {
				t.Errorf("TestDifference(%s) = (%.10g, SE %.10g, t %.7g), want (%.10g, SE %.10g, t %.7g)",
					tt.name, res.Estimate, res.SE, res.Statistic, tt.diff, tt.se, tt.tst)
			}
			noCov := math.Sqrt(fit.Covariance.At(tt.i, tt.i) + fit.Covariance.At(tt.j, tt.j))
			if relativeDifference(noCov, tt.seNoCov) > 1e-9 {
				t.Errorf("SE ignoring the covariance = %.10g, want %.10g", noCov, tt.seNoCov)
			}
		})
	}
}

// DiCiccio TJ, Efron B (1996). Bootstrap confidence intervals. Statistical
// Science 11(3):189–228, cd4 data, 20 subjects (baseline, one year); data
// transcription SECONDARY, as quoted at stats.stackexchange.com/questions/109861.
// With one predictor the standardized slope is the correlation: published
// θ̂ = 0.723; r = 0.7231654 is derived here from the 20 pairs, not a
// published value.
func TestOLSStandardizedSlopeIsCorrelation(t *testing.T) {
	baseline := []float64{2.12, 4.35, 3.39, 2.51, 4.04, 5.10, 3.77, 3.35, 4.10, 3.35,
		4.15, 3.56, 3.39, 1.88, 2.56, 2.96, 2.49, 3.03, 2.66, 3.00}
	oneYear := []float64{2.47, 4.61, 5.26, 3.02, 6.36, 5.93, 3.93, 4.09, 4.88, 3.81,
		4.74, 3.29, 5.55, 2.82, 4.23, 3.23, 2.56, 4.31, 4.37, 2.40}
	fit, err := OLS(oneYear, [][]float64{baseline}, Options{})
	if err != nil {
		t.Fatalf("OLS(cd4) error: %v", err)
	}
	if got := fit.Standardized[0]; math.Abs(got-0.7231654) > 5e-8 || math.Abs(got-0.723) > 5e-4 {
		t.Errorf("OLS(cd4) standardized slope = %.8f, want 0.7231654 (published 0.723)", got)
	}
}
