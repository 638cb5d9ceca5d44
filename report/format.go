package report

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"coefaudit/audit"
	"coefaudit/extract"
)

// reportTitle is every report's title.
const reportTitle = "Audit of published comparisons"

// titleOf is the report's title with the input's name, escaped for the
// format, after sep.
func titleOf(h Header, sep string, escape func(string) string) string {
	if h.Source == "" {
		return reportTitle
	}
	return reportTitle + sep + escape(h.Source)
}

func dash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// The cells below follow the precision rule of audit/precision.go: every
// report meant for people writes its numbers through them.

// differenceCell is the difference as shown with its interval: "0.230
// [0.082, 0.378]", a ratio measure's "ratio 0.681 [0.452, 1.028]".
func differenceCell(c *audit.ClaimResult) string {
	if !c.Difference.Known() {
		return "-"
	}
	switch c.Scale {
	case extract.ScaleLog:
		return "ratio " + differenceInterval(c)
	case extract.ScaleFisherZ:
		return "Fisher z " + differenceInterval(c)
	}
	return differenceInterval(c)
}

// differenceInterval is the shown difference and its interval, unlabelled:
// "0.681 [0.452, 1.028]".
func differenceInterval(c *audit.ClaimResult) string {
	s := c.Shown()
	if !c.DifferenceCI[0].Known() {
		return c.FormatEstimate(s.Estimate)
	}
	return fmt.Sprintf("%s [%s, %s]", c.FormatEstimate(s.Estimate), c.FormatEstimate(s.Low), c.FormatEstimate(s.High))
}

// shownScale says what the difference columns hold when it is not the
// difference as computed: "ratio of the two ratios" for ratio measures
// (their log-scale difference is in the JSON and CSV).
func shownScale(c *audit.ClaimResult) string {
	if c.Scale == extract.ScaleLog {
		return c.Shown().Name
	}
	return c.Scale
}

// estimateCell is one side's estimate as shown (a correlation as r, a
// ratio as the ratio).
func estimateCell(c *audit.ClaimResult, s audit.Side) string {
	if !s.Estimate.Known() {
		return "–"
	}
	return c.FormatEstimate(c.ShownEstimate(s))
}

// seCell is one side's SE, with the scale it is on when that is not the
// scale the estimate is shown on: "0.107 (log)".
func seCell(c *audit.ClaimResult, s audit.Side) string {
	if !s.SE.Known() {
		return "–"
	}
	text := c.FormatEstimate(float64(s.SE))
	if sc := c.SEScale(); sc != "" {
		text += " (" + sc + ")"
	}
	return text
}

// statisticCell is the test statistic to two decimals.
func statisticCell(x audit.Number) string {
	if !x.Known() {
		return "-"
	}
	return audit.FormatStatistic(float64(x))
}

// dfCell is the df, whole or to one decimal (a Welch df).
func dfCell(x audit.Number) string {
	if !x.Known() {
		return "-"
	}
	return strconv.FormatFloat(math.Round(float64(x)*10)/10, 'f', -1, 64)
}

func pCell(p audit.Number) string {
	if !p.Known() {
		return "-"
	}
	return audit.FormatP(float64(p))
}

func pRangeCell(r [2]audit.Number) string {
	if !r[0].Known() || !r[1].Known() {
		return "-"
	}
	lo, hi := audit.FormatP(float64(r[0])), audit.FormatP(float64(r[1]))
	if lo == hi {
		return lo
	}
	return lo + "–" + hi
}

// pOrRange is the claim's p, or the range of p when there is no point p
// (an unknown covariance): ".043", "< .001–.167".
func pOrRange(c *audit.ClaimResult) string {
	if c.P.Known() {
		return pCell(c.P)
	}
	return pRangeCell(c.PRange)
}

// adjustedP is the claim's p adjusted within its study by method, NaN
// when there is none.
func adjustedP(c *audit.ClaimResult, method string) audit.Number {
	q, _ := c.AdjustedP.By(method)
	return q
}

// problemText places a problem: `review.xlsx, sheet "claims", row 4,
// column "p": …`, or `file "claims.csv", row 4, …` for a CSV, whose sheet
// is its file name. The file is named when the problem has one, so that
// the problems of a folder of articles say which article each is of.
func problemText(p audit.Problem) string {
	var loc []string
	if p.File != "" && p.File != p.Sheet { // a CSV's sheet is its file
		loc = append(loc, p.File)
	}
	switch {
	case strings.HasSuffix(strings.ToLower(p.Sheet), ".csv"):
		loc = append(loc, fmt.Sprintf("file %q", p.Sheet))
	case p.Sheet != "":
		loc = append(loc, fmt.Sprintf("sheet %q", p.Sheet))
	}
	if p.Row > 0 {
		loc = append(loc, fmt.Sprintf("row %d", p.Row))
	}
	if p.Column != "" {
		loc = append(loc, fmt.Sprintf("column %q", p.Column))
	}
	if len(loc) == 0 {
		return p.Message
	}
	return strings.Join(loc, ", ") + ": " + p.Message
}

// summaryLine is "12 claims audited in review.xlsx: 9 consistent, 3
// unsupported; 2 problem(s) in the input."
func summaryLine(source string, sum audit.Summary, problems int) string {
	var parts []string
	for _, o := range outcomesShown(sum.Counts) {
		parts = append(parts, fmt.Sprintf("%d %s", sum.Counts[o], o))
	}
	src := ""
	if source != "" {
		src = " in " + source
	}
	noun := "claims"
	if sum.Claims == 1 {
		noun = "claim"
	}
	s := fmt.Sprintf("%d %s audited%s", sum.Claims, noun, src)
	if len(parts) > 0 {
		s += ": " + strings.Join(parts, ", ")
	}
	if problems > 0 {
		s += fmt.Sprintf("; %d problem(s) in the input", problems)
	}
	return s + "."
}

// outcomesShown lists the outcomes that occur, in the order of
// audit.Outcomes, then any outcome outside it in the order of the names.
func outcomesShown(counts map[string]int) []string {
	var out, other []string
	for _, o := range audit.Outcomes {
		if counts[o] > 0 {
			out = append(out, o)
		}
	}
	for o, n := range counts {
		if n > 0 && !isOutcome(o) {
			other = append(other, o)
		}
	}
	slices.Sort(other)
	return append(out, other...)
}

func isOutcome(o string) bool { return slices.Contains(audit.Outcomes, o) }

// MaxProblems is how many problems of the studies a report lists; beyond
// it they are counted, and a last problem says how many were left out. A
// file of a million broken rows would otherwise be held whole until the
// report's end (common practice, no source).
const MaxProblems = 10000

// heldProblems collects the problems of a report's studies until End, at
// most MaxProblems of them.
type heldProblems struct {
	kept    []audit.Problem
	omitted int
}

func (h *heldProblems) add(ps []audit.Problem) {
	n := min(len(ps), MaxProblems-len(h.kept))
	h.kept = append(h.kept, ps[:n]...)
	h.omitted += len(ps) - n
}

// all returns the input's own problems, then the studies', then how many
// were left out.
func (h *heldProblems) all(f Footer) []audit.Problem {
	out := append(append([]audit.Problem(nil), f.Problems...), h.kept...)
	if h.omitted > 0 {
		out = append(out, audit.Problem{Message: fmt.Sprintf("%d more problems of the rows are not listed: a report lists the first %d; the claims they touch say in their notes what was wrong", h.omitted, MaxProblems)})
	}
	return out
}
