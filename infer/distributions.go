package infer

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// ErrDegreesOfFreedom is returned when degrees of freedom are not positive.
var ErrDegreesOfFreedom = errors.New("degrees of freedom must be positive")

// ErrQuantileRange is returned when a t quantile is beyond the largest
// double, which happens only at tiny df (below about 0.004 for a 95%
// interval).
var ErrQuantileRange = errors.New("degrees of freedom too small for a finite t quantile")

// ErrProbability is returned when a probability or level lies outside (0, 1).
var ErrProbability = errors.New("probability must lie strictly between 0 and 1")

// unitNormal is constructed with Sigma 1 on purpose: a zero-value Normal
// silently returns wrong values (LIBRARY-NOTES.md).
var unitNormal = distuv.Normal{Mu: 0, Sigma: 1}

// NormalUpperTail returns P(Z > z) for a standard normal Z,
//
//	Q(z) = erfc(z/√2) / 2,
//
// computed with the complementary error function so that it stays accurate
// far into the tail (to z ≈ 37), where 1 − Φ(z) would lose every digit.
func NormalUpperTail(z float64) float64 {
	return 0.5 * math.Erfc(z/math.Sqrt2)
}

// NormalTwoSidedP returns the two-sided p-value of a standard normal
// statistic,
//
//	p = 2 Q(|z|) = erfc(|z|/√2).
func NormalTwoSidedP(z float64) float64 {
	if math.IsNaN(z) {
		return math.NaN()
	}
	return math.Erfc(math.Abs(z) / math.Sqrt2)
}

// NormalZFromTwoSidedP returns the |z| whose two-sided p-value is p,
// z = Φ⁻¹(1 − p/2), computed as −Φ⁻¹(p/2) so that small p keep their digits.
// It returns ErrProbability unless 0 < p ≤ 1.
func NormalZFromTwoSidedP(p float64) (float64, error) {
	if !(p > 0 && p <= 1) {
		return math.NaN(), fmt.Errorf("two-sided p %v: %w", p, ErrProbability)
	}
	return -unitNormal.Quantile(p / 2), nil
}

// NormalCriticalValue returns the two-sided critical value z_(1−α/2) of a
// confidence level given as a proportion (0.95 for 95%).
func NormalCriticalValue(level float64) (float64, error) {
	if !(level > 0 && level < 1) {
		return math.NaN(), fmt.Errorf("confidence level %v: %w", level, ErrProbability)
	}
	if level == 0.95 {
		return z95, nil
	}
	return -unitNormal.Quantile((1 - level) / 2), nil
}

// z95 is the critical value nearly every interval uses, computed once by
// the same formula.
var z95 = -unitNormal.Quantile((1 - 0.95) / 2)

// StudentTTwoSidedP returns the two-sided p-value of a Student t statistic
// with df degrees of freedom, 2 P(T_df > |t|). It is the regularized
// incomplete beta function
//
//	p = I_x(df/2, 1/2),  x = df/(df + t²) = u²/(1 + u²),  u = √df/|t|,
//
// (Abramowitz & Stegun 1964, 26.7.1 and 26.5.27), with x formed from u so
// that t² cannot overflow: p stays accurate down to the smallest normal
// doubles (p = 6.4e-300 at t = 1e299 with df = 1). Where df is large
// enough for the Cornish–Fisher series to give t from the normal quantile
// to double precision, p is the normal tail of the inverted series, and
// where the t and the normal agree to double precision it is the normal
// tail (tlarge.go); an infinite df is the normal.
func StudentTTwoSidedP(t, df float64) (float64, error) {
	if !(df/2 > 0) { // the beta's parameter: the smallest subnormal df halves to 0
		return math.NaN(), fmt.Errorf("t test with df %v: %w", df, ErrDegreesOfFreedom)
	}
	switch at := math.Abs(t); {
	case math.IsNaN(t):
		return math.NaN(), nil
	case at == 0:
		return 1, nil
	case math.IsInf(at, 1):
		return 0, nil
	case normalLimit(at, df):
		return NormalTwoSidedP(at), nil
	case cornishFisherConverged(at, df):
		return NormalTwoSidedP(normalDeviate(at, df)), nil
	default:
		u := math.Sqrt(df) / at
		if u < 1e-100 {
			// Far enough out that x = u² underflows: the leading term of the
			// series I_x(a, b) = x^a/(a B(a, b)) (1 + O(x)) is exact to double
			// precision, computed in logs, with log u² formed from df and t
			// since u itself may underflow (df = 1e-300, t = 1e300).
			a := df / 2
			lb, _ := math.Lgamma(a)
			lh, _ := math.Lgamma(0.5)
			lab, _ := math.Lgamma(a + 0.5)
			logU2 := math.Log(df) - 2*math.Log(at)
			return math.Min(1, math.Exp(a*logU2-math.Log(a)-(lb+lh-lab))), nil
		}
		if tailUnderflows(u, df) {
			// So that the incomplete beta never sees a df beyond 2.4e6,
			// where it is off, with p far below any double.
			return 0, nil
		}
		x := u * u / (1 + u*u)
		if x > df/(df+1) && u*u > unitRoundoff {
			// Beyond the mean of the beta distribution, df/(df + 1), p is
			// above about one half, and the complement, with 1 − x formed
			// from u, keeps its digits. Below it p may be tiny even with
			// x near 1 (large df), so it is computed directly; so it is
			// when 1 − x rounds to 1 (df below 1e-16 t²), where the
			// complement would give 0 for a p near 1.
			return 1 - mathext.RegIncBeta(0.5, df/2, 1/(1+u*u)), nil
		}
		// gonum's incomplete beta can exceed 1 at tiny df (1 + 2.3e-14 at
		// df = 2e-300, +Inf once df/2 is subnormal), where p is 1 to double
		// precision.
		return math.Min(1, mathext.RegIncBeta(df/2, 0.5, x)), nil
	}
}

// StudentTFromTwoSidedP returns the |t| with df degrees of freedom whose
// two-sided p-value is p: the root of StudentTTwoSidedP, found by Halley's
// method in log coordinates (see studentTQuantile), so that the two
// functions invert each other to the tail function's own accuracy, down to
// p = 1e-300. gonum's StudentsT.Quantile is used only if that iteration
// fails to settle: in the far tail it is wrong (at df = 1000 and p = 1e-20
// it gives 3.0e9 for 9.546). Where df is large enough, t is the
// Cornish–Fisher series in the normal quantile, or the normal quantile
// itself where the two agree to double precision (tlarge.go); an infinite
// df is the normal.
func StudentTFromTwoSidedP(p, df float64) (float64, error) {
	if !(p > 0 && p <= 1) {
		return math.NaN(), fmt.Errorf("two-sided p %v: %w", p, ErrProbability)
	}
	if !(df/2 > 0) {
		return math.NaN(), fmt.Errorf("t quantile with df %v: %w", df, ErrDegreesOfFreedom)
	}
	z := -unitNormal.Quantile(p / 2)
	switch {
	case normalLimit(z, df):
		return z, nil
	case cornishFisherConverged(z, df):
		return cornishFisher(z, df), nil
	}
	q, ok := studentTQuantile(p, z, df)
	if !ok {
		st := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}
		q = -st.Quantile(p / 2)
	}
	if !(q < math.Inf(1)) {
		// The tail falls as t^−df, so below df ≈ −log p / 709 the
		// quantile is beyond the largest double.
		return math.NaN(), fmt.Errorf("t quantile at p %.3g with df %v: %w", p, df, ErrQuantileRange)
	}
	return q, nil
}

// StudentTCriticalValue returns t_(1−α/2, df) for a two-sided confidence
// level given as a proportion.
func StudentTCriticalValue(level, df float64) (float64, error) {
	if !(level > 0 && level < 1) {
		return math.NaN(), fmt.Errorf("confidence level %v: %w", level, ErrProbability)
	}
	key := criticalKey{math.Float64bits(level), math.Float64bits(df)}
	if t, ok := criticalValues.Load(key); ok {
		return t.(float64), nil
	}
	t, err := StudentTFromTwoSidedP(1-level, df)
	if err != nil {
		return t, err
	}
	criticalValues.Store(key, t)
	return t, nil
}

// criticalValues remembers StudentTCriticalValue's results, keyed by
// criticalKey: reading a literature's intervals asks for the same few
// critical values (95% at the df of each sample size) over and over, each
// costing several incomplete beta values. It is kept because
// BenchmarkReconstructPairedFile (package extract) is far slower without
// it. It holds one entry per valid (level, df) pair asked for, so it grows
// with the number of distinct df in the input, not with its rows.
var criticalValues sync.Map

// criticalKey is a level and a df as their bits. A key of plain bits is
// hashed and compared as memory, where float fields are taken one by one
// (BenchmarkAuditMillion in package report); the two agree on every key
// stored, which has a level in (0, 1) and a positive df.
type criticalKey struct{ level, df uint64 }

// ChiSquareUpperTail returns P(X > x) for a chi-square variable with df
// degrees of freedom, the regularized upper incomplete gamma function
// Q(df/2, x/2).
func ChiSquareUpperTail(x, df float64) (float64, error) {
	if !(df > 0) {
		return math.NaN(), fmt.Errorf("chi-square with df %v: %w", df, ErrDegreesOfFreedom)
	}
	if x <= 0 {
		return 1, nil
	}
	return mathext.GammaIncRegComp(df/2, x/2), nil
}

// FUpperTail returns P(F > f) for an F variable with (d1, d2) degrees of
// freedom, computed directly as the regularized incomplete beta function on
// swapped arguments,
//
//	P(F > f) = I_{d2/(d2 + d1 f)}(d2/2, d1/2),
//
// because gonum's F.Survival is 1 − CDF and loses the tail
// (LIBRARY-NOTES.md: 1.1e-16 where the truth is 4.1e-42).
func FUpperTail(f, d1, d2 float64) (float64, error) {
	if !(d1 > 0 && d2 > 0) {
		return math.NaN(), fmt.Errorf("F with df (%v, %v): %w", d1, d2, ErrDegreesOfFreedom)
	}
	if f <= 0 {
		return 1, nil
	}
	return mathext.RegIncBeta(d2/2, d1/2, d2/(d2+d1*f)), nil
}
