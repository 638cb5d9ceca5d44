package extract

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
)

// maxDataErrors is how many malformed cells ReadData reports before it
// stops reading.
const maxDataErrors = 20

// DataTable is raw data for the bootstrap, stored once and column-major:
// Columns[j][i] is observation i of the variable Names[j], NaN where the
// value is missing.
type DataTable struct {
	Position // File and Sheet (Sheet empty for a CSV file); Row 0
	// Names are the numeric columns' names as written, in sheet order.
	Names []string
	// Columns holds one slice per name, each of length Rows.
	Columns [][]float64
	// Rows is the number of observations (non-blank data rows).
	Rows int
	// TextColumns names the columns in which no cell is a number (an
	// identifier, a group label). They are not in Columns and cannot be
	// analysed; a column with some numbers and some text is an error instead.
	TextColumns []string
}

// Column returns the values of the named column (matched
// case-insensitively after trimming) and whether it exists.
func (d *DataTable) Column(name string) ([]float64, bool) {
	j := d.index(name)
	if j < 0 {
		return nil, false
	}
	return d.Columns[j], true
}

func (d *DataTable) index(name string) int {
	key := canonicalColumn(name)
	for j, n := range d.Names {
		if canonicalColumn(n) == key {
			return j
		}
	}
	return -1
}

// Complete returns the named columns with listwise deletion: every row in
// which any of them is missing is dropped, and dropped counts those rows.
// The columns returned are new slices of equal length, in the order of
// names. It fails naming a column that does not exist or holds text.
//
//	row i is kept  ⇔  x_j[i] is not NaN for every named column j
//
// Complete-case analysis is unbiased only when the data are missing
// completely at random [1]; the count dropped goes into the notes.
//
// References:
//
//	[1] Little RJA, Rubin DB (2019). Statistical Analysis with Missing
//	    Data, 3rd ed. Wiley, ch. 3 (from memory).
func (d *DataTable) Complete(names []string) (columns [][]float64, dropped int, err error) {
	idx := make([]int, len(names))
	for k, n := range names {
		j := d.index(n)
		if j < 0 {
			for _, t := range d.TextColumns {
				if canonicalColumn(t) == canonicalColumn(n) {
					return nil, 0, fmt.Errorf("%s: column %q holds text, not numbers: %w", d.Position, n, ErrUnknownValue)
				}
			}
			return nil, 0, fmt.Errorf("%s: no column %q (the columns are %s): %w", d.Position, n, strings.Join(quoteAll(d.Names), ", "), ErrMissingColumn)
		}
		idx[k] = j
	}
	keep := 0
	for i := 0; i < d.Rows; i++ {
		if d.completeRow(idx, i) {
			keep++
		}
	}
	columns = make([][]float64, len(names))
	for k := range columns {
		columns[k] = make([]float64, 0, keep)
	}
	for i := 0; i < d.Rows; i++ {
		if !d.completeRow(idx, i) {
			continue
		}
		for k, j := range idx {
			columns[k] = append(columns[k], d.Columns[j][i])
		}
	}
	return columns, d.Rows - keep, nil
}

func (d *DataTable) completeRow(idx []int, i int) bool {
	for _, j := range idx {
		if math.IsNaN(d.Columns[j][i]) {
			return false
		}
	}
	return true
}

// isMissingCode recognizes the codes for a missing value: a blank cell,
// NA, na, ".", NaN (case-insensitive).
func isMissingCode(s string) bool {
	switch strings.ToLower(s) {
	case "", "na", ".", "nan":
		return true
	}
	return false
}

// ReadData reads raw data from a CSV file or a workbook (its first sheet
// unless sheet names one; sheet is ignored for a CSV file). The first
// non-blank row names the columns. Numeric cells are read as numbers, text
// cells with ParseNumber (significance stars refused); blank, NA, na, "."
// and NaN are missing (NaN). Any other cell in a column that holds numbers
// is an error naming file, sheet, row and column; ReadData collects up to 20
// of them (joined with errors.Join, each a *CellError) and then stops.
// Blank rows are skipped. The missing-value codes are those R, SAS and Stata
// write (common practice, no source).
func ReadData(path string, sheet string) (*DataTable, error) {
	zipLike, err := isZipFile(path)
	if err != nil {
		return nil, err
	}
	var src rowSource
	pos := Position{File: path}
	if zipLike {
		wb, err := openWorkbook(path)
		if err != nil {
			return nil, err
		}
		defer wb.Close()
		name, err := pickSheet(wb.sheets(), sheet, path)
		if err != nil {
			return nil, err
		}
		pos.Sheet = name
		s, err := wb.source(name)
		if err != nil {
			return nil, err
		}
		src = s
	} else {
		if _, err := os.Stat(path); err != nil {
			return nil, err
		}
		s, err := openCSV(path)
		if err != nil {
			return nil, err
		}
		src = s
	}
	d, err := readData(src, pos)
	if cerr := src.Close(); err == nil && cerr != nil {
		err = cerr
	}
	if err != nil {
		return nil, err
	}
	return d, nil
}

// pickSheet finds the sheet asked for, or the first.
func pickSheet(sheets []string, want, path string) (string, error) {
	if len(sheets) == 0 {
		return "", fmt.Errorf("%s has no sheets: %w", path, ErrMissingSheet)
	}
	if want == "" {
		return sheets[0], nil
	}
	for _, s := range sheets {
		if strings.EqualFold(trimSpace(s), trimSpace(want)) {
			return s, nil
		}
	}
	return "", fmt.Errorf("%s has no sheet %q (its sheets: %s): %w", path, want, strings.Join(quoteAll(sheets), ", "), ErrMissingSheet)
}

// dataColumn accumulates one column while reading.
type dataColumn struct {
	name    string
	values  []float64
	numbers int
	bad     []*CellError
	nbad    int
}

func readData(src rowSource, pos Position) (*DataTable, error) {
	var row sheetRow
	var cols []*dataColumn
	var header []string
	var extraErrs []*CellError
	rows := 0
	confirmed := func() int {
		n := len(extraErrs)
		for _, c := range cols {
			if c.numbers > 0 {
				n += c.nbad
			}
		}
		return n
	}
	for {
		err := src.Next(&row)
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		if row.blank() {
			continue
		}
		if header == nil {
			if row.Problem != nil {
				p := pos
				p.Row = row.Row
				extraErrs = append(extraErrs, &CellError{Position: p, Err: fmt.Errorf("the header row: %w", row.Problem)})
			}
			header = make([]string, len(row.Cells))
			seen := map[string]int{}
			for j, c := range row.Cells {
				name := trimSpace(c.shown())
				if name == "" {
					name = "column " + strconv.Itoa(j+1)
				}
				if k, dup := seen[canonicalColumn(name)]; dup {
					p := pos
					p.Row, p.Column = row.Row, name
					return nil, &CellError{Position: p, Err: fmt.Errorf("column %q appears twice (columns %d and %d): %w", name, k+1, j+1, ErrDuplicate)}
				}
				seen[canonicalColumn(name)] = j
				header[j] = name
				cols = append(cols, &dataColumn{name: name})
			}
			continue
		}
		rowPos := pos
		rowPos.Row = row.Row
		if row.Problem != nil {
			p := rowPos
			var fe *fieldError
			if errors.As(row.Problem, &fe) && fe.field < len(header) {
				p.Column = header[fe.field]
			}
			extraErrs = append(extraErrs, &CellError{Position: p, Err: row.Problem})
		}
		for j := len(cols); j < len(row.Cells); j++ {
			if c := row.Cells[j]; c.Numeric || trimSpace(c.Text) != "" {
				extraErrs = append(extraErrs, &CellError{Position: rowPos,
					Err: fmt.Errorf("a value (%q) in column %d, which has no name in the header: %w", trimSpace(c.shown()), j+1, ErrUnknownValue)})
				break
			}
		}
		for j, col := range cols {
			var c sheetCell
			if j < len(row.Cells) {
				c = row.Cells[j]
			}
			v, err := dataValue(c)
			if err != nil {
				col.nbad++
				if len(col.bad) < maxDataErrors {
					p := rowPos
					p.Column = col.name
					col.bad = append(col.bad, &CellError{Position: p,
						Err: fmt.Errorf("%w; a missing value is written blank, NA, . or NaN", err)})
				}
				v = math.NaN()
			} else if !math.IsNaN(v) {
				col.numbers++
			}
			col.values = append(col.values, v)
		}
		rows++
		if confirmed() >= maxDataErrors {
			break
		}
	}
	if header == nil {
		return nil, fmt.Errorf("%s: no header row: %w", pos, ErrMissingColumn)
	}
	d := &DataTable{Position: pos, Rows: rows}
	errs := extraErrs
	for _, c := range cols {
		if c.numbers == 0 && c.nbad > 0 {
			d.TextColumns = append(d.TextColumns, c.name)
			continue
		}
		errs = append(errs, c.bad...)
		d.Names = append(d.Names, c.name)
		d.Columns = append(d.Columns, c.values)
	}
	if len(errs) > 0 {
		// Report in reading order: by row, then by column.
		colIndex := map[string]int{}
		for j, c := range cols {
			colIndex[c.name] = j
		}
		sort.SliceStable(errs, func(a, b int) bool {
			pa, pb := errs[a], errs[b]
			if pa.Row != pb.Row {
				return pa.Row < pb.Row
			}
			return colIndex[pa.Column] < colIndex[pb.Column]
		})
		if len(errs) > maxDataErrors {
			errs = errs[:maxDataErrors]
		}
		joined := make([]error, len(errs))
		for i, e := range errs {
			joined[i] = e
		}
		return nil, errors.Join(joined...)
	}
	return d, nil
}

// dataValue reads one cell of raw data.
func dataValue(c sheetCell) (float64, error) {
	if c.Numeric {
		v, err := strconv.ParseFloat(trimSpace(c.Text), 64)
		if err != nil {
			return 0, &ParseError{Text: c.Display, Kind: ErrMalformedNumber, Reason: "the workbook's stored value is not a number"}
		}
		return v, nil
	}
	t := trimSpace(c.Text)
	if isMissingCode(t) {
		return math.NaN(), nil
	}
	// A whole number written with a trailing decimal point ("760.", as
	// Fortran-era data files print them) is that whole number.
	if n := len(t); n > 1 && t[n-1] == '.' && t[n-2] >= '0' && t[n-2] <= '9' {
		t = t[:n-1]
	}
	p, err := parsePrinted(t, numberLimit, ErrMalformedNumber)
	if err != nil {
		return 0, err
	}
	return p.Value, nil
}
