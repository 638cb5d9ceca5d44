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

func tau2DL(studies []Study) float64 {
	var sw, sw2 float64
	for _, s := range studies {
		w := 1 / s.Variance
		sw += w
		sw2 += w * w
	}
	q := generalizedQ(studies, 0)
	t := (q - float64(len(studies)-1)) / (sw - sw2/sw)
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
	o := opts.resolved()
	fit, err := remlFisherScoring(studies, tau2DL(studies), o)
	if err == nil {
		return fit, nil
	}
	fb, fbErr := remlBracketing(studies, o)
	if fbErr != nil {
		return REMLFit{}, fmt.Errorf("REML tau2 (Fisher scoring: %v): %w", err, fbErr)
	}
	fb.Iterations += fit.Iterations
	return fb, nil
}

// remlTerms evaluates ℓ_R, its score U and the expected information I.
func remlTerms(studies []Study, tau2 float64) (ll, score, info float64) {
	mu, sw := weightedMean(studies, tau2)
	var logV, sw2, sw3, rss, wr2 float64
	for _, s := range studies {
		v := s.Variance + tau2
		w := 1 / v
		d := s.Effect - mu
		logV += math.Log(v)
		sw2 += w * w
		sw3 += w * w * w
		rss += w * d * d
		wr2 += w * w * d * d
	}
	ll = -0.5 * (logV + math.Log(sw) + rss)
	score = 0.5 * (wr2 - sw + sw2/sw)
	info = 0.5 * (sw2 - 2*sw3/sw + sw2*sw2/(sw*sw))
	return ll, score, info
}

func remlFisherScoring(studies []Study, start float64, o REMLOptions) (REMLFit, error) {
	tau2 := start
	ll, score, info := remlTerms(studies, tau2)
	change := math.Inf(1)
	for it := 1; it <= o.MaxIterations; it++ {
		if tau2 == 0 && score <= 0 {
			return remlFit(studies, 0, it-1, false), nil
		}
		step := score / info
		next := math.Max(0, tau2+step)
		nll, nscore, ninfo := remlTerms(studies, next)
		// Step halving: scoring can overshoot where ℓ_R is far from
		// quadratic, typically for large τ².
		for h := 0; h < 50 && !(nll >= ll) && next != tau2; h++ {
			step /= 2
			next = math.Max(0, tau2+step)
			nll, nscore, ninfo = remlTerms(studies, next)
		}
		if math.IsNaN(nll) || math.IsNaN(next) {
			return REMLFit{Iterations: it}, &ConvergenceError{Method: "REML Fisher scoring", Iterations: it, Last: next, Change: math.NaN()}
		}
		change = math.Abs(next - tau2)
		tau2, ll, score, info = next, nll, nscore, ninfo
		if change <= o.Tolerance*math.Max(1, tau2) {
			return remlFit(studies, tau2, it, false), nil
		}
	}
	return REMLFit{Iterations: o.MaxIterations}, &ConvergenceError{
		Method: "REML Fisher scoring", Iterations: o.MaxIterations, Last: tau2, Change: change}
}

// remlBracketing finds the root of the REML score by bracketing, the
// fallback when Fisher scoring fails.
func remlBracketing(studies []Study, o REMLOptions) (REMLFit, error) {
	score := func(t float64) float64 {
		_, u, _ := remlTerms(studies, t)
		return u
	}
	u0 := score(0)
	if u0 <= 0 {
		return remlFit(studies, 0, 0, true), nil
	}
	var sumV float64
	for _, s := range studies {
		sumV += s.Variance
	}
	hi, uhi, ok := expandUpper(score, math.Max(tau2DL(studies), sumV/float64(len(studies))))
	if !ok {
		return REMLFit{}, &ConvergenceError{Method: "REML bracketing", Iterations: 0, Last: hi, Change: math.Inf(1)}
	}
	r := bracketRoot(score, 0, hi, u0, uhi, o.Tolerance, o.MaxIterations)
	if !r.converged {
		return REMLFit{}, &ConvergenceError{Method: "REML bracketing", Iterations: r.iterations, Last: r.x, Change: r.width}
	}
	return remlFit(studies, r.x, r.iterations, true), nil
}

func remlFit(studies []Study, tau2 float64, iterations int, fallback bool) REMLFit {
	ll, _, info := remlTerms(studies, tau2)
	return REMLFit{
		Tau2:          tau2,
		SE:            1 / math.Sqrt(info),
		LogLikelihood: ll,
		Iterations:    iterations,
		AtBoundary:    tau2 == 0,
		UsedFallback:  fallback,
	}
}
