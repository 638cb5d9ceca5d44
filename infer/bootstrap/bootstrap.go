package bootstrap

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"

	"coefaudit/infer/regress"
)

// Defaults of Options.
const (
	// DefaultResamples is B when Options.Resamples is 0.
	DefaultResamples = 10000
	// DefaultLevel is the confidence level when Options.Level is 0.
	DefaultLevel = 0.95
	// MinResamples is the fewest resamples accepted.
	MinResamples = 100
)

// conditionWarning is the condition number of the centred, scaled design
// above which the cross-product computations (whose error grows with its
// square) may cost the jackknife differences digits.
const conditionWarning = 1e5

// Sentinel errors (the first two are regress's, so errors.Is works with
// either name).
var (
	// ErrTooFewObservations: fewer rows than predictors + 2.
	ErrTooFewObservations = regress.ErrTooFewObservations
	// ErrLengthMismatch: the data columns differ in length.
	ErrLengthMismatch = regress.ErrLengthMismatch
	// ErrColumn: an outcome or predictor index is out of range or repeated.
	ErrColumn = errors.New("bad column index")
	// ErrCompare: the compared columns are not two different predictors of
	// the model.
	ErrCompare = errors.New("compared columns must be two different predictors")
	// ErrOption: a resample count, level or worker count is invalid.
	ErrOption = errors.New("invalid bootstrap option")
	// ErrDegenerate: no resample gave a usable fit.
	ErrDegenerate = errors.New("every resample was degenerate")
)

// ColumnError names the data column behind a regress.PredictorError
// (constant or collinear predictor). It unwraps to the regress error, so
// errors.Is(err, regress.ErrCollinear) and errors.As(err,
// *regress.PredictorError) both work.
type ColumnError struct {
	// Column is the index of the offending column in the data.
	Column int
	// Err is the regress error.
	Err error
}

// Error names the data column and the regress error.
func (e *ColumnError) Error() string { return fmt.Sprintf("data column %d: %v", e.Column, e.Err) }

// Unwrap returns the regress error.
func (e *ColumnError) Unwrap() error { return e.Err }

// Options configures CompareCoefficients. The zero value of each optional
// field selects its default.
type Options struct {
	// Outcome is the data column of the outcome; Predictors those of the
	// predictors, in model order.
	Outcome    int
	Predictors []int
	// Compare holds the data columns of the two predictors compared: the
	// statistic is coefficient(Compare[0]) − coefficient(Compare[1]).
	Compare [2]int
	// Resamples is B (default DefaultResamples, at least MinResamples).
	Resamples int
	// Level is the confidence level as a proportion (default 0.95).
	Level float64
	// Seed selects the random streams: resample b draws its n row indices
	// with rand.New(rand.NewPCG(Seed, b)).IntN(n), in order, so any run can
	// be reproduced exactly.
	Seed uint64
	// Unstandardized compares b_A − b_B instead of β_A − β_B.
	Unstandardized bool
	// Workers is the number of goroutines (default runtime.NumCPU()). The
	// result does not depend on it.
	Workers int
	// Progress, if not nil, is called with the resamples done so far, from
	// the calling goroutine, at most about 100 times.
	Progress func(done, total int)
}

// Result is a bootstrap comparison of two coefficients.
type Result struct {
	// Fit is the OLS fit of the full sample: coefficients, classical SEs,
	// standardized coefficients.
	Fit *regress.Fit
	// Compare are the data columns compared; Standardized reports whether
	// the difference is of standardized coefficients.
	Compare      [2]int
	Standardized bool
	// Estimate is θ̂, the difference in the full sample.
	Estimate float64
	// Level is the confidence level of the intervals.
	Level float64
	// Percentile, BC and BCa are the bootstrap intervals for the difference.
	Percentile, BC, BCa Interval
	// BiasCorrection is ẑ0 and Acceleration â (see BCa).
	BiasCorrection, Acceleration float64
	// P is the two-sided percentile bootstrap p-value for a zero difference,
	// min(1, 2 min(1 + #{θ* ≤ 0}, 1 + #{θ* ≥ 0})/(B + 1)) over the Used
	// replicates — twice the smaller tail beyond 0 with the +1 counts of a
	// Monte Carlo p-value (Davison & Hinkley 1997, Bootstrap Methods and
	// their Application, ch. 4); never below 2/(B + 1).
	P float64
	// PBCa is the two-sided p-value from inverting the BCa interval, the
	// smallest α at which the (1 − α) BCa interval excludes 0 (Efron &
	// Tibshirani 1993, An Introduction to the Bootstrap, on achieved
	// significance levels from confidence intervals): with u the share of
	// replicates below 0 and w = Φ⁻¹(u) − ẑ0, p = 2Φ(−|w/(1 + âw) − ẑ0|).
	PBCa float64
	// BootstrapSE is the standard deviation of the replicates and
	// BootstrapBias their mean minus Estimate.
	BootstrapSE, BootstrapBias float64
	// Delta is the large-sample test beside the bootstrap: for standardized
	// coefficients the normal-theory delta-method covariance for random
	// regressors (z test), for unstandardized ones the classical OLS
	// covariance (t test with the residual df). DeltaMethod names which.
	// Delta is nil if it could not be computed (see Warnings).
	Delta       *regress.Difference
	DeltaMethod string
	// Resamples is B as requested, Used the resamples whose fit existed
	// (degenerate resamples are left out of every result), and
	// JackknifeUsed the leave-one-out fits behind the acceleration.
	Resamples, Used, JackknifeUsed int
	// Replicates are the bootstrap statistics θ*_b in resample order
	// (NaN for a degenerate resample).
	Replicates []float64
	// Warnings lists non-fatal problems.
	Warnings []string
}

// CompareCoefficients bootstraps the difference between the coefficients
// of two predictors of one OLS model fitted to data (one slice per column,
// no missing values: the caller deletes incomplete rows). It returns the
// percentile, bias-corrected (BC) and bias-corrected and accelerated (BCa)
// intervals [1, 2] for
//
//	θ = β_A − β_B   (β_j = b_j s_xj/s_y; or b_A − b_B when Unstandardized)
//
// with ẑ0 = Φ⁻¹((#{θ* < θ̂} + ½ #{θ* = θ̂})/B) (ties count one half) and the
// jackknife acceleration â = Σ(θ̄ − θ_(i))³ / (6 [Σ(θ̄ − θ_(i))²]^{3/2}):
//
//	BCa: θ* quantiles at Φ(ẑ0 + (ẑ0 + z_α)/(1 − â(ẑ0 + z_α))), α = (1 ∓ level)/2,
//
// the bootstrap p-values P and PBCa (see Result), and the delta-method test
// beside them. Quantiles of the replicates are read by the (B + 1)u rule
// with interpolation (Hyndman & Fan definition 6).
//
// Computation: each resample draws row indices from its own PCG stream and
// accumulates the centred cross-product matrix of (outcome, predictors)
// straight from the columns, around the full-sample means, then solves the
// small system by Cholesky; no resample is ever copied out and each worker
// holds only O(p²) numbers. (The one full-sample OLS fit before resampling
// works on a scaled copy of the predictors, released before it starts.) The jackknife downdates the full cross-product matrix
// by one row at a time instead of refitting. Workers share the resamples;
// results are stored by resample index, so a seed gives bit-identical
// results for any number of workers.
//
// Errors: ErrColumn, ErrCompare, ErrOption, ErrLengthMismatch,
// ErrTooFewObservations (n < p + 2), a *ColumnError wrapping a
// *regress.PredictorError for a constant or collinear predictor, other
// regress errors (non-finite values), ErrDegenerate.
//
// [1] Efron B (1987). Better bootstrap confidence intervals. Journal of the
// American Statistical Association 82(397):171–185.
// [2] DiCiccio TJ, Efron B (1996). Bootstrap confidence intervals.
// Statistical Science 11(3):189–228.
func CompareCoefficients(data [][]float64, opts Options) (*Result, error) {
	opts, ia, ib, err := checkOptions(data, opts)
	if err != nil {
		return nil, fmt.Errorf("bootstrap: %w", err)
	}
	y := data[opts.Outcome]
	x := make([][]float64, len(opts.Predictors))
	for j, c := range opts.Predictors {
		x[j] = data[c]
	}
	n, k := len(y), len(x)
	if n < k+2 {
		return nil, fmt.Errorf("bootstrap: %d rows for %d predictors (need at least %d): %w", n, k, k+2, ErrTooFewObservations)
	}
	fit, err := regress.OLS(y, x, regress.Options{})
	if err != nil {
		var pe *regress.PredictorError
		if errors.As(err, &pe) {
			err = &ColumnError{Column: opts.Predictors[pe.Index], Err: err}
		}
		return nil, fmt.Errorf("bootstrap: %w", err)
	}

	res := &Result{Fit: fit, Compare: opts.Compare, Standardized: !opts.Unstandardized,
		Level: opts.Level, Resamples: opts.Resamples}
	res.Warnings = append(res.Warnings, fit.Warnings...)
	if res.Standardized {
		res.Estimate = fit.Standardized[ia] - fit.Standardized[ib]
	} else {
		res.Estimate = fit.Coefficients[fit.SlopeIndex(ia)] - fit.Coefficients[fit.SlopeIndex(ib)]
	}
	if fit.ConditionNumber > conditionWarning {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"condition number %.3g: the bootstrap works from cross-products, whose error grows with its square; the jackknife acceleration may have lost digits", fit.ConditionNumber))
	}
	if opts.Resamples < 1000 {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"%d resamples: BCa endpoints need about 1000 or more to be stable (common practice, no source)", opts.Resamples))
	}
	deltaMethod(res, y, x, ia, ib)

	cols := append([][]float64{y}, x...)
	mean := append([]float64{fit.OutcomeMean}, fit.PredictorMeans...)
	proto := newKernel(cols, mean, ia+1, ib+1, res.Standardized)

	res.Replicates = make([]float64, opts.Resamples)
	runResamples(res.Replicates, proto, opts.Seed, opts.Workers, opts.Progress)
	sorted := make([]float64, 0, len(res.Replicates))
	for _, v := range res.Replicates {
		if !math.IsNaN(v) {
			sorted = append(sorted, v)
		}
	}
	res.Used = len(sorted)
	if res.Used == 0 {
		return nil, fmt.Errorf("bootstrap: %d resamples: %w", opts.Resamples, ErrDegenerate)
	}
	if res.Used < opts.Resamples {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"%d of %d resamples were degenerate (a variable without variance, or collinear, in the resample) and were left out",
			opts.Resamples-res.Used, opts.Resamples))
	}
	slices.Sort(sorted)

	var a float64
	a, res.JackknifeUsed = acceleration(jackknife(proto, opts.Workers))
	if res.JackknifeUsed < n {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"%d leave-one-out fits were degenerate and left out of the acceleration", n-res.JackknifeUsed))
	}
	res.Acceleration = a
	intervals(res, sorted)
	return res, nil
}

// intervals fills the intervals, constants, p-values and moments.
func intervals(res *Result, sorted []float64) {
	alpha := 1 - res.Level
	res.Percentile = intervalAt(sorted, alpha/2, 1-alpha/2)
	res.BiasCorrection = biasCorrection(sorted, res.Estimate)
	nan := Interval{Lower: math.NaN(), Upper: math.NaN(), LowerLevel: math.NaN(), UpperLevel: math.NaN()}
	res.BC, res.BCa = nan, nan
	if lo, hi, ok := bcaLevels(res.BiasCorrection, 0, res.Level); ok {
		res.BC = intervalAt(sorted, lo, hi)
	} else {
		res.Warnings = append(res.Warnings, "all replicates lie on one side of the estimate: the bias correction, BC and BCa intervals are undefined")
	}
	if lo, hi, ok := bcaLevels(res.BiasCorrection, res.Acceleration, res.Level); ok {
		res.BCa = intervalAt(sorted, lo, hi)
	} else if !math.IsInf(res.BiasCorrection, 0) {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"acceleration %.3g is too large for the BCa interval at this level", res.Acceleration))
	}
	for _, c := range []struct {
		name string
		iv   Interval
	}{{"percentile", res.Percentile}, {"BC", res.BC}, {"BCa", res.BCa}} {
		if c.iv.Clamped {
			res.Warnings = append(res.Warnings, fmt.Sprintf(
				"the %s interval reaches beyond the most extreme replicate; increase the resamples", c.name))
		}
	}
	res.P = percentileP(sorted)
	p, floored, ok := bcaP(sorted, res.BiasCorrection, res.Acceleration)
	res.PBCa = p
	if !ok {
		res.Warnings = append(res.Warnings, "the BCa p-value is undefined for these bias-correction and acceleration constants")
	} else if floored {
		res.Warnings = append(res.Warnings, "0 lies beyond every replicate: the BCa p-value is limited by the number of resamples")
	}
	var sum float64
	for _, v := range sorted {
		sum += v
	}
	mean := sum / float64(len(sorted))
	var ss float64
	for _, v := range sorted {
		ss += (v - mean) * (v - mean)
	}
	res.BootstrapBias = mean - res.Estimate
	if len(sorted) > 1 {
		res.BootstrapSE = math.Sqrt(ss / float64(len(sorted)-1))
	}
}

// deltaMethod adds the large-sample test of the difference.
func deltaMethod(res *Result, y []float64, x [][]float64, ia, ib int) {
	fit := res.Fit
	if !res.Standardized {
		res.DeltaMethod = "classical OLS covariance, t test with the residual df"
		d, err := regress.TestDifference(fit.Coefficients, fit.Covariance,
			fit.SlopeIndex(ia), fit.SlopeIndex(ib), float64(fit.ResidualDF), res.Level)
		if err != nil {
			res.Warnings = append(res.Warnings, fmt.Sprintf("no large-sample test: %v", err))
			return
		}
		res.Delta = d
		return
	}
	res.DeltaMethod = "normal-theory delta method for random regressors (Yuan & Chan 2011), z test"
	s, err := regress.SummarizeData(y, x)
	if err == nil {
		var sf *regress.SummaryFit
		if sf, err = regress.FromSummary(s); err == nil {
			res.Delta, err = regress.TestDifference(sf.Standardized, sf.StandardizedDeltaCov, ia, ib, math.Inf(1), res.Level)
		}
	}
	if err != nil {
		res.Delta = nil
		res.Warnings = append(res.Warnings, fmt.Sprintf("no delta-method test: %v", err))
	}
}

// checkOptions validates the options against the data, fills defaults and
// returns the positions of the compared predictors among the predictors.
func checkOptions(data [][]float64, opts Options) (Options, int, int, error) {
	if len(data) == 0 {
		return opts, 0, 0, fmt.Errorf("no data columns: %w", ErrColumn)
	}
	for c, col := range data {
		if len(col) != len(data[0]) {
			return opts, 0, 0, fmt.Errorf("column %d has %d rows, column 0 has %d: %w", c, len(col), len(data[0]), ErrLengthMismatch)
		}
	}
	inRange := func(c int) bool { return c >= 0 && c < len(data) }
	if !inRange(opts.Outcome) {
		return opts, 0, 0, fmt.Errorf("outcome column %d of %d: %w", opts.Outcome, len(data), ErrColumn)
	}
	if len(opts.Predictors) == 0 {
		return opts, 0, 0, fmt.Errorf("no predictors: %w", ErrColumn)
	}
	seen := map[int]bool{opts.Outcome: true}
	for _, c := range opts.Predictors {
		if !inRange(c) {
			return opts, 0, 0, fmt.Errorf("predictor column %d of %d: %w", c, len(data), ErrColumn)
		}
		if seen[c] {
			return opts, 0, 0, fmt.Errorf("column %d used twice in the model: %w", c, ErrColumn)
		}
		seen[c] = true
	}
	ia, ib := slices.Index(opts.Predictors, opts.Compare[0]), slices.Index(opts.Predictors, opts.Compare[1])
	if ia < 0 || ib < 0 || ia == ib {
		return opts, 0, 0, fmt.Errorf("compare columns %d and %d with predictors %v: %w",
			opts.Compare[0], opts.Compare[1], opts.Predictors, ErrCompare)
	}
	switch {
	case opts.Resamples == 0:
		opts.Resamples = DefaultResamples
	case opts.Resamples < MinResamples:
		return opts, 0, 0, fmt.Errorf("%d resamples (at least %d): %w", opts.Resamples, MinResamples, ErrOption)
	}
	switch {
	case opts.Level == 0:
		opts.Level = DefaultLevel
	case !(opts.Level > 0 && opts.Level < 1):
		return opts, 0, 0, fmt.Errorf("level %v (a proportion, e.g. 0.95): %w", opts.Level, ErrOption)
	}
	switch {
	case opts.Workers == 0:
		opts.Workers = runtime.NumCPU()
	case opts.Workers < 0:
		return opts, 0, 0, fmt.Errorf("%d workers: %w", opts.Workers, ErrOption)
	}
	return opts, ia, ib, nil
}
