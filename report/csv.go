package report

import (
	"encoding/csv"
	"io"
	"strconv"
	"strings"

	"coefaudit/audit"
)

// csvColumns are the CSV report's columns, before the claims rows' own
// unknown columns.
var csvColumns = [...]string{"row", "study", "claim", "first", "first_estimate", "first_se", "first_se_from",
	"second", "second_estimate", "second_se", "second_se_from", "relation", "method", "scale",
	"difference", "difference_se", "difference_ci_low", "difference_ci_high", "statistic", "df", "p",
	"p_low", "p_high", "alpha", "basis", "published", "recomputed", "outcome",
	"overlap_proportion", "overlap_implied_p", "notes"}

// csvWriter writes one row per claim with encoding/csv, as the claims
// arrive: the result's columns, then the claims rows' unknown columns
// (Header.ClaimColumns) passed through. Text a spreadsheet would evaluate
// as a formula, in a cell or in a pass-through column's name, is prefixed
// with an apostrophe (safeText).
//
// The rows are written with encoding/csv rather than mapped from a tagged
// struct with gocarina/gocsv: gocsv's columns are fixed by the struct's
// tags, and the pass-through columns differ from input to input; it also
// writes 1,000,000 claims slower (BenchmarkCSVRowsGocsv against
// BenchmarkCSVRowsEncodingCSV).
type csvWriter struct {
	w      *csv.Writer
	extra  []string // pass-through columns, as the claims rows name them
	record []string
}

func newCSVWriter(w io.Writer) *csvWriter { return &csvWriter{w: csv.NewWriter(w)} }

// Begin implements Writer: it writes the header.
func (c *csvWriter) Begin(h Header) error {
	own := map[string]bool{}
	for _, name := range csvColumns {
		own[name] = true
	}
	header := append([]string(nil), csvColumns[:]...)
	for _, name := range h.ClaimColumns {
		if !own[name] {
			own[name] = true
			c.extra = append(c.extra, name)
			header = append(header, safeText(name))
		}
	}
	c.record = make([]string, len(header))
	return c.w.Write(header)
}

// Study implements Writer: it writes the claims' rows.
func (c *csvWriter) Study(res audit.StudyResult) error {
	for i := range res.Claims {
		if err := c.w.Write(c.claimRecord(&res.Claims[i])); err != nil {
			return err
		}
	}
	return c.w.Error()
}

// End implements Writer: it flushes the rows. The CSV holds claims only;
// the input's problems and the cautions are in the other formats.
func (c *csvWriter) End(Footer) error {
	c.w.Flush()
	return c.w.Error()
}

// claimRecord fills the writer's record with one claim's cells.
func (c *csvWriter) claimRecord(r *audit.ClaimResult) []string {
	var overlap, impliedP string
	if r.Overlap != nil {
		overlap, impliedP = csvNumber(r.Overlap.Proportion), csvNumber(r.Overlap.ImpliedP)
	}
	rec := c.record[:0]
	rec = append(rec, strconv.Itoa(r.Row), safeText(r.Study), safeText(r.Claim),
		safeText(r.First.Label), csvNumber(r.First.Estimate), csvNumber(r.First.SE), safeText(r.First.SEFrom),
		safeText(r.Second.Label), csvNumber(r.Second.Estimate), csvNumber(r.Second.SE), safeText(r.Second.SEFrom),
		r.Relation, r.Method, r.Scale,
		csvNumber(r.Difference), csvNumber(r.DifferenceSE), csvNumber(r.DifferenceCI[0]), csvNumber(r.DifferenceCI[1]),
		csvNumber(r.Statistic), csvNumber(r.DF), csvNumber(r.P), csvNumber(r.PRange[0]), csvNumber(r.PRange[1]),
		audit.FormatAlpha(r.Alpha), r.Basis, r.Published, r.Recomputed, r.Outcome,
		overlap, impliedP, safeText(strings.Join(r.Notes, " | ")))
	for _, name := range c.extra {
		rec = append(rec, safeText(extraValue(r, name)))
	}
	return rec
}

// extraValue is the claims row's value of its unknown column name.
func extraValue(r *audit.ClaimResult, name string) string {
	for i, n := range r.ExtraNames {
		if n == name && i < len(r.ExtraValues) {
			return r.ExtraValues[i]
		}
	}
	return ""
}

// csvNumber writes a number at full precision, the shortest text that
// reads back as the same float64 (as the JSON does); nothing when it is
// not known.
func csvNumber(n audit.Number) string {
	if !n.Known() {
		return ""
	}
	return strconv.FormatFloat(float64(n), 'g', -1, 64)
}

// safeText keeps a spreadsheet from evaluating a text cell: a leading =, +,
// -, @, tab or carriage return is prefixed with an apostrophe.
func safeText(s string) string {
	if s != "" && strings.IndexByte("=+-@\t\r", s[0]) >= 0 {
		return "'" + s
	}
	return s
}
