package audit

import (
	"math"
	"strconv"
	"strings"

	"coefaudit/extract"
)

// The precision rule of every report meant for people (the table, Markdown,
// HTML, xlsx and methods text; JSON and CSV keep full precision):
// estimates, differences and their intervals are written to the decimals
// the inputs were printed with plus one, at least MinDecimals and at most
// MaxDecimals; test statistics to two decimals; p as journals print it
// ("p = .043", "p < .001"), three decimals without the leading zero, which
// is the style of the APA Publication Manual (7th ed., 2020, §6.36; from
// memory) and of many journals in medicine and the social sciences. One
// decimal more than printed keeps the rounding of the inputs visible
// without claiming digits the paper never had (common practice, no
// source).
const (
	// MinDecimals is the fewest decimals an estimate is written with.
	MinDecimals = 2
	// MaxDecimals is the most decimals an estimate is written with.
	MaxDecimals = 4
	// StatisticDecimals is how many decimals a test statistic gets.
	StatisticDecimals = 2
	// defaultPrintedDecimals stands for the printed decimals when none of
	// the claim's numbers shows how many there were.
	defaultPrintedDecimals = 2
)

// DisplayDecimals is the precision rule for estimates: the most decimals
// among the printed numbers given (those whose decimals are known), plus
// one, kept within [MinDecimals, MaxDecimals].
func DisplayDecimals(printed ...extract.Printed) int {
	most := -1
	for _, p := range printed {
		if p.Bound == extract.Exact && p.Decimals >= 0 && p.Text != "" {
			most = max(most, int(p.Decimals))
		}
	}
	if most < 0 {
		most = defaultPrintedDecimals
	}
	return min(max(most+1, MinDecimals), MaxDecimals)
}

// coefficientDecimals is DisplayDecimals over the printed estimates and
// interval limits of the coefficients.
func coefficientDecimals(c1, c2 *extract.Coefficient) int {
	return DisplayDecimals(c1.Estimate, c1.CI.Low, c1.CI.High, c2.Estimate, c2.CI.Low, c2.CI.High)
}

// FormatFixed writes x with the given decimals; a value that rounds to
// zero is written without a sign ("0.00", never "-0.00"). It writes a minus
// as the hyphen-minus, so that the text pastes into any program.
func FormatFixed(x float64, decimals int) string {
	if s, ok := nonFinite(x); ok {
		return s
	}
	s := strconv.FormatFloat(x, 'f', decimals, 64)
	if s[0] == '-' && strings.Trim(s[1:], "0.") == "" {
		return s[1:]
	}
	return s
}

// FormatStatistic writes a test statistic to StatisticDecimals decimals.
func FormatStatistic(x float64) string { return FormatFixed(x, StatisticDecimals) }

// EstimateDecimals is how many decimals the claim's estimates, difference
// and interval are written with (DisplayDecimals of its coefficients).
func (r *ClaimResult) EstimateDecimals() int {
	if r.decimals == 0 {
		return DisplayDecimals()
	}
	return r.decimals
}

// FormatEstimate writes x, an estimate or difference of the claim, by the
// precision rule.
func (r *ClaimResult) FormatEstimate(x float64) string {
	return FormatFixed(x, r.EstimateDecimals())
}

// PSpan writes the range of p from lo to hi as a sentence continues it:
// "from .025 to .053", "from below .001 to .167", or "below .001
// throughout" when both ends print alike.
func PSpan(lo, hi float64) string {
	a, b := FormatP(lo), FormatP(hi)
	if a == b {
		if lo < 0.001 {
			return "below .001 throughout"
		}
		return "at " + a + " throughout"
	}
	if lo < 0.001 {
		a = "below .001"
	}
	return "from " + a + " to " + b
}

// ShownDifference is a claim's difference as a reader is shown it: for
// ratio measures the ratio of the two ratios exp(log R₁ − log R₂) with its
// interval (Altman & Bland 2003 give it for comparing two ratios), for
// correlations r₁ − r₂ or, where the test worked on Fisher's z alone,
// z₁ − z₂ so labelled, otherwise the difference as computed.
type ShownDifference struct {
	// Name says what the number is ("difference", "ratio of the two
	// ratios", "difference r₁ − r₂", "difference in Fisher's z").
	Name string
	// Estimate, Low and High are the number and its interval, NaN when not
	// known.
	Estimate, Low, High float64
}

// Shown returns the claim's difference as a reader is shown it.
func (r *ClaimResult) Shown() ShownDifference {
	s := ShownDifference{Name: "difference", Estimate: float64(r.Difference),
		Low: float64(r.DifferenceCI[0]), High: float64(r.DifferenceCI[1])}
	switch r.Scale {
	case extract.ScaleLog:
		s.Name = "ratio of the two ratios"
		s.Estimate, s.Low, s.High = math.Exp(s.Estimate), math.Exp(s.Low), math.Exp(s.High)
	case ScaleCorrelation:
		s.Name = "difference r₁ − r₂"
	case extract.ScaleFisherZ:
		s.Name = "difference in Fisher's z"
	}
	return s
}

// ShownEstimate is a coefficient's estimate as a reader is shown it: a
// correlation (analysed as Fisher's z) as r = tanh z, a ratio (analysed on
// the log scale) as the ratio.
func (r *ClaimResult) ShownEstimate(s Side) float64 {
	switch r.sideScale() {
	case extract.ScaleFisherZ:
		return math.Tanh(float64(s.Estimate))
	case extract.ScaleLog:
		return math.Exp(float64(s.Estimate))
	}
	return float64(s.Estimate)
}

// SEScale names the scale the sides' SEs are on, "" when as printed.
func (r *ClaimResult) SEScale() string {
	switch r.sideScale() {
	case extract.ScaleFisherZ:
		return "Fisher z"
	case extract.ScaleLog:
		return "log"
	}
	return ""
}

// sideScale is the scale of the sides' estimates and SEs: the scale the
// coefficients were analysed on (a correlation comparison keeps its sides
// on Fisher's z while its difference is r₁ − r₂).
func (r *ClaimResult) sideScale() string {
	if r.Scale == ScaleCorrelation {
		return extract.ScaleFisherZ
	}
	return r.Scale
}

// ScaleCorrelation is the Scale of a claim whose difference is r₁ − r₂.
const ScaleCorrelation = "correlation"

// DifferenceText writes the shown difference with its interval:
// "difference 0.24, 95% CI 0.06 to 0.42".
func (r *ClaimResult) DifferenceText() string {
	s := r.Shown()
	if math.IsNaN(s.Low) || math.IsNaN(s.High) {
		return s.Name + " " + r.FormatEstimate(s.Estimate)
	}
	return s.Name + " " + r.FormatEstimate(s.Estimate) + ", " + formatLevel(r.Alpha) + "% CI " + r.FormatEstimate(s.Low) + " to " + r.FormatEstimate(s.High)
}

// ConfidenceLevel writes the confidence level 100(1 − α) of the claim's
// interval ("95").
func (r *ClaimResult) ConfidenceLevel() string { return formatLevel(r.Alpha) }

// formatPBound writes a printed bound on p as journals do, without the
// leading zero: ".05", ".001".
func formatPBound(p float64) string {
	return strings.TrimPrefix(strconv.FormatFloat(p, 'g', -1, 64), "0")
}

// nonFinite writes NaN as "NA" and the infinities as "∞", "−∞"; ok is
// false for a finite x.
func nonFinite(x float64) (string, bool) {
	switch {
	case math.IsNaN(x):
		return "NA", true
	case math.IsInf(x, 1):
		return "∞", true
	case math.IsInf(x, -1):
		return "−∞", true
	}
	return "", false
}
