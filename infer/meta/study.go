package meta

import (
	"errors"
	"fmt"
	"math"

	"coefaudit/infer"
)

// DefaultLevel is the confidence level used when a level of 0 is given.
const DefaultLevel = 0.95

// ErrTooFewStudies is returned when there are fewer studies than a method
// needs: two for any pooling, three for the prediction interval and the
// leave-one-out analysis.
var ErrTooFewStudies = errors.New("too few studies")

// ErrVariance is returned (inside a StudyError) for a study whose sampling
// variance is zero, negative, NaN or infinite.
var ErrVariance = errors.New("variance must be positive and finite")

// ErrEffect is returned (inside a StudyError) for a study whose effect is
// NaN or infinite.
var ErrEffect = errors.New("effect must be finite")

// ErrNoConvergence is returned (inside a ConvergenceError) when an iterative
// estimator stops before meeting its tolerance.
var ErrNoConvergence = errors.New("estimate did not converge")

// Study is one study's contribution: the effect y_i, a difference between
// two coefficients on the scale common to all studies, and its sampling
// variance v_i, treated as known.
type Study struct {
	// Label names the study in messages and in the leave-one-out rows.
	Label string
	// Effect is y_i.
	Effect float64
	// Variance is v_i = SE_i²; it must be positive and finite.
	Variance float64
}

// StudyFromStandardError returns the Study with variance
//
//	v_i = SE_i²,
//
// for callers that hold standard errors rather than variances. A negative
// or non-finite SE gives a variance that Analyze rejects with ErrVariance.
func StudyFromStandardError(label string, effect, se float64) Study {
	v := se * se
	if se < 0 || math.IsNaN(se) {
		v = math.NaN()
	}
	return Study{Label: label, Effect: effect, Variance: v}
}

// StudyError reports which study made a computation impossible. Index is
// the study's 0-based position in the input slice; Err is ErrVariance or
// ErrEffect.
type StudyError struct {
	Index int
	Label string
	Value float64
	Err   error
}

// Error names the study by index and label, then the value and the problem.
func (e *StudyError) Error() string {
	return fmt.Sprintf("study at index %d (%q) has value %v: %v", e.Index, e.Label, e.Value, e.Err)
}

// Unwrap returns ErrVariance or ErrEffect, for errors.Is.
func (e *StudyError) Unwrap() error { return e.Err }

// ConvergenceError reports an iterative estimator that stopped before
// meeting its tolerance. Method names the estimator, Iterations the
// iterations spent, Last the last iterate and Change the size of the last
// step. It unwraps to ErrNoConvergence.
type ConvergenceError struct {
	Method     string
	Iterations int
	Last       float64
	Change     float64
}

// Error names the estimator and how far it got.
func (e *ConvergenceError) Error() string {
	return fmt.Sprintf("%s: %v after %d iterations (last value %.6g, last change %.3g)",
		e.Method, ErrNoConvergence, e.Iterations, e.Last, e.Change)
}

// Unwrap returns ErrNoConvergence, for errors.Is.
func (e *ConvergenceError) Unwrap() error { return ErrNoConvergence }

// validate checks that there are at least minK studies and that every
// effect and variance can be used.
func validate(studies []Study, minK int) error {
	if len(studies) < minK {
		return fmt.Errorf("%d studies, need at least %d: %w", len(studies), minK, ErrTooFewStudies)
	}
	for i, s := range studies {
		if math.IsNaN(s.Effect) || math.IsInf(s.Effect, 0) {
			return &StudyError{Index: i, Label: s.Label, Value: s.Effect, Err: ErrEffect}
		}
		if !(s.Variance > 0) || math.IsInf(s.Variance, 1) {
			return &StudyError{Index: i, Label: s.Label, Value: s.Variance, Err: ErrVariance}
		}
	}
	return nil
}

// resolveLevel turns the zero level into DefaultLevel and rejects levels
// outside (0, 1).
func resolveLevel(level float64) (float64, error) {
	if level == 0 {
		return DefaultLevel, nil
	}
	if !(level > 0 && level < 1) {
		return math.NaN(), fmt.Errorf("confidence level %v: %w", level, infer.ErrProbability)
	}
	return level, nil
}

// weightedMean returns Σ w_i y_i / Σ w_i and Σ w_i for w_i = 1/(v_i + τ²).
func weightedMean(studies []Study, tau2 float64) (mean, sumW float64) {
	var sumWY float64
	for _, s := range studies {
		w := 1 / (s.Variance + tau2)
		sumW += w
		sumWY += w * s.Effect
	}
	return sumWY / sumW, sumW
}

// generalizedQ returns Σ (y_i − μ̂(τ²))² / (v_i + τ²), which is Cochran's Q
// at τ² = 0.
func generalizedQ(studies []Study, tau2 float64) float64 {
	mu, _ := weightedMean(studies, tau2)
	var q float64
	for _, s := range studies {
		d := s.Effect - mu
		q += d * d / (s.Variance + tau2)
	}
	return q
}
