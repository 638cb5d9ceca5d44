package pool

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"coefaudit/audit"
	"coefaudit/infer/meta"
)

// Ways of pooling the claims whose two estimates share a sample but whose
// covariance was never printed, for Covariance.Mode.
const (
	// CovarianceOmit leaves them out (the default): their difference is
	// known, but the SE of it only to lie between |SE1 − SE2| and SE1 + SE2.
	CovarianceOmit = "omit"
	// CovarianceCorrelation pools them, in a sensitivity analysis beside
	// the main result, at a stated sampling correlation ρ of the two
	// estimates: SE² = SE1² + SE2² − 2ρ SE1 SE2.
	CovarianceCorrelation = "correlation"
	// CovarianceBound pools them, in a sensitivity analysis, at the
	// least favourable bound: ρ = −1, SE = SE1 + SE2, the largest SE the
	// printed numbers allow, which gives them the least weight and the
	// widest intervals.
	CovarianceBound = "bound"
)

// Covariance says how Run treats the claims whose SE of the
// difference is only bounded, for want of the two estimates' covariance.
type Covariance struct {
	// Mode is CovarianceOmit (also for ""), CovarianceCorrelation or
	// CovarianceBound.
	Mode string
	// Correlation is ρ for CovarianceCorrelation, in [−1, 1].
	Correlation float64
}

// ErrCovariance is returned for a covariance setting that is neither
// omit, bound nor a correlation in [−1, 1].
var ErrCovariance = errors.New("unknown covariance setting")

// ParseCovariance reads a covariance setting as written on the command
// line: "omit", "bound", or a correlation between −1 and 1 ("0.5").
func ParseCovariance(s string) (Covariance, error) {
	switch t := strings.TrimSpace(strings.ToLower(s)); t {
	case "", CovarianceOmit:
		return Covariance{Mode: CovarianceOmit}, nil
	case CovarianceBound:
		return Covariance{Mode: CovarianceBound, Correlation: -1}, nil
	default:
		rho, err := strconv.ParseFloat(strings.ReplaceAll(t, "−", "-"), 64)
		if err != nil || !(rho >= -1 && rho <= 1) {
			return Covariance{}, fmt.Errorf("covariance %q: %w (want omit, bound, or a correlation between -1 and 1)", s, ErrCovariance)
		}
		return Covariance{Mode: CovarianceCorrelation, Correlation: rho}, nil
	}
}

func (pc Covariance) validate() error {
	switch pc.Mode {
	case "", CovarianceOmit, CovarianceBound:
		return nil
	case CovarianceCorrelation:
		if pc.Correlation >= -1 && pc.Correlation <= 1 {
			return nil
		}
	}
	return fmt.Errorf("pooling: covariance %q with correlation %v: %w", pc.Mode, pc.Correlation, ErrCovariance)
}

func (pc Covariance) pools() bool {
	return pc.Mode == CovarianceCorrelation || pc.Mode == CovarianceBound
}

// rho is the sampling correlation the setting assumes.
func (pc Covariance) rho() float64 {
	if pc.Mode == CovarianceBound {
		return -1
	}
	return pc.Correlation
}

// Assumption says in words what the sensitivity analysis assumes.
func (pc Covariance) assumption() string {
	if pc.Mode == CovarianceBound {
		return "the claims whose covariance was not printed pooled at the least favourable bound: correlation −1 between their two estimates, SE of the difference SE1 + SE2, the largest the printed numbers allow"
	}
	return fmt.Sprintf("the claims whose covariance was not printed pooled at a stated correlation of %s between their two estimates: SE² = SE1² + SE2² − 2ρ SE1 SE2", strconv.FormatFloat(pc.Correlation, 'g', -1, 64))
}

// Sensitivity is the topic pooled again with the claims whose SE of the
// difference is only bounded, at the assumption stated: a sensitivity
// analysis beside the main result, which leaves them out.
type Sensitivity struct {
	// Assumption says in words what was assumed; Correlation is the ρ used.
	Assumption  string       `json:"assumption"`
	Correlation audit.Number `json:"correlation"`
	// K is the number of claims pooled in it, Added those not in the main
	// result, with the SE of their difference under the assumption.
	K     int     `json:"k"`
	Added []Study `json:"added"`
	// Estimates are the pooled estimates; Tau2 and I2 the random-effects
	// τ² (by Tau2Method) and Cochran's I², null when not pooled.
	Estimates
	Tau2       audit.Number `json:"tau2"`
	I2         audit.Number `json:"i2"`
	Tau2Method string       `json:"tau2_method"`
	// Error is why the analysis could not be run, when it could not.
	Error string `json:"error,omitempty"`
}

// boundedDifference returns a claim's difference and the SEs of its two
// estimates when its two estimates share a sample whose covariance was not
// printed (the range over every admissible correlation), so that the SE of
// the difference is only bounded; ok is false for any other claim.
func boundedDifference(c audit.ClaimResult) (d, se1, se2 float64, ok bool) {
	if c.Method != audit.MethodAdmissibleRange || !c.Difference.Known() || !c.First.SE.Known() || !c.Second.SE.Known() ||
		!(c.First.SE > 0) || !(c.Second.SE > 0) {
		return 0, 0, 0, false
	}
	return float64(c.Difference), float64(c.First.SE), float64(c.Second.SE), true
}

// methodAdmissible is the method of a claim tested over every admissible
// correlation of its two estimates.
const methodAdmissible = "admissible-range"

// boundedReason is why a claim with a bounded SE is left out of the main
// result.
func boundedReason(pc Covariance) string {
	r := "the covariance of its two estimates was not printed, so the SE of its difference is known only to lie between |SE1 − SE2| and SE1 + SE2"
	if pc.pools() {
		return r + "; it is pooled in the sensitivity analysis instead"
	}
	return r + "; pool it in a sensitivity analysis with --covariance (a stated correlation, or bound)"
}

// sensitivity pools the main claims together with the bounded ones at the
// covariance setting.
func sensitivity(pc Covariance, main []meta.Study, bounded []audit.ClaimResult, z float64, mo meta.Options) *Sensitivity {
	rho := pc.rho()
	s := &Sensitivity{Assumption: pc.assumption(), Correlation: audit.Number(rho), Added: []Study{}, Tau2: unknown(), I2: unknown()}
	studies := append([]meta.Study(nil), main...)
	for _, c := range bounded {
		d, se1, se2, _ := boundedDifference(c)
		se := math.Sqrt(math.Max(0, se1*se1+se2*se2-2*rho*se1*se2))
		s.Added = append(s.Added, Study{Study: c.Study, Claim: c.Claim, Row: c.Row, First: c.First.Label, Second: c.Second.Label,
			Outcome: c.Outcome, Estimate: audit.Number(d), SE: audit.Number(se), CI: [2]audit.Number{audit.Number(d - z*se), audit.Number(d + z*se)},
			WeightFixed: unknown(), WeightRandom: unknown()})
		if se > 0 {
			studies = append(studies, meta.StudyFromStandardError(fmt.Sprintf("%s, %s (row %d)", c.Study, c.Claim, c.Row), d, se))
		}
	}
	s.K = len(studies)
	if len(studies) < 2 {
		s.Error = fmt.Sprintf("only %d claim(s) can be pooled under this assumption; pooling needs at least 2", len(studies))
		return s
	}
	fixed, err := meta.FixedEffect(studies, mo.Level)
	if err == nil {
		var het meta.Heterogeneity
		het, err = meta.CochranQ(studies)
		s.I2 = audit.Number(het.I2)
	}
	var re meta.RandomEffects
	if err == nil {
		re, err = meta.FitRandomEffects(studies, mo.Method, mo)
		if err != nil && mo.Method == meta.RestrictedMaximumLikelihood {
			re, err = meta.FitRandomEffects(studies, meta.DerSimonianLaird, mo)
		}
	}
	if err != nil {
		s.Error = err.Error()
		return s
	}
	s.Fixed, s.Random, s.HKSJ = estimateOf(fixed), estimateOf(re.Wald), estimateOf(re.HartungKnapp)
	s.Tau2, s.Tau2Method = audit.Number(re.Tau2), re.Method.String()
	return s
}
