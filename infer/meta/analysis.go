package meta

import (
	"errors"
	"fmt"
	"math"
)

// Options collects the settings of a meta-analysis. The zero value is
// usable: level 0.95, REML for the leave-one-out analysis, plain HKSJ and
// DefaultREMLOptions.
type Options struct {
	// Level is the confidence level as a proportion; 0 means DefaultLevel.
	Level float64
	// Method is the τ² estimator used by LeaveOneOut; the zero value is
	// RestrictedMaximumLikelihood. Analyze fits both estimators regardless.
	Method Tau2Method
	// TruncateHartungKnapp replaces the HKSJ scale q by max(1, q); see
	// HartungKnapp. The default false gives plain HKSJ.
	TruncateHartungKnapp bool
	// REML controls the REML iteration.
	REML REMLOptions
}

// RandomEffects is a random-effects fit at one estimate of τ².
type RandomEffects struct {
	// Method is the τ² estimator.
	Method Tau2Method
	// Tau2 is the estimated between-study variance, ≥ 0.
	Tau2 float64
	// Tau2SE is REML's large-sample standard error of Tau2 (NaN for DL).
	Tau2SE float64
	// I2 is τ²/(τ² + s²) with s² the typical within-study variance of
	// Higgins & Thompson (2002, eq. 9); for DL it equals (Q − df)/Q.
	I2 float64
	// H2 is (τ² + s²)/s².
	H2 float64
	// Wald is the estimate with its normal-theory interval.
	Wald Pooled
	// HartungKnapp is the estimate with the HKSJ t interval.
	HartungKnapp Pooled
	// HartungKnappScale is the HKSJ scale q before any truncation.
	HartungKnappScale float64
	// HasPrediction reports whether Prediction was computed (k ≥ 3).
	HasPrediction bool
	// Prediction is the prediction interval for a new study's true effect.
	Prediction PredictionInterval
	// Iterations and AtBoundary describe the REML fit (zero for DL).
	Iterations int
	AtBoundary bool
	// Warnings lists non-fatal problems with this fit.
	Warnings []string
}

// FitRandomEffects estimates τ² with method and returns the random-effects
// estimate with its Wald interval (RandomEffectsWald), its HKSJ interval
// (HartungKnapp, truncated if opts.TruncateHartungKnapp) and, for k ≥ 3,
// the prediction interval (Prediction). I² and H² are expressed through the
// estimated τ²,
//
//	I² = τ²/(τ² + s²),  H² = (τ² + s²)/s²,
//	s² = (k − 1) Σ w_i / ((Σ w_i)² − Σ w_i²),  w_i = 1/v_i.
//
// With k = 2 the prediction interval is omitted with a warning rather than
// an error.
//
// It returns the errors of Tau2DerSimonianLaird and Tau2REML.
//
// References
//
//	[1] Higgins JPT, Thompson SG (2002). Quantifying heterogeneity in a
//	    meta-analysis. Statistics in Medicine 21(11):1539-1558.
//	[2] Higgins JPT, Thompson SG, Spiegelhalter DJ (2009). A re-evaluation
//	    of random-effects meta-analysis. Journal of the Royal Statistical
//	    Society A 172(1):137-159.
func FitRandomEffects(studies []Study, method Tau2Method, opts Options) (RandomEffects, error) {
	level, err := resolveLevel(opts.Level)
	if err != nil {
		return RandomEffects{}, fmt.Errorf("random-effects fit: %w", err)
	}
	re := RandomEffects{Method: method, Tau2SE: math.NaN()}
	switch method {
	case DerSimonianLaird:
		if re.Tau2, err = Tau2DerSimonianLaird(studies); err != nil {
			return RandomEffects{}, err
		}
	case RestrictedMaximumLikelihood:
		fit, err := Tau2REML(studies, opts.REML)
		if err != nil {
			return RandomEffects{}, err
		}
		re.Tau2, re.Tau2SE, re.Iterations, re.AtBoundary = fit.Tau2, fit.SE, fit.Iterations, fit.AtBoundary
		if fit.UsedFallback {
			re.Warnings = append(re.Warnings, "REML: Fisher scoring did not converge; the estimate comes from bracketing the score")
		}
	default:
		return RandomEffects{}, fmt.Errorf("random-effects fit: unknown tau2 method %v", method)
	}
	s2 := typicalVariance(studies)
	re.I2 = re.Tau2 / (re.Tau2 + s2)
	re.H2 = (re.Tau2 + s2) / s2
	if re.Wald, err = RandomEffectsWald(studies, re.Tau2, level); err != nil {
		return RandomEffects{}, err
	}
	re.HartungKnapp, re.HartungKnappScale, err = HartungKnapp(studies, re.Tau2, level, opts.TruncateHartungKnapp)
	if err != nil {
		return RandomEffects{}, err
	}
	switch q := re.HartungKnappScale; {
	case q == 0:
		re.Warnings = append(re.Warnings, fmt.Sprintf(
			"%v: every effect equals the pooled estimate, so the Hartung-Knapp interval has zero width", method))
	case q < 1 && !opts.TruncateHartungKnapp:
		re.Warnings = append(re.Warnings, fmt.Sprintf(
			"%v: Hartung-Knapp scale q = %.3g < 1 makes its standard error smaller than the Wald one; "+
				"with few studies the interval may be too narrow (Röver, Knapp & Friede 2015); the modified interval with max(1, q) guards against that",
			method, q))
	}
	re.Prediction, err = Prediction(re.Wald, re.Tau2, len(studies), level)
	switch {
	case err == nil:
		re.HasPrediction = true
	case errors.Is(err, ErrTooFewStudies):
		re.Warnings = append(re.Warnings, fmt.Sprintf(
			"%v: prediction interval omitted: it needs at least 3 studies (t with k-2 df), have %d", method, len(studies)))
	default:
		return RandomEffects{}, err
	}
	return re, nil
}

// Analysis is the full meta-analysis of a set of studies.
type Analysis struct {
	// K is the number of studies.
	K int
	// Level is the confidence level used throughout.
	Level float64
	// Fixed is the inverse-variance fixed-effect estimate.
	Fixed Pooled
	// Heterogeneity is Cochran's Q with I² and H².
	Heterogeneity Heterogeneity
	// DerSimonianLaird and REML are the random-effects fits.
	DerSimonianLaird, REML RandomEffects
	// Tau2Interval is the Q-profile interval for τ².
	Tau2Interval Tau2Interval
	// LeaveOneOut has one row per omitted study (empty when k < 3).
	LeaveOneOut []LeaveOneOutResult
	// Warnings lists non-fatal problems, each naming what it concerns.
	Warnings []string
}

// Analyze runs the whole meta-analysis: FixedEffect, CochranQ,
// FitRandomEffects with both DerSimonianLaird and
// RestrictedMaximumLikelihood, Tau2QProfile and, for k ≥ 3, LeaveOneOut
// with opts.Method. Parts that need more studies than are given are
// omitted with a warning; a failure of REML to converge is an error
// (a *ConvergenceError inside), so that no silently wrong τ² is reported.
//
// It returns ErrTooFewStudies for fewer than two studies, a *StudyError for
// an unusable effect or variance, and the errors of the parts.
func Analyze(studies []Study, opts Options) (Analysis, error) {
	if err := validate(studies, 2); err != nil {
		return Analysis{}, fmt.Errorf("meta-analysis: %w", err)
	}
	level, err := resolveLevel(opts.Level)
	if err != nil {
		return Analysis{}, fmt.Errorf("meta-analysis: %w", err)
	}
	opts.Level = level
	a := Analysis{K: len(studies), Level: level}
	if a.Fixed, err = FixedEffect(studies, level); err != nil {
		return Analysis{}, err
	}
	if a.Heterogeneity, err = CochranQ(studies); err != nil {
		return Analysis{}, err
	}
	if a.DerSimonianLaird, err = FitRandomEffects(studies, DerSimonianLaird, opts); err != nil {
		return Analysis{}, fmt.Errorf("meta-analysis: %w", err)
	}
	if a.REML, err = FitRandomEffects(studies, RestrictedMaximumLikelihood, opts); err != nil {
		return Analysis{}, fmt.Errorf("meta-analysis: %w", err)
	}
	a.Warnings = append(a.Warnings, a.DerSimonianLaird.Warnings...)
	a.Warnings = append(a.Warnings, a.REML.Warnings...)
	if a.Tau2Interval, err = Tau2QProfile(studies, level); err != nil {
		return Analysis{}, fmt.Errorf("meta-analysis: %w", err)
	}
	if a.Tau2Interval.HighAtZero {
		a.Warnings = append(a.Warnings, fmt.Sprintf(
			"Q = %.4g is below the %.3g quantile of chi-square(%d): the effects agree more closely than their variances predict; check that the variances are not overstated",
			a.Heterogeneity.Q, (1-level)/2, a.Heterogeneity.DF))
	}
	if len(studies) < 3 {
		a.Warnings = append(a.Warnings, fmt.Sprintf(
			"leave-one-out omitted: it needs at least 3 studies, have %d", len(studies)))
		return a, nil
	}
	if a.LeaveOneOut, err = LeaveOneOut(studies, opts); err != nil {
		return Analysis{}, fmt.Errorf("meta-analysis: %w", err)
	}
	return a, nil
}
