package meta

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// Tau2Interval is a confidence interval for τ².
type Tau2Interval struct {
	// Low and High bound the interval; either may be 0.
	Low, High float64
	// Level is the level as a proportion.
	Level float64
	// LowAtZero reports that Q < χ²_(k−1, 1−α/2): even τ² = 0 is not
	// rejected from below, so the lower bound is the boundary 0.
	LowAtZero bool
	// HighAtZero reports that Q < χ²_(k−1, α/2): the data are more
	// homogeneous than sampling error alone predicts, and the interval is
	// the single point 0.
	HighAtZero bool
}

// Tau2QProfile returns the Q-profile confidence interval for τ² of
// Viechtbauer (2007). The generalized Q statistic
//
//	Q(τ²) = Σ (y_i − μ̂(τ²))² / (v_i + τ²),  μ̂(τ²) = Σ w*_i y_i / Σ w*_i,
//
// follows χ²_(k−1) at the true τ² and decreases monotonically in τ², so
// the bounds solve
//
//	Q(τ²_low)  = χ²_(k−1, 1−α/2),
//	Q(τ²_high) = χ²_(k−1, α/2),
//
// with a bound set to 0 when Q(0) already lies below its quantile. Each
// root is bracketed between 0 and a doubled upper limit and found by
// regula falsi (Illinois) with bisection safeguards, to a relative
// tolerance of 1e-12. The interval does not depend on the point estimator
// of τ². A level of 0 means DefaultLevel.
//
// It returns ErrTooFewStudies, a *StudyError, or a *ConvergenceError.
//
// References
//
//	[1] Viechtbauer W (2007). Confidence intervals for the amount of
//	    heterogeneity in meta-analysis. Statistics in Medicine 26(1):37-52.
func Tau2QProfile(studies []Study, level float64) (Tau2Interval, error) {
	if err := validate(studies, 2); err != nil {
		return Tau2Interval{}, fmt.Errorf("Q-profile interval: %w", err)
	}
	level, err := resolveLevel(level)
	if err != nil {
		return Tau2Interval{}, fmt.Errorf("Q-profile interval: %w", err)
	}
	df := float64(len(studies) - 1)
	chi := distuv.ChiSquared{K: df}
	alpha := 1 - level
	upperQuantile := chi.Quantile(1 - alpha/2)
	lowerQuantile := chi.Quantile(alpha / 2)
	out := Tau2Interval{Level: level}
	q0 := generalizedQ(studies, 0)

	// The scale of the data sets where the search for an upper bracket
	// starts; the doubling makes the choice matter only for speed.
	var sumV float64
	for _, s := range studies {
		sumV += s.Variance
	}
	start := math.Max(tau2DL(studies), sumV/float64(len(studies)))

	solve := func(target float64, which string) (float64, error) {
		f := func(t float64) float64 { return generalizedQ(studies, t) - target }
		hi, fhi, ok := expandUpper(f, start)
		if !ok {
			return math.NaN(), &ConvergenceError{Method: "Q-profile " + which + " bound (bracketing)", Last: hi, Change: math.Inf(1)}
		}
		r := bracketRoot(f, 0, hi, q0-target, fhi, 1e-12, 500)
		if !r.converged {
			return math.NaN(), &ConvergenceError{Method: "Q-profile " + which + " bound", Iterations: r.iterations, Last: r.x, Change: r.width}
		}
		return r.x, nil
	}

	if q0 <= upperQuantile {
		out.LowAtZero = true
	} else if out.Low, err = solve(upperQuantile, "lower"); err != nil {
		return Tau2Interval{}, fmt.Errorf("Q-profile interval: %w", err)
	}
	if q0 <= lowerQuantile {
		out.HighAtZero = true
	} else if out.High, err = solve(lowerQuantile, "upper"); err != nil {
		return Tau2Interval{}, fmt.Errorf("Q-profile interval: %w", err)
	}
	return out, nil
}
