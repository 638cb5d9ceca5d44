package report

import (
	"strconv"
	"strings"

	"coefaudit/extract"

	"github.com/xuri/excelize/v2"
)

// coefficientInputColumns are the coefficients sheet's columns as the
// reader knows them; rowResultColumns follow the input's own columns.
var (
	coefficientInputColumns = []string{"study", "label", "measure", "outcome", "predictor", "group", "model",
		"estimate", "ci_low", "ci_high", "ci_level", "se", "stat", "p", "df", "n"}
	rowResultColumns = []string{"problems", "source_row"}
)

// heldCoefficients keeps the coefficients rows of the input until the
// workbook's end, when their sheet's header can name every pass-through
// column: each row as one record in a spool (a temporary file), its cells
// as printed, its sheet and row, then its unknown columns as name and value
// pairs. Why a file:
// held in memory, even packed so (some 70 bytes a row, a fifth of the
// coefficient it came from), they took the xlsx report of 500,000 paired
// claims to 291 MB (/usr/bin/time -v), and the report is to hold as many
// claims as a sheet has rows within 150 MB.
type heldCoefficients struct {
	records spool[[]string]
	rows    int
	extra   []string        // the unknown columns, in first-seen order
	seen    map[string]bool // their names, lower case, and the sheet's own
	// bad holds the cells of a row that could not be read, by the row's
	// place among the held rows; only rows with such cells are in it.
	bad map[int][]badCell
}

// close removes the temporary file.
func (h *heldCoefficients) close() { h.records.close() }

// heldSheetPosition is the number of cells before a record's pass-through
// pairs: the sheet's input columns, then the row's sheet and row number.
const heldSheetPosition = 16

func (h *heldCoefficients) add(c *extract.Coefficient) error {
	if h.seen == nil {
		h.seen = nameSet(coefficientInputColumns, rowResultColumns)
	}
	level := ""
	if c.CILevel > 0 && (c.CI.Low.Present() || c.CI.High.Present()) {
		level = strconv.FormatFloat(c.CILevel, 'g', -1, 64)
	}
	rec := []string{c.Study, c.Label, c.Measure, c.Outcome, c.Predictor, c.Group, c.Model, c.Estimate.Text,
		c.CI.Low.Text, c.CI.High.Text, level, c.SE.Text, c.Stat.Text, c.P.Text, c.DF.Text, c.N.Text,
		c.Sheet, strconv.Itoa(c.Row)}
	for i, n := range c.Extra.Names {
		if !h.seen[strings.ToLower(n)] {
			h.seen[strings.ToLower(n)] = true
			h.extra = append(h.extra, n)
		}
		if i < len(c.Extra.Values) {
			rec = append(rec, n, c.Extra.Values[i])
		}
	}
	if bad := badCells(c.Problems, coefficientInputColumns); len(bad) > 0 {
		if h.bad == nil {
			h.bad = map[int][]badCell{}
		}
		h.bad[h.rows] = bad
		for _, b := range bad {
			rec[b.col] = b.text
		}
	}
	h.rows++
	return h.records.add(rec)
}

// writeCoefficientsSheet writes the first of the xlsx report's input
// sheets: the coefficients as they were read, with the problems of each
// row (probs, by problemsByRow) beside it.
func writeCoefficientsSheet(s *xlsxSheet, st *xlsxStyles, held *heldCoefficients, probs map[string][]string) error {
	names := append(append(append([]string{}, coefficientInputColumns...), held.extra...), rowResultColumns...)
	widths := []float64{16, 16, 9, 14, 14, 12, 10, 10, 10, 10, 9, 9, 9, 10, 8, 8}
	for range held.extra {
		widths = append(widths, 14)
	}
	if err := s.columns(append(widths, 60, 11), true); err != nil {
		return err
	}
	if err := s.header(st, names, len(coefficientInputColumns)+len(held.extra)); err != nil {
		return err
	}
	k := -1
	err := held.records.each(func(rec []string) error {
		k++
		row := make([]any, 0, len(names))
		for _, cell := range rec[:heldSheetPosition] {
			row = append(row, st.textCell(cell))
		}
		markBad(st, row, held.bad[k])
		var pairNames, pairValues []string
		for k := heldSheetPosition + 2; k+1 < len(rec); k += 2 {
			pairNames, pairValues = append(pairNames, rec[k]), append(pairValues, rec[k+1])
		}
		row = append(row, extraCells(st, pairNames, pairValues, held.extra)...)
		n, _ := strconv.Atoi(rec[heldSheetPosition+1])
		row = append(row, st.textCell(rowProblems(probs, extract.Position{Sheet: rec[heldSheetPosition], Row: n})),
			excelize.Cell{StyleID: st.count, Value: n})
		if err := s.add(row...); err != nil {
			return err
		}
		return s.commentBad(held.bad[k])
	})
	if err != nil {
		return err
	}
	return s.filter(len(names))
}

func writeCorrelationsSheet(s *xlsxSheet, st *xlsxStyles, correlations []extract.Correlation, probs map[string][]string) error {
	names := []string{"study", "group", "var_a", "var_b", "r", "n", "sd", "mean", "problems", "source_row"}
	if err := s.columns([]float64{16, 12, 16, 16, 9, 8, 9, 9, 60, 11}, true); err != nil {
		return err
	}
	if err := s.header(st, names, 8); err != nil {
		return err
	}
	for _, c := range correlations {
		row := []any{st.textCell(c.Study), st.textCell(c.Group), st.textCell(c.VarA), st.textCell(c.VarB),
			st.textCell(c.R.Text), st.textCell(c.N.Text), st.textCell(c.SD.Text), st.textCell(c.Mean.Text),
			st.textCell(rowProblems(probs, c.Position)), excelize.Cell{StyleID: st.count, Value: c.Row}}
		bad := badCells(c.Problems, names[:8])
		markBad(st, row, bad)
		if err := s.add(row...); err != nil {
			return err
		}
		if err := s.commentBad(bad); err != nil {
			return err
		}
	}
	return s.filter(len(names))
}

// writeTableSheet lays a correlation table out as the reader takes it: key
// rows, a header naming the variables, the lower triangle, then its
// problems as notes below a blank row (the reader stops at the blank row).
func writeTableSheet(s *xlsxSheet, st *xlsxStyles, t *extract.CorrelationTable) error {
	widths := []float64{22}
	for range t.Variables {
		widths = append(widths, 10)
	}
	if err := s.columns(append(widths, 9, 9, 9), false); err != nil {
		return err
	}
	if err := s.add(excelize.Cell{StyleID: st.label, Value: "study"}, st.textCell(t.Study)); err != nil {
		return err
	}
	if t.Group != "" {
		if err := s.add(excelize.Cell{StyleID: st.label, Value: "group"}, st.textCell(t.Group)); err != nil {
			return err
		}
	}
	stats := []struct {
		name string
		vals []extract.Printed
	}{{"n", t.N}, {"mean", t.Mean}, {"sd", t.SD}}
	head := []any{excelize.Cell{StyleID: st.header, Value: "variable"}}
	var shown []int
	for k, sv := range stats {
		for _, p := range sv.vals {
			if p.Present() {
				shown = append(shown, k)
				head = append(head, excelize.Cell{StyleID: st.header, Value: sv.name})
				break
			}
		}
	}
	for _, v := range t.Variables {
		head = append(head, excelize.Cell{StyleID: st.header, Value: v})
	}
	if err := s.add(head...); err != nil {
		return err
	}
	for i, v := range t.Variables {
		row := []any{excelize.Cell{StyleID: st.label, Value: v}}
		for _, k := range shown {
			var cell any
			if i < len(stats[k].vals) {
				cell = st.textCell(stats[k].vals[i].Text)
			}
			row = append(row, cell)
		}
		for j := range t.Variables {
			switch {
			case j == i:
				row = append(row, st.textCell("—"))
			case j < i && i < len(t.R) && j < len(t.R[i]):
				row = append(row, st.textCell(t.R[i][j].Text))
			default:
				row = append(row, nil)
			}
		}
		if err := s.add(row...); err != nil {
			return err
		}
	}
	if len(t.Problems) > 0 {
		if err := s.add(); err != nil {
			return err
		}
		for _, p := range t.Problems {
			if err := s.add(excelize.Cell{StyleID: st.note, Value: "Note: " + p.Error()}); err != nil {
				return err
			}
		}
	}
	return nil
}

// tableSheetName makes a valid, unused sheet name for a correlation table:
// "table " and the table's name, without the characters a sheet name may
// not hold, cut to Excel's 31 characters.
func tableSheetName(name string, used map[string]bool) string {
	clean := strings.Map(func(r rune) rune {
		if strings.ContainsRune(`[]:*?/\`, r) {
			return '_'
		}
		return r
	}, name)
	base := []rune("table " + clean)
	if len(base) > 31 {
		base = base[:31]
	}
	cand := strings.TrimRight(string(base), "' ")
	for k := 2; used[strings.ToLower(cand)]; k++ {
		suffix := " " + strconv.Itoa(k)
		b := base
		if len(b)+len(suffix) > 31 {
			b = b[:31-len(suffix)]
		}
		cand = string(b) + suffix
	}
	used[strings.ToLower(cand)] = true
	return cand
}
