package report

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"coefaudit/audit"
	"coefaudit/extract"

	"github.com/xuri/excelize/v2"
)

// xlsxWriter writes the report as a workbook a review can publish:
//
//   - summary: the counts by outcome and by study × outcome, and the cautions;
//   - claims: the input's claims rows with the audit's columns beside each
//     (outcome, recomputed verdict, relation, method, difference and its CI,
//     p and its range, statistic, df, notes);
//   - methods: each claim's methods paragraph, then the cautions;
//   - coefficients, correlations and one "table …" sheet per correlation
//     table: the input as it was read, numbers kept as printed (text), with
//     each row's problems beside it; only when Check hands the writer the
//     input (InputWriter);
//   - problems: the problems of the input, when there are any.
//
// Outcome cells are filled with the report palette and always carry the
// outcome word. Header rows are frozen. Every text cell is written as a
// text (inline string) cell in the text number format, so a value such as
// "=HYPERLINK(…)" is shown as written and never evaluated; numbers are
// numeric cells with fixed formats (p to 4 decimals, in scientific
// notation below 0.0001).
//
// Every sheet is written with excelize's StreamWriter, which keeps each
// sheet's buffer until the workbook is written. The claims sheet is
// written as the claims arrive; the methods sheet's rows (methodsRow) and
// the input's coefficients (heldCoefficients) wait in spools, the
// other input sheets, the problems and a count per study in memory, until
// End (the coefficients sheet's header names the unknown columns of every
// coefficient row, known only then), so that memory grows with neither
// the claims nor the coefficients. The report
// holds at most MaxXLSXClaims claims, and a sheet at most 1,048,575 rows
// below its header (ErrSheetFull, for an input whose coefficients alone
// pass it).
//
// The input sheets keep the names and columns the reader knows, so the
// workbook can be read back and audited again; the audit's own columns are
// then ignored. A cell the reader could not read is left blank, since no
// text of it is kept, and its problem is written beside the row.
type xlsxWriter struct {
	w      io.Writer
	tmpDir string
	f      *excelize.File
	st     *xlsxStyles
	h      Header

	claims, methods *xlsxSheet
	extra           []string          // the claims rows' unknown columns, in the claims sheet
	methodRows      spool[methodsRow] // the methods sheet's rows, written at End

	// inputs are the claims rows of the studies handed to Input and not
	// yet written, by Index.
	inputs       map[int]*extract.Claim
	shownInput   bool
	coefficients heldCoefficients
	correlations []extract.Correlation
	tables       []extract.CorrelationTable
	seenRow      map[extract.Position]bool // correlations rows held (a study's are handed to each study of its name)
	seenTable    map[string]bool

	tally    tallies
	problems heldProblems
	// written counts the claims written; maxClaims is MaxXLSXClaims but in
	// tests.
	written, maxClaims int
}

// newXLSXWriter returns the writer; excelize keeps its temporary files in
// tmpDir (the system's temporary folder when empty).
func newXLSXWriter(w io.Writer, tmpDir string) *xlsxWriter {
	return &xlsxWriter{w: w, tmpDir: tmpDir, inputs: map[int]*extract.Claim{}, seenRow: map[extract.Position]bool{}, seenTable: map[string]bool{},
		coefficients: heldCoefficients{records: spool[[]string]{dir: tmpDir, what: "the input's coefficients"}}, methodRows: spool[methodsRow]{dir: tmpDir, what: "the methods sheet"}, maxClaims: MaxXLSXClaims}
}

// Begin implements Writer: the workbook, its styles, and the headers of
// the claims and methods sheets.
func (x *xlsxWriter) Begin(h Header) error {
	x.h = h
	// An input counted beforehand is refused before any work on it.
	switch {
	case h.RowsKnown && h.ClaimRows > x.maxClaims:
		return x.errTooManyClaims()
	case h.RowsKnown && h.CoefficientRows >= excelize.TotalRows:
		return errSheetFull()
	}
	x.f = excelize.NewFile(excelize.Options{TmpDir: x.tmpDir})
	st, err := newXLSXStyles(x.f)
	if err != nil {
		return fmt.Errorf("xlsx report: %w", err)
	}
	x.st = st
	if err := x.f.SetSheetName("Sheet1", "summary"); err != nil {
		return fmt.Errorf("xlsx report: %w", err)
	}
	if x.claims, err = x.sheet("claims"); err != nil {
		return err
	}
	seen := nameSet(claimInputColumns, claimResultColumns)
	for _, n := range h.ClaimColumns {
		if !seen[strings.ToLower(n)] {
			seen[strings.ToLower(n)] = true
			x.extra = append(x.extra, n)
		}
	}
	if err := x.claimsHeader(); err != nil {
		return fmt.Errorf("xlsx report, sheet %q: %w", "claims", err)
	}
	if x.methods, err = x.sheet("methods"); err != nil {
		return err
	}
	if err := x.methods.columns([]float64{11, 16, 12, 15, 110}, true); err != nil {
		return fmt.Errorf("xlsx report, sheet %q: %w", "methods", err)
	}
	return x.methods.header(st, []string{"source_row", "study", "claim", "outcome", "methods"}, -1)
}

// sheet adds a sheet (the summary is there from the start) and opens its
// stream.
func (x *xlsxWriter) sheet(name string) (*xlsxSheet, error) {
	if name != "summary" {
		if _, err := x.f.NewSheet(name); err != nil {
			return nil, fmt.Errorf("xlsx report, sheet %q: %w", name, err)
		}
	}
	sw, err := x.f.NewStreamWriter(name)
	if err != nil {
		return nil, fmt.Errorf("xlsx report, sheet %q: %w", name, err)
	}
	return &xlsxSheet{f: x.f, name: name, sw: sw}, nil
}

// Input implements InputWriter: it keeps the study's rows for the input
// sheets and its claims rows for their cells on the claims sheet.
func (x *xlsxWriter) Input(st *extract.Study) error {
	x.shownInput = true
	for i := range st.Claims {
		x.inputs[st.Claims[i].Index] = &st.Claims[i]
	}
	for i := range st.Coefficients {
		if err := x.coefficients.add(&st.Coefficients[i]); err != nil {
			return fmt.Errorf("xlsx report: %w", err)
		}
	}
	for _, c := range st.Correlations {
		if !x.seenRow[c.Position] {
			x.seenRow[c.Position] = true
			x.correlations = append(x.correlations, c)
		}
	}
	for _, t := range st.Tables {
		if !x.seenTable[t.Name] {
			x.seenTable[t.Name] = true
			x.tables = append(x.tables, t)
		}
	}
	if max(x.coefficients.rows, len(x.correlations)) >= excelize.TotalRows {
		return errSheetFull()
	}
	return nil
}

// Study implements Writer: the claims' rows and methods paragraphs.
func (x *xlsxWriter) Study(res audit.StudyResult) error {
	if x.written += len(res.Claims); x.written > x.maxClaims {
		return x.errTooManyClaims()
	}
	x.problems.add(res.Problems)
	x.tally.add(res.Claims)
	st := x.st
	for i := range res.Claims {
		c := &res.Claims[i]
		in := x.inputs[c.Index]
		delete(x.inputs, c.Index)
		row := claimInputCells(st, c, in, x.extra)
		var bad []badCell
		if in != nil {
			bad = badCells(in.Problems, claimInputColumns)
			markBad(st, row, bad)
		}
		shown := c.Shown()
		row = append(row, st.outcomeCell(c.Outcome), st.textCell(c.Recomputed), st.textCell(c.Relation),
			st.textCell(c.Method), st.textCell(shownScale(c)), st.estimateNumber(c, shown.Estimate),
			st.estimateNumber(c, shown.Low), st.estimateNumber(c, shown.High),
			st.pValue(c.P), st.pValue(c.PRange[0]), st.pValue(c.PRange[1]),
			st.pValue(adjustedP(c, audit.AdjustHolm)), st.pValue(adjustedP(c, audit.AdjustBH)),
			st.number(c.Statistic, st.stat), st.number(c.DF, st.general), st.number(overlapProportion(c), st.stat),
			st.textCell(strings.Join(c.Notes, " | ")), excelize.Cell{StyleID: st.count, Value: c.Row})
		if err := x.claims.add(row...); err != nil {
			return fmt.Errorf("xlsx report, sheet %q: %w", "claims", err)
		}
		if err := x.claims.commentBad(bad); err != nil {
			return fmt.Errorf("xlsx report, sheet %q: %w", "claims", err)
		}
		if err := x.methodRows.add(methodsRow{Row: c.Row, Study: c.Study, Claim: c.Claim, Outcome: c.Outcome,
			Methods: strings.TrimSpace(methodsText(c))}); err != nil {
			return fmt.Errorf("xlsx report, sheet %q: %w", "methods", err)
		}
	}
	return nil
}

// Close implements io.Closer: it removes the temporary files in which
// excelize keeps long sheets. End closes the writer; a run that fails
// before End must (Check and Write do).
func (x *xlsxWriter) Close() error {
	x.coefficients.close()
	x.methodRows.close()
	if x.f == nil {
		return nil
	}
	err := x.f.Close()
	x.f = nil
	return err
}

// xlsxStep writes the rows of one sheet, before its stream is flushed.
type xlsxStep struct {
	s     *xlsxSheet
	write func(*xlsxSheet) error
}

// End implements Writer: it finishes the claims and methods sheets, writes
// the summary, the input sheets and the problems, and the workbook to w.
func (x *xlsxWriter) End(f Footer) error {
	defer x.Close()
	problems := x.problems.all(f)
	steps := []xlsxStep{
		{x.claims, func(s *xlsxSheet) error {
			return s.filter(len(claimInputColumns) + len(x.extra) + len(claimResultColumns))
		}},
		{x.methods, x.writeMethods},
	}
	add := func(name string, write func(*xlsxSheet) error) error {
		s, err := x.sheet(name)
		if err == nil {
			steps = append(steps, xlsxStep{s, write})
		}
		return err
	}
	if err := add("summary", func(s *xlsxSheet) error {
		err := x.writeSummary(s, f.Summary, len(problems))
		// Written: the sheets after it need the memory. Kept, the counts
		// took the xlsx report of BenchmarkReadWorkbook100k's workbook of
		// 140,000 claims to its memory target (/usr/bin/time -v).
		x.tally = tallies{}
		return err
	}); err != nil {
		return err
	}
	if x.shownInput {
		byRow := problemsByRow(problems)
		if err := add("coefficients", func(s *xlsxSheet) error { return writeCoefficientsSheet(s, x.st, &x.coefficients, byRow) }); err != nil {
			return err
		}
		if len(x.correlations) > 0 {
			if err := add("correlations", func(s *xlsxSheet) error { return writeCorrelationsSheet(s, x.st, x.correlations, byRow) }); err != nil {
				return err
			}
		}
		used := map[string]bool{"summary": true, "claims": true, "coefficients": true, "correlations": true, "methods": true, "problems": true}
		for i := range x.tables {
			t := &x.tables[i]
			if err := add(tableSheetName(t.Name, used), func(s *xlsxSheet) error { return writeTableSheet(s, x.st, t) }); err != nil {
				return err
			}
		}
	}
	if len(problems) > 0 {
		if err := add("problems", func(s *xlsxSheet) error { return writeProblemsSheet(s, x.st, problems) }); err != nil {
			return err
		}
	}
	for _, step := range steps {
		if err := step.write(step.s); err != nil {
			return fmt.Errorf("xlsx report, sheet %q: %w", step.s.name, err)
		}
		if err := step.s.sw.Flush(); err != nil {
			return fmt.Errorf("xlsx report, sheet %q: %w", step.s.name, err)
		}
	}
	// The summary, the first sheet, is active as made. (SetActiveSheet would
	// parse every streamed sheet back into memory.)
	if err := x.f.SetDocProps(&excelize.DocProperties{Creator: "coefaudit", Title: reportTitle,
		Description: strings.Join(x.h.cautions(), " ")}); err != nil {
		return fmt.Errorf("xlsx report: %w", err)
	}
	if err := extract.WriteXLSX(x.f, x.w); err != nil {
		return fmt.Errorf("xlsx report: %w", err)
	}
	return nil
}

// claimResultColumns are the audit's columns on the claims sheet.
var claimResultColumns = []string{"outcome", "recomputed", "relation", "method", "scale", "difference",
	"difference_ci_low", "difference_ci_high", "p", "p_low", "p_high", "p_holm", "p_bh", "statistic", "df",
	"overlap_proportion", "notes", "source_row"}

// claimInputColumns are the claims sheet's columns as the reader knows them.
var claimInputColumns = []string{"study", "claim", "first", "second", "published", "published_p", "basis",
	"alpha", "estimate_corr", "topic"}

// claimsHeader sets the claims sheet's widths and writes its header.
func (x *xlsxWriter) claimsHeader() error {
	names := append(append(append([]string{}, claimInputColumns...), x.extra...), claimResultColumns...)
	widths := []float64{16, 10, 16, 16, 14, 12, 16, 7, 13, 12}
	for range x.extra {
		widths = append(widths, 14)
	}
	widths = append(widths, 15, 15, 14, 24, 12, 12, 12, 12, 9, 9, 9, 9, 9, 10, 8, 11, 100, 11)
	if err := x.claims.columns(widths, true); err != nil {
		return err
	}
	return x.claims.header(x.st, names, len(claimInputColumns)+len(x.extra))
}

// writeMethods writes the methods sheet's rows, held until the end, and
// the cautions after them.
func (x *xlsxWriter) writeMethods(s *xlsxSheet) error {
	st := x.st
	err := x.methodRows.each(func(r methodsRow) error {
		cell := any(excelize.Cell{StyleID: st.wrap, Value: r.Methods})
		if r.Methods == "" {
			cell = excelize.Cell{StyleID: st.note, Value: "No methods paragraph was written for this claim; its notes are on the claims sheet."}
		}
		return s.add(excelize.Cell{StyleID: st.count, Value: r.Row}, st.textCell(r.Study), st.textCell(r.Claim),
			st.outcomeCell(r.Outcome), cell)
	})
	if err != nil {
		return err
	}
	if err := s.add(); err != nil {
		return err
	}
	if err := s.add(nil, nil, nil, nil, excelize.Cell{StyleID: x.st.label, Value: "Cautions"}); err != nil {
		return err
	}
	for _, c := range x.h.cautions() {
		if err := s.add(nil, nil, nil, nil, excelize.Cell{StyleID: x.st.wrap, Value: c}); err != nil {
			return err
		}
	}
	return nil
}

// writeSummary writes the summary sheet: the counts by outcome and by
// study × outcome, and the cautions.
func (x *xlsxWriter) writeSummary(s *xlsxSheet, sum audit.Summary, problems int) error {
	st := x.st
	widths := []float64{30}
	for range audit.Outcomes {
		widths = append(widths, 14)
	}
	if err := s.columns(append(widths, 10), false); err != nil {
		return err
	}
	n := sum.Claims
	rows := [][]any{
		{excelize.Cell{StyleID: st.title, Value: reportTitle}},
		{excelize.Cell{StyleID: st.label, Value: "Input"}, st.textCell(x.h.Source)},
		{excelize.Cell{StyleID: st.label, Value: "Claims audited"}, excelize.Cell{StyleID: st.count, Value: n}},
		{excelize.Cell{StyleID: st.label, Value: "Problems in the input"}, excelize.Cell{StyleID: st.count, Value: problems}},
		{excelize.Cell{StyleID: st.label, Value: "Default α"}, excelize.Cell{StyleID: st.general, Value: x.h.Alpha}},
		nil,
		{excelize.Cell{StyleID: st.header, Value: "outcome"}, excelize.Cell{StyleID: st.header, Value: "claims"}, excelize.Cell{StyleID: st.header, Value: "share"}},
	}
	for _, o := range audit.Outcomes {
		var share any
		if n > 0 {
			share = excelize.Cell{StyleID: st.share, Value: float64(sum.Counts[o]) / float64(n)}
		}
		rows = append(rows, []any{st.outcomeCell(o), excelize.Cell{StyleID: st.count, Value: sum.Counts[o]}, share})
	}
	rows = append(rows, []any{excelize.Cell{StyleID: st.label, Value: "total"}, excelize.Cell{StyleID: st.count, Value: n}}, nil,
		[]any{excelize.Cell{StyleID: st.label, Value: "Claims by study and outcome"}})
	head := []any{excelize.Cell{StyleID: st.header, Value: "study"}}
	for _, o := range audit.Outcomes {
		head = append(head, st.outcomeCell(o))
	}
	rows = append(rows, append(head, excelize.Cell{StyleID: st.header, Value: "total"}))
	for _, r := range rows {
		if err := s.add(r...); err != nil {
			return err
		}
	}
	for k := range x.tally.len() {
		row := []any{excelize.Cell{StyleID: st.label, Value: x.tally.names[k]}}
		for _, o := range audit.Outcomes {
			row = append(row, excelize.Cell{StyleID: st.count, Value: x.tally.count(k, o)})
		}
		if err := s.add(append(row, excelize.Cell{StyleID: st.count, Value: x.tally.total(k)})...); err != nil {
			return err
		}
	}
	if err := s.add(); err != nil {
		return err
	}
	if err := s.add(excelize.Cell{StyleID: st.label, Value: "Cautions"}); err != nil {
		return err
	}
	for _, c := range x.h.cautions() {
		if err := s.add(st.textCell(c)); err != nil {
			return err
		}
	}
	return nil
}

func writeProblemsSheet(s *xlsxSheet, st *xlsxStyles, problems []audit.Problem) error {
	if err := s.columns([]float64{18, 18, 8, 16, 100}, true); err != nil {
		return err
	}
	if err := s.header(st, []string{"file", "sheet", "row", "column", "message"}, -1); err != nil {
		return err
	}
	for _, p := range problems {
		var row any
		if p.Row > 0 {
			row = excelize.Cell{StyleID: st.count, Value: p.Row}
		}
		if err := s.add(st.textCell(p.File), st.textCell(p.Sheet), row, st.textCell(p.Column), st.textCell(p.Message)); err != nil {
			return err
		}
	}
	return s.filter(5)
}

func overlapProportion(c *audit.ClaimResult) audit.Number {
	if c.Overlap == nil {
		return audit.Number(math.NaN())
	}
	return c.Overlap.Proportion
}

// claimInputCells are the claims row's own cells: from the row as read
// when the input was shown, else from the result.
func claimInputCells(st *xlsxStyles, c *audit.ClaimResult, cl *extract.Claim, extra []string) []any {
	if cl == nil {
		row := []any{st.textCell(c.Study), st.textCell(c.Claim), st.textCell(c.First.Label), st.textCell(c.Second.Label),
			st.textCell(c.Published), nil, st.textCell(c.Basis), st.textCell(alphaText(c.Alpha)), nil, st.textCell(c.Topic)}
		return append(row, extraCells(st, c.ExtraNames, c.ExtraValues, extra)...)
	}
	row := []any{st.textCell(cl.Study), st.textCell(cl.Claim), st.textCell(cl.First), st.textCell(cl.Second),
		st.textCell(cl.Published), st.textCell(cl.PublishedP.Text), st.textCell(cl.Basis), st.textCell(alphaText(cl.Alpha)),
		st.textCell(cl.EstimateCorr.Text), st.textCell(cl.Topic)}
	return append(row, extraCells(st, cl.Extra.Names, cl.Extra.Values, extra)...)
}

func alphaText(a float64) string {
	if a <= 0 {
		return ""
	}
	return strconv.FormatFloat(a, 'g', -1, 64)
}

// extraCells lays a row's unknown columns out in the order of extra.
func extraCells(st *xlsxStyles, names, values, extra []string) []any {
	out := make([]any, len(extra))
	for i, want := range extra {
		for k, n := range names {
			if n == want && k < len(values) {
				out[i] = st.textCell(values[k])
			}
		}
	}
	return out
}

func nameSet(lists ...[]string) map[string]bool {
	m := map[string]bool{}
	for _, l := range lists {
		for _, n := range l {
			m[n] = true
		}
	}
	return m
}

// problemsByRow indexes problems by sheet and row.
func problemsByRow(problems []audit.Problem) map[string][]string {
	m := map[string][]string{}
	for _, p := range problems {
		if p.Row > 0 {
			k := p.Sheet + "\x00" + strconv.Itoa(p.Row)
			msg := p.Message
			if p.Column != "" {
				msg = fmt.Sprintf("column %q: %s", p.Column, p.Message)
			}
			m[k] = append(m[k], msg)
		}
	}
	return m
}

func rowProblems(m map[string][]string, pos extract.Position) string {
	return strings.Join(m[pos.Sheet+"\x00"+strconv.Itoa(pos.Row)], " | ")
}
