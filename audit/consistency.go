package audit

import (
	"fmt"
	"math"

	"coefaudit/extract"
	"coefaudit/infer"
)

// A coefficient's printed numbers must agree with each other beyond their
// rounding. consistencyProblems checks what can be checked:
//
//   - the estimate inside its own interval;
//   - the interval and the p-value on the same side of the interval's α
//     (an interval excluding the null goes with p < 1 − level);
//   - the p-value against estimate/SE, and a printed t or z against
//     estimate/SE, each over the rounding box of the numbers involved;
//   - df below n.
//
// Each conflict is a problem placed at the coefficient's row and the column
// that disagrees. An asymmetric interval alone is not a conflict.
func consistencyProblems(c *extract.Coefficient) []Problem {
	var out []Problem
	add := func(column, format string, a ...any) {
		out = append(out, problemAt(c.Position, column, fmt.Sprintf("coefficient %s: ", c.Label)+fmt.Sprintf(format, a...)))
	}
	ratio := extract.IsRatioMeasure(c.Measure)
	scale := func(x float64) float64 {
		if ratio {
			return math.Log(x)
		}
		return x
	}
	level := c.CILevel / 100
	if level == 0 {
		level = extract.DefaultCILevel / 100
	}
	df := math.NaN()
	if c.DF.IsExact() && c.DF.Value > 0 {
		df = c.DF.Value
	}
	if c.Estimate.IsExact() && c.CI.Present() {
		h := c.Estimate.HalfUnit() + math.Max(c.CI.Low.HalfUnit(), c.CI.High.HalfUnit())
		if c.Estimate.Value < c.CI.Low.Value-h || c.Estimate.Value > c.CI.High.Value+h {
			add("estimate", "the estimate %s lies outside its own interval %s to %s", c.Estimate.Text, c.CI.Low.Text, c.CI.High.Text)
		}
	}
	if c.CI.Present() && c.P.Present() && (!ratio || (c.CI.Low.Value > 0 && c.CI.High.Value > 0)) {
		null := 0.0
		if ratio {
			null = 1
		}
		lowMin, lowMax := c.CI.Low.RoundingInterval()
		highMin, highMax := c.CI.High.RoundingInterval()
		// Decided whatever the rounding of the limits:
		excludes := lowMin > null || highMax < null
		includes := lowMax < null && highMin > null
		a := 1 - level
		pLo, pHi := pBounds(c.P)
		switch {
		case excludes && pLo >= a:
			add("p", "the %g%% interval %s to %s excludes %g, yet p is %s (not below %g)", 100*level, c.CI.Low.Text, c.CI.High.Text, null, c.P.Text, a)
		case includes && pHi < a:
			add("p", "the %g%% interval %s to %s includes %g, yet p is %s (below %g)", 100*level, c.CI.Low.Text, c.CI.High.Text, null, c.P.Text, a)
		}
	}
	if c.Estimate.IsExact() && c.SE.IsExact() && c.SE.Value > 0 {
		er := transformRange(c.Estimate, scale)
		sLo, sHi := c.SE.RoundingInterval()
		sr := infer.Range{Lo: math.Max(sLo, 1e-12), Hi: sHi}
		if c.Stat.IsExact() {
			zLo, zHi := ratioRange(er, sr)
			tLo, tHi := c.Stat.RoundingInterval()
			if tHi < zLo || tLo > zHi {
				add("stat", "the statistic %s disagrees with estimate/SE = %s/%s, which lies in [%s, %s]", c.Stat.Text, c.Estimate.Text, c.SE.Text, FormatStatistic(zLo), FormatStatistic(zHi))
			}
		}
		if c.P.IsExact() || c.P.Bound == extract.Below {
			pr, err := infer.DifferencePRange(er, sr, df)
			if err == nil {
				pLo, pHi := pBounds(c.P)
				// Without a printed df the paper may have used a t reference:
				// allow the t with n − 2 df as well as the normal.
				if math.IsNaN(df) && c.N.IsExact() && c.N.Value > 3 {
					if pt, err := infer.DifferencePRange(er, sr, c.N.Value-2); err == nil {
						pr.Lo, pr.Hi = math.Min(pr.Lo, pt.Lo), math.Max(pr.Hi, pt.Hi)
					}
				}
				if pHi < pr.Lo*(1-1e-9) || pLo > pr.Hi*(1+1e-9) {
					add("p", "p %s disagrees with estimate/SE = %s/%s, which implies p %s", c.P.Text, c.Estimate.Text, c.SE.Text, PSpan(pr.Lo, pr.Hi))
				}
			}
		}
	}
	if c.DF.IsExact() && c.N.IsExact() && c.DF.Value >= c.N.Value {
		add("df", "df %s is not below n %s", c.DF.Text, c.N.Text)
	}
	return out
}

// pBounds returns the range a printed p allows.
func pBounds(p extract.Printed) (lo, hi float64) {
	switch p.Bound {
	case extract.Below:
		return 0, p.Value
	case extract.Above:
		return p.Value, 1
	case extract.NotSignificant:
		return 0.05, 1
	}
	lo, hi = p.RoundingInterval()
	return math.Max(lo, 0), math.Min(hi, 1)
}

func transformRange(p extract.Printed, f func(float64) float64) infer.Range {
	lo, hi := p.RoundingInterval()
	a, b := f(lo), f(hi)
	if math.IsNaN(a) || math.IsInf(a, 0) {
		a = f(p.Value)
	}
	return infer.Range{Lo: math.Min(a, b), Hi: math.Max(a, b)}
}

// ratioRange returns the range of e/s for e in er and s in sr (s > 0).
func ratioRange(er, sr infer.Range) (lo, hi float64) {
	c := []float64{er.Lo / sr.Lo, er.Lo / sr.Hi, er.Hi / sr.Lo, er.Hi / sr.Hi}
	lo, hi = c[0], c[0]
	for _, x := range c[1:] {
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	return lo, hi
}
