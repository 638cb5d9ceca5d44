package correlation

import (
	"fmt"
	"math"
)

// FisherZ returns Fisher's z of a correlation,
//
//	z = atanh(r) = ½ ln[(1 + r)/(1 − r)],
//
// approximately normal with variance 1/(n − 3) for a sample of n from a
// bivariate normal population [1]. It returns ErrCorrelationRange unless
// −1 < r < 1.
//
// References:
//
//	[1] Fisher RA (1921). On the "probable error" of a coefficient of
//	    correlation deduced from a small sample. Metron 1:3–32.
func FisherZ(r float64) (float64, error) {
	if err := checkCorrelation("r", r); err != nil {
		return math.NaN(), err
	}
	return math.Atanh(r), nil
}

// FisherCI returns the confidence interval of one correlation at level (a
// proportion), found on the z scale and transformed back:
//
//	tanh( atanh(r) ± z_(1−α/2) / √(n − 3) ).
//
// The interval is asymmetric around r. It returns ErrCorrelationRange,
// ErrSampleSize (n < 4) or an error wrapping infer.ErrProbability.
//
// References:
//
//	[1] Fisher RA (1921). On the "probable error" of a coefficient of
//	    correlation deduced from a small sample. Metron 1:3–32.
func FisherCI(r float64, n int, level float64) ([2]float64, error) {
	nan := [2]float64{math.NaN(), math.NaN()}
	if err := checkCorrelation("r", r); err != nil {
		return nan, err
	}
	if err := checkSampleSize("n", n); err != nil {
		return nan, err
	}
	c, err := criticalValue(level)
	if err != nil {
		return nan, err
	}
	return fisherInterval(r, n, c), nil
}

// independentInput holds validated inputs and the design's Zou interval.
type independentInput struct {
	r1, r2   float64
	n1, n2   int
	level    float64
	ci       [2]float64
	warnings []string
}

func checkIndependent(r1 float64, n1 int, r2 float64, n2 int, level float64) (independentInput, error) {
	in := independentInput{r1: r1, r2: r2, n1: n1, n2: n2, level: level}
	if err := checkCorrelation("r1", r1); err != nil {
		return in, err
	}
	if err := checkCorrelation("r2", r2); err != nil {
		return in, err
	}
	if err := checkSampleSize("n1", n1); err != nil {
		return in, err
	}
	if err := checkSampleSize("n2", n2); err != nil {
		return in, err
	}
	c, err := criticalValue(level)
	if err != nil {
		return in, err
	}
	ci1, ci2 := fisherIntervals(r1, n1, r2, n2, c)
	in.ci, in.warnings = zouInterval(r1, r2, ci1, ci2, 0)
	return in, nil
}

// FisherZTest tests H0: ρ1 = ρ2 for correlations r1 and r2 from independent
// samples of n1 and n2 [1]:
//
//	z = (z1 − z2) / √[1/(n1 − 3) + 1/(n2 − 3)],  z_i = atanh(r_i),
//
// referred to the standard normal. Result.CI is Zou's interval
// (ZouIndependentCI), not tanh of the limits of z1 − z2: those would be
// limits for a transformed difference, not for ρ1 − ρ2 [2]. It returns
// ErrCorrelationRange, ErrSampleSize or an error wrapping
// infer.ErrProbability.
//
// References:
//
//	[1] Fisher RA (1921). On the "probable error" of a coefficient of
//	    correlation deduced from a small sample. Metron 1:3–32.
//	[2] Zou GY (2007). Toward using confidence intervals to compare
//	    correlations. Psychological Methods 12(4):399–413.
func FisherZTest(r1 float64, n1 int, r2 float64, n2 int, level float64) (Result, error) {
	in, err := checkIndependent(r1, n1, r2, n2, level)
	if err != nil {
		return Result{}, err
	}
	return fisherZTest(in), nil
}

func fisherZTest(in independentInput) Result {
	v := 1/float64(in.n1-3) + 1/float64(in.n2-3)
	res := zTest(MethodFisherZ, math.Atanh(in.r1)-math.Atanh(in.r2), v, in.r1-in.r2, in.ci, in.level)
	res.Warnings = append(res.Warnings, in.warnings...)
	return res
}

// ZouIndependentCI returns Zou's interval for ρ1 − ρ2 from independent
// samples [1], built from the Fisher intervals (l_i, u_i) of each
// correlation at the same level:
//
//	L = r1 − r2 − √[(r1 − l1)² + (u2 − r2)²]
//	U = r1 − r2 + √[(u1 − r1)² + (r2 − l2)²]
//
// The Result has no statistic and no p-value (NaN). It returns
// ErrCorrelationRange, ErrSampleSize or an error wrapping
// infer.ErrProbability.
//
// References:
//
//	[1] Zou GY (2007). Toward using confidence intervals to compare
//	    correlations. Psychological Methods 12(4):399–413.
func ZouIndependentCI(r1 float64, n1 int, r2 float64, n2 int, level float64) (Result, error) {
	in, err := checkIndependent(r1, n1, r2, n2, level)
	if err != nil {
		return Result{}, err
	}
	return intervalResult(r1-r2, in.ci, level, in.warnings), nil
}

// CompareIndependent compares correlations r1 and r2 from two independent
// samples of n1 and n2. The primary method is Fisher's z test
// (FisherZTest): for two independent samples it is the standard large-sample
// test, and the difference of z values it tests is what Zou's interval is
// built from. The Comparison's CI is Zou's interval (ZouIndependentCI),
// which Zou (2007) proposed because an interval for ρ1 − ρ2 taken
// symmetrically around r1 − r2 does not keep its coverage; it is also the
// only alternative.
//
// Errors are those of FisherZTest.
func CompareIndependent(r1 float64, n1 int, r2 float64, n2 int, level float64) (Comparison, error) {
	in, err := checkIndependent(r1, n1, r2, n2, level)
	if err != nil {
		return Comparison{}, fmt.Errorf("independent correlations: %w", err)
	}
	return Comparison{
		Design:       DesignIndependent,
		Primary:      fisherZTest(in),
		Alternatives: []Result{intervalResult(r1-r2, in.ci, level, in.warnings)},
		Difference:   r1 - r2,
		CI:           in.ci,
		Level:        level,
	}, nil
}
