package pool

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"coefaudit/audit"
	"coefaudit/infer"
	"coefaudit/infer/meta"
)

// Estimators of τ² for Options.Method.
const (
	REML = "reml"
	DL   = "dl"
)

// Orientation says which way every pooled difference points.
const Orientation = "Each claim's difference is first − second, as the two coefficients are entered in the claims sheet; " +
	"a positive pooled value means the first coefficients are the larger on average."

// Options are the settings of Run.
type Options struct {
	// Method is the τ² estimator of the random-effects model: REML
	// (the default, also for "") or DL.
	Method string
	// Level is the confidence level as a proportion, e.g. 0.95; 0 means
	// meta.DefaultLevel.
	Level float64
	// REML controls the REML iteration; zero fields take meta's defaults.
	REML meta.REMLOptions
	// Covariance says what to do with the claims whose SE of the
	// difference is only bounded (an unknown covariance); the zero value
	// leaves them out.
	Covariance Covariance
}

// DefaultOptions are the settings used when none are given.
var DefaultOptions = Options{Method: REML, Level: meta.DefaultLevel}

// ErrMethod is returned by Run for a Method other than REML or DL.
var ErrMethod = errors.New("unknown tau2 method")

// Run meta-analyses the differences of the claims that share a non-empty
// topic (compared after trimming spaces). Claim i contributes
//
//	y_i = ClaimResult.PoolEstimate (first − second, on PoolScale),  v_i = PoolSE²,
//
// on the log scale for ratio measures (the log of the ratio of the two
// ratios), on Fisher's z scale for correlations (z1 − z2 with z = atanh r,
// near normal with a variance that does not depend on ρ [1]), and in the
// coefficients' own units otherwise. A claim is left out, with its reason,
// only when its difference or SE is unknown or its SE is 0, and when its
// measure or scale differs from those of most of the topic's remaining
// claims (a tie goes to the first in input order). Its outcome does not
// matter: a claim indeterminate for the rounding of its printed numbers
// has a known difference and SE and is pooled, since leaving it out would
// select studies by how close their p is to α. A claim whose two
// estimates share a sample whose covariance was not printed has a known
// difference but an SE known only to lie between |SE1 − SE2| and
// SE1 + SE2: it is left out of the main result, and opts.Covariance can
// pool it in a sensitivity analysis beside it (Topic.Sensitivity), at
// a stated correlation ρ of the two estimates (SE² = SE1² + SE2² −
// 2ρ SE1 SE2) or at the least favourable bound ρ = −1. Per topic it reports
//
//	fixed effect      μ̂ = Σ w_i y_i / Σ w_i,  w_i = 1/v_i               [2]
//	Q = Σ w_i (y_i − μ̂)²,  I² = max(0, (Q − (K−1))/Q)                    [3]
//	random effects    μ̂* = Σ w*_i y_i / Σ w*_i,  w*_i = 1/(v_i + τ̂²),
//	                  τ̂² by REML [4] or DerSimonian–Laird [2]
//	HKSJ              μ̂* ± t_(K−1) √(q/Σ w*_i)                          [5, 6]
//	τ² interval       Q-profile                                          [7]
//	prediction        μ̂* ± t_(K−2) √(τ̂² + SE(μ̂*)²)                       [8]
//
// and the random-effects estimate without each claim in turn. The
// statistics are those of package coefaudit/infer/meta. When REML does not
// converge the topic is refitted with DerSimonian–Laird and its Notes say
// so; a topic that cannot be fitted at all has Error set. Claims from one
// study are pooled as if independent, with a note, since they are not.
//
// It returns ErrMethod for an unknown Method, ErrCovariance for a
// covariance setting it does not know, and an error wrapping
// infer.ErrProbability for a Level outside (0, 1).
//
// References
//
//	[1] Fisher RA (1921). On the "probable error" of a coefficient of
//	    correlation deduced from a small sample. Metron 1:3-32.
//	[2] DerSimonian R, Laird N (1986). Meta-analysis in clinical trials.
//	    Controlled Clinical Trials 7(3):177-188.
//	[3] Higgins JPT, Thompson SG (2002). Quantifying heterogeneity in a
//	    meta-analysis. Statistics in Medicine 21(11):1539-1558.
//	[4] Viechtbauer W (2005). Bias and efficiency of meta-analytic variance
//	    estimators in the random-effects model. Journal of Educational and
//	    Behavioral Statistics 30(3):261-293.
//	[5] Hartung J, Knapp G (2001). A refined method for the meta-analysis
//	    of controlled clinical trials with binary outcome. Statistics in
//	    Medicine 20(24):3875-3889.
//	[6] Sidik K, Jonkman JN (2002). A simple confidence interval for
//	    meta-analysis. Statistics in Medicine 21(21):3153-3159.
//	[7] Viechtbauer W (2007). Confidence intervals for the amount of
//	    heterogeneity in meta-analysis. Statistics in Medicine 26(1):37-52.
//	[8] Higgins JPT, Thompson SG, Spiegelhalter DJ (2009). A re-evaluation
//	    of random-effects meta-analysis. Journal of the Royal Statistical
//	    Society A 172(1):137-159.
func Run(rep *audit.Report, opts Options) (*Report, error) {
	var method meta.Tau2Method
	switch opts.Method {
	case REML, "":
		method = meta.RestrictedMaximumLikelihood
	case DL:
		method = meta.DerSimonianLaird
	default:
		return nil, fmt.Errorf("pooling: %q: %w (want %s or %s)", opts.Method, ErrMethod, REML, DL)
	}
	level := opts.Level
	if level == 0 {
		level = meta.DefaultLevel
	}
	if !(level > 0 && level < 1) {
		return nil, fmt.Errorf("pooling: confidence level %v: %w", opts.Level, infer.ErrProbability)
	}
	if err := opts.Covariance.validate(); err != nil {
		return nil, err
	}
	cautions := rep.Cautions
	if len(cautions) == 0 {
		cautions = audit.Cautions
	}
	out := &Report{Source: rep.Source, Level: level, Method: method.String(), Orientation: Orientation,
		Topics: []Topic{}, Plots: []string{}, Cautions: cautions}
	var order []string
	byTopic := map[string][]audit.ClaimResult{}
	for _, c := range rep.Claims {
		topic := strings.TrimSpace(c.Topic)
		if topic == "" {
			out.ClaimsWithoutTopic++
			continue
		}
		if _, ok := byTopic[topic]; !ok {
			order = append(order, topic)
		}
		byTopic[topic] = append(byTopic[topic], c)
	}
	slugs := map[string]bool{}
	mo := meta.Options{Level: level, Method: method, REML: opts.REML}
	for _, topic := range order {
		t := poolTopic(topic, byTopic[topic], mo, opts.Covariance)
		t.Slug = uniqueSlug(Slug(topic), slugs)
		out.Topics = append(out.Topics, t)
	}
	return out, nil
}

// key is what the claims of a topic must share to be pooled.
type key struct{ measure, scale string }

func poolTopic(topic string, claims []audit.ClaimResult, mo meta.Options, pc Covariance) (t Topic) {
	t = Topic{Topic: topic, Studies: []Study{}, LeaveOneOut: []LeaveOneOut{},
		LeftOut: []LeftOut{}, Notes: []string{}}
	reasons := make([]string, len(claims))
	count := map[key]int{}
	var keys []key
	bounded := make([]bool, len(claims))
	for i, c := range claims {
		if _, _, _, ok := boundedDifference(c); ok {
			bounded[i] = true
			continue
		}
		if reasons[i] = unusableReason(c); reasons[i] != "" {
			continue
		}
		k := key{c.Measure, c.PoolScale}
		if count[k] == 0 {
			keys = append(keys, k)
		}
		count[k]++
	}
	var major key
	for _, k := range keys {
		if count[k] > count[major] {
			major = k
		}
	}
	t.Measure, t.Scale = major.measure, major.scale
	t.ScaleNote = scaleNote(major)
	z, _ := infer.NormalCriticalValue(mo.Level)
	var usable, boundedUsable []audit.ClaimResult
	for i, c := range claims {
		if bounded[i] {
			if (key{c.Measure, c.Scale}) != major {
				reasons[i] = otherKeyReason(key{c.Measure, c.Scale}, major)
			} else {
				reasons[i] = boundedReason(pc)
				boundedUsable = append(boundedUsable, c)
			}
		}
		if reasons[i] == "" && (key{c.Measure, c.PoolScale}) != major {
			reasons[i] = otherKeyReason(key{c.Measure, c.PoolScale}, major)
		}
		if reasons[i] != "" {
			t.LeftOut = append(t.LeftOut, LeftOut{Study: c.Study, Claim: c.Claim, Row: c.Row, Reason: reasons[i]})
			continue
		}
		usable = append(usable, c)
		est, se := float64(c.PoolEstimate), float64(c.PoolSE)
		t.Studies = append(t.Studies, Study{Study: c.Study, Claim: c.Claim, Row: c.Row,
			First: c.First.Label, Second: c.Second.Label, Outcome: c.Outcome,
			Estimate: c.PoolEstimate, SE: c.PoolSE, CI: [2]audit.Number{audit.Number(est - z*se), audit.Number(est + z*se)},
			WeightFixed: unknown(), WeightRandom: unknown()})
	}
	t.K = len(usable)
	t.Decimals = topicDecimals(append(append([]audit.ClaimResult(nil), usable...), boundedUsable...))
	// The sensitivity analysis stands beside the main result however that
	// ends: pooled, too few claims or failed.
	defer func() {
		if pc.pools() && len(boundedUsable) > 0 {
			t.Sensitivity = sensitivity(pc, metaStudies(usable), boundedUsable, z, mo)
		}
	}()
	if t.K < 2 {
		t.Notes = append(t.Notes, fmt.Sprintf("Only %d claim(s) of this topic can be pooled; pooling needs at least 2, so no pooled result is given.", t.K))
		return t
	}
	t.Notes = append(t.Notes, independenceNotes(usable)...)
	studies := metaStudies(usable)
	for _, c := range usable {
		if c.Outcome == audit.Conflict {
			t.Notes = append(t.Notes, fmt.Sprintf("Row %d (%s, %s): its printed numbers contradict each other; its difference is pooled as computed, so check it.", c.Row, c.Study, c.Claim))
		}
	}
	fit, err := fitTopic(studies, mo)
	var ce *meta.ConvergenceError
	if err != nil && mo.Method == meta.RestrictedMaximumLikelihood && errors.As(err, &ce) && strings.HasPrefix(ce.Method, "REML") {
		t.Notes = append(t.Notes, fmt.Sprintf("REML did not converge (%v). The random-effects results, τ², the prediction interval and the leave-one-out estimates below use DerSimonian–Laird instead.", err))
		mo.Method = meta.DerSimonianLaird
		fit, err = fitTopic(studies, mo)
	}
	if err != nil {
		t.Error = err.Error()
		t.Notes = append(t.Notes, "The claims could not be pooled: "+err.Error()+".")
		return t
	}
	t.fill(fit, mo.Method, usable, studies)
	return t
}

// metaStudies are the claims as meta's studies.
func metaStudies(claims []audit.ClaimResult) []meta.Study {
	studies := make([]meta.Study, len(claims))
	for i, c := range claims {
		studies[i] = meta.StudyFromStandardError(fmt.Sprintf("%s, %s (row %d)", c.Study, c.Claim, c.Row),
			float64(c.PoolEstimate), float64(c.PoolSE))
	}
	return studies
}

// topicFit is one topic's meta-analysis with a single τ² estimator.
type topicFit struct {
	fixed  meta.Pooled
	het    meta.Heterogeneity
	re     meta.RandomEffects
	tau2CI meta.Tau2Interval
	loo    []meta.LeaveOneOutResult
	notes  []string
}

// fitTopic runs the parts of meta.Analyze with the one estimator asked for:
// Analyze fits REML whatever the choice, so a REML failure would block a
// DerSimonian–Laird analysis and the fallback.
func fitTopic(studies []meta.Study, mo meta.Options) (topicFit, error) {
	var f topicFit
	var err error
	if f.fixed, err = meta.FixedEffect(studies, mo.Level); err != nil {
		return f, err
	}
	if f.het, err = meta.CochranQ(studies); err != nil {
		return f, err
	}
	if f.re, err = meta.FitRandomEffects(studies, mo.Method, mo); err != nil {
		return f, err
	}
	f.notes = append(f.notes, randomEffectsNotes(f.re)...)
	if f.tau2CI, err = meta.Tau2QProfile(studies, mo.Level); err != nil {
		return f, err
	}
	if f.tau2CI.HighAtZero {
		f.notes = append(f.notes, fmt.Sprintf("Q = %.4g is below the lower %g%% point of chi-square with %d df: the differences agree more closely than their SEs predict; check that the SEs are not overstated.",
			f.het.Q, 100*(1-mo.Level)/2, f.het.DF))
	}
	if len(studies) < 3 {
		f.notes = append(f.notes, "The prediction interval and the leave-one-out estimates need at least 3 claims.")
		return f, nil
	}
	f.loo, err = meta.LeaveOneOut(studies, mo)
	return f, err
}

// fill copies a fit into the topic's report.
func (t *Topic) fill(f topicFit, method meta.Tau2Method, usable []audit.ClaimResult, studies []meta.Study) {
	t.Tau2Method = method.String()
	var sw, swr float64
	for _, s := range studies {
		sw += 1 / s.Variance
		swr += 1 / (s.Variance + f.re.Tau2)
	}
	for i, s := range studies {
		t.Studies[i].WeightFixed = audit.Number(1 / s.Variance / sw)
		t.Studies[i].WeightRandom = audit.Number(1 / (s.Variance + f.re.Tau2) / swr)
	}
	t.Fixed = estimateOf(f.fixed)
	t.Random = estimateOf(f.re.Wald)
	t.HKSJ = estimateOf(f.re.HartungKnapp)
	t.Heterogeneity = &Heterogeneity{Q: audit.Number(f.het.Q), DF: f.het.DF, P: audit.Number(f.het.P),
		I2: audit.Number(f.het.I2), H2: audit.Number(f.het.H2), I2Tau2: audit.Number(f.re.I2), Tau2: audit.Number(f.re.Tau2),
		Tau2SE: audit.Number(f.re.Tau2SE), Tau2CI: [2]audit.Number{audit.Number(f.tau2CI.Low), audit.Number(f.tau2CI.High)}}
	if f.re.HasPrediction {
		p := f.re.Prediction
		t.Prediction = &Prediction{CI: [2]audit.Number{audit.Number(p.Low), audit.Number(p.High)}, DF: audit.Number(p.DF)}
	}
	for _, l := range f.loo {
		c := usable[l.Omitted]
		t.LeaveOneOut = append(t.LeaveOneOut, LeaveOneOut{Study: c.Study, Claim: c.Claim, Row: c.Row,
			Estimate: audit.Number(l.Pooled.Estimate), SE: audit.Number(l.Pooled.SE),
			CI: [2]audit.Number{audit.Number(l.Pooled.Low), audit.Number(l.Pooled.High)}, Tau2: audit.Number(l.Tau2), Q: audit.Number(l.Q), I2: audit.Number(l.I2)})
	}
	for _, n := range f.notes {
		n = strings.TrimSuffix(n, ".")
		if n != "" {
			n = strings.ToUpper(n[:1]) + n[1:]
		}
		t.Notes = append(t.Notes, n+".")
	}
}

func estimateOf(p meta.Pooled) *Estimate {
	return &Estimate{Estimate: audit.Number(p.Estimate), SE: audit.Number(p.SE), CI: [2]audit.Number{audit.Number(p.Low), audit.Number(p.High)},
		Statistic: audit.Number(p.Stat), DF: audit.Number(p.DF), P: audit.Number(p.P)}
}

// unknown is a number not known, written null in JSON.
func unknown() audit.Number { return audit.Number(math.NaN()) }
