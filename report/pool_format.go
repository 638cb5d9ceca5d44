package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"coefaudit/audit"
	"coefaudit/pool"
)

// The pooling reports meant for people (table, Markdown, HTML, xlsx and the
// forest plots) print numbers by the precision rule of the claims' reports
// (audit/precision.go), with a true minus sign: differences,
// estimates and their intervals to one decimal more than the claims'
// estimates were printed with, from 2 to 4 (pool.Topic.Decimals); test
// statistics to 2 decimals; p as journals print it, with no leading zero
// (p = .043, p < .001); τ² to 2 significant digits; I² and weights as
// percentages. JSON and CSV keep every digit.

// poolFormat formats a topic's numbers for people.
type poolFormat int

// num is a difference or estimate to the topic's decimals, written by the
// precision rule (audit.FormatFixed: never "−0.00") with a true minus sign.
func (f poolFormat) num(n audit.Number) string {
	if !n.Known() {
		return "–"
	}
	return minusSign(audit.FormatFixed(float64(n), max(audit.MinDecimals, int(f))))
}

// minusSign turns the hyphen-minus that audit's rule writes, so that its
// text pastes into any program, into the true minus sign of a report
// meant to be read.
func minusSign(s string) string { return strings.Replace(s, "-", "−", 1) }

// ci is an interval in brackets, "[0.12, 0.45]".
func (f poolFormat) ci(ci [2]audit.Number) string {
	if !ci[0].Known() && !ci[1].Known() {
		return "–"
	}
	return "[" + f.num(ci[0]) + ", " + f.num(ci[1]) + "]"
}

// stat2 is a test statistic to audit.StatisticDecimals decimals.
func stat2(n audit.Number) string {
	if !n.Known() {
		return "–"
	}
	return minusSign(audit.FormatStatistic(float64(n)))
}

// poolP writes p as journals print it (audit.PStatement), or says it is
// unknown.
func poolP(p audit.Number) string {
	if !p.Known() {
		return "p unknown"
	}
	return audit.PStatement(float64(p))
}

// percent is a proportion as a percentage with the given decimals.
func percent(n audit.Number, decimals int) string {
	if !n.Known() {
		return "–"
	}
	return strconv.FormatFloat(100*float64(n), 'f', decimals, 64) + "%"
}

// sig2 is a variance such as τ² to 2 significant digits, "0" for zero.
func sig2(n audit.Number) string {
	x := float64(n)
	switch {
	case !n.Known():
		return "–"
	case x == 0:
		return "0"
	case math.Abs(x) < 1e-6:
		return strconv.FormatFloat(x, 'g', 2, 64)
	}
	dec := max(0, 1-int(math.Floor(math.Log10(math.Abs(x)))))
	return minusSign(audit.FormatFixed(x, dec))
}

// poolTest is a pooled estimate's test, "z = 2.14" or "t(8) = 2.14".
func poolTest(p *pool.Estimate) string {
	if !p.Statistic.Known() {
		return "–"
	}
	if !p.DF.Known() {
		return "z = " + stat2(p.Statistic)
	}
	return fmt.Sprintf("t(%s) = %s", strconv.FormatFloat(float64(p.DF), 'f', -1, 64), stat2(p.Statistic))
}

// poolSpread says in words what I² says of the spread between studies.
// The bands of 25%, 50% and 75% are those of Higgins JPT, Thompson SG,
// Deeks JJ, Altman DG (2003). Measuring inconsistency in meta-analyses.
// BMJ 327:557-560 (from memory), a rule of thumb.
func poolSpread(i2 float64) string {
	switch {
	case !(i2 > 0):
		return "the studies agree within their sampling error"
	case i2 < 0.25:
		return "little of the spread between the studies goes beyond their sampling error"
	case i2 < 0.5:
		return "some of the spread between the studies goes beyond their sampling error"
	case i2 < 0.75:
		return "much of the spread between the studies is real variation between them, beyond their sampling error"
	}
	return "most of the spread between the studies is real variation between them, not sampling error"
}

// poolHeterogeneitySentences are the heterogeneity summary of a pooled
// topic in plain sentences: τ² with its interval and I² with what it
// means; Cochran's Q with its test; the prediction interval.
func poolHeterogeneitySentences(t pool.Topic, pct string) []string {
	h := t.Heterogeneity
	if h == nil {
		return nil
	}
	f := poolFormat(t.Decimals)
	out := []string{
		fmt.Sprintf("Between-study variance τ² = %s (%s CI %s to %s, Q-profile), by %s; I² = %s: %s.",
			sig2(h.Tau2), pct, sig2(h.Tau2CI[0]), sig2(h.Tau2CI[1]), t.Tau2Method, percent(h.I2, 0), poolSpread(float64(h.I2))),
		fmt.Sprintf("Cochran's Q = %s on %d df, %s.", stat2(h.Q), h.DF, poolP(h.P)),
	}
	if t.Prediction != nil {
		out = append(out, fmt.Sprintf("The true difference in a new study would lie between %s and %s (%s prediction interval).",
			f.num(t.Prediction.CI[0]), f.num(t.Prediction.CI[1]), pct))
	}
	return out
}

// poolSensitivityText says what the sensitivity analysis of a topic
// assumed and found, or "" when there is none.
func poolSensitivityText(t pool.Topic, pct string) string {
	s := t.Sensitivity
	if s == nil {
		return ""
	}
	f := poolFormat(t.Decimals)
	var rows []string
	for _, a := range s.Added {
		rows = append(rows, strconv.Itoa(a.Row))
	}
	head := fmt.Sprintf("With %s (row(s) %s), %d claims", s.Assumption, strings.Join(rows, ", "), s.K)
	if s.Random == nil {
		return head + " could not be pooled: " + s.Error + "."
	}
	return fmt.Sprintf("%s pool to %s, %s CI %s (Wald) and %s (HKSJ), by random effects (%s); fixed effect %s %s; τ² = %s, I² = %s.",
		head, f.num(s.Random.Estimate), pct, f.ci(s.Random.CI), f.ci(s.HKSJ.CI), s.Tau2Method,
		f.num(s.Fixed.Estimate), f.ci(s.Fixed.CI), sig2(s.Tau2), percent(s.I2, 0))
}

// poolRatioLine gives the pooled ratio of ratios of a topic on the log
// scale, or "".
func poolRatioLine(t pool.Topic) string {
	if t.Scale != "log" || t.Random == nil {
		return ""
	}
	f := poolFormat(t.Decimals)
	e := func(ci [2]audit.Number) [2]audit.Number {
		return [2]audit.Number{audit.Number(math.Exp(float64(ci[0]))), audit.Number(math.Exp(float64(ci[1])))}
	}
	return fmt.Sprintf("Ratio of ratios, exp of the random-effects estimate: %s, CI %s (Wald), %s (HKSJ).",
		f.num(audit.Number(math.Exp(float64(t.Random.Estimate)))), f.ci(e(t.Random.CI)), f.ci(e(t.HKSJ.CI)))
}
