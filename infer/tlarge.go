package infer

import "math"

// Student's t at large df. gonum's incomplete beta normalizes with
// log-gamma values of about (df/2) log df, whose rounding costs relative
// accuracy as df grows (about 1e-10 at df = 1e5, 5e-5 at 1e12) until, at
// df = 1e15, the tail it gives is no probability at all (1.8 for
// t = 1.96). At large df the t is therefore computed from the normal,
// through the Cornish–Fisher expansion of the t quantile in the normal one
// [1, 2]:
//
//	t = z + g₁(z)/ν + g₂(z)/ν² + g₃(z)/ν³ + g₄(z)/ν⁴ + …
//	g₁(z) = (z³ + z)/4
//	g₂(z) = (5z⁵ + 16z³ + 3z)/96
//	g₃(z) = (3z⁷ + 19z⁵ + 17z³ − 15z)/384
//	g₄(z) = (79z⁹ + 776z⁷ + 1482z⁵ − 1920z³ − 945z)/92160
//
// References:
//
//	[1] Abramowitz M, Stegun IA (1964). Handbook of Mathematical Functions.
//	    National Bureau of Standards, 26.7.5.
//	[2] Johnson NL, Kotz S, Balakrishnan N (1995). Continuous Univariate
//	    Distributions, vol. 2, 2nd ed. Wiley, ch. 28.

// unitRoundoff is 2⁻⁵³, half the spacing of doubles just above 1: a
// relative change smaller than this is lost in rounding to a double.
const unitRoundoff = 0x1p-53

// normalLimit reports whether, at df degrees of freedom, the t deviate x (a
// |t|, or the normal quantile of a p) equals the normal one to double
// precision, so that the t can be taken as the normal. By the first term
// of the Cornish–Fisher series the t quantile exceeds z by the fraction
// (z² + 1)/(4ν); once that is below the unit roundoff the two quantiles are
// the same double, and the two p-values at a given x differ by less than
// rounding x itself to a double changes either (by the same factor, the
// relative slope of the tail). The switch-over df is therefore
// (x² + 1)/(4 · 2⁻⁵³): 2.3e15 at x = 0, 1.1e16 at x = 1.96, 3.1e18 at
// x = 37 (p = 1e-300). An infinite df is the normal.
func normalLimit(x, df float64) bool {
	r := x / math.Sqrt(df) // x²/ν = r², without overflowing x²
	return (r*r+1/df)/4 < unitRoundoff
}

// cornishFisherConverged reports whether the Cornish–Fisher series, summed
// to g₄, gives the t deviate x at df degrees of freedom to double
// precision: whether its last term is below the unit roundoff relative to
// x, bounded with the coefficients' absolute values so that a root of g₄
// cannot pass for convergence. In terms of w = x²/ν and v = 1/ν,
//
//	|g₄(x)|/(x ν⁴) ≤ (79w⁴ + 776w³v + 1482w²v² + 1920wv³ + 945v⁴)/92160.
//
// It holds from df = 3.1e3 at x = 0, and at large df wherever
// x²/ν < 6e-4. Beyond that, once df exceeds 2.4e6, p is below the smallest
// double (tailUnderflows), so the incomplete beta is never asked for a
// larger df; below it, it is good to about 2e-10.
func cornishFisherConverged(x, df float64) bool {
	r := x / math.Sqrt(df)
	w, v := r*r, 1/df
	b := (((79*w+776*v)*w+1482*v*v)*w+1920*v*v*v)*w + 945*v*v*v*v
	return b/92160 < unitRoundoff
}

// cornishFisher returns the t quantile with df degrees of freedom whose
// normal quantile is z, by the series above to its fourth term.
func cornishFisher(z, df float64) float64 {
	z2, v := z*z, 1/df
	g1 := (z2 + 1) / 4
	g2 := ((5*z2+16)*z2 + 3) / 96
	g3 := (((3*z2+19)*z2+17)*z2 - 15) / 384
	g4 := ((((79*z2+776)*z2+1482)*z2-1920)*z2 - 945) / 92160
	return z + z*v*(g1+v*(g2+v*(g3+v*g4)))
}

// normalDeviate inverts cornishFisher: the z whose t quantile is t. It is
// the fixed point of z = t − (cornishFisher(z) − z), a contraction by the
// slope of the correction, about (3z² + 1)/(4ν), which is below 5e-4
// wherever the series has converged (z²/ν < 6e-4): each step gains three
// digits, and a handful reach the double nearest the root.
func normalDeviate(t, df float64) float64 {
	z := t
	for range 20 {
		next := t - (cornishFisher(z, df) - z)
		if math.Abs(next-z) <= 2*unitRoundoff*math.Abs(next) {
			return next
		}
		z = next
	}
	return z
}

// tailUnderflows reports whether the two-sided tail of Student's t with
// df ≥ 1 degrees of freedom at |t| = √df/u is below the smallest positive
// double, by the bound
//
//	p ≤ √(πν/2) (1 + t²/ν)^−(ν−1)/2,
//
// which follows from the density c (1 + s²/ν)^−(ν+1)/2 with
// c < 1/√(2π) (Wendel 1948, Γ(x + ½)/Γ(x) < √x) and, for ν ≥ 1,
// (1 + s²/ν)^−(ν−1)/2 ≤ (1 + t²/ν)^−(ν−1)/2 beyond t and
// ∫₀^∞ (1 + s²/ν)⁻¹ ds = π√ν/2.
//
//	[1] Wendel JG (1948). Note on the gamma function. American
//	    Mathematical Monthly 55:563–564.
func tailUnderflows(u, df float64) bool {
	if !(df >= 1) {
		return false
	}
	logBound := 0.5*math.Log(math.Pi*df/2) - (df-1)/2*math.Log1p(1/(u*u))
	return logBound < math.Log(math.SmallestNonzeroFloat64)
}
