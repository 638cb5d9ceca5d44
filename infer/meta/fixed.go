package meta

import (
	"fmt"
	"math"

	"coefaudit/infer"
)

// Pooled is a pooled estimate with its standard error, its confidence
// interval at Level, the test statistic of the null of no difference and
// its two-sided p-value.
type Pooled struct {
	// Estimate is the pooled effect μ̂.
	Estimate float64
	// SE is the standard error of Estimate used for the interval.
	SE float64
	// Low and High bound the two-sided interval at Level.
	Low, High float64
	// Stat is Estimate/SE: a z statistic when DF is +Inf, else a t statistic.
	Stat float64
	// DF is the degrees of freedom of the reference distribution; +Inf
	// means the standard normal.
	DF float64
	// P is the two-sided p-value of Stat.
	P float64
	// Level is the confidence level as a proportion, e.g. 0.95.
	Level float64
}

// Heterogeneity holds Cochran's test of homogeneity and the descriptive
// measures derived from it.
type Heterogeneity struct {
	// Q is Cochran's Q.
	Q float64
	// DF is k − 1.
	DF int
	// P is P(χ²_DF > Q), the p-value of the test of homogeneity.
	P float64
	// I2 is the share of total variability due to heterogeneity, a
	// proportion in [0, 1).
	I2 float64
	// H2 is Q/DF; 1 means no more variability than sampling error.
	H2 float64
}

// FixedEffect returns the inverse-variance (common-effect) estimate
//
//	w_i = 1/v_i,   μ̂ = Σ w_i y_i / Σ w_i,   SE = 1/√(Σ w_i),
//	z = μ̂/SE,      CI = μ̂ ± z_(1−α/2) SE,
//
// with the two-sided normal p-value. A level of 0 means DefaultLevel.
//
// It returns ErrTooFewStudies for fewer than two studies and a *StudyError
// (ErrVariance, ErrEffect) for a study that cannot be weighted.
//
// References
//
//	[1] Borenstein M, Hedges LV, Higgins JPT, Rothstein HR (2010). A basic
//	    introduction to fixed-effect and random-effects models for
//	    meta-analysis. Research Synthesis Methods 1(2):97-111.
func FixedEffect(studies []Study, level float64) (Pooled, error) {
	if err := validate(studies, 2); err != nil {
		return Pooled{}, fmt.Errorf("fixed-effect estimate: %w", err)
	}
	level, err := resolveLevel(level)
	if err != nil {
		return Pooled{}, fmt.Errorf("fixed-effect estimate: %w", err)
	}
	mu, sumW := weightedMean(studies, 0)
	return normalPooled(mu, 1/math.Sqrt(sumW), level)
}

// normalPooled builds the Wald interval and z test of an estimate.
func normalPooled(est, se, level float64) (Pooled, error) {
	z, err := infer.NormalCriticalValue(level)
	if err != nil {
		return Pooled{}, err
	}
	stat := est / se
	return Pooled{
		Estimate: est,
		SE:       se,
		Low:      est - z*se,
		High:     est + z*se,
		Stat:     stat,
		DF:       math.Inf(1),
		P:        infer.NormalTwoSidedP(stat),
		Level:    level,
	}, nil
}

// CochranQ returns Cochran's test of homogeneity with the I² and H² of
// Higgins & Thompson,
//
//	Q  = Σ w_i (y_i − μ̂_FE)²,  w_i = 1/v_i,  df = k − 1,
//	p  = P(χ²_df > Q),
//	I² = max(0, (Q − df)/Q),
//	H² = Q/df.
//
// I² is 0 when Q is 0 (all effects equal).
//
// It returns ErrTooFewStudies for fewer than two studies and a *StudyError
// for a study that cannot be weighted.
//
// References
//
//	[1] Cochran WG (1954). The combination of estimates from different
//	    experiments. Biometrics 10(1):101-129.
//	[2] Higgins JPT, Thompson SG (2002). Quantifying heterogeneity in a
//	    meta-analysis. Statistics in Medicine 21(11):1539-1558.
func CochranQ(studies []Study) (Heterogeneity, error) {
	if err := validate(studies, 2); err != nil {
		return Heterogeneity{}, fmt.Errorf("Cochran's Q: %w", err)
	}
	df := len(studies) - 1
	q := generalizedQ(studies, 0)
	p, err := infer.ChiSquareUpperTail(q, float64(df))
	if err != nil {
		return Heterogeneity{}, fmt.Errorf("Cochran's Q: %w", err)
	}
	i2 := 0.0
	if q > float64(df) {
		i2 = (q - float64(df)) / q
	}
	return Heterogeneity{Q: q, DF: df, P: p, I2: i2, H2: q / float64(df)}, nil
}

// typicalVariance returns the "typical" within-study variance of Higgins &
// Thompson (2002, eq. 9),
//
//	s² = (k − 1) Σ w_i / ((Σ w_i)² − Σ w_i²),  w_i = 1/v_i,
//
// which makes τ²/(τ² + s²) equal to (Q − df)/Q at the DerSimonian–Laird τ².
func typicalVariance(studies []Study) float64 {
	var sw, sw2 float64
	for _, s := range studies {
		w := 1 / s.Variance
		sw += w
		sw2 += w * w
	}
	return float64(len(studies)-1) * sw / (sw*sw - sw2)
}
