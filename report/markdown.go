package report

import (
	"bufio"
	"fmt"
	"io"

	"coefaudit/audit"
)

// markdownWriter writes the report as one Markdown document for a
// review's supplement or a referee report, as the claims arrive: for each
// run of a study's claims a table, then one section per claim with its
// methods paragraph and notes; at the end the summary by outcome, the
// input's problems and the cautions. Text taken from the input is escaped
// (mdText).
type markdownWriter struct {
	bw       *bufio.Writer
	h        Header
	problems heldProblems
}

func newMarkdownWriter(w io.Writer) *markdownWriter {
	return &markdownWriter{bw: bufio.NewWriterSize(w, 1<<16)}
}

// Begin implements Writer.
func (m *markdownWriter) Begin(h Header) error {
	m.h = h
	_, err := fmt.Fprintf(m.bw, "# %s\n\nThe summary, the problems of the input and the cautions follow the claims.\n\n## Claims\n",
		titleOf(h, ": ", mdText))
	return err
}

// Study implements Writer.
func (m *markdownWriter) Study(res audit.StudyResult) error {
	m.problems.add(res.Problems)
	if len(res.Claims) == 0 {
		return nil
	}
	bw := m.bw
	fmt.Fprintf(bw, "\n### Study %s\n", mdText(res.Study))
	fmt.Fprintln(bw, "\n| row | study | claim | relation | method | difference [CI] | p | p range | published | outcome |")
	fmt.Fprintln(bw, "|---:|---|---|---|---|---|---|---|---|---|")
	for i := range res.Claims {
		c := &res.Claims[i]
		fmt.Fprintf(bw, "| %d | %s | %s | %s | %s | %s | %s | %s | %s | **%s** |\n", c.Row, mdText(c.Study), mdText(c.Claim),
			dash(c.Relation), dash(c.Method), differenceCell(c), pCell(c.P), pRangeCell(c.PRange), dash(c.Published), c.Outcome)
	}
	for i := range res.Claims {
		c := &res.Claims[i]
		fmt.Fprintf(bw, "\n#### Claim %s (%s), row %d: %s\n\n%s\n", mdText(c.Claim), mdText(c.Study), c.Row, c.Outcome, mdText(methodsText(c)))
		if alts := alternativeRows(c); len(alts) > 0 {
			bw.WriteString("\nOther tests of the same comparison:\n\n| test | source | statistic | p |\n|---|---|---:|---:|\n")
			for _, a := range alts {
				fmt.Fprintf(bw, "| %s | %s | %s | %s |\n", mdText(a.Name), mdText(a.Source), a.Statistic, a.P)
			}
		}
		if len(c.Notes) > 0 {
			bw.WriteString("\nNotes:\n\n")
			for _, n := range c.Notes {
				fmt.Fprintf(bw, "- %s\n", mdText(n))
			}
		}
	}
	return nil
}

// End implements Writer.
func (m *markdownWriter) End(f Footer) error {
	bw := m.bw
	problems := m.problems.all(f)
	fmt.Fprintf(bw, "\n## Summary\n\n%s\n\n", mdText(summaryLine(m.h.Source, f.Summary, len(problems))))
	fmt.Fprintln(bw, "| outcome | claims |")
	fmt.Fprintln(bw, "|---|---:|")
	for _, o := range outcomesShown(f.Summary.Counts) {
		fmt.Fprintf(bw, "| %s | %d |\n", mdText(o), f.Summary.Counts[o])
	}
	if len(problems) > 0 {
		fmt.Fprintln(bw, "\n## Problems in the input")
		bw.WriteString("\n")
		for _, p := range problems {
			fmt.Fprintf(bw, "- %s\n", mdText(problemText(p)))
		}
	}
	fmt.Fprintln(bw, "\n## Cautions")
	bw.WriteString("\n")
	for _, c := range m.h.cautions() {
		fmt.Fprintf(bw, "- %s\n", c)
	}
	return bw.Flush()
}
