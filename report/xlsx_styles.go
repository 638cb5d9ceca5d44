package report

import (
	"fmt"
	"strings"

	"coefaudit/audit"

	"github.com/xuri/excelize/v2"
)

// xlsxStyles are the workbook's cell styles, made once before any row.
type xlsxStyles struct {
	title, label, header, resultHeader, text, wrap, note int
	stat, general, p, pTiny, count, share                int
	// bad marks an input cell that could not be read, shown as typed.
	bad int
	// estimate holds the styles of estimates written with MinDecimals to
	// MaxDecimals decimals (the precision rule), from MinDecimals.
	estimate [audit.MaxDecimals - audit.MinDecimals + 1]int
	outcome  map[string]int
}

func newXLSXStyles(f *excelize.File) (*xlsxStyles, error) {
	st := &xlsxStyles{outcome: map[string]int{}}
	textFmt := 49 // "@": text, so that nothing typed later is read as a formula
	// p as journals print it: ".043", and "< .001" below (audit's
	// precision rule), while the cell keeps the full value.
	pFmt, pTinyFmt := xlsxPFormat, xlsxPTinyFormat
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
		{&st.bad, excelize.Style{NumFmt: textFmt, Alignment: top, Font: &excelize.Font{Bold: true, Color: "9C0006"},
			Fill:   excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"FFC7CE"}},
			Border: []excelize.Border{{Type: "left", Color: "9C0006", Style: 1}, {Type: "right", Color: "9C0006", Style: 1}, {Type: "top", Color: "9C0006", Style: 1}, {Type: "bottom", Color: "9C0006", Style: 1}}}},
		{&st.stat, excelize.Style{CustomNumFmt: &statFmt, Alignment: top}},
		{&st.general, excelize.Style{NumFmt: 0, Alignment: top}},
		{&st.p, excelize.Style{CustomNumFmt: &pFmt, Alignment: top}},
		{&st.pTiny, excelize.Style{CustomNumFmt: &pTinyFmt, Alignment: top}},
		{&st.count, excelize.Style{NumFmt: 1, Alignment: top}},
		{&st.share, excelize.Style{CustomNumFmt: &shareFmt, Alignment: top}},
	}
	for k := range st.estimate {
		format := "0." + strings.Repeat("0", audit.MinDecimals+k)
		defs = append(defs, struct {
			id    *int
			style excelize.Style
		}{&st.estimate[k], excelize.Style{CustomNumFmt: &format, Alignment: top}})
	}
	for _, d := range defs {
		id, err := f.NewStyle(&d.style)
		if err != nil {
			return nil, err
		}
		*d.id = id
	}
	for _, o := range audit.Outcomes {
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
func (st *xlsxStyles) number(n audit.Number, style int) any {
	if !n.Known() {
		return nil
	}
	return excelize.Cell{StyleID: style, Value: float64(n)}
}

// xlsxPFormat shows a p cell as journals print p, ".043"; a p below .001
// is shown as "< .001" by xlsxPTinyFormat. Two styles rather than one
// conditional format, which not every reader of xlsx files honours.
const (
	xlsxPFormat     = "#.000"
	xlsxPTinyFormat = `"< .001"`
)

// pValue is a p cell in the journals' style, holding the full value.
func (st *xlsxStyles) pValue(p audit.Number) any {
	if p.Known() && p < 0.001 {
		return st.number(p, st.pTiny)
	}
	return st.number(p, st.p)
}

// estimateNumber is a number of claim c (an estimate, a difference or an
// interval's limit) shown to the claim's decimals.
func (st *xlsxStyles) estimateNumber(c *audit.ClaimResult, x float64) any {
	return st.number(audit.Number(x), st.estimate[c.EstimateDecimals()-audit.MinDecimals])
}

// outcomeCell is an outcome word on its fill.
func (st *xlsxStyles) outcomeCell(o string) any {
	id, ok := st.outcome[o]
	if !ok {
		id = st.outcome[audit.Incomplete]
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

// add writes the next row; it fails with ErrSheetFull past the last row a
// worksheet holds.
func (s *xlsxSheet) add(cells ...any) error {
	if s.row >= excelize.TotalRows {
		return fmt.Errorf("%w (%d rows); write csv or json for an input this large", ErrSheetFull, excelize.TotalRows)
	}
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
