package audit

import (
	"bufio"
	"fmt"
	"io"
	"strings"
)

// WriteMarkdown writes the report as one Markdown document for a review's
// supplement or a referee report: a summary table, one section per claim
// with its methods paragraph and notes, the input's problems and the
// cautions.
func WriteMarkdown(w io.Writer, rep *Report) error {
	bw := bufio.NewWriter(w)
	title := "Audit of published comparisons"
	if rep.Source != "" {
		title += ": " + mdText(rep.Source)
	}
	fmt.Fprintf(bw, "# %s\n\n%s\n\n", title, mdText(summaryLine(rep)))
	fmt.Fprintln(bw, "| outcome | claims |")
	fmt.Fprintln(bw, "|---|---:|")
	for _, o := range Outcomes {
		if n := rep.Summary.Counts[o]; n > 0 {
			fmt.Fprintf(bw, "| %s | %d |\n", o, n)
		}
	}
	fmt.Fprintln(bw, "\n## Claims")
	fmt.Fprintln(bw, "\n| row | study | claim | relation | method | difference [CI] | p | p range | published | outcome |")
	fmt.Fprintln(bw, "|---:|---|---|---|---|---|---|---|---|---|")
	for _, c := range rep.Claims {
		fmt.Fprintf(bw, "| %d | %s | %s | %s | %s | %s | %s | %s | %s | **%s** |\n", c.Row, mdCell(c.Study), mdCell(c.Claim),
			dash(c.Relation), dash(c.Method), differenceCell(c), pCell(c.P), pRangeCell(c.PRange), dash(c.Published), c.Outcome)
	}
	for _, c := range rep.Claims {
		fmt.Fprintf(bw, "\n### Claim %s (%s), row %d: %s\n\n%s\n", mdText(c.Claim), mdText(c.Study), c.Row, c.Outcome, mdText(c.Methods))
		if len(c.Notes) > 0 {
			bw.WriteString("\nNotes:\n\n")
			for _, n := range c.Notes {
				fmt.Fprintf(bw, "- %s\n", mdText(n))
			}
		}
	}
	if len(rep.Problems) > 0 {
		fmt.Fprintln(bw, "\n## Problems in the input")
		bw.WriteString("\n")
		for _, p := range rep.Problems {
			fmt.Fprintf(bw, "- %s\n", mdText(problemText(p)))
		}
	}
	fmt.Fprintln(bw, "\n## Cautions")
	bw.WriteString("\n")
	for _, c := range rep.Cautions {
		fmt.Fprintf(bw, "- %s\n", c)
	}
	return bw.Flush()
}

// mdText escapes the characters Markdown would read as markup in running
// text taken from the input.
var mdEscaper = strings.NewReplacer(`\`, `\\`, "*", `\*`, "_", `\_`, "`", "\\`", "<", "&lt;", ">", "&gt;", "[", `\[`, "]", `\]`, "#", `\#`)

func mdText(s string) string { return mdEscaper.Replace(s) }

// mdCell also keeps a table cell in one piece.
func mdCell(s string) string {
	return strings.ReplaceAll(strings.ReplaceAll(mdText(s), "|", `\|`), "\n", " ")
}
