package extract

import (
	"strconv"

	"github.com/xuri/excelize/v2"
)

// maxDisplayMemo bounds the displayed texts remembered: the values of a
// table repeat (0.43 is typed many times), but a column of computed values
// does not (common practice, no source).
const maxDisplayMemo = 1 << 16

// numberDisplay gives the text a spreadsheet shows for a numeric cell,
// from which the printed decimals are taken (displayDecimals). The
// formatting is excelize's, which it applies only to the cells of a file it
// holds: each cell format of the workbook that a numeric cell uses gets a
// cell with the same number format in a scratch workbook that is never
// saved, and a value is shown by writing it there and reading it back. A
// cell without a format (s 0, or a format the styles part does not hold)
// shows its value as excelize shows an unformatted cell.
type numberDisplay struct {
	styles   *cellStyles
	date1904 bool
	f        *excelize.File
	cells    map[int]string // a workbook's cell format → its scratch cell
	memo     map[displayKey]string
}

type displayKey struct {
	style int
	value string
}

const displaySheet = "Sheet1"

func newNumberDisplay(styles *cellStyles, date1904 bool) *numberDisplay {
	return &numberDisplay{styles: styles, date1904: date1904}
}

// show returns the displayed text of a numeric cell of cell format style
// holding value. A value that is not a number is shown as it is.
func (d *numberDisplay) show(style int, value string) string {
	if style < 0 || style >= len(d.styles.numFmt) {
		style = 0
	}
	key := displayKey{style, value}
	if s, ok := d.memo[key]; ok {
		return s
	}
	if _, err := strconv.ParseFloat(value, 64); err != nil {
		return value
	}
	ref := d.cell(style)
	if err := d.f.SetCellDefault(displaySheet, ref, value); err != nil {
		return value
	}
	s, err := d.f.GetCellValue(displaySheet, ref)
	if err != nil {
		return value
	}
	if len(d.memo) >= maxDisplayMemo {
		clear(d.memo)
	}
	d.memo[key] = s
	return s
}

// forget lets go of the displayed texts remembered; a map cleared would
// keep its memory.
func (d *numberDisplay) forget() {
	if d.memo != nil {
		d.memo = map[displayKey]string{}
	}
}

// cell returns the scratch cell of a cell format, making it (and the
// scratch workbook) when first asked.
func (d *numberDisplay) cell(style int) string {
	if d.f == nil {
		d.f = excelize.NewFile()
		d.cells = map[int]string{0: "A1"}
		d.memo = map[displayKey]string{}
		if d.date1904 {
			on := true
			// A failure leaves the 1900 date system, which only changes
			// how a date is shown; a date is refused either way.
			_ = d.f.SetWorkbookProps(&excelize.WorkbookPropsOptions{Date1904: &on})
		}
	}
	if ref, ok := d.cells[style]; ok {
		return ref
	}
	ref, _ := excelize.CoordinatesToCellName(1, len(d.cells)+1)
	id := d.styles.numFmt[style]
	st := &excelize.Style{NumFmt: id}
	if code, ok := d.styles.custom[id]; ok {
		st = &excelize.Style{CustomNumFmt: &code}
	} else if id >= 164 {
		// Ids from 164 are the workbook's own formats; one it does not
		// define leaves the cell unformatted, as in excelize.
		d.cells[style] = "A1"
		return "A1"
	}
	sid, err := d.f.NewStyle(st)
	if err == nil {
		err = d.f.SetCellStyle(displaySheet, ref, ref, sid)
	}
	if err != nil {
		ref = "A1"
	}
	d.cells[style] = ref
	return ref
}

// Close releases the scratch workbook.
func (d *numberDisplay) Close() error {
	if d.f == nil {
		return nil
	}
	return d.f.Close()
}
