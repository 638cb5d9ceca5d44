package report

import (
	"fmt"
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
	if d, ok := methodDescriptions[r.Method]; ok {
		fmt.Fprintf(&b, "We recomputed it with %s. ", d)
		if r.First.SE.Known() && r.Second.SE.Known() {
			fmt.Fprintf(&b, "The estimates were %s (SE %s, from %s) and %s (SE %s, from %s)%s. ",
				audit.FormatNum(float64(r.First.Estimate)), audit.FormatNum(float64(r.First.SE)), r.First.SEFrom,
				audit.FormatNum(float64(r.Second.Estimate)), audit.FormatNum(float64(r.Second.SE)), r.Second.SEFrom, onScale(r.Scale))
		}
		if r.P.Known() {
			fmt.Fprintf(&b, "The difference was %s", audit.FormatNum(float64(r.Difference)))
			if r.DifferenceCI[0].Known() {
				fmt.Fprintf(&b, " (%g%% CI %s to %s)", 100*(1-r.Alpha), audit.FormatNum(float64(r.DifferenceCI[0])), audit.FormatNum(float64(r.DifferenceCI[1])))
			}
			fmt.Fprintf(&b, ", %s, %s.", statPhrase(r), audit.PStatement(float64(r.P)))
		} else if r.Difference.Known() {
			fmt.Fprintf(&b, "The difference was %s.", audit.FormatNum(float64(r.Difference)))
		}
		if r.PRange[0].Known() && r.PRange[1].Known() {
			fmt.Fprintf(&b, " Allowing for what was not printed, p lies between %s and %s.", audit.FormatP(float64(r.PRange[0])), audit.FormatP(float64(r.PRange[1])))
		}
		b.WriteString(" ")
	}
	fmt.Fprintf(&b, "Outcome: %s. %s", r.Outcome, outcomeWords[r.Outcome])
	if r.Recomputed != "" && r.Recomputed != audit.Undetermined && r.Outcome != audit.Conflict {
		fmt.Fprintf(&b, " The recomputed verdict is that %s at α = %s.", publishedOr(r.Recomputed), audit.FormatAlpha(r.Alpha))
	}
	if caveats := caveatNotes(r); len(caveats) > 0 {
		b.WriteString(" Caveats: " + strings.Join(caveats, " "))
	}
	return b.String()
}

func publishedOr(v string) string {
	if w, ok := publishedWords[v]; ok {
		return w
	}
	return fmt.Sprintf("%q", v)
}

func onScale(scale string) string {
	switch scale {
	case "", extract.ScaleAsPrinted:
		return ""
	case "correlation":
		return " (on the Fisher z scale)"
	}
	return " (on the " + scale + " scale)"
}

func statPhrase(r *audit.ClaimResult) string {
	if !r.Statistic.Known() {
		return "statistic not defined"
	}
	if r.DF.Known() {
		return fmt.Sprintf("t(%s) = %s", audit.FormatNum(float64(r.DF)), formatStat(float64(r.Statistic)))
	}
	return "z = " + formatStat(float64(r.Statistic))
}

func formatStat(x float64) string { return fmt.Sprintf("%.2f", x) }

// caveatNotes picks the notes a reader of the paragraph must not miss:
// all but the verdict sentence, which the paragraph has said already.
func caveatNotes(r *audit.ClaimResult) []string {
	verdict, decided := r.VerdictNote()
	var out []string
	for i, n := range r.Notes {
		if decided && i == verdict {
			continue
		}
		out = append(out, n)
	}
	return out
}
