package report

import (
	"fmt"
	"slices"
	"strings"

	"coefaudit/audit"
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

func numberOrDash(n audit.Number) string {
	if !n.Known() {
		return "–"
	}
	return audit.FormatNum(float64(n))
}

// differenceCell is the difference with its interval: "0.23 [0.06, 0.40]".
func differenceCell(c *audit.ClaimResult) string {
	if !c.Difference.Known() {
		return "-"
	}
	if !c.DifferenceCI[0].Known() {
		return audit.FormatNum(float64(c.Difference))
	}
	return fmt.Sprintf("%s [%s, %s]", audit.FormatNum(float64(c.Difference)), audit.FormatNum(float64(c.DifferenceCI[0])), audit.FormatNum(float64(c.DifferenceCI[1])))
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

// adjustedP is the claim's p adjusted within its study by method, NaN
// when there is none.
func adjustedP(c *audit.ClaimResult, method string) audit.Number {
	q, _ := c.AdjustedP.By(method)
	return q
}

// problemText places a problem: `sheet "claims", row 4, column "p": …`,
// or `file "claims.csv", row 4, …` for a CSV, whose sheet is its file name.
func problemText(p audit.Problem) string {
	var loc []string
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
