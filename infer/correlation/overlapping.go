package correlation

import (
	"fmt"
	"math"

	"coefaudit/infer"
)

// overlappingInput holds validated inputs of an overlapping comparison and
// the quantities every method shares.
type overlappingInput struct {
	rjk, rjh, rkh float64
	n             int
	level         float64
	det           float64 // |R| of j, k, h
	ci            [2]float64
	warnings      []string
}

// checkOverlapping validates r(j,k), r(j,h), r(k,h), n and level, checks
// that the three correlations can coexist (|R| > 0; with every |r| < 1 this
// is positive definiteness) and computes Zou's interval.
func checkOverlapping(rjk, rjh, rkh float64, n int, level float64) (overlappingInput, error) {
	in := overlappingInput{rjk: rjk, rjh: rjh, rkh: rkh, n: n, level: level}
	for _, c := range []struct {
		name string
		r    float64
	}{{"r(j,k)", rjk}, {"r(j,h)", rjh}, {"r(k,h)", rkh}} {
		if err := checkCorrelation(c.name, c.r); err != nil {
			return in, err
		}
	}
	if err := checkSampleSize("n", n); err != nil {
		return in, err
	}
	in.det = 1 - rjk*rjk - rjh*rjh - rkh*rkh + 2*rjk*rjh*rkh
	if !(in.det > 0) {
		return in, fmt.Errorf("r(j,k) = %v, r(j,h) = %v, r(k,h) = %v give |R| = %.4g: %w",
			rjk, rjh, rkh, in.det, ErrNotPositiveDefinite)
	}
	c, err := criticalValue(level)
	if err != nil {
		return in, err
	}
	ci1, ci2 := fisherIntervals(rjk, n, rjh, n, c)
	in.ci, in.warnings = zouInterval(rjk, rjh, ci1, ci2, OverlappingSamplingCorrelation(rjk, rjh, rkh))
	return in, nil
}

// OverlappingSamplingCorrelation returns the large-sample correlation
// between r(j,k) and r(j,h) measured on the same individuals, with the
// population values replaced by the sample ones (Pearson & Filon 1898, in
// the form of Dunn & Clark 1969 and Zou 2007):
//
//	ψ = r_kh (1 − r_jk² − r_jh²) − ½ r_jk r_jh (1 − r_jk² − r_jh² − r_kh²)
//	c = ψ / [(1 − r_jk²)(1 − r_jh²)]
//
// It is also the large-sample correlation of the two Fisher z values. The
// inputs are not validated; it returns NaN when |r_jk| or |r_jh| is 1.
//
// References:
//
//	[1] Dunn OJ, Clark V (1969). Correlation coefficients measured on the
//	    same individuals. Journal of the American Statistical Association
//	    64(325):366–377.
//	[2] Zou GY (2007). Toward using confidence intervals to compare
//	    correlations. Psychological Methods 12(4):399–413.
func OverlappingSamplingCorrelation(rjk, rjh, rkh float64) float64 {
	psi := rkh*(1-rjk*rjk-rjh*rjh) - 0.5*rjk*rjh*(1-rjk*rjk-rjh*rjh-rkh*rkh)
	den := (1 - rjk*rjk) * (1 - rjh*rjh)
	if den == 0 {
		return math.NaN()
	}
	return psi / den
}

// WilliamsT tests H0: ρ(j,k) = ρ(j,h) for two correlations of one sample of
// n that share the variable j, given r(k,h) [1], in the form Steiger (1980,
// eq. 7) gives it [2]:
//
//	t = (r_jk − r_jh) √{ (n − 1)(1 + r_kh) /
//	      [ 2 ((n − 1)/(n − 3)) |R| + r̄² (1 − r_kh)³ ] },
//	|R| = 1 − r_jk² − r_jh² − r_kh² + 2 r_jk r_jh r_kh,  r̄ = (r_jk + r_jh)/2,
//
// referred to Student's t with n − 3 df. Result.Estimate is r_jk − r_jh and
// Result.SE its standard error, so that Stat = Estimate/SE. Result.CI is
// Zou's interval (ZouOverlappingCI). It returns ErrCorrelationRange,
// ErrSampleSize, ErrNotPositiveDefinite (|R| ≤ 0) or an error wrapping
// infer.ErrProbability.
//
// References:
//
//	[1] Williams EJ (1959). The comparison of regression variables. Journal
//	    of the Royal Statistical Society B 21(2):396–399.
//	[2] Steiger JH (1980). Tests for comparing elements of a correlation
//	    matrix. Psychological Bulletin 87(2):245–251.
func WilliamsT(rjk, rjh, rkh float64, n int, level float64) (Result, error) {
	in, err := checkOverlapping(rjk, rjh, rkh, n, level)
	if err != nil {
		return Result{}, err
	}
	return williamsT(in)
}

func williamsT(in overlappingInput) (Result, error) {
	nf := float64(in.n)
	rbar := (in.rjk + in.rjh) / 2
	q := 1 - in.rkh
	v := (2*((nf-1)/(nf-3))*in.det + rbar*rbar*q*q*q) / ((nf - 1) * (1 + in.rkh))
	d := in.rjk - in.rjh
	res := Result{Method: MethodWilliamsT, Estimate: d, SE: math.Sqrt(v),
		DF: nf - 3, Difference: d, CI: in.ci, Level: in.level,
		Warnings: append([]string(nil), in.warnings...)}
	res.Stat = d / res.SE
	p, err := infer.StudentTTwoSidedP(res.Stat, res.DF)
	if err != nil {
		return Result{}, fmt.Errorf("Williams' t: %w", err)
	}
	res.P = p
	return res, nil
}

// SteigerZ tests H0: ρ(j,k) = ρ(j,h) on Fisher z values [1], with the
// sampling covariance evaluated at the pooled estimate r̄ of the common
// value that H0 asserts (Steiger's modification of Dunn & Clark 1969 [2]):
//
//	r̄ = (r_jk + r_jh)/2
//	ψ̄ = r_kh (1 − 2 r̄²) − ½ r̄² (1 − 2 r̄² − r_kh²),  s̄ = ψ̄ / (1 − r̄²)²
//	Z = (z_jk − z_jh) √(n − 3) / √(2 − 2 s̄),
//
// referred to the standard normal. Result.Estimate is z_jk − z_jh. The
// formula is as recalled from Steiger (1980); the paper's text was not
// available to re-read. Errors are those of WilliamsT.
//
// References:
//
//	[1] Steiger JH (1980). Tests for comparing elements of a correlation
//	    matrix. Psychological Bulletin 87(2):245–251.
//	[2] Dunn OJ, Clark V (1969). Correlation coefficients measured on the
//	    same individuals. Journal of the American Statistical Association
//	    64(325):366–377.
func SteigerZ(rjk, rjh, rkh float64, n int, level float64) (Result, error) {
	in, err := checkOverlapping(rjk, rjh, rkh, n, level)
	if err != nil {
		return Result{}, err
	}
	return steigerZ(in), nil
}

func steigerZ(in overlappingInput) Result {
	rbar := (in.rjk + in.rjh) / 2
	r2 := rbar * rbar
	psi := in.rkh*(1-2*r2) - 0.5*r2*(1-2*r2-in.rkh*in.rkh)
	s := psi / ((1 - r2) * (1 - r2))
	res := zTest(MethodSteigerZ, math.Atanh(in.rjk)-math.Atanh(in.rjh),
		(2-2*s)/float64(in.n-3), in.rjk-in.rjh, in.ci, in.level)
	res.Warnings = append(res.Warnings, in.warnings...)
	return res
}

// MengRosenthalRubinZ tests H0: ρ(j,k) = ρ(j,h) with the z of Meng,
// Rosenthal & Rubin [1], asymptotically equivalent to Dunn & Clark's test
// but simpler:
//
//	r̄² = (r_jk² + r_jh²)/2
//	f = (1 − r_kh) / [2 (1 − r̄²)],  set to 1 if larger
//	h = (1 − f r̄²) / (1 − r̄²)
//	Z = (z_jk − z_jh) √{ (n − 3) / [2 (1 − r_kh) h] },
//
// referred to the standard normal. Result.Estimate is z_jk − z_jh; a
// warning says when f was capped. Errors are those of WilliamsT.
//
// References:
//
//	[1] Meng X-L, Rosenthal R, Rubin DB (1992). Comparing correlated
//	    correlation coefficients. Psychological Bulletin 111(1):172–175.
func MengRosenthalRubinZ(rjk, rjh, rkh float64, n int, level float64) (Result, error) {
	in, err := checkOverlapping(rjk, rjh, rkh, n, level)
	if err != nil {
		return Result{}, err
	}
	return mengRosenthalRubinZ(in), nil
}

func mengRosenthalRubinZ(in overlappingInput) Result {
	r2 := (in.rjk*in.rjk + in.rjh*in.rjh) / 2
	f := (1 - in.rkh) / (2 * (1 - r2))
	var capped []string
	if f > 1 {
		capped = append(capped, fmt.Sprintf("mrr-z: f = %.4g exceeds 1 and was set to 1, as the method prescribes", f))
		f = 1
	}
	h := (1 - f*r2) / (1 - r2)
	res := zTest(MethodMengRosenthalRubinZ, math.Atanh(in.rjk)-math.Atanh(in.rjh),
		2*(1-in.rkh)*h/float64(in.n-3), in.rjk-in.rjh, in.ci, in.level)
	res.Warnings = append(append(res.Warnings, capped...), in.warnings...)
	return res
}

// ZouOverlappingCI returns Zou's interval for ρ(j,k) − ρ(j,h), two
// correlations of one sample of n sharing the variable j [1]. With (l, u)
// the Fisher interval of each correlation at level and c their sampling
// correlation (OverlappingSamplingCorrelation),
//
//	L = r_jk − r_jh − √[(r_jk − l_jk)² + (u_jh − r_jh)² − 2c (r_jk − l_jk)(u_jh − r_jh)]
//	U = r_jk − r_jh + √[(u_jk − r_jk)² + (r_jh − l_jh)² − 2c (u_jk − r_jk)(r_jh − l_jh)].
//
// The Result has no statistic and no p-value (NaN). Errors are those of
// WilliamsT.
//
// References:
//
//	[1] Zou GY (2007). Toward using confidence intervals to compare
//	    correlations. Psychological Methods 12(4):399–413.
func ZouOverlappingCI(rjk, rjh, rkh float64, n int, level float64) (Result, error) {
	in, err := checkOverlapping(rjk, rjh, rkh, n, level)
	if err != nil {
		return Result{}, err
	}
	return intervalResult(rjk-rjh, in.ci, level, in.warnings), nil
}

// CompareOverlapping compares r(j,k) with r(j,h), two correlations of one
// sample of n that share the variable j, given r(k,h). The primary method
// is Williams' t (WilliamsT): Steiger (1980) recommended it in place of
// Hotelling's t, which it corrects, and in the simulations of Hittner, May &
// Silver (2003) it was among the tests that kept closest to the nominal
// level (both recalled, not re-read: neither paper's text was available).
// It is also the one test of the design on the scale of r itself. The alternatives are SteigerZ, MengRosenthalRubinZ
// and ZouOverlappingCI, in that order. The Comparison's CI is Zou's
// interval.
//
// Errors are those of WilliamsT, wrapped with the design's name.
func CompareOverlapping(rjk, rjh, rkh float64, n int, level float64) (Comparison, error) {
	in, err := checkOverlapping(rjk, rjh, rkh, n, level)
	if err != nil {
		return Comparison{}, fmt.Errorf("overlapping correlations: %w", err)
	}
	primary, err := williamsT(in)
	if err != nil {
		return Comparison{}, fmt.Errorf("overlapping correlations: %w", err)
	}
	return Comparison{
		Design:  DesignOverlapping,
		Primary: primary,
		Alternatives: []Result{
			steigerZ(in),
			mengRosenthalRubinZ(in),
			intervalResult(rjk-rjh, in.ci, level, in.warnings),
		},
		Difference: rjk - rjh,
		CI:         in.ci,
		Level:      level,
	}, nil
}
