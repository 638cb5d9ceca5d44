package infer

import (
	"errors"
	"math"
	"testing"
)

// studentTLargeDFReference holds {df, two-sided p, t} with p = 2 P(T_df > t)
// at large df, computed with mpmath 1.3.0 at 80 digits by
// testdata/studentt_large_df.py: p as the density's integral beyond t
// (agreeing with the regularized incomplete beta to 1e-49 where both were
// computed), t as its root, to 20 digits.
var studentTLargeDFReference = [][3]float64{
	{1e6, 0.5, 0.67448999553108737862},
	{1e6, 0.05, 1.9599663568141070353},
	{1e6, 1e-3, 3.2905364612486911308},
	{1e6, 1e-8, 5.7307773523516517454},
	{1e6, 1e-20, 9.3362506235384834775},
	{1e6, 1e-100, 21.308363547157574781},
	{1e6, 1e-300, 37.078531718230499388},
	{1e8, 0.5, 0.6744897526494310126},
	{1e8, 0.05, 1.9599640082627668208},
	{1e8, 1e-3, 3.2905268287892040392},
	{1e8, 1e-8, 5.7307293530739439331},
	{1e8, 1e-20, 9.3360469069391861907},
	{1e8, 1e-100, 21.305964301849668223},
	{1e8, 1e-300, 37.065915282980648655},
	{1e10, 0.5, 0.67448975022061523582},
	{1e10, 0.05, 1.9599639847772813586},
	{1e10, 1e-3, 3.2905267324648678598},
	{1e10, 1e-8, 5.730728873084665843},
	{1e10, 1e-20, 9.3360448698111075052},
	{1e10, 1e-100, 21.305940311676280877},
	{1e10, 1e-300, 37.065789154790599716},
	{1e12, 0.5, 0.67448975019632707813},
	{1e12, 0.05, 1.9599639845424265068},
	{1e12, 1e-3, 3.2905267315016245239},
	{1e12, 1e-8, 5.730728868284773412},
	{1e12, 1e-20, 9.3360448494398305097},
	{1e12, 1e-100, 21.305940071774774957},
	{1e12, 1e-300, 37.065787893512314725},
	{1e15, 0.5, 0.67448975019608198854},
	{1e15, 0.05, 1.9599639845400566078},
	{1e15, 1e-3, 3.290526731491904523},
	{1e15, 1e-8, 5.7307288682363381338},
	{1e15, 1e-20, 9.3360448492342658059},
	{1e15, 1e-100, 21.305940069353950693},
	{1e15, 1e-300, 37.065787880784870578},
}

// TestStudentTLargeDFAgainstReference checks both directions against the
// large-df reference table, from the centre to p = 1e-300, to 1e-12
// relative: the tolerance of the README's claim for df 3 to 10,000, here
// met by the Cornish–Fisher series. At df = 1e6 and p = 1e-300 the series
// has not converged (t²/df = 1.4e-3) and the incomplete beta, good there to
// about 2e-10 in p, is still used.
func TestStudentTLargeDFAgainstReference(t *testing.T) {
	checkStudentTReference(t, studentTLargeDFReference, func(df, p float64) float64 {
		if df == 1e6 && p == 1e-300 {
			return 5e-10
		}
		return 1e-12
	})
}

// TestStudentTNormalLimit checks the t at df from 1e6 to 1e300 and at an
// infinite df (which is the normal, by definition) against the normal
// limit. The t quantile exceeds the normal quantile z by the first term of
// the Cornish–Fisher series, a fraction (z² + 1)/(4 df) (Abramowitz &
// Stegun 1964, 26.7.5), up to the terms after it, which here sum to less
// than twice the second, a fraction (5z⁴ + 16z² + 3)/(96 df²), and
// rounding. The two-sided p at t therefore
// exceeds the normal one: log(p_t/p_z) lies between 0 and
// (φ(t)/Q(t)) (t³ + t)/(4 df), where the normal's Mills ratio φ(t)/Q(t)
// is below (t + √(t² + 4))/2 ≤ t + 1 (Birnbaum 1942, Annals of
// Mathematical Statistics 13:245). Each side is allowed 1e-13 for
// rounding; the quantile is finite and its p gives p back to 1e-12.
func TestStudentTNormalLimit(t *testing.T) {
	const rounding = 1e-13
	for _, df := range []float64{1e6, 1e8, 1e10, 1e12, 1e15, 1e16, 1e20, 1e100, 1e300, math.Inf(1)} {
		for _, x := range []float64{0.5, 1.96, 5, 20, 37} {
			p, err := StudentTTwoSidedP(x, df)
			if err != nil || !(p >= 0 && p <= 1) {
				t.Errorf("StudentTTwoSidedP(%v, %v) = %v, %v; want a probability", x, df, p, err)
				continue
			}
			gap := math.Log(p / NormalTwoSidedP(x))
			if limit := (x + 1) * (x*x*x + x) / (4 * df); !(gap >= -rounding && gap <= limit+rounding) {
				t.Errorf("StudentTTwoSidedP(%v, %v) = %v: log ratio to the normal's %.3g, want within [0, %.3g]", x, df, p, gap, limit)
			}
		}
		for _, p := range []float64{1, 0.5, 0.05, 1e-10, 1e-300} {
			q, err := StudentTFromTwoSidedP(p, df)
			z, _ := NormalZFromTwoSidedP(p)
			if err != nil || math.IsNaN(q) || math.IsInf(q, 0) {
				t.Errorf("StudentTFromTwoSidedP(%v, %v) = %v, %v; want a finite quantile", p, df, q, err)
				continue
			}
			z2 := z * z
			first, second := z*(z2+1)/(4*df), z*((5*z2+16)*z2+3)/(96*df*df)
			if d := q - z - first; math.Abs(d) > 2*second+rounding*z {
				t.Errorf("StudentTFromTwoSidedP(%v, %v) = %v: %.3g above the normal quantile %v, want %.3g ± %.3g", p, df, q, q-z, z, first, 2*second)
			}
			if back, _ := StudentTTwoSidedP(q, df); relErr(back, p) > 1e-12 {
				t.Errorf("StudentTTwoSidedP(StudentTFromTwoSidedP(%v, %v) = %v) = %v", p, df, q, back)
			}
		}
	}
}

// TestStudentTTailFallsWithDF checks, from df = 1e-320 to an infinite df
// and from the centre to t = 1e300, that the two-sided p is a probability
// and never rises with df, nor falls below the normal's: the tail of |T|
// falls as df grows, to the normal's (Ghosh 1973, JRSS B 35:480). Each
// comparison allows 1e-12 relative, the tail function's accuracy, and
// 1e-300 absolute, below which no accuracy is claimed (the incomplete beta
// gives 0 for p near 1e-316).
func TestStudentTTailFallsWithDF(t *testing.T) {
	dfs := []float64{1e-320, 1e-300, 1e-100, 1e-20, 1e-10, 1e-3, 0.01, 0.1, 0.5, 1, 1.5, 2, 3, 10, 30, 100, 1e3, 3e3, 1e4, 3e4, 1e5, 3e5, 1e6, 2.5e6, 3e6, 1e7,
		1e8, 1e10, 1e12, 1e13, 1e14, 1e15, 2e15, 5e15, 1e16, 3e16, 1e17, 1e18, 1e20, 1e50, 1e100, 1e300, math.Inf(1)}
	for _, x := range []float64{0.01, 0.3, 1, 1.96, 3, 5, 10, 20, 37, 38.5, 40, 100, 1e3, 1e10, 1e100, 1e300} {
		prev := 1.0
		for _, df := range dfs {
			p, err := StudentTTwoSidedP(x, df)
			if err != nil || !(p >= 0 && p <= 1) {
				t.Errorf("StudentTTwoSidedP(%v, %v) = %v, %v; want a probability", x, df, p, err)
				continue
			}
			if p > prev*(1+1e-12)+1e-300 {
				t.Errorf("StudentTTwoSidedP(%v, %v) = %v, above %v at the df before", x, df, p, prev)
			}
			if n := NormalTwoSidedP(x); p < n*(1-1e-12)-1e-300 {
				t.Errorf("StudentTTwoSidedP(%v, %v) = %v, below the normal's %v", x, df, p, n)
			}
			prev = p
		}
	}
}

// TestStudentTTinyDF checks the quantile at df down to the smallest
// subnormal: it is either finite and gives p back, or refused with
// ErrQuantileRange where the tail at the largest double is still above p,
// so that the quantile is indeed beyond it; nothing panics. A df whose half
// is 0 is refused as not positive.
func TestStudentTTinyDF(t *testing.T) {
	for _, df := range []float64{1e-320, 1e-300, 1e-100, 1e-10, 1e-3, 4e-3, 0.01, 0.1, 0.5} {
		for _, p := range []float64{1, 0.9, 0.05, 1e-10} {
			q, err := StudentTFromTwoSidedP(p, df)
			if err != nil {
				if top, _ := StudentTTwoSidedP(math.MaxFloat64, df); !errors.Is(err, ErrQuantileRange) || !(top > p) {
					t.Errorf("StudentTFromTwoSidedP(%v, %v) = %v, %v; the tail at the largest double is %v", p, df, q, err, top)
				}
				continue
			}
			if back, _ := StudentTTwoSidedP(q, df); math.IsInf(q, 0) || relErr(back, p) > 1e-12 {
				t.Errorf("StudentTTwoSidedP(StudentTFromTwoSidedP(%v, %v) = %v) = %v", p, df, q, back)
			}
		}
	}
	if p, err := StudentTTwoSidedP(1, 5e-324); !errors.Is(err, ErrDegreesOfFreedom) {
		t.Errorf("StudentTTwoSidedP(1, 5e-324) = %v, %v; want ErrDegreesOfFreedom", p, err)
	}
	if q, err := StudentTCriticalValue(0.95, 5e-324); !errors.Is(err, ErrDegreesOfFreedom) {
		t.Errorf("StudentTCriticalValue(0.95, 5e-324) = %v, %v; want ErrDegreesOfFreedom", q, err)
	}
}
