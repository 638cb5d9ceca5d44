package report

import (
	"fmt"
	"html"
	"math"
	"slices"
	"strconv"
	"strings"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/infer"
)

// chartRow is one interval of a claim's chart.
type chartRow struct {
	label         string
	est, lo, hi   float64 // lo and hi NaN when the interval is not known
	difference    bool
	intervalLabel string
}

// chartRows collects what the chart of a claim draws: both estimates with
// their Wald intervals, and the difference with its interval, all on the
// scale the difference is on.
//
// The estimates' intervals are rebuilt from the result as
//
//	estimate ± z₀.₉₇₅ · SE      (z₀.₉₇₅ = 1.959964)
//
// on the analysis scale (the log for ratio measures, Fisher's z for
// correlations), since the report carries the SEs and not the printed
// intervals. When the difference of two correlations is on the
// correlation scale, the estimates are moved there by tanh, which gives
// the usual Fisher interval for each correlation. The difference's
// interval is the result's; when only its SE is known it is
// difference ± z₁₋α/₂ · SE.
func chartRows(c *audit.ClaimResult) []chartRow {
	z95, err := infer.NormalCriticalValue(0.95)
	if err != nil {
		return nil
	}
	toCorrelation := c.Measure == extract.MeasureR && c.Scale == audit.ScaleCorrelation
	var rows []chartRow
	for i, s := range []audit.Side{c.First, c.Second} {
		if !s.Estimate.Known() {
			continue
		}
		r := chartRow{label: []string{"first", "second"}[i] + ": " + s.Label, est: float64(s.Estimate),
			lo: math.NaN(), hi: math.NaN(), intervalLabel: "95% interval, estimate ± 1.96 SE"}
		if s.SE.Known() {
			r.lo, r.hi = r.est-z95*float64(s.SE), r.est+z95*float64(s.SE)
		}
		if c.Scale == extract.ScaleLog {
			r.intervalLabel = "95% interval, exp(log ratio ± 1.96 SE)"
		}
		if toCorrelation {
			r.est, r.lo, r.hi = math.Tanh(r.est), math.Tanh(r.lo), math.Tanh(r.hi)
			r.intervalLabel = "95% Fisher interval"
		}
		rows = append(rows, r)
	}
	if c.Difference.Known() {
		level := 1 - c.Alpha
		if c.Alpha <= 0 || c.Alpha >= 1 {
			level = 1 - extract.DefaultAlpha
		}
		r := chartRow{label: "difference", est: float64(c.Difference), lo: math.NaN(), hi: math.NaN(), difference: true,
			intervalLabel: fmt.Sprintf("%g%% interval", 100*level)}
		switch {
		case c.DifferenceCI[0].Known() && c.DifferenceCI[1].Known():
			r.lo, r.hi = float64(c.DifferenceCI[0]), float64(c.DifferenceCI[1])
		case c.DifferenceSE.Known():
			if z, err := infer.NormalCriticalValue(level); err == nil {
				r.lo, r.hi = r.est-z*float64(c.DifferenceSE), r.est+z*float64(c.DifferenceSE)
			}
		}
		if math.IsNaN(r.lo) {
			r.intervalLabel = "interval not known"
		}
		rows = append(rows, r)
	}
	return rows
}

// chartCaption is the legend of a claim's chart: it names only what
// chartRows draws (a dot per estimate drawn, with its interval when known;
// the diamond of the difference, with its interval when known), and the
// dashed line at zero.
func chartCaption(c *audit.ClaimResult) string {
	var dots, diamond []chartRow
	for _, r := range chartRows(c) {
		if r.difference {
			diamond = append(diamond, r)
		} else {
			dots = append(dots, r)
		}
	}
	if len(dots)+len(diamond) == 0 {
		return ""
	}
	var parts []string
	if len(dots) > 0 {
		what, each := "the estimate", "with its "
		if len(dots) == 2 {
			what, each = "the two estimates", "each with its "
		}
		if c.Scale == extract.ScaleLog {
			what = strings.Replace(what, "estimate", "ratio", 1)
		}
		var with []string
		for _, r := range dots {
			if !math.IsNaN(r.lo) && !slices.Contains(with, r.intervalLabel) {
				with = append(with, r.intervalLabel)
			}
		}
		if len(with) > 0 {
			what += ", " + each + strings.Join(with, " or ")
		}
		parts = append(parts, "Dots: "+what+".")
	}
	if len(diamond) > 0 {
		what := "the difference"
		if c.Scale == extract.ScaleLog {
			what = "the ratio of the two ratios"
		}
		if !math.IsNaN(diamond[0].lo) {
			what += " with its " + diamond[0].intervalLabel
		}
		parts = append(parts, "Diamond: "+what+".")
	}
	zero := "zero"
	if c.Scale == extract.ScaleLog {
		zero = "a ratio of 1"
	}
	parts = append(parts, "Dashed line: "+zero+", on the "+chartScale(c)+".")
	return strings.Join(parts, " ")
}

// chartScale names the axis of a claim's chart.
func chartScale(c *audit.ClaimResult) string {
	switch c.Scale {
	case extract.ScaleLog:
		return "ratio scale, drawn as logs"
	case extract.ScaleFisherZ:
		return "Fisher z scale"
	case audit.ScaleCorrelation:
		return "correlation scale"
	}
	return "scale as printed"
}

// Chart geometry, in SVG user units.
const (
	chartWidth  = 560
	chartLeft   = 170 // room for the row labels
	chartRight  = 20
	chartRowH   = 26
	chartTop    = 12
	chartAxisH  = 40
	chartLabelN = 26 // characters of a row label before it is shortened
)

// intervalChartSVG draws a claim's intervals as a small inline SVG:
// one row per estimate and one for the difference, against a dashed line
// at zero. It returns "" when there is nothing to draw. All text is
// escaped; the result can be embedded in HTML as it is.
func intervalChartSVG(c *audit.ClaimResult) string {
	rows := chartRows(c)
	if len(rows) == 0 {
		return ""
	}
	lo, hi := 0.0, 0.0
	for _, r := range rows {
		for _, v := range []float64{r.est, r.lo, r.hi} {
			if !math.IsNaN(v) && !math.IsInf(v, 0) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if hi-lo == 0 {
		lo, hi = -1, 1
	}
	step := niceStep((hi - lo) / 5)
	lo, hi = math.Floor(lo/step)*step, math.Ceil(hi/step)*step
	plotW := float64(chartWidth - chartLeft - chartRight)
	x := func(v float64) float64 { return chartLeft + (v-lo)/(hi-lo)*plotW }
	height := chartTop + len(rows)*chartRowH + chartAxisH

	var b strings.Builder
	title := chartTitle(c, rows)
	fmt.Fprintf(&b, `<svg class="chart" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 %d %d" width="%d" height="%d" role="img" aria-label="%s">`,
		chartWidth, height, chartWidth, height, html.EscapeString(title))
	fmt.Fprintf(&b, `<title>%s</title>`, html.EscapeString(title))
	axisY := chartTop + len(rows)*chartRowH + 6
	// Grid and ticks.
	for k := 0; k <= int(math.Round((hi-lo)/step)); k++ {
		v := lo + float64(k)*step
		xv := x(v)
		fmt.Fprintf(&b, `<line class="grid" x1="%.1f" y1="%d" x2="%.1f" y2="%d"/>`, xv, chartTop, xv, axisY)
		fmt.Fprintf(&b, `<text class="tick" x="%.1f" y="%d" text-anchor="middle">%s</text>`, xv, axisY+14, tickLabel(c, v, step))
	}
	fmt.Fprintf(&b, `<line class="axis" x1="%d" y1="%d" x2="%d" y2="%d"/>`, chartLeft, axisY, chartWidth-chartRight, axisY)
	fmt.Fprintf(&b, `<text class="axis-label" x="%.1f" y="%d" text-anchor="middle">%s</text>`,
		chartLeft+plotW/2, axisY+32, html.EscapeString(chartScale(c)))
	fmt.Fprintf(&b, `<line class="zero" x1="%.1f" y1="%d" x2="%.1f" y2="%d"/>`, x(0), chartTop-4, x(0), axisY)
	for i, r := range rows {
		y := float64(chartTop + i*chartRowH + chartRowH/2)
		cls := "estimate"
		if r.difference {
			cls = "difference"
			fmt.Fprintf(&b, `<line class="separator" x1="8" y1="%.1f" x2="%d" y2="%.1f"/>`, y-chartRowH/2, chartWidth-chartRight, y-chartRowH/2)
		}
		fmt.Fprintf(&b, `<g class="%s"><title>%s</title>`, cls, html.EscapeString(rowText(c, r)))
		fmt.Fprintf(&b, `<text class="row-label" x="%d" y="%.1f" text-anchor="end" dominant-baseline="middle">%s</text>`,
			chartLeft-10, y, html.EscapeString(shorten(r.label, chartLabelN)))
		if !math.IsNaN(r.lo) && !math.IsNaN(r.hi) {
			x1, x2 := x(r.lo), x(r.hi)
			fmt.Fprintf(&b, `<line class="ci" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f"/>`, x1, y, x2, y)
			fmt.Fprintf(&b, `<line class="cap" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f"/>`, x1, y-5, x1, y+5)
			fmt.Fprintf(&b, `<line class="cap" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f"/>`, x2, y-5, x2, y+5)
		}
		if r.difference {
			xe := x(r.est)
			fmt.Fprintf(&b, `<path class="point" d="M%.1f %.1fl6 6l-6 6l-6-6z"/>`, xe, y-6)
		} else {
			fmt.Fprintf(&b, `<circle class="point" cx="%.1f" cy="%.1f" r="4.5"/>`, x(r.est), y)
		}
		b.WriteString(`</g>`)
	}
	b.WriteString(`</svg>`)
	return b.String()
}

// niceStep rounds a raw tick step up to 1, 2 or 5 times a power of ten.
func niceStep(raw float64) float64 {
	if !(raw > 0) || math.IsInf(raw, 0) {
		return 1
	}
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= raw {
			return m * p
		}
	}
	return 10 * p
}

// tickLabel writes a tick value with as many decimals as the step needs;
// on the log scale of a ratio measure, the ratio exp(v) to two decimals,
// so that the axis reads as ratios.
func tickLabel(c *audit.ClaimResult, v, step float64) string {
	if c.Scale == extract.ScaleLog {
		return minusSign(audit.FormatFixed(math.Exp(v), 2))
	}
	dec := 0
	if step < 1 {
		dec = int(math.Ceil(-math.Log10(step) - 1e-9))
	}
	if math.Abs(v) < step/2 {
		v = 0
	}
	return minusSign(strconv.FormatFloat(v, 'f', dec, 64))
}

// rowText says what a chart row draws, to the claim's decimals: for a
// ratio measure the ratios themselves (exp of what is drawn).
func rowText(c *audit.ClaimResult, r chartRow) string {
	shown := func(x float64) string {
		if c.Scale == extract.ScaleLog {
			x = math.Exp(x)
		}
		return c.FormatEstimate(x)
	}
	s := r.label + " " + shown(r.est)
	if !math.IsNaN(r.lo) {
		s += " (" + shown(r.lo) + " to " + shown(r.hi) + ")"
	}
	return s + ", " + r.intervalLabel
}

func chartTitle(c *audit.ClaimResult, rows []chartRow) string {
	parts := make([]string, len(rows))
	for i, r := range rows {
		parts[i] = rowText(c, r)
	}
	return "Intervals of claim " + c.Claim + " on the " + chartScale(c) + ": " + strings.Join(parts, "; ")
}

// shorten cuts s to n characters, marking the cut with an ellipsis.
func shorten(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return string(r[:n-1]) + "…"
}
