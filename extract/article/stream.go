package article

import (
	"encoding/csv"
	"fmt"
	"io"
)

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

// ImportFolder reads every file as Import does and writes the sheets
// WriteFolder would write of the Result, as CSV files each opened through
// create, an article's rows as soon as it is read, so that no article is
// held once written: memory stays flat over a folder of any number of
// articles (Import holds them all, as a workbook or JSON needs). The
// Result it returns names each article read (File, Format, Study and
// ConfirmCount) and each file not read, whose lines to confirm end that
// sheet, as in Sheets. An error of create or of a write ends the import.
func ImportFolder(files []string, stdin io.Reader, progress func(done, total int), create func(name string) (io.WriteCloser, error)) (*Result, error) {
	var opened []*csvFile
	open := func(sheet string, header []string) (*csvFile, error) {
		wc, err := create(CSVName(sheet))
		if err != nil {
			return nil, err
		}
		c := &csvFile{name: CSVName(sheet), wc: wc, w: csv.NewWriter(wc)}
		opened = append(opened, c)
		if header != nil {
			return c, c.write([][]string{header})
		}
		return c, nil
	}
	closeAll := func() error {
		var first error
		for _, c := range opened {
			c.w.Flush()
			if err := c.w.Error(); err != nil && first == nil {
				first = fmt.Errorf("%s: %w", c.name, err)
			}
			if err := c.wc.Close(); err != nil && first == nil {
				first = err
			}
		}
		return first
	}
	res := &Result{}
	coefs, err := open("coefficients", coefficientHeader)
	if err != nil {
		closeAll()
		return nil, err
	}
	claims, err := open("claims", claimHeader)
	if err != nil {
		closeAll()
		return nil, err
	}
	confirm, err := open(ToConfirmSheet, confirmHeader)
	if err != nil {
		closeAll()
		return nil, err
	}
	used := usedSheetNames()
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
			var t *csvFile
			if t, err = open(s.Name, nil); err != nil {
				return false
			}
			if err = t.write(s.Rows); err != nil {
				return false
			}
			// A table's file is finished at once, so that the open
			// files stay three however many tables there are.
			t.w.Flush()
			if err = t.w.Error(); err == nil {
				err = t.wc.Close()
			}
			opened = opened[:len(opened)-1]
			if err != nil {
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
