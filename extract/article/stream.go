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

// importSheets reads every file as Import does and hands the sheets
// Sheets lays out to sheets made by open (sheetLayout), an article's rows
// as soon as it is read. An error of open or of a write ends the import;
// every sheet opened is closed in any case.
func importSheets(files []string, stdin io.Reader, progress func(done, total int), open func(sheet string, header []string) (sheetWriter, error)) (*Result, error) {
	l, err := newSheetLayout(open)
	if err != nil {
		return nil, err
	}
	res := &Result{}
	importEach(files, stdin, progress, func(file string, f *Found, ferr error) bool {
		if ferr != nil {
			res.Failed = append(res.Failed, &Failure{File: file, Err: ferr, Message: ferr.Error()})
			return true
		}
		res.Articles = append(res.Articles, &Found{File: f.File, Format: f.Format, Study: f.Study, ConfirmCount: len(f.ToConfirm)})
		err = l.article(f)
		return err == nil
	})
	if ferr := l.finish(res.Failed, err == nil); err == nil {
		err = ferr
	}
	if err != nil {
		return nil, err
	}
	return res, nil
}

// sheetLayout lays articles out as the sheets of the input contract, for
// Sheets and for the imports that write as they read: the coefficients,
// claims and to confirm sheets, open from the start to the finish, and a
// sheet of its own for each correlation table, made by open (header nil:
// a table's rows are all its own) and finished at once, so that what is
// open stays three however many tables there are.
type sheetLayout struct {
	open                   func(sheet string, header []string) (sheetWriter, error)
	coefs, claims, confirm sheetWriter
	opened                 []sheetWriter
	used                   map[string]bool // sheet names taken
}

// newSheetLayout opens the three sheets every import writes; on an error
// it closes what it opened.
func newSheetLayout(open func(sheet string, header []string) (sheetWriter, error)) (*sheetLayout, error) {
	l := &sheetLayout{open: open, used: usedSheetNames()}
	for _, s := range []struct {
		w      *sheetWriter
		name   string
		header []string
	}{{&l.coefs, "coefficients", coefficientHeader}, {&l.claims, "claims", claimHeader}, {&l.confirm, ToConfirmSheet, confirmHeader}} {
		w, err := open(s.name, s.header)
		if w != nil {
			l.opened = append(l.opened, w)
		}
		if err != nil {
			l.finish(nil, false)
			return nil, err
		}
		*s.w = w
	}
	return l, nil
}

// article writes an article's rows.
func (l *sheetLayout) article(f *Found) error {
	if err := l.coefs.write(coefficientRows(f)); err != nil {
		return err
	}
	if err := l.claims.write(claimRows(f)); err != nil {
		return err
	}
	for _, s := range tableSheets(f, l.used) {
		t, err := l.open(s.Name, nil)
		if err != nil {
			return err
		}
		if err := t.write(s.Rows); err != nil {
			t.close()
			return err
		}
		if err := t.close(); err != nil {
			return err
		}
	}
	return l.confirm.write(confirmRows(f))
}

// finish ends the to confirm sheet with the files not read, when write,
// and closes the sheets, returning the first error.
func (l *sheetLayout) finish(failed []*Failure, write bool) error {
	var first error
	if write {
		first = l.confirm.write(failedRows(failed))
	}
	for _, s := range l.opened {
		if err := s.close(); err != nil && first == nil {
			first = err
		}
	}
	return first
}
