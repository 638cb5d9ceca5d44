package regress

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// simulate draws n rows of p predictors with pairwise correlation rho and
// y = Σ b_j x_j + σ e, σ² = 1 − bᵀ Rxx b (so Var y = 1), with a location
// and scale per variable so that the unstandardized results are not
// trivially the standardized ones. Truth set here, not taken from anywhere.
func simulate(rng *rand.Rand, n int, b []float64, rho float64, loc, scale []float64) ([]float64, [][]float64) {
	p := len(b)
	r2 := 0.0
	for i := range b {
		for j := range b {
			c := rho
			if i == j {
				c = 1
			}
			r2 += b[i] * b[j] * c
		}
	}
	sigma := math.Sqrt(1 - r2)
	y := make([]float64, n)
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
	}
	for i := 0; i < n; i++ {
		f := rng.NormFloat64()
		for j := 0; j < p; j++ {
			x[j][i] = math.Sqrt(rho)*f + math.Sqrt(1-rho)*rng.NormFloat64()
			y[i] += b[j] * x[j][i]
		}
		y[i] += sigma * rng.NormFloat64()
	}
	if loc != nil {
		for i := range y {
			y[i] = loc[0] + scale[0]*y[i]
			for j := 0; j < p; j++ {
				x[j][i] = loc[j+1] + scale[j+1]*x[j][i]
			}
		}
	}
	return y, x
}

func relativeDifference(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

// TestFromSummaryMatchesRawOLS: the regression rebuilt from the unrounded
// correlation matrix, SDs and means of simulated data must reproduce the
// raw-data OLS fit (an algebraic identity, so only rounding separates them).
func TestFromSummaryMatchesRawOLS(t *testing.T) {
	tests := []struct {
		name  string
		seed  uint64
		n     int
		b     []float64
		rho   float64
		means bool
		tol   float64
	}{
		{"three predictors with means", 1, 60, []float64{0.5, -0.3, 0.2}, 0.3, true, 1e-10},
		{"five predictors, standardized SDs only", 2, 500, []float64{0.1, 0.2, -0.4, 0.3, 0.05}, 0.6, false, 1e-10},
		{"one predictor small n", 3, 5, []float64{0.7}, 0, true, 1e-10},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(tt.seed, 99))
			p := len(tt.b)
			loc, scale := make([]float64, p+1), make([]float64, p+1)
			for j := range loc {
				loc[j], scale[j] = 100*float64(j)-30, 0.5+3*float64(j)
			}
			y, x := simulate(rng, tt.n, tt.b, tt.rho, loc, scale)
			raw, err := OLS(y, x, Options{})
			if err != nil {
				t.Fatalf("OLS error: %v", err)
			}
			s, err := SummarizeData(y, x)
			if err != nil {
				t.Fatalf("SummarizeData error: %v", err)
			}
			if !tt.means {
				s.Means = nil
			}
			sum, err := FromSummary(s)
			if err != nil {
				t.Fatalf("FromSummary error: %v", err)
			}
			check := func(what string, got, want float64) {
				t.Helper()
				if d := relativeDifference(got, want); d > tt.tol {
					t.Errorf("FromSummary %s = %.15g, want %.15g (raw OLS; relative difference %.2g)", what, got, want, d)
				}
			}
			check("R²", sum.RSquared, raw.RSquared)
			check("residual SD", sum.ResidualSD, raw.ResidualSD)
			if sum.ResidualDF != raw.ResidualDF {
				t.Errorf("FromSummary ResidualDF = %d, want %d", sum.ResidualDF, raw.ResidualDF)
			}
			for j := 0; j < p; j++ {
				check("β", sum.Standardized[j], raw.Standardized[j])
				check("standard-method SE(β)", sum.StandardizedSE[j], raw.StandardizedSE[j])
				i := raw.SlopeIndex(j)
				check("b", sum.Coefficients[sum.SlopeIndex(j)], raw.Coefficients[i])
				check("SE(b)", sum.StandardErrors[sum.SlopeIndex(j)], raw.StandardErrors[i])
				for k := 0; k < p; k++ {
					check("Cov(b)", sum.Covariance.At(sum.SlopeIndex(j), sum.SlopeIndex(k)), raw.Covariance.At(i, raw.SlopeIndex(k)))
				}
			}
			if tt.means {
				check("intercept", sum.Coefficients[0], raw.Coefficients[0])
				for j := 0; j < len(raw.Coefficients); j++ {
					check("Cov(b0, ·)", sum.Covariance.At(0, j), raw.Covariance.At(0, j))
				}
			} else if sum.Intercept || len(sum.Coefficients) != p {
				t.Errorf("FromSummary without means: Intercept %v, %d coefficients, want false, %d", sum.Intercept, len(sum.Coefficients), p)
			}
		})
	}
}

// Standardized coefficients of NIST Longley: derived here from the NIST
// StRD Longley certified coefficients and SEs as β = b·s_x/s_y and the
// "standard method" SE(β) = SE(b)·s_x/s_y (Cohen, Cohen, West & Aiken 2003,
// p. 86, as named by Jones JA, Waller NG (2013). Computing confidence
// intervals for standardized regression coefficients. Psychological Methods
// 18(4):435–453, volume and pages from memory), with s_x and s_y the sample
// SDs of the NIST StRD Longley data (s_y = 3511.968355969816, computed here
// from the data); the SEs were cross-checked against
// √[(1 − R²)/((N − p − 1)(1 − R²_j))] (formula from memory), agreeing to
// all digits shown. Not published values: NIST certifies no standardized
// coefficients.
func TestLongleyStandardized(t *testing.T) {
	y, x := longley(t)
	beta := []float64{0.04628202, -1.01374635, -0.53754258, -0.20474069, -0.10122111, 2.47966438}
	se := []float64{0.26092603, 0.94785496, 0.12995335, 0.04245983, 0.44777970, 0.61746325}
	const sy = 3511.968355969816

	raw, err := OLS(y, x, Options{})
	if err != nil {
		t.Fatalf("OLS(Longley) error: %v", err)
	}
	s, err := SummarizeData(y, x)
	if err != nil {
		t.Fatalf("SummarizeData(Longley) error: %v", err)
	}
	sum, err := FromSummary(s)
	if err != nil {
		t.Fatalf("FromSummary(Longley) error: %v", err)
	}
	if relativeDifference(s.SDs[0], sy) > 1e-13 {
		t.Errorf("SummarizeData(Longley) s_y = %.16g, want %.16g", s.SDs[0], sy)
	}
	for j := range beta {
		// Eight decimals printed: half a unit in the last place.
		const tol = 5e-9 + 1e-12
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"OLS β", raw.Standardized[j], beta[j]},
			{"OLS standard-method SE(β)", raw.StandardizedSE[j], se[j]},
			{"FromSummary β", sum.Standardized[j], beta[j]},
			{"FromSummary standard-method SE(β)", sum.StandardizedSE[j], se[j]},
		} {
			if math.Abs(c.got-c.want) > tol {
				t.Errorf("Longley %s x%d = %.10f, want %.8f", c.what, j+1, c.got, c.want)
			}
		}
	}
}

// TestFromSummaryErrors: validation of the correlation matrix and the
// other inputs.
func TestFromSummaryErrors(t *testing.T) {
	three := func(r12, r13, r23 float64) *mat.Dense {
		return mat.NewDense(3, 3, []float64{1, r12, r13, r12, 1, r23, r13, r23, 1})
	}
	asym := three(0.3, 0.2, 0.1)
	asym.Set(0, 1, 0.31)
	diag := three(0.3, 0.2, 0.1)
	diag.Set(2, 2, 0.99)
	tests := []struct {
		name string
		s    Summary
		want error
	}{
		{"not symmetric", Summary{Correlation: asym, N: 50}, ErrNotCorrelationMatrix},
		{"diagonal not 1", Summary{Correlation: diag, N: 50}, ErrNotCorrelationMatrix},
		{"entry above 1", Summary{Correlation: three(1.2, 0.2, 0.1), N: 50}, ErrNotCorrelationMatrix},
		{"not square", Summary{Correlation: mat.NewDense(2, 3, nil), N: 50}, ErrNotCorrelationMatrix},
		{"NaN entry", Summary{Correlation: three(math.NaN(), 0.2, 0.1), N: 50}, ErrNotCorrelationMatrix},
		{"not positive definite", Summary{Correlation: three(-0.6, -0.6, -0.6), N: 50}, ErrNotPositiveDefinite},
		{"n = p + 1", Summary{Correlation: three(0.3, 0.2, 0.1), N: 3}, ErrTooFewObservations},
		{"SDs wrong length", Summary{Correlation: three(0.3, 0.2, 0.1), N: 50, SDs: []float64{1, 2}}, ErrBadSummary},
		{"SD zero", Summary{Correlation: three(0.3, 0.2, 0.1), N: 50, SDs: []float64{1, 0, 2}}, ErrBadSummary},
		{"means without SDs", Summary{Correlation: three(0.3, 0.2, 0.1), N: 50, Means: []float64{1, 2, 3}}, ErrBadSummary},
		{"nearly collinear predictors", Summary{Correlation: three(0.5, 0.5, 1-1e-13), N: 50}, ErrCollinear},
		{"no predictors", Summary{Correlation: mat.NewDense(1, 1, []float64{1}), N: 50}, ErrNoPredictors},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := FromSummary(tt.s)
			if !errors.Is(err, tt.want) {
				t.Fatalf("FromSummary() error = %v, want %v", err, tt.want)
			}
		})
	}
}

// The equicorrelation matrix (1 − r)I + r 11ᵀ of size q has eigenvalues
// 1 + (q − 1)r and 1 − r (closed form); with q = 3 and r = −0.6 the smallest
// is 1 − 1.2 = −0.2.
func TestNotPositiveDefiniteEigenvalue(t *testing.T) {
	r := mat.NewSymDense(3, []float64{1, -0.6, -0.6, -0.6, 1, -0.6, -0.6, -0.6, 1})
	_, err := FromSummary(Summary{Correlation: r, N: 40})
	var npd *NotPositiveDefiniteError
	if !errors.As(err, &npd) {
		t.Fatalf("FromSummary(equicorrelation −0.6) error = %v, want *NotPositiveDefiniteError", err)
	}
	if math.Abs(npd.MinEigenvalue-(-0.2)) > 1e-12 {
		t.Errorf("FromSummary(equicorrelation −0.6) MinEigenvalue = %v, want −0.2", npd.MinEigenvalue)
	}
}

// TestCollinearNamesPredictor: with x2 ≈ x1 the second predictor is the
// one explained by the one before it.
func TestCollinearNamesPredictor(t *testing.T) {
	r := mat.NewSymDense(4, []float64{
		1, 0.4, 0.5, 0.5,
		0.4, 1, 0.2, 0.2,
		0.5, 0.2, 1, 1 - 1e-13,
		0.5, 0.2, 1 - 1e-13, 1,
	})
	_, err := FromSummary(Summary{Correlation: r, N: 100})
	var pe *PredictorError
	if !errors.As(err, &pe) || !errors.Is(err, ErrCollinear) {
		t.Fatalf("FromSummary(near-duplicate predictors) error = %v, want *PredictorError with ErrCollinear", err)
	}
	if pe.Index != 2 {
		t.Errorf("FromSummary(near-duplicate predictors) names predictor %d, want 2", pe.Index)
	}
}
