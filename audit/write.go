package audit

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"
)

// WriteTable writes the report as a table for the terminal: one line per
// claim, then each claim's notes, the input's problems and the cautions.
func WriteTable(w io.Writer, rep *Report) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%s\n\n", summaryLine(rep))
	tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "ROW\tSTUDY\tCLAIM\tRELATION\tMETHOD\tDIFFERENCE [CI]\tP\tP RANGE\tPUBLISHED\tRECOMPUTED\tOUTCOME")
	for _, c := range rep.Claims {
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", c.Row, c.Study, c.Claim,
			dash(c.Relation), dash(c.Method), differenceCell(c), pCell(c.P), pRangeCell(c.PRange),
			dash(c.Published), dash(c.Recomputed), strings.ToUpper(c.Outcome))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintln(bw, "\nNotes")
	for _, c := range rep.Claims {
		fmt.Fprintf(bw, "  row %d (%s, %s): %s\n", c.Row, c.Study, c.Claim, c.Outcome)
		for _, n := range c.Notes {
			fmt.Fprintf(bw, "    - %s\n", n)
		}
	}
	if len(rep.Problems) > 0 {
		fmt.Fprintln(bw, "\nProblems in the input")
		for _, p := range rep.Problems {
			fmt.Fprintf(bw, "  - %s\n", problemText(p))
		}
	}
	fmt.Fprintln(bw, "\nCautions")
	for _, c := range rep.Cautions {
		fmt.Fprintf(bw, "  - %s\n", c)
	}
	return bw.Flush()
}

func summaryLine(rep *Report) string {
	parts := []string{}
	for _, o := range Outcomes {
		if n := rep.Summary.Counts[o]; n > 0 {
			parts = append(parts, fmt.Sprintf("%d %s", n, o))
		}
	}
	src := ""
	if rep.Source != "" {
		src = " in " + rep.Source
	}
	noun := "claims"
	if rep.Summary.Claims == 1 {
		noun = "claim"
	}
	s := fmt.Sprintf("%d %s audited%s", rep.Summary.Claims, noun, src)
	if len(parts) > 0 {
		s += ": " + strings.Join(parts, ", ")
	}
	if len(rep.Problems) > 0 {
		s += fmt.Sprintf("; %d problem(s) in the input", len(rep.Problems))
	}
	return s + "."
}

func problemText(p Problem) string {
	var loc []string
	if p.Sheet != "" {
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

func dash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

func differenceCell(c ClaimResult) string {
	if !c.Difference.Known() {
		return "-"
	}
	if !c.DifferenceCI[0].Known() {
		return formatNum(float64(c.Difference))
	}
	return fmt.Sprintf("%s [%s, %s]", formatNum(float64(c.Difference)), formatNum(float64(c.DifferenceCI[0])), formatNum(float64(c.DifferenceCI[1])))
}

func pCell(p Number) string {
	if !p.Known() {
		return "-"
	}
	return formatP(float64(p))
}

func pRangeCell(r [2]Number) string {
	if !r[0].Known() || !r[1].Known() {
		return "-"
	}
	lo, hi := formatP(float64(r[0])), formatP(float64(r[1]))
	if lo == hi {
		return lo
	}
	return lo + "–" + hi
}

// WriteJSON writes the report in the JSON form of the output contract.
func WriteJSON(w io.Writer, rep *Report) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(rep)
}

// csvColumns are the CSV report's columns, before the claims row's own
// unknown columns.
var csvColumns = []string{"row", "study", "claim", "first", "first_estimate", "first_se", "first_se_from",
	"second", "second_estimate", "second_se", "second_se_from", "relation", "method", "scale",
	"difference", "difference_se", "difference_ci_low", "difference_ci_high", "statistic", "df", "p",
	"p_low", "p_high", "alpha", "basis", "published", "recomputed", "outcome",
	"overlap_proportion", "overlap_implied_p", "notes"}

// WriteCSV writes one row per claim. Text cells that a spreadsheet would
// evaluate as a formula are prefixed with an apostrophe.
func WriteCSV(w io.Writer, rep *Report) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	extra := extraColumns(rep)
	bw.Write(appendCSVHeader(nil, extra))
	var buf []byte
	for i := range rep.Claims {
		buf = appendCSVClaim(buf[:0], &rep.Claims[i], extra)
		if _, err := bw.Write(buf); err != nil {
			return err
		}
	}
	return bw.Flush()
}

// appendCSVHeader appends the CSV report's header row.
func appendCSVHeader(dst []byte, extra []string) []byte {
	for i, name := range csvColumns {
		if i > 0 {
			dst = append(dst, ',')
		}
		dst = appendCSVField(dst, name)
	}
	for _, name := range extra {
		dst = appendCSVField(append(dst, ','), name)
	}
	return append(dst, '\n')
}

// extraColumns lists the claims rows' unknown columns in first-seen order,
// leaving out names the report's own columns already use.
func extraColumns(rep *Report) []string {
	seen := reportColumnSet()
	var out []string
	for _, c := range rep.Claims {
		out = appendUnseen(out, c.ExtraNames, seen)
	}
	return out
}

// reportColumnSet is the set of the CSV report's own columns, which an
// input's unknown column cannot take.
func reportColumnSet() map[string]bool {
	seen := make(map[string]bool, len(csvColumns))
	for _, c := range csvColumns {
		seen[c] = true
	}
	return seen
}

func appendUnseen(out, names []string, seen map[string]bool) []string {
	for _, n := range names {
		if !seen[n] {
			seen[n] = true
			out = append(out, n)
		}
	}
	return out
}

// safeText keeps a spreadsheet from evaluating a text cell: a leading =, +,
// -, @, tab or carriage return is prefixed with an apostrophe.
func safeText(s string) string {
	if s != "" && isGuarded(s[0]) {
		return "'" + s
	}
	return s
}
