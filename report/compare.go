package report

import (
	"bufio"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"coefaudit/audit"
)

// WriteComparison writes the audit of one comparison for the terminal: the
// two estimates as given and as read, the test, the verdict, the notes,
// the methods paragraph and the cautions. Control characters of the text
// typed are shown escaped (EscapeControls).
func WriteComparison(w io.Writer, rep *audit.Report, c audit.Comparison) error {
	if len(rep.Claims) != 1 {
		return fmt.Errorf("a comparison report holds %d claims, want 1", len(rep.Claims))
	}
	r := &rep.Claims[0]
	bw := bufio.NewWriter(w)
	for i, s := range []audit.Side{r.First, r.Second} {
		fmt.Fprintf(bw, "%-10s %s\n", []string{"First", "Second"}[i]+":", EscapeControls([]audit.Reported{c.First, c.Second}[i].Text))
		if s.Estimate.Known() {
			if s.SE.Known() {
				fmt.Fprintf(bw, "%-10s estimate %s\n", "", sideProse(r, s))
			} else {
				fmt.Fprintf(bw, "%-10s estimate %s, SE not known\n", "", estimateCell(r, s))
			}
		}
	}
	fmt.Fprintf(bw, "%-10s %s\n", "Design:", designWords(r.Relation))
	if r.Method != "" {
		fmt.Fprintf(bw, "%-10s %s: %s %s", "Test:", r.Method, r.Shown().Name, differenceInterval(r))
		if r.Statistic.Known() {
			fmt.Fprintf(bw, ", statistic %s", statisticCell(r.Statistic))
		}
		if r.DF.Known() {
			fmt.Fprintf(bw, ", df %s", dfCell(r.DF))
		}
		if r.P.Known() {
			fmt.Fprintf(bw, ", %s", audit.PStatement(float64(r.P)))
		}
		if pr := pRangeCell(r.PRange); pr != "-" {
			fmt.Fprintf(bw, ", p range %s", pr)
		}
		fmt.Fprintln(bw)
	}
	fmt.Fprintf(bw, "%-10s %s; recomputed: %s; α = %s\n", "Published:", dash(r.Published), dash(r.Recomputed), audit.FormatAlpha(r.Alpha))
	fmt.Fprintf(bw, "%-10s %s\n", "Verdict:", strings.ToUpper(r.Outcome))
	if len(r.Notes) > 0 {
		fmt.Fprintln(bw, "\nNotes")
		for _, n := range r.Notes {
			fmt.Fprintf(bw, "  - %s\n", EscapeControls(n))
		}
	}
	if m := EscapeControls(strings.TrimSpace(methodsText(r))); m != "" {
		fmt.Fprintln(bw, "\nMethods")
		writeWrapped(bw, m, "  ", 78)
	}
	if len(rep.Problems) > 0 {
		fmt.Fprintln(bw, "\nProblems")
		for _, p := range rep.Problems {
			fmt.Fprintf(bw, "  - %s\n", EscapeControls(p.Message))
		}
	}
	fmt.Fprintln(bw, "\nCautions")
	for _, c := range (Header{Cautions: rep.Cautions}).cautions() {
		fmt.Fprintf(bw, "  - %s\n", c)
	}
	return bw.Flush()
}

func designWords(relation string) string {
	switch relation {
	case audit.Independent:
		return "independent samples"
	case audit.SameModel:
		return "one fitted model"
	case audit.SameSample:
		return "one sample, two models"
	}
	return "-"
}

// writeWrapped writes a paragraph wrapped at width runes, each line indented.
func writeWrapped(w io.Writer, text, indent string, width int) {
	line := indent
	for _, word := range strings.Fields(text) {
		if utf8.RuneCountInString(line)+1+utf8.RuneCountInString(word) > width && line != indent {
			fmt.Fprintln(w, line)
			line = indent
		}
		if line != indent {
			line += " "
		}
		line += word
	}
	if line != indent {
		fmt.Fprintln(w, line)
	}
}
