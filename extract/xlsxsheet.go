package extract

import (
	"encoding/xml"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"
)

// xlsxSource streams one worksheet, reading its XML once: each row as its
// cells come, each cell with its type, value and format together.
type xlsxSource struct {
	wb          *workbook
	x           *partXML
	file, sheet string
	last        int // the sheet's number of the last row begun
	delivered   int // the sheet's number of the last row read whole
	cells       int // the widths of the rows read so far, summed
	cellBudget  int // the most cells read before the sheet is refused
	done        bool
	value, text []byte // the current cell's v and inline text
	ahead       *readAhead
}

// next reads the next row element. Rows the sheet leaves out are not
// read; the row after them has AfterBlank set (a blank row ends a
// correlation table). A numeric cell carries its stored value and
// displayed text; a boolean or error cell what it shows; a text cell what
// was typed. A row with content beyond MaxColumns is not read and gets a
// problem, and so does a cell longer than MaxFieldBytes, which is read as
// blank. Damaged sheet XML is an error, and so are a sheet whose rows add
// up to more than cellBudget cells, XML beyond the part's limits, and
// cells whose shared strings, counted each time they are used, take the
// workbook beyond MaxUnzippedBytes.
func (s *xlsxSource) next(row *sheetRow) error {
	for !s.done {
		tok, err := s.x.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			return s.fail(err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if el.Name.Local == "row" {
				return s.readRow(el, row)
			}
		case xml.EndElement:
			if el.Name.Local == "sheetData" {
				s.done = true
			}
		}
	}
	s.done = true
	return io.EOF
}

// fail turns an error of the sheet's XML into the sheet's error.
func (s *xlsxSource) fail(err error) error {
	s.done = true
	if isLimit(err) {
		if s.delivered == 0 {
			return fmt.Errorf("%s, sheet %q: %w", s.file, s.sheet, err)
		}
		return fmt.Errorf("%s, sheet %q, after row %d: %w", s.file, s.sheet, s.delivered, err)
	}
	return fmt.Errorf("%s, sheet %q: the sheet's XML is damaged (%v), so the rows after row %d cannot be read: %w",
		s.file, s.sheet, err, s.delivered, ErrUnsupportedInput)
}

// readRow reads the row element just started.
func (s *xlsxSource) readRow(start xml.StartElement, row *sheetRow) error {
	n := s.last + 1
	var problem error
	if r, err := strconv.Atoi(attr(start, "r")); err == nil && r > 0 {
		n = r
		if r <= s.last {
			n = s.last + 1
			problem = fmt.Errorf("the sheet's XML numbers this row %d, after row %d; it is read as row %d", r, s.last, n)
		}
	}
	if n > excelize.TotalRows {
		return s.fail(fmt.Errorf("a row is numbered %d, beyond the %d rows a sheet has: %w", n, excelize.TotalRows, errXMLStructure))
	}
	row.Row, row.Fields, row.Problem = n, 0, problem
	row.AfterBlank = s.last > 0 && n > s.last+1
	row.Cells = row.Cells[:0]
	s.last = n
	col, wide := 0, 0
	depth := s.x.depth()
	for {
		tok, err := s.x.Token()
		if err != nil {
			if err == io.EOF {
				err = errXMLStructure
			}
			return s.fail(err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if el.Name.Local != "c" || s.x.depth() != depth+1 {
				if err := s.x.skip(); err != nil {
					return s.fail(err)
				}
				continue
			}
			col++
			if ref := attr(el, "r"); ref != "" {
				c, _, err := excelize.CellNameToCoordinates(ref)
				if err != nil {
					if row.Problem == nil {
						row.Problem = fmt.Errorf("cell %q of the sheet's XML has no place in a sheet (%v); it is read as column %d", ref, err, col)
					}
				} else {
					col = c
				}
			}
			cell, content, err := s.readCell(el, col, row)
			if err != nil {
				return err
			}
			switch {
			case !content:
			case col > MaxColumns:
				wide = max(wide, col)
			default:
				for len(row.Cells) < col {
					row.Cells = append(row.Cells, sheetCell{})
				}
				row.Cells[col-1] = cell
			}
		case xml.EndElement:
			if s.x.depth() < depth {
				return s.endRow(row, wide)
			}
		}
	}
}

// endRow checks the width of the row just read.
func (s *xlsxSource) endRow(row *sheetRow, wide int) error {
	if wide > 0 {
		last, _ := excelize.ColumnNumberToName(wide)
		row.Problem = fmt.Errorf("the row has a value in column %s, beyond the first %d columns that are read; the row is not read: %w", last, MaxColumns, ErrInputTooLarge)
		row.Cells = row.Cells[:0]
	}
	s.cells += len(row.Cells)
	if s.cells > s.cellBudget {
		s.done = true
		return &CellError{Position: Position{File: s.file, Sheet: s.sheet, Row: row.Row},
			Err: fmt.Errorf("the sheet holds more than %d cells up to this row; its rows reach too far to the right or are too many: %w", s.cellBudget, ErrInputTooLarge)}
	}
	s.delivered = row.Row
	return nil
}

// readCell reads the c element just started, in column col of row. It
// reports whether the cell has content: a value, or a formula, which is
// what makes a spreadsheet count it in the row's width. A problem with the
// cell goes to the row.
func (s *xlsxSource) readCell(start xml.StartElement, col int, row *sheetRow) (sheetCell, bool, error) {
	typ, style := attr(start, "t"), attr(start, "s")
	s.value, s.text = s.value[:0], s.text[:0]
	formula, inline := false, false
	depth := s.x.depth()
	for {
		tok, err := s.x.Token()
		if err != nil {
			if err == io.EOF {
				err = errXMLStructure
			}
			return sheetCell{}, false, s.fail(err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			switch el.Name.Local {
			case "f":
				formula = true
			case "is":
				inline = true
			}
		case xml.CharData:
			switch {
			case s.x.parent(0) == "v" && s.x.depth() == depth+1:
				s.value = append(s.value, el...)
			case s.x.parent(0) == "t" && inline && (s.x.parent(1) == "is" || s.x.parent(1) == "r" && s.x.parent(2) == "is"):
				s.text = append(s.text, el...)
			}
		case xml.EndElement:
			if s.x.depth() < depth {
				return s.cellValue(typ, style, formula, inline, col, row)
			}
		}
	}
}

// cellValue makes the cell of what readCell read, as excelize reads a cell
// (its getValueFrom): a shared string looked up, an inline string
// unescaped, TRUE or FALSE for a boolean, a number with its displayed text.
// A cell longer than MaxFieldBytes is read as blank, with a problem.
func (s *xlsxSource) cellValue(typ, style string, formula, inline bool, col int, row *sheetRow) (sheetCell, bool, error) {
	raw := s.value
	if typ == "inlineStr" && inline {
		raw = s.text
	}
	long := func(n int) (sheetCell, bool, error) {
		s.cellProblem(row, col, fmt.Errorf("the cell holds %d KiB of text; a cell longer than %d MiB is read as blank: %w", n>>10, MaxFieldBytes>>20, ErrInputTooLarge))
		return sheetCell{}, true, nil
	}
	if len(raw) > MaxFieldBytes {
		return long(len(raw))
	}
	var c sheetCell
	switch typ {
	case "s":
		if len(raw) == 0 {
			break
		}
		i, err := strconv.Atoi(strings.TrimSpace(string(raw)))
		text, ok := s.wb.sst.get(i)
		if err != nil || !ok {
			s.cellProblem(row, col, fmt.Errorf("the cell refers to shared string %q, which the workbook's table of %d does not hold: %w",
				raw, s.wb.sst.len(), ErrUnsupportedInput))
			return c, true, nil
		}
		if s.wb.budget -= int64(len(text)); s.wb.budget < 0 {
			return c, false, s.tooMuchText(row, col)
		}
		if len(text) > MaxFieldBytes {
			return long(len(text))
		}
		c.Text = text
	case "inlineStr":
		c.Text = string(unescapeXstring(raw))
	case "b":
		switch string(raw) {
		case "1":
			c.Text = "TRUE"
		case "0":
			c.Text = "FALSE"
		default:
			c.Text = string(raw)
		}
	case "str", "e", "d":
		c.Text = string(raw)
	default:
		c.Text = string(raw)
		if c.Text != "" {
			st, _ := strconv.Atoi(style)
			c.Display = s.wb.display.show(st, c.Text)
			c.Numeric = true
		}
	}
	return c, c.Text != "" || formula, nil
}

// cellProblem gives the row a problem with the cell in column col (from
// 1), unless it has one already.
func (s *xlsxSource) cellProblem(row *sheetRow, col int, err error) {
	if row.Problem == nil {
		row.Problem = &fieldError{field: col - 1, err: err}
	}
}

// tooMuchText refuses the workbook at a cell whose shared string takes
// the text read beyond MaxUnzippedBytes: a short table of shared strings
// used over and over would otherwise unpack to any size.
func (s *xlsxSource) tooMuchText(row *sheetRow, col int) error {
	s.done = true
	name, _ := excelize.ColumnNumberToName(col)
	return &CellError{Position: Position{File: s.file, Sheet: s.sheet, Row: row.Row, Column: name},
		Err: fmt.Errorf("the workbook's unpacked parts and the shared strings of its cells, each counted every time a cell uses it, come to more than %d MiB at this cell: %w",
			MaxUnzippedBytes>>20, ErrInputTooLarge)}
}
