package article

import (
	"encoding/csv"
	"fmt"
	"io"
	"strings"

	"coefaudit/extract"

	"github.com/xuri/excelize/v2"
)

// sheetWriter is one sheet of an import being written: its rows are added
// as the articles are read, and close finishes it.
type sheetWriter interface {
	write(rows [][]string) error
	close() error
}

// csvFile is one CSV file of a folder being written.
type csvFile struct {
	name string
	wc   io.WriteCloser
	w    *csv.Writer
}

func (c *csvFile) write(rows [][]string) error {
	if err := c.w.WriteAll(rows); err != nil {
		return fmt.Errorf("%s: %w", c.name, err)
	}
	return nil
}

func (c *csvFile) close() error {
	c.w.Flush()
	if err := c.w.Error(); err != nil {
		c.wc.Close()
		return fmt.Errorf("%s: %w", c.name, err)
	}
	return c.wc.Close()
}

// ImportFolder reads every file as Import does and writes the sheets
// Sheets lays out of the Result, as CSV files each opened through create,
// an article's rows as soon as it is read, so that no article is held once
// written: memory stays flat over a folder of any number of articles. The
// Result it returns names each article read (File, Format, Study and
// ConfirmCount) and each file not read, whose lines to confirm end that
// sheet, as in Sheets. An error of create or of a write ends the import.
func ImportFolder(files []string, stdin io.Reader, progress func(done, total int), create func(name string) (io.WriteCloser, error)) (*Result, error) {
	return importSheets(files, stdin, progress, func(sheet string, header []string) (sheetWriter, error) {
		wc, err := create(CSVName(sheet))
		if err != nil {
			return nil, err
		}
		c := &csvFile{name: CSVName(sheet), wc: wc, w: csv.NewWriter(wc)}
		if header != nil {
			if err := c.write([][]string{header}); err != nil {
				c.wc.Close()
				return nil, err
			}
		}
		return c, nil
	})
}

// xlsxSheet is one sheet of a workbook being written through excelize's
// stream writer, every cell a text cell in the text number format, so
// that "0.40" keeps its zero and "=…" is never a formula.
type xlsxSheet struct {
	name       string
	sw         *excelize.StreamWriter
	style      int // of the rows after the header
	headerBold int // of the first row; the text style for a table sheet
	rows       int
}

func (x *xlsxSheet) write(rows [][]string) error {
	for _, row := range rows {
		if x.rows == excelize.TotalRows {
			return fmt.Errorf("sheet %q: more than %d rows, the most a workbook's sheet holds: import into a folder of CSV files (--out DIR) instead", x.name, excelize.TotalRows)
		}
		style := x.style
		if x.rows == 0 {
			style = x.headerBold
		}
		cells := make([]any, len(row))
		for j, v := range row {
			cells[j] = excelize.Cell{StyleID: style, Value: v}
		}
		x.rows++
		cell, err := excelize.CoordinatesToCellName(1, x.rows)
		if err == nil {
			err = x.sw.SetRow(cell, cells)
		}
		if err != nil {
			return fmt.Errorf("sheet %q: %w", x.name, err)
		}
	}
	return nil
}

func (x *xlsxSheet) close() error {
	if err := x.sw.Flush(); err != nil {
		return fmt.Errorf("sheet %q: %w", x.name, err)
	}
	return nil
}

// ImportWorkbook reads every file as Import does and writes the sheets
// Sheets lays out of the Result as an .xlsx workbook to w, an article's
// rows passed to excelize's stream writers as soon as it is read (they
// keep what exceeds their buffer in files of tmpDir, "" for the system's
// temporary folder), so that memory stays flat over a folder of any
// number of articles. The header rows are bold and frozen. The sheets
// stand in the order coefficients, claims, to confirm, then a sheet per
// correlation table, since each sheet is made when its first row comes. A
// sheet holds at most excelize.TotalRows rows; beyond that the import
// fails with an error that says to write a CSV folder. The Result is as
// ImportFolder's; w is written only when at least one article was read.
func ImportWorkbook(files []string, stdin io.Reader, progress func(done, total int), w io.Writer, tmpDir string) (*Result, error) {
	f := excelize.NewFile(excelize.Options{TmpDir: tmpDir})
	defer f.Close()
	text, err := f.NewStyle(&excelize.Style{NumFmt: 49})
	if err != nil {
		return nil, err
	}
	bold, err := f.NewStyle(&excelize.Style{NumFmt: 49, Font: &excelize.Font{Bold: true}})
	if err != nil {
		return nil, err
	}
	first := true
	res, err := importSheets(files, stdin, progress, func(sheet string, header []string) (sheetWriter, error) {
		var err error
		if first {
			err, first = f.SetSheetName("Sheet1", sheet), false
		} else {
			_, err = f.NewSheet(sheet)
		}
		if err != nil {
			return nil, fmt.Errorf("sheet %q: %w", sheet, err)
		}
		sw, err := f.NewStreamWriter(sheet)
		if err != nil {
			return nil, fmt.Errorf("sheet %q: %w", sheet, err)
		}
		x := &xlsxSheet{name: sheet, sw: sw, style: text, headerBold: text}
		if strings.HasPrefix(sheet, extract.TablePrefix) {
			return x, nil // a correlation table's first row is its variables, not a header to freeze
		}
		x.headerBold = bold
		if err := sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"}); err != nil {
			return nil, fmt.Errorf("sheet %q: %w", sheet, err)
		}
		return x, x.write([][]string{header})
	})
	if err != nil || len(res.Articles) == 0 {
		return res, err
	}
	return res, extract.WriteXLSX(f, w)
}

// importSheets reads every file as Import does and hands the rows of the
// sheets Sheets lays out to sheets made by open (header nil for a table's
// sheet, whose rows are all its own), an article's rows as soon as it is
// read. The coefficients, claims and to confirm sheets are open for the
// whole import; a table's sheet is finished at once, so that what is open
// stays three however many tables there are. An error of open or of a
// write ends the import; every sheet opened is closed in any case.
func importSheets(files []string, stdin io.Reader, progress func(done, total int), open func(sheet string, header []string) (sheetWriter, error)) (*Result, error) {
	var opened []sheetWriter
	closeAll := func() error {
		var first error
		for _, s := range opened {
			if err := s.close(); err != nil && first == nil {
				first = err
			}
		}
		return first
	}
	var main [3]sheetWriter
	for i, s := range []struct {
		name   string
		header []string
	}{{"coefficients", coefficientHeader}, {"claims", claimHeader}, {ToConfirmSheet, confirmHeader}} {
		w, err := open(s.name, s.header)
		if w != nil {
			opened = append(opened, w)
		}
		if err != nil {
			closeAll()
			return nil, err
		}
		main[i] = w
	}
	coefs, claims, confirm := main[0], main[1], main[2]
	res := &Result{}
	used := usedSheetNames()
	var err error
	importEach(files, stdin, progress, func(file string, f *Found, ferr error) bool {
		if ferr != nil {
			res.Failed = append(res.Failed, &Failure{File: file, Err: ferr, Message: ferr.Error()})
			return true
		}
		res.Articles = append(res.Articles, &Found{File: f.File, Format: f.Format, Study: f.Study, ConfirmCount: len(f.ToConfirm)})
		if err = coefs.write(coefficientRows(f)); err != nil {
			return false
		}
		if err = claims.write(claimRows(f)); err != nil {
			return false
		}
		for _, s := range tableSheets(f, used) {
			var t sheetWriter
			if t, err = open(s.Name, nil); err != nil {
				return false
			}
			if err = t.write(s.Rows); err != nil {
				t.close()
				return false
			}
			if err = t.close(); err != nil {
				return false
			}
		}
		err = confirm.write(confirmRows(f))
		return err == nil
	})
	if err == nil {
		err = confirm.write(failedRows(res.Failed))
	}
	if cerr := closeAll(); err == nil {
		err = cerr
	}
	if err != nil {
		return nil, err
	}
	return res, nil
}
