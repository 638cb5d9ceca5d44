package report

import (
	"errors"
	"fmt"

	"github.com/xuri/excelize/v2"
)

// ErrSheetFull is returned when a sheet of the xlsx report would pass the
// rows a worksheet holds (excelize.TotalRows, 1,048,576 with the header).
var ErrSheetFull = errors.New("more rows than a worksheet holds")

// MaxXLSXClaims is the most claims an xlsx report holds: the rows of its
// claims sheet below the header (excelize.TotalRows, 1,048,576 rows a
// worksheet). A larger input stops with ErrTooManyForXLSX and leaves no
// file; so does one whose coefficients pass a sheet's rows (ErrSheetFull:
// a paired CSV of more than 524,287 claims, two coefficients each). csv
// and json have no such limit.
const MaxXLSXClaims = excelize.TotalRows - 1

// ErrTooManyForXLSX is returned past MaxXLSXClaims claims.
var ErrTooManyForXLSX = errors.New("more claims than an xlsx report holds")

// errTooManyClaims says that the input has more claims than the report
// holds.
func (x *xlsxWriter) errTooManyClaims() error {
	return fmt.Errorf("the input has more than %d claims: %w; write csv or json for an input this large", x.maxClaims, ErrTooManyForXLSX)
}

// errSheetFull says that the input's coefficients or correlations would
// pass a sheet's rows.
func errSheetFull() error {
	return fmt.Errorf("the input's coefficients or correlations pass %d rows: %w; write csv or json for an input this large",
		excelize.TotalRows-1, ErrSheetFull)
}
