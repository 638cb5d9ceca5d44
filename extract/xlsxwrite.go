package extract

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"

	"github.com/xuri/excelize/v2"
)

// WriteXLSX writes the workbook f as an .xlsx zip straight to w.
// excelize's Write builds the whole zip in a buffer before it copies it out
// (the buffer is there for encryption, which this program never uses); the
// zip writer that excelize's SetZipWriter sets is pointed at w instead, so
// that the buffer stays empty. Without it the peak memory of a large
// workbook is its size more: measured with /usr/bin/time -v on `import` of
// the 1,000 dense articles TestWriteDenseArticles (package article) writes,
// and on BenchmarkXLSXReport (package report). The other thing the buffer
// carries, the local headers excelize rewrites for members over 4 GiB,
// cannot arise within the rows a sheet holds.
func WriteXLSX(f *excelize.File, w io.Writer) error {
	var zw *zip.Writer
	f.SetZipWriter(func(io.Writer) excelize.ZipWriter {
		zw = zip.NewWriter(w)
		return zw
	})
	var none bytes.Buffer
	if err := f.Write(&none); err != nil {
		return err
	}
	if zw == nil || none.Len() > 0 {
		return fmt.Errorf("excelize wrote the workbook past its zip writer (%d bytes)", none.Len())
	}
	return nil
}
