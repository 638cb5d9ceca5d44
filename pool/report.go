package pool

import "coefaudit/audit"

// What Run reports: the pooling of every topic, and per topic the claims
// pooled, the pooled estimates, heterogeneity, prediction, leave-one-out
// results and the claims left out.

// Report is the pooling of every topic of an audit.
type Report struct {
	// Source names the input.
	Source string `json:"source"`
	// Level is the confidence level of every interval, as a proportion.
	Level float64 `json:"level"`
	// Method is the τ² estimator asked for ("REML" or "DL"); a topic whose
	// REML fit failed says so in its Tau2Method and Notes.
	Method string `json:"method"`
	// Orientation is Orientation.
	Orientation string `json:"orientation"`
	// ClaimsWithoutTopic counts the claims rows with a blank topic, which
	// are not pooled.
	ClaimsWithoutTopic int `json:"claims_without_topic"`
	// Topics are the topics in order of their first claim.
	Topics []Topic `json:"topics"`
	// Plots lists the forest-plot files written, filled in by the caller
	// that writes them.
	Plots []string `json:"plots"`
	// Cautions are the audit's cautions, printed with every report.
	Cautions []string `json:"cautions"`
}

// Topic is the meta-analysis of the claims of one topic. Fixed, Random,
// HKSJ and Heterogeneity are nil when fewer than two claims could be
// pooled; Prediction is also nil for fewer than three.
type Topic struct {
	// Topic is the topic as entered; Slug its file-name form (see Slug).
	Topic string `json:"topic"`
	Slug  string `json:"slug"`
	// Measure and Scale are those of the claims pooled (the topic's
	// majority); ScaleNote explains the scale in words.
	Measure   string `json:"measure"`
	Scale     string `json:"scale"`
	ScaleNote string `json:"scale_note"`
	// K is the number of claims pooled.
	K int `json:"k"`
	// Tau2Method is the τ² estimator the random-effects results used
	// ("REML" or "DL"); empty when nothing was pooled.
	Tau2Method string `json:"tau2_method"`
	// Decimals is how many decimals reports meant for people give the
	// topic's differences and estimates: the most that audit's precision
	// rule gives its claims (ClaimResult.EstimateDecimals: one more than
	// their estimates and interval limits were printed with, from 2 to 4).
	// JSON and CSV keep every digit.
	Decimals int `json:"-"`
	// Studies are the claims pooled, in input order.
	Studies []Study `json:"studies"`
	// Estimates are the pooled estimates.
	Estimates
	// Heterogeneity holds Q, I², H² and τ² with its Q-profile interval.
	Heterogeneity *Heterogeneity `json:"heterogeneity"`
	// Prediction is the interval for the true difference in a new study.
	Prediction *Prediction `json:"prediction"`
	// LeaveOneOut has one row per pooled claim (empty when K < 3).
	LeaveOneOut []LeaveOneOut `json:"leave_one_out"`
	// LeftOut lists the topic's claims that were not pooled, and why.
	LeftOut []LeftOut `json:"left_out"`
	// Sensitivity is the topic pooled again with the claims whose SE is
	// only bounded, at Options.Covariance; nil when it was not asked
	// for or the topic has no such claim.
	Sensitivity *Sensitivity `json:"sensitivity,omitempty"`
	// Notes are warnings and remarks on this topic in plain words.
	Notes []string `json:"notes"`
	// Error is why the pooling failed, when it did; empty otherwise.
	Error string `json:"error,omitempty"`
}

// Study is one pooled claim: its difference, the SE, the interval at
// the report's level and its share of the fixed-effect and random-effects
// weights (proportions summing to 1; null when nothing was pooled).
type Study struct {
	Study        string          `json:"study"`
	Claim        string          `json:"claim"`
	Row          int             `json:"row"`
	First        string          `json:"first"`
	Second       string          `json:"second"`
	Outcome      string          `json:"outcome"`
	Estimate     audit.Number    `json:"estimate"`
	SE           audit.Number    `json:"se"`
	CI           [2]audit.Number `json:"ci"`
	WeightFixed  audit.Number    `json:"weight_fixed"`
	WeightRandom audit.Number    `json:"weight_random"`
}

// Estimates are the three pooled estimates of a set of claims: Fixed is
// the inverse-variance estimate, Random the random-effects estimate with
// its Wald interval, HKSJ the same estimate with the
// Hartung–Knapp–Sidik–Jonkman t interval. All are nil when the claims
// could not be pooled.
type Estimates struct {
	Fixed  *Estimate `json:"fixed"`
	Random *Estimate `json:"random"`
	HKSJ   *Estimate `json:"hksj"`
}

// Estimate is a pooled difference with its SE and interval, the
// statistic for the null of no difference, its degrees of freedom (null
// for the standard normal) and two-sided p.
type Estimate struct {
	Estimate  audit.Number    `json:"estimate"`
	SE        audit.Number    `json:"se"`
	CI        [2]audit.Number `json:"ci"`
	Statistic audit.Number    `json:"statistic"`
	DF        audit.Number    `json:"df"`
	P         audit.Number    `json:"p"`
}

// Heterogeneity is Cochran's Q with df = K − 1 and its p, I² = max(0,
// (Q − df)/Q) and H² = Q/df as proportions, I2Tau2 = τ²/(τ² + s²) from the
// fitted τ², and τ² with its SE (REML only) and Q-profile interval.
type Heterogeneity struct {
	Q      audit.Number    `json:"q"`
	DF     int             `json:"df"`
	P      audit.Number    `json:"p"`
	I2     audit.Number    `json:"i2"`
	H2     audit.Number    `json:"h2"`
	I2Tau2 audit.Number    `json:"i2_tau2"`
	Tau2   audit.Number    `json:"tau2"`
	Tau2SE audit.Number    `json:"tau2_se"`
	Tau2CI [2]audit.Number `json:"tau2_ci"`
}

// Prediction is the prediction interval with its t degrees of freedom.
type Prediction struct {
	CI [2]audit.Number `json:"ci"`
	DF audit.Number    `json:"df"`
}

// LeaveOneOut is the random-effects result without one claim.
type LeaveOneOut struct {
	Study    string          `json:"study"`
	Claim    string          `json:"claim"`
	Row      int             `json:"row"`
	Estimate audit.Number    `json:"estimate"`
	SE       audit.Number    `json:"se"`
	CI       [2]audit.Number `json:"ci"`
	Tau2     audit.Number    `json:"tau2"`
	Q        audit.Number    `json:"q"`
	I2       audit.Number    `json:"i2"`
}

// LeftOut is a claim of the topic that was not pooled, with the reason
// in plain words.
type LeftOut struct {
	Study  string `json:"study"`
	Claim  string `json:"claim"`
	Row    int    `json:"row"`
	Reason string `json:"reason"`
}
