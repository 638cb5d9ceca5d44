package report

import (
	"fmt"
	"slices"
	"strings"

	"coefaudit/audit"
	"coefaudit/extract"
)

// methodDescriptions say in a reviewer's words what each method is, with
// its source.
var methodDescriptions = map[string]string{
	"independent-z":                  "a z test of the difference between two estimates from independent samples, with the SE of the difference √(SE₁² + SE₂²) (Altman & Bland 2003)",
	"fisher-z":                       "Fisher's z test of two correlations from independent samples, with Zou's (2007) interval for the difference of the correlations",
	"williams-t":                     "Williams' t test for two correlations from one sample that share a variable (Williams 1959, as given by Steiger 1980), with Zou's (2007) interval for their difference",
	"zpf":                            "the Fisher-z form of the Pearson–Filon test for two correlations from one sample with no variable in common (Raghunathan, Rosenthal & Rubin 1996), with Zou's (2007) interval for their difference",
	"t-from-correlation-table":       "a t test, on the residual df, of the difference between two coefficients of one regression, the regression and its coefficients' covariance matrix being rebuilt from the paper's correlation table, SDs and n (OLS from summary statistics)",
	"z-delta-from-correlation-table": "a z test of the difference between two standardized coefficients of one regression, with their normal-theory delta-method covariance (Yuan & Chan 2011; Jones & Waller 2013) rebuilt from the paper's correlation table and n",
	"z-with-estimate-corr":           "a z test of the difference between two estimates from one sample, using the sampling correlation of the two estimates that the paper printed",
	"t-with-estimate-corr":           "a t test of the difference between two coefficients of one model, using the sampling correlation of the two estimates that the paper printed",
	"admissible-range":               "the range of p over every admissible sampling correlation of the two estimates (−1 to 1), since the paper printed nothing that gives their covariance",
}

// alternativeMethod is another test of the same comparison of
// correlations, as a reader is shown it.
type alternativeMethod struct {
	Name, Source string
}

// alternativeMethods name the correlation tests reported beside the
// primary one (infer/correlation's method identifiers), with their sources.
var alternativeMethods = map[string]alternativeMethod{
	"fisher-z":        {"Fisher's z test of two independent correlations", "Fisher 1921"},
	"zou-ci":          {"Zou's confidence interval for the difference of two correlations (an interval, no test)", "Zou 2007"},
	"williams-t":      {"Williams' t test of two correlations sharing a variable", "Williams 1959; Steiger 1980"},
	"steiger-z":       {"Steiger's z test on Fisher's z, the correlations pooled under the null", "Steiger 1980"},
	"mrr-z":           {"Meng, Rosenthal and Rubin's z test of two correlations sharing a variable", "Meng, Rosenthal & Rubin 1992"},
	"pearson-filon-z": {"Pearson and Filon's z test of two correlations with no variable in common", "Pearson & Filon 1898"},
	"zpf":             {"the Pearson–Filon test on Fisher's z (ZPF)", "Dunn & Clark 1969; Raghunathan, Rosenthal & Rubin 1996"},
}

// alternativeRow is one line of the table of other tests: the method's
// full name and source, its statistic and p by the precision rule.
type alternativeRow struct {
	Name, Source, Statistic, P string
}

// alternativeRows lists the claim's other tests of the same comparison.
func alternativeRows(c *audit.ClaimResult) []alternativeRow {
	var out []alternativeRow
	for _, a := range c.Alternatives {
		m, ok := alternativeMethods[a.Method]
		if !ok {
			m = alternativeMethod{Name: a.Method}
		}
		row := alternativeRow{Name: m.Name, Source: m.Source, Statistic: statisticCell(a.Statistic), P: pCell(a.P)}
		if !a.P.Known() {
			row.P = "interval only"
		}
		out = append(out, row)
	}
	return out
}

var publishedWords = map[string]string{
	extract.PublishedDiffer:         "the two estimates differ",
	extract.PublishedNoDifference:   "the two estimates do not differ",
	extract.PublishedFirstLarger:    "the first is the larger",
	extract.PublishedSecondLarger:   "the second is the larger",
	extract.PublishedFirstStronger:  "the first is the stronger (larger in magnitude)",
	extract.PublishedSecondStronger: "the second is the stronger (larger in magnitude)",
}

var outcomeWords = map[string]string{
	audit.Consistent:    "The published verdict stands.",
	audit.Unsupported:   "The published difference is not supported by the test of the difference.",
	audit.Missed:        "The paper reports no difference, but the test of the difference shows one.",
	audit.Reversed:      "The test of the difference shows the opposite of the published direction.",
	audit.Indeterminate: "The verdict cannot be decided from what was printed.",
	audit.Conflict:      "The printed numbers contradict each other, so the verdict cannot be checked as printed.",
	audit.Incomplete:    "Not enough was printed to test the claim.",
}

// methodsText writes the claim's paragraph for a report, which a reviewer
// can paste into their own: what was claimed, the method, the numbers, the
// verdict and its caveats.
func methodsText(r *audit.ClaimResult) string {
	var b strings.Builder
	if r.Row > 0 {
		fmt.Fprintf(&b, "Claim %s (%s, claims row %d): t", r.Claim, r.Study, r.Row)
	} else {
		b.WriteString("T") // typed with compare: no workbook row
	}
	fmt.Fprintf(&b, "he paper reports that %s (%s vs %s", publishedOr(r.Published), r.First.Label, r.Second.Label)
	if r.Basis != "" {
		fmt.Fprintf(&b, "; basis: %s", r.Basis)
	}
	b.WriteString("). ")
	caveats := caveatNotes(r)
	if d, ok := methodDescriptions[r.Method]; ok {
		fmt.Fprintf(&b, "We recomputed it with %s. ", d)
		if r.First.SE.Known() && r.Second.SE.Known() {
			fmt.Fprintf(&b, "The estimates were %s and %s. ", sideProse(r, r.First), sideProse(r, r.Second))
		}
		shown := r.Shown()
		if r.P.Known() {
			fmt.Fprintf(&b, "The %s was %s", shown.Name, r.FormatEstimate(shown.Estimate))
			if r.DifferenceCI[0].Known() {
				fmt.Fprintf(&b, " (%s%% CI %s to %s)", r.ConfidenceLevel(), r.FormatEstimate(shown.Low), r.FormatEstimate(shown.High))
			}
			fmt.Fprintf(&b, ", %s, %s.", statPhrase(r), audit.PStatement(float64(r.P)))
		} else if r.Difference.Known() {
			fmt.Fprintf(&b, "The %s was %s.", shown.Name, r.FormatEstimate(shown.Estimate))
		}
		if span := pRangeSpan(r); span != "" && !slices.ContainsFunc(caveats, func(n string) bool { return strings.Contains(n, span) }) {
			verb := "ranges"
			if strings.HasSuffix(span, "throughout") {
				verb = "stays"
			}
			fmt.Fprintf(&b, " Allowing for what was not printed, p %s %s.", verb, span)
		}
		b.WriteString(" ")
	}
	fmt.Fprintf(&b, "Outcome: %s. %s", r.Outcome, outcomeSentence(r))
	if r.Recomputed != "" && r.Recomputed != audit.Undetermined && r.Outcome != audit.Conflict {
		fmt.Fprintf(&b, " The recomputed verdict is that %s at α = %s.", publishedOr(r.Recomputed), audit.FormatAlpha(r.Alpha))
	}
	if len(caveats) > 0 {
		b.WriteString(" Caveats: " + strings.Join(caveats, " "))
	}
	return b.String()
}

// outcomeSentence says what the outcome means; an incomplete claim whose
// row could not be read says so, rather than that too little was printed.
func outcomeSentence(r *audit.ClaimResult) string {
	if r.Outcome == audit.Incomplete && r.Unreadable {
		return "The claims row could not be read, so the claim was not tested."
	}
	return outcomeWords[r.Outcome]
}

// sideProse is one estimate with its SE for the paragraph: "0.67 (SE
// 0.193 on the log scale, from ci_low, ci_high (normal))".
func sideProse(r *audit.ClaimResult, s audit.Side) string {
	se := "SE " + r.FormatEstimate(float64(s.SE))
	if sc := r.SEScale(); sc != "" {
		se += " on the " + sc + " scale"
	}
	switch {
	case strings.HasPrefix(s.SEFrom, "rebuilt"):
		se += ", " + s.SEFrom
	case s.SEFrom != "":
		se += ", from " + s.SEFrom
	}
	return estimateCell(r, s) + " (" + se + ")"
}

// pRangeSpan is the range of p over what was not printed, as a sentence
// continues it ("from .025 to .053"), "" when there is none.
func pRangeSpan(r *audit.ClaimResult) string {
	if !r.PRange[0].Known() || !r.PRange[1].Known() {
		return ""
	}
	return audit.PSpan(float64(r.PRange[0]), float64(r.PRange[1]))
}

func publishedOr(v string) string {
	if w, ok := publishedWords[v]; ok {
		return w
	}
	return fmt.Sprintf("%q", v)
}

func statPhrase(r *audit.ClaimResult) string {
	if !r.Statistic.Known() {
		return "statistic not defined"
	}
	if r.DF.Known() {
		return fmt.Sprintf("t(%s) = %s", dfCell(r.DF), statisticCell(r.Statistic))
	}
	return "z = " + statisticCell(r.Statistic)
}

// caveatNotes picks the notes a reader of the paragraph must not miss:
// all but the verdict sentence, which the paragraph has said already, each
// once.
func caveatNotes(r *audit.ClaimResult) []string {
	verdict, decided := r.VerdictNote()
	var out []string
	for i, n := range r.Notes {
		if decided && i == verdict || slices.Contains(out, n) {
			continue
		}
		out = append(out, n)
	}
	return out
}
