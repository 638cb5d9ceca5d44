package report

import (
	"slices"

	"coefaudit/extract"

	"github.com/xuri/excelize/v2"
)

// badCell is an input cell that could not be read: the xlsx report shows it
// as it was typed, marked (st.bad), with its problem as the cell's comment.
type badCell struct {
	col           int // the cell's index among the sheet's input columns
	text, message string
}

// badCells picks the problems of a row that concern one cell's content in
// one of columns (the sheet's input columns, by their canonical names).
func badCells(problems []*extract.CellError, columns []string) []badCell {
	var out []badCell
	for _, p := range problems {
		if p.Text == "" {
			continue
		}
		if i := slices.Index(columns, p.Column); i >= 0 {
			out = append(out, badCell{col: i, text: p.Text, message: p.Err.Error()})
		}
	}
	return out
}

// markBad puts each bad cell, as typed and marked, in place in row, whose
// first cells are the sheet's input columns.
func markBad(st *xlsxStyles, row []any, bad []badCell) {
	for _, b := range bad {
		if b.col < len(row) {
			row[b.col] = excelize.Cell{StyleID: st.bad, Value: b.text}
		}
	}
}

// commentBad adds each bad cell's problem as the comment of its cell in
// the row last written to s.
func (s *xlsxSheet) commentBad(bad []badCell) error {
	for _, b := range bad {
		ref, err := excelize.CoordinatesToCellName(b.col+1, s.row)
		if err != nil {
			return err
		}
		if err := s.f.AddComment(s.name, excelize.Comment{Cell: ref, Author: "coefaudit", Text: b.message}); err != nil {
			return err
		}
	}
	return nil
}
