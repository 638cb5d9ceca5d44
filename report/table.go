package report

import (
	"bufio"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"coefaudit/audit"
)

// tableWriter writes the report for the terminal, a block per run of a
// study's claims as they are audited: one line per claim, aligned within
// the block, then the claims' notes. The input's problems, the summary
// line and the cautions follow the last block.
type tableWriter struct {
	bw       *bufio.Writer
	h        Header
	problems heldProblems
}

func newTableWriter(w io.Writer) *tableWriter { return &tableWriter{bw: bufio.NewWriter(w)} }

// Begin implements Writer: a title line, since the summary comes last.
func (t *tableWriter) Begin(h Header) error {
	t.h = h
	_, err := fmt.Fprintf(t.bw, "%s; the summary and the cautions follow the claims.\n", titleOf(h, " in ", EscapeControls))
	return err
}

// Study implements Writer.
func (t *tableWriter) Study(res audit.StudyResult) error {
	t.problems.add(res.Problems)
	if len(res.Claims) == 0 {
		return nil
	}
	tw := tabwriter.NewWriter(t.bw, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "\nROW\tSTUDY\tCLAIM\tRELATION\tMETHOD\tDIFFERENCE [CI]\tP\tP RANGE\tPUBLISHED\tRECOMPUTED\tOUTCOME")
	for i := range res.Claims {
		c := &res.Claims[i]
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", c.Row, EscapeControls(c.Study), EscapeControls(c.Claim),
			dash(c.Relation), dash(c.Method), differenceCell(c), pCell(c.P), pRangeCell(c.PRange),
			dash(c.Published), dash(c.Recomputed), strings.ToUpper(c.Outcome))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintln(t.bw, "Notes")
	for i := range res.Claims {
		c := &res.Claims[i]
		fmt.Fprintf(t.bw, "  row %d (%s, %s): %s\n", c.Row, EscapeControls(c.Study), EscapeControls(c.Claim), c.Outcome)
		for _, n := range c.Notes {
			fmt.Fprintf(t.bw, "    - %s\n", EscapeControls(n))
		}
	}
	return nil
}

// End implements Writer.
func (t *tableWriter) End(f Footer) error {
	problems := t.problems.all(f)
	if len(problems) > 0 {
		fmt.Fprintln(t.bw, "\nProblems in the input")
		for _, p := range problems {
			fmt.Fprintf(t.bw, "  - %s\n", EscapeControls(problemText(p)))
		}
	}
	fmt.Fprintf(t.bw, "\n%s\n", EscapeControls(summaryLine(t.h.Source, f.Summary, len(problems))))
	fmt.Fprintln(t.bw, "\nCautions")
	for _, c := range t.h.cautions() {
		fmt.Fprintf(t.bw, "  - %s\n", c)
	}
	return t.bw.Flush()
}
