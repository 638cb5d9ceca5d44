package meta

import (
	"fmt"
)

// LeaveOneOutResult is the random-effects analysis with one study omitted.
type LeaveOneOutResult struct {
	// Omitted is the 0-based index of the omitted study; Label its label.
	Omitted int
	Label   string
	// Pooled is the random-effects estimate of the remaining k − 1 studies
	// with its Wald interval.
	Pooled Pooled
	// Tau2 is τ² of the remaining studies by the chosen method.
	Tau2 float64
	// Q and I2 are Cochran's Q and the I² of Higgins & Thompson,
	// max(0, (Q − df)/Q), of the remaining studies.
	Q, I2 float64
}

// LeaveOneOut refits the random-effects model k times, each time without
// one study: τ² by opts.Method, the estimate with its Wald interval
// (RandomEffectsWald) at opts.Level, and Cochran's Q with I² (CochranQ).
// A study whose omission moves the estimate or removes the heterogeneity
// is one the pooled result depends on.
//
// It returns ErrTooFewStudies for fewer than three studies (two must
// remain), a *StudyError, and the errors of the τ² estimators.
//
// References
//
//	[1] Viechtbauer W, Cheung MW-L (2010). Outlier and influence diagnostics
//	    for meta-analysis. Research Synthesis Methods 1(2):112-125.
func LeaveOneOut(studies []Study, opts Options) ([]LeaveOneOutResult, error) {
	if err := validate(studies, 3); err != nil {
		return nil, fmt.Errorf("leave-one-out: %w", err)
	}
	level, err := resolveLevel(opts.Level)
	if err != nil {
		return nil, fmt.Errorf("leave-one-out: %w", err)
	}
	out := make([]LeaveOneOutResult, len(studies))
	rest := make([]Study, 0, len(studies)-1)
	for i, omitted := range studies {
		rest = append(rest[:0], studies[:i]...)
		rest = append(rest, studies[i+1:]...)
		var tau2 float64
		switch opts.Method {
		case DerSimonianLaird:
			tau2 = tau2DL(rest)
		case RestrictedMaximumLikelihood:
			fit, err := Tau2REML(rest, opts.REML)
			if err != nil {
				return nil, fmt.Errorf("leave-one-out without study at index %d (%q): %w", i, omitted.Label, err)
			}
			tau2 = fit.Tau2
		default:
			return nil, fmt.Errorf("leave-one-out: unknown tau2 method %v", opts.Method)
		}
		pooled, err := RandomEffectsWald(rest, tau2, level)
		if err != nil {
			return nil, fmt.Errorf("leave-one-out without study at index %d (%q): %w", i, omitted.Label, err)
		}
		het, err := CochranQ(rest)
		if err != nil {
			return nil, fmt.Errorf("leave-one-out without study at index %d (%q): %w", i, omitted.Label, err)
		}
		out[i] = LeaveOneOutResult{Omitted: i, Label: omitted.Label, Pooled: pooled, Tau2: tau2, Q: het.Q, I2: het.I2}
	}
	return out, nil
}
