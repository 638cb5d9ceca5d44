package meta

import (
	"fmt"
	"math"
)

// Tau2Method names an estimator of the between-study variance τ².
type Tau2Method int

const (
	// RestrictedMaximumLikelihood maximises the restricted likelihood
	// (Viechtbauer 2005); the zero value of Options selects it.
	RestrictedMaximumLikelihood Tau2Method = iota
	// DerSimonianLaird is the method-of-moments estimator of DerSimonian &
	// Laird (1986).
	DerSimonianLaird
)

// String returns the estimator's usual abbreviation.
func (m Tau2Method) String() string {
	switch m {
	case RestrictedMaximumLikelihood:
		return "REML"
	case DerSimonianLaird:
		return "DL"
	default:
		return fmt.Sprintf("Tau2Method(%d)", int(m))
	}
}

// Tau2DerSimonianLaird returns the method-of-moments estimate
//
//	τ²_DL = max(0, (Q − (k − 1)) / (Σ w_i − Σ w_i²/Σ w_i)),  w_i = 1/v_i,
//
// truncated at the boundary 0 where Q < k − 1.
//
// It returns ErrTooFewStudies for fewer than two studies and a *StudyError
// for a study that cannot be weighted.
//
// References
//
//	[1] DerSimonian R, Laird N (1986). Meta-analysis in clinical trials.
//	    Controlled Clinical Trials 7(3):177-188.
func Tau2DerSimonianLaird(studies []Study) (float64, error) {
	if err := validate(studies, 2); err != nil {
		return math.NaN(), fmt.Errorf("DerSimonian-Laird tau2: %w", err)
	}
	return tau2DL(studies), nil
}

func tau2DL(studies []Study) float64 { return dataOf(studies).tau2DL() }

// data is the effects and variances of a set of studies as two slices,
// with the study at index skip left out when skip ≥ 0: the loops of the
// REML fit run over it many times, and leave-one-out shares one copy of
// it among all its fits instead of copying the other studies k times.
type data struct {
	y, v []float64
	skip int
}

func dataOf(studies []Study) data {
	d := data{y: make([]float64, len(studies)), v: make([]float64, len(studies)), skip: -1}
	for i, s := range studies {
		d.y[i], d.v[i] = s.Effect, s.Variance
	}
	return d
}

// without returns the same data with study i left out.
func (d data) without(i int) data { return data{y: d.y, v: d.v, skip: i} }

// k is the number of studies in d.
func (d data) k() int {
	if d.skip >= 0 {
		return len(d.y) - 1
	}
	return len(d.y)
}

// weightedMean returns Σ w_i y_i / Σ w_i and Σ w_i for w_i = 1/(v_i + τ²).
func (d data) weightedMean(tau2 float64) (mean, sumW float64) {
	var sumWY float64
	for j, v := range d.v {
		if j != d.skip {
			w := 1 / (v + tau2)
			sumW += w
			sumWY += w * d.y[j]
		}
	}
	return sumWY / sumW, sumW
}

// tau2DL is the DerSimonian–Laird estimate of d.
func (d data) tau2DL() float64 {
	mu, sw := d.weightedMean(0)
	var sw2, q float64
	for j, v := range d.v {
		if j != d.skip {
			sw2 += 1 / (v * v)
		}
	}
	for j, v := range d.v {
		if j != d.skip {
			e := d.y[j] - mu
			q += e * e / v
		}
	}
	t := (q - float64(d.k()-1)) / (sw - sw2/sw)
	return math.Max(0, t)
}

// REMLOptions controls the REML iteration. Zero fields take the defaults
// given beside them.
type REMLOptions struct {
	// Tolerance is the convergence criterion on τ²: iteration stops when a
	// step changes τ² by less than Tolerance·max(1, τ²). Default 1e-10.
	Tolerance float64
	// MaxIterations bounds the Fisher-scoring iterations and, separately,
	// the iterations of the bracketing fallback. Default 100.
	MaxIterations int
}

// DefaultREMLOptions returns the tolerance and iteration limit used when
// REMLOptions fields are zero.
func DefaultREMLOptions() REMLOptions {
	return REMLOptions{Tolerance: 1e-10, MaxIterations: 100}
}

func (o REMLOptions) resolved() REMLOptions {
	d := DefaultREMLOptions()
	if o.Tolerance > 0 {
		d.Tolerance = o.Tolerance
	}
	if o.MaxIterations > 0 {
		d.MaxIterations = o.MaxIterations
	}
	return d
}

// REMLFit is the REML estimate of τ² and how it was reached.
type REMLFit struct {
	// Tau2 is the estimate, ≥ 0.
	Tau2 float64
	// SE is 1/√I(τ̂²), the large-sample standard error from the expected
	// information; it is poor near the boundary and for few studies.
	SE float64
	// LogLikelihood is the restricted log-likelihood at Tau2, without the
	// constant −(k−1)/2 · log 2π.
	LogLikelihood float64
	// Iterations counts the Fisher-scoring steps (plus the fallback's steps
	// when it was needed).
	Iterations int
	// AtBoundary reports that the maximum lies at τ² = 0.
	AtBoundary bool
	// UsedFallback reports that Fisher scoring failed and the root of the
	// score was bracketed instead.
	UsedFallback bool
	// mu and sw are the weighted mean and Σ w_i at Tau2, kept so that
	// leave-one-out need not run over the studies once more for them.
	mu, sw float64
}

// Tau2REML returns the restricted maximum-likelihood estimate of τ², the
// maximiser over τ² ≥ 0 of
//
//	ℓ_R(τ²) = −½ [ Σ log(v_i + τ²) + log Σ w_i + Σ w_i (y_i − μ̂)² ],
//	w_i = 1/(v_i + τ²),  μ̂ = Σ w_i y_i / Σ w_i.
//
// It runs Fisher scoring from the DerSimonian–Laird estimate,
//
//	τ²_new = τ² + U(τ²)/I(τ²),
//	U = ½ [ Σ w_i² (y_i − μ̂)² − Σ w_i + Σ w_i²/Σ w_i ],
//	I = ½ [ Σ w_i² − 2 Σ w_i³/Σ w_i + (Σ w_i²)²/(Σ w_i)² ],
//
// halving any step that lowers ℓ_R, and projecting negative values onto 0.
// When U(0) ≤ 0 at the boundary the estimate is 0. If scoring does not
// settle within MaxIterations, the root of U is bracketed between 0 and a
// doubled upper bound and found by regula falsi (Illinois) with bisection
// safeguards. ℓ_R can have several local maxima in unusual data; the one
// returned is the one these iterations reach.
//
// It returns ErrTooFewStudies, a *StudyError, or a *ConvergenceError
// (unwrapping to ErrNoConvergence) when neither algorithm converges.
//
// References
//
//	[1] Viechtbauer W (2005). Bias and efficiency of meta-analytic variance
//	    estimators in the random-effects model. Journal of Educational and
//	    Behavioral Statistics 30(3):261-293.
//	[2] Harville DA (1977). Maximum likelihood approaches to variance
//	    component estimation and to related problems. Journal of the
//	    American Statistical Association 72(358):320-338.
func Tau2REML(studies []Study, opts REMLOptions) (REMLFit, error) {
	if err := validate(studies, 2); err != nil {
		return REMLFit{}, fmt.Errorf("REML tau2: %w", err)
	}
	d := dataOf(studies)
	return tau2REML(d, d.tau2DL(), opts.resolved())
}

// tau2REML runs Fisher scoring from start and, if it fails, the
// bracketing fallback.
func tau2REML(d data, start float64, o REMLOptions) (REMLFit, error) {
	fit, err := remlFisherScoring(func(t float64) remlPoint { return remlTerms(d, t) }, start, o)
	if err == nil {
		return fit, nil
	}
	fb, fbErr := remlBracketing(d, o)
	if fbErr != nil {
		return REMLFit{}, fmt.Errorf("REML tau2 (Fisher scoring: %v): %w", err, fbErr)
	}
	fb.Iterations += fit.Iterations
	return fb, nil
}

// remlPoint is ℓ_R, its score U and the expected information I at one τ²,
// with the weighted mean μ̂ and Σ w_i there.
type remlPoint struct {
	tau2, ll, score, info, mu, sw float64
}

// remlTerms evaluates ℓ_R, U and I at tau2.
func remlTerms(d data, tau2 float64) remlPoint {
	mu, sw := d.weightedMean(tau2)
	var logV, sw2, sw3, rss, wr2 float64
	for j, v := range d.v {
		if j == d.skip {
			continue
		}
		v += tau2
		w := 1 / v
		e := d.y[j] - mu
		logV += math.Log(v)
		sw2 += w * w
		sw3 += w * w * w
		rss += w * e * e
		wr2 += w * w * e * e
	}
	return remlPoint{tau2: tau2, mu: mu, sw: sw,
		ll:    -0.5 * (logV + math.Log(sw) + rss),
		score: 0.5 * (wr2 - sw + sw2/sw),
		info:  0.5 * (sw2 - 2*sw3/sw + sw2*sw2/(sw*sw))}
}

// remlFisherScoring runs Fisher scoring from start, evaluating ℓ_R, U and
// I with terms.
func remlFisherScoring(terms func(tau2 float64) remlPoint, start float64, o REMLOptions) (REMLFit, error) {
	p := terms(start)
	change := math.Inf(1)
	for it := 1; it <= o.MaxIterations; it++ {
		if p.tau2 == 0 && p.score <= 0 {
			return remlFit(p, it-1, false), nil
		}
		step := p.score / p.info
		n := terms(math.Max(0, p.tau2+step))
		// Step halving: scoring can overshoot where ℓ_R is far from
		// quadratic, typically for large τ².
		for h := 0; h < 50 && !(n.ll >= p.ll) && n.tau2 != p.tau2; h++ {
			step /= 2
			n = terms(math.Max(0, p.tau2+step))
		}
		if math.IsNaN(n.ll) || math.IsNaN(n.tau2) {
			return REMLFit{Iterations: it}, &ConvergenceError{Method: "REML Fisher scoring", Iterations: it, Last: n.tau2, Change: math.NaN()}
		}
		change = math.Abs(n.tau2 - p.tau2)
		p = n
		if change <= o.Tolerance*math.Max(1, p.tau2) {
			return remlFit(remlPolish(terms, p), it, false), nil
		}
	}
	return REMLFit{Iterations: o.MaxIterations}, &ConvergenceError{
		Method: "REML Fisher scoring", Iterations: o.MaxIterations, Last: p.tau2, Change: change}
}

// remlPolish takes a converged Fisher-scoring point to the root of the
// score U. Near the maximum a step changes ℓ_R by less than its rounding,
// so the step-halving test of Fisher scoring halves good steps until they
// fall below the tolerance, and scoring stops some 1e-8 short of the root
// (Kacker's data without lab 8: 7e-9 short), at a point that depends on
// the start. Steps on U itself do not have that problem: a Fisher step,
// then secant steps through the last two points, are taken while they
// shrink |U| and keep τ² > 0.
func remlPolish(terms func(float64) remlPoint, p remlPoint) remlPoint {
	var prev remlPoint
	for i := range 8 {
		if p.tau2 == 0 || p.score == 0 {
			break
		}
		t := p.tau2 + p.score/p.info
		if i > 0 && prev.score != p.score {
			t = p.tau2 - p.score*(p.tau2-prev.tau2)/(p.score-prev.score)
		}
		if !(t > 0) {
			break
		}
		n := terms(t)
		if !(math.Abs(n.score) < math.Abs(p.score)) {
			break
		}
		prev, p = p, n
	}
	return p
}

// remlBracketing finds the root of the REML score by bracketing, the
// fallback when Fisher scoring fails.
func remlBracketing(d data, o REMLOptions) (REMLFit, error) {
	score := func(t float64) float64 { return remlTerms(d, t).score }
	u0 := score(0)
	if u0 <= 0 {
		return remlFit(remlTerms(d, 0), 0, true), nil
	}
	var sumV float64
	for j, v := range d.v {
		if j != d.skip {
			sumV += v
		}
	}
	hi, uhi, ok := expandUpper(score, math.Max(d.tau2DL(), sumV/float64(d.k())))
	if !ok {
		return REMLFit{}, &ConvergenceError{Method: "REML bracketing", Iterations: 0, Last: hi, Change: math.Inf(1)}
	}
	r := bracketRoot(score, 0, hi, u0, uhi, o.Tolerance, o.MaxIterations)
	if !r.converged {
		return REMLFit{}, &ConvergenceError{Method: "REML bracketing", Iterations: r.iterations, Last: r.x, Change: r.width}
	}
	return remlFit(remlTerms(d, r.x), r.iterations, true), nil
}

func remlFit(p remlPoint, iterations int, fallback bool) REMLFit {
	return REMLFit{
		Tau2:          p.tau2,
		SE:            1 / math.Sqrt(p.info),
		LogLikelihood: p.ll,
		Iterations:    iterations,
		AtBoundary:    p.tau2 == 0,
		UsedFallback:  fallback,
		mu:            p.mu,
		sw:            p.sw,
	}
}
