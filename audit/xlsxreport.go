package audit

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"coefaudit/extract"

	"github.com/xuri/excelize/v2"
)

// WriteXLSX writes the report as a workbook a review can publish:
//
//   - summary: the counts by outcome and by study × outcome, and the cautions;
//   - claims: the input's claims rows with the audit's columns beside each
//     (outcome, recomputed verdict, relation, method, difference and its CI,
//     p and its range, statistic, df, notes);
//   - coefficients, correlations and one "table …" sheet per correlation
//     table: the input as it was read, numbers kept as printed (text), with
//     each row's problems beside it;
//   - methods: each claim's methods paragraph, then the cautions;
//   - problems: the problems of the input, when there are any.
//
// Outcome cells are filled with the report palette and always carry the
// outcome word. Header rows are frozen. Every text cell is written as a
// text (inline string) cell in the text number format, so a value such as
// "=HYPERLINK(…)" is shown as written and never evaluated; numbers are
// numeric cells with fixed formats (p to 4 decimals, in scientific
// notation below 0.0001).
// Sheets are written with excelize's StreamWriter, so memory stays flat in
// the number of claims.
//
// in is the input the report was made from (for the input sheets); when it
// is nil only the summary, claims, methods and problems sheets are written.
// The input sheets keep the names and columns the reader knows, so the
// workbook can be read back and audited again; the audit's own columns are
// then ignored. A cell the reader could not read is left blank, since no
// text of it is kept, and its problem is written beside the row.
func WriteXLSX(w io.Writer, rep *Report, in *extract.Input) error {
	f := excelize.NewFile()
	defer f.Close()
	st, err := newXLSXStyles(f)
	if err != nil {
		return fmt.Errorf("xlsx report: %w", err)
	}
	if err := f.SetSheetName("Sheet1", "summary"); err != nil {
		return fmt.Errorf("xlsx report: %w", err)
	}
	steps := []xlsxStep{
		{"summary", func(s *xlsxSheet) error { return writeSummarySheet(s, st, rep) }},
		{"claims", func(s *xlsxSheet) error { return writeClaimsSheet(s, st, rep, in) }},
	}
	if in != nil {
		steps = append(steps, xlsxStep{"coefficients", func(s *xlsxSheet) error { return writeCoefficientsSheet(s, st, rep, in) }})
		if len(in.Correlations) > 0 {
			steps = append(steps, xlsxStep{"correlations", func(s *xlsxSheet) error { return writeCorrelationsSheet(s, st, rep, in) }})
		}
		used := map[string]bool{"summary": true, "claims": true, "coefficients": true, "correlations": true, "methods": true, "problems": true}
		for i := range in.Tables {
			t := &in.Tables[i]
			steps = append(steps, xlsxStep{tableSheetName(t.Name, used), func(s *xlsxSheet) error { return writeTableSheet(s, st, t) }})
		}
	}
	steps = append(steps, xlsxStep{"methods", func(s *xlsxSheet) error { return writeMethodsSheet(s, st, rep) }})
	if len(rep.Problems) > 0 {
		steps = append(steps, xlsxStep{"problems", func(s *xlsxSheet) error { return writeProblemsSheet(s, st, rep) }})
	}
	for _, step := range steps {
		if step.name != "summary" {
			if _, err := f.NewSheet(step.name); err != nil {
				return fmt.Errorf("xlsx report, sheet %q: %w", step.name, err)
			}
		}
		sw, err := f.NewStreamWriter(step.name)
		if err != nil {
			return fmt.Errorf("xlsx report, sheet %q: %w", step.name, err)
		}
		s := &xlsxSheet{f: f, name: step.name, sw: sw}
		if err := step.write(s); err != nil {
			return fmt.Errorf("xlsx report, sheet %q: %w", step.name, err)
		}
		if err := sw.Flush(); err != nil {
			return fmt.Errorf("xlsx report, sheet %q: %w", step.name, err)
		}
	}
	// The summary, the first sheet, is active as made. (SetActiveSheet would
	// parse every streamed sheet back into memory.)
	if err := f.SetDocProps(&excelize.DocProperties{Creator: "coefaudit", Title: "Audit of published comparisons",
		Description: strings.Join(Cautions, " ")}); err != nil {
		return fmt.Errorf("xlsx report: %w", err)
	}
	if _, err := f.WriteTo(w); err != nil {
		return fmt.Errorf("xlsx report: %w", err)
	}
	return nil
}

// xlsxStep writes one sheet.
type xlsxStep struct {
	name  string
	write func(*xlsxSheet) error
}

// xlsxStyles are the workbook's cell styles, made once before any row.
type xlsxStyles struct {
	title, label, header, resultHeader, text, wrap, note int
	decimal, stat, general, p, pTiny, count, share       int
	outcome                                              map[string]int
}

func newXLSXStyles(f *excelize.File) (*xlsxStyles, error) {
	st := &xlsxStyles{outcome: map[string]int{}}
	textFmt := 49 // "@": text, so that nothing typed later is read as a formula
	pFmt, pTinyFmt := "0.0000", "0.0E+00"
	decFmt := "0.0000"
	statFmt := "0.00"
	shareFmt := "0%"
	thin := []excelize.Border{{Type: "bottom", Color: "1C2330", Style: 2}}
	top := &excelize.Alignment{Vertical: "top"}
	defs := []struct {
		id    *int
		style excelize.Style
	}{
		{&st.title, excelize.Style{Font: &excelize.Font{Bold: true, Size: 16, Color: "1C2330"}}},
		{&st.label, excelize.Style{Font: &excelize.Font{Bold: true}, NumFmt: textFmt, Alignment: top}},
		{&st.header, excelize.Style{Font: &excelize.Font{Bold: true, Color: "1C2330"}, NumFmt: textFmt, Border: thin,
			Fill: excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"EDEAE3"}}, Alignment: top}},
		{&st.resultHeader, excelize.Style{Font: &excelize.Font{Bold: true, Color: "FFFFFF"}, NumFmt: textFmt, Border: thin,
			Fill: excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"0E5A6A"}}, Alignment: top}},
		{&st.text, excelize.Style{NumFmt: textFmt, Alignment: top}},
		{&st.wrap, excelize.Style{NumFmt: textFmt, Alignment: &excelize.Alignment{Vertical: "top", WrapText: true}}},
		{&st.note, excelize.Style{NumFmt: textFmt, Font: &excelize.Font{Italic: true, Color: "5A6270"}}},
		{&st.decimal, excelize.Style{CustomNumFmt: &decFmt, Alignment: top}},
		{&st.stat, excelize.Style{CustomNumFmt: &statFmt, Alignment: top}},
		{&st.general, excelize.Style{NumFmt: 0, Alignment: top}},
		{&st.p, excelize.Style{CustomNumFmt: &pFmt, Alignment: top}},
		{&st.pTiny, excelize.Style{CustomNumFmt: &pTinyFmt, Alignment: top}},
		{&st.count, excelize.Style{NumFmt: 1, Alignment: top}},
		{&st.share, excelize.Style{CustomNumFmt: &shareFmt, Alignment: top}},
	}
	for _, d := range defs {
		id, err := f.NewStyle(&d.style)
		if err != nil {
			return nil, err
		}
		*d.id = id
	}
	for _, o := range Outcomes {
		id, err := f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true, Color: "111111"}, NumFmt: textFmt,
			Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{strings.TrimPrefix(fillOf(o), "#")}},
			Border:    []excelize.Border{{Type: "left", Color: "9A9A9A", Style: 1}, {Type: "right", Color: "9A9A9A", Style: 1}, {Type: "top", Color: "9A9A9A", Style: 1}, {Type: "bottom", Color: "9A9A9A", Style: 1}},
			Alignment: &excelize.Alignment{Horizontal: "center", Vertical: "top"}})
		if err != nil {
			return nil, err
		}
		st.outcome[o] = id
	}
	return st, nil
}

// text is a text cell, or no cell for "".
func (st *xlsxStyles) textCell(s string) any {
	if s == "" {
		return nil
	}
	return excelize.Cell{StyleID: st.text, Value: s}
}

// number is a numeric cell in the given style, or no cell when n is not known.
func (st *xlsxStyles) number(n Number, style int) any {
	if !n.Known() {
		return nil
	}
	return excelize.Cell{StyleID: style, Value: float64(n)}
}

// pValue is a p cell: 4 decimals, or two significant digits in scientific
// notation below 0.0001, where 4 decimals would show 0.0000.
func (st *xlsxStyles) pValue(p Number) any {
	if p.Known() && p > 0 && p < 1e-4 {
		return st.number(p, st.pTiny)
	}
	return st.number(p, st.p)
}

// outcomeCell is an outcome word on its fill.
func (st *xlsxStyles) outcomeCell(o string) any {
	id, ok := st.outcome[o]
	if !ok {
		id = st.outcome[Incomplete]
	}
	return excelize.Cell{StyleID: id, Value: o}
}

// xlsxSheet streams the rows of one sheet.
type xlsxSheet struct {
	f    *excelize.File
	name string
	sw   *excelize.StreamWriter
	row  int
}

// columns sets the widths and, when freeze is set, freezes the first row;
// it must come before the first row.
func (s *xlsxSheet) columns(widths []float64, freeze bool) error {
	for i, w := range widths {
		if err := s.sw.SetColWidth(i+1, i+1, w); err != nil {
			return err
		}
	}
	if freeze {
		return s.sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"})
	}
	return nil
}

func (s *xlsxSheet) add(cells ...any) error {
	s.row++
	ref, err := excelize.CoordinatesToCellName(1, s.row)
	if err != nil {
		return err
	}
	return s.sw.SetRow(ref, cells)
}

// header writes a header row: input columns in the input style, the
// audit's columns (from index first) in the result style.
func (s *xlsxSheet) header(st *xlsxStyles, names []string, firstResult int) error {
	cells := make([]any, len(names))
	for i, n := range names {
		style := st.header
		if firstResult >= 0 && i >= firstResult {
			style = st.resultHeader
		}
		cells[i] = excelize.Cell{StyleID: style, Value: n}
	}
	return s.add(cells...)
}

// filter puts an autofilter on the header and the rows written so far.
// Like conditional formats, it must be set before the sheet's Flush.
func (s *xlsxSheet) filter(ncol int) error {
	if s.row < 2 || ncol < 1 {
		return nil
	}
	last, err := excelize.CoordinatesToCellName(ncol, s.row)
	if err != nil {
		return err
	}
	return s.f.AutoFilter(s.name, "A1:"+last, nil)
}

func writeSummarySheet(s *xlsxSheet, st *xlsxStyles, rep *Report) error {
	widths := []float64{30}
	for range Outcomes {
		widths = append(widths, 14)
	}
	if err := s.columns(append(widths, 10), false); err != nil {
		return err
	}
	n := len(rep.Claims)
	rows := [][]any{
		{excelize.Cell{StyleID: st.title, Value: "Audit of published comparisons"}},
		{excelize.Cell{StyleID: st.label, Value: "Input"}, st.textCell(rep.Source)},
		{excelize.Cell{StyleID: st.label, Value: "Claims audited"}, excelize.Cell{StyleID: st.count, Value: n}},
		{excelize.Cell{StyleID: st.label, Value: "Problems in the input"}, excelize.Cell{StyleID: st.count, Value: len(rep.Problems)}},
		{excelize.Cell{StyleID: st.label, Value: "Default α"}, excelize.Cell{StyleID: st.general, Value: rep.Alpha}},
		nil,
		{excelize.Cell{StyleID: st.header, Value: "outcome"}, excelize.Cell{StyleID: st.header, Value: "claims"}, excelize.Cell{StyleID: st.header, Value: "share"}},
	}
	counts, studies := tallyClaims(rep)
	for _, o := range Outcomes {
		var share any
		if n > 0 {
			share = excelize.Cell{StyleID: st.share, Value: float64(counts[o]) / float64(n)}
		}
		rows = append(rows, []any{st.outcomeCell(o), excelize.Cell{StyleID: st.count, Value: counts[o]}, share})
	}
	rows = append(rows, []any{excelize.Cell{StyleID: st.label, Value: "total"}, excelize.Cell{StyleID: st.count, Value: n}}, nil,
		[]any{excelize.Cell{StyleID: st.label, Value: "Claims by study and outcome"}})
	head := []any{excelize.Cell{StyleID: st.header, Value: "study"}}
	for _, o := range Outcomes {
		head = append(head, st.outcomeCell(o))
	}
	rows = append(rows, append(head, excelize.Cell{StyleID: st.header, Value: "total"}))
	for _, sc := range studies {
		row := []any{excelize.Cell{StyleID: st.label, Value: sc.Study}}
		for _, o := range Outcomes {
			row = append(row, excelize.Cell{StyleID: st.count, Value: sc.Counts[o]})
		}
		rows = append(rows, append(row, excelize.Cell{StyleID: st.count, Value: sc.Total}))
	}
	rows = append(rows, nil, []any{excelize.Cell{StyleID: st.label, Value: "Cautions"}})
	for _, c := range cautionsOf(rep) {
		rows = append(rows, []any{st.textCell(c)})
	}
	for _, r := range rows {
		if err := s.add(r...); err != nil {
			return err
		}
	}
	return nil
}

func cautionsOf(rep *Report) []string {
	if len(rep.Cautions) > 0 {
		return rep.Cautions
	}
	return Cautions
}

// claimResultColumns are the audit's columns on the claims sheet.
var claimResultColumns = []string{"outcome", "recomputed", "relation", "method", "scale", "difference",
	"difference_ci_low", "difference_ci_high", "p", "p_low", "p_high", "p_holm", "p_bh", "statistic", "df",
	"overlap_proportion", "notes", "source_row"}

var claimInputColumns = []string{"study", "claim", "first", "second", "published", "published_p", "basis",
	"alpha", "estimate_corr", "topic"}

func writeClaimsSheet(s *xlsxSheet, st *xlsxStyles, rep *Report, in *extract.Input) error {
	inputs := matchClaims(rep, in)
	var extra []string
	seen := nameSet(claimInputColumns, claimResultColumns)
	for i := range rep.Claims {
		names := rep.Claims[i].ExtraNames
		if inputs[i] != nil {
			names = inputs[i].Extra.Names
		}
		for _, n := range names {
			if !seen[strings.ToLower(n)] {
				seen[strings.ToLower(n)] = true
				extra = append(extra, n)
			}
		}
	}
	names := append(append(append([]string{}, claimInputColumns...), extra...), claimResultColumns...)
	widths := []float64{16, 10, 16, 16, 14, 12, 16, 7, 13, 12}
	for range extra {
		widths = append(widths, 14)
	}
	widths = append(widths, 15, 15, 14, 24, 12, 12, 12, 12, 9, 9, 9, 9, 9, 10, 8, 11, 100, 11)
	if err := s.columns(widths, true); err != nil {
		return err
	}
	if err := s.header(st, names, len(claimInputColumns)+len(extra)); err != nil {
		return err
	}
	for i := range rep.Claims {
		c := &rep.Claims[i]
		row := claimInputCells(st, c, inputs[i], extra)
		row = append(row, st.outcomeCell(c.Outcome), st.textCell(c.Recomputed), st.textCell(c.Relation),
			st.textCell(c.Method), st.textCell(c.Scale), st.number(c.Difference, st.decimal),
			st.number(c.DifferenceCI[0], st.decimal), st.number(c.DifferenceCI[1], st.decimal),
			st.pValue(c.P), st.pValue(c.PRange[0]), st.pValue(c.PRange[1]),
			st.pValue(adjustedP(c, AdjustHolm)), st.pValue(adjustedP(c, AdjustBH)),
			st.number(c.Statistic, st.stat), st.number(c.DF, st.general), st.number(overlapProportion(c), st.stat),
			st.textCell(strings.Join(c.Notes, " | ")), excelize.Cell{StyleID: st.count, Value: c.Row})
		if err := s.add(row...); err != nil {
			return err
		}
	}
	return s.filter(len(names))
}

// adjustedP is the claim's p adjusted within its study by method, NaN
// when there is none.
func adjustedP(c *ClaimResult, method string) Number {
	q, _ := c.AdjustedP.By(method)
	return q
}

func overlapProportion(c *ClaimResult) Number {
	if c.Overlap == nil {
		return nan
	}
	return c.Overlap.Proportion
}

// matchClaims pairs each claim of the report with its claims row of the
// input: by position when both list the same rows, else by row number.
func matchClaims(rep *Report, in *extract.Input) []*extract.Claim {
	out := make([]*extract.Claim, len(rep.Claims))
	if in == nil {
		return out
	}
	byRow := map[int]*extract.Claim{}
	for i := range in.Claims {
		byRow[in.Claims[i].Row] = &in.Claims[i]
	}
	for i := range rep.Claims {
		if len(in.Claims) == len(rep.Claims) && in.Claims[i].Row == rep.Claims[i].Row {
			out[i] = &in.Claims[i]
		} else {
			out[i] = byRow[rep.Claims[i].Row]
		}
	}
	return out
}

func claimInputCells(st *xlsxStyles, c *ClaimResult, cl *extract.Claim, extra []string) []any {
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

// problemsByRow indexes the report's problems by sheet and row.
func problemsByRow(rep *Report) map[string][]string {
	m := map[string][]string{}
	for _, p := range rep.Problems {
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

var coefficientInputColumns = []string{"study", "label", "measure", "outcome", "predictor", "group", "model",
	"estimate", "ci_low", "ci_high", "ci_level", "se", "stat", "p", "df", "n"}

var rowResultColumns = []string{"problems", "source_row"}

func writeMethodsSheet(s *xlsxSheet, st *xlsxStyles, rep *Report) error {
	if err := s.columns([]float64{11, 16, 12, 15, 110}, true); err != nil {
		return err
	}
	if err := s.header(st, []string{"source_row", "study", "claim", "outcome", "methods"}, -1); err != nil {
		return err
	}
	for i := range rep.Claims {
		c := &rep.Claims[i]
		methods := any(excelize.Cell{StyleID: st.wrap, Value: strings.TrimSpace(c.Methods)})
		if strings.TrimSpace(c.Methods) == "" {
			methods = excelize.Cell{StyleID: st.note, Value: "No methods paragraph was written for this claim; its notes are on the claims sheet."}
		}
		if err := s.add(excelize.Cell{StyleID: st.count, Value: c.Row}, st.textCell(c.Study), st.textCell(c.Claim),
			st.outcomeCell(c.Outcome), methods); err != nil {
			return err
		}
	}
	if err := s.add(); err != nil {
		return err
	}
	if err := s.add(nil, nil, nil, nil, excelize.Cell{StyleID: st.label, Value: "Cautions"}); err != nil {
		return err
	}
	for _, c := range cautionsOf(rep) {
		if err := s.add(nil, nil, nil, nil, excelize.Cell{StyleID: st.wrap, Value: c}); err != nil {
			return err
		}
	}
	return nil
}

func writeProblemsSheet(s *xlsxSheet, st *xlsxStyles, rep *Report) error {
	if err := s.columns([]float64{18, 8, 16, 100}, true); err != nil {
		return err
	}
	if err := s.header(st, []string{"sheet", "row", "column", "message"}, -1); err != nil {
		return err
	}
	for _, p := range rep.Problems {
		var row any
		if p.Row > 0 {
			row = excelize.Cell{StyleID: st.count, Value: p.Row}
		}
		if err := s.add(st.textCell(p.Sheet), row, st.textCell(p.Column), st.textCell(p.Message)); err != nil {
			return err
		}
	}
	return s.filter(4)
}
