package extract

import (
	"archive/zip"
	"bytes"
	"compress/flate"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"

	"github.com/xuri/excelize/v2"
)

// Limits of the workbook reader. The archive's directory is checked before
// excelize sees the file, and every member is then decompressed once with a
// counter, because a member that understates its size would otherwise open
// without error and give no rows (LIBRARY-NOTES.md). Beyond a limit the
// workbook is refused with ErrInputTooLarge.
//
// MaxUnzippedBytes bounds each member and their sum (excelize's
// UnzipSizeLimit); MaxXMLPartBytes is excelize's UnzipXMLSizeLimit, above
// which it spills a worksheet to a temporary file instead of memory.
// MaxCompressionRatio applies to members over 1 MiB unpacked: a worksheet
// of repetitive XML packs about 10 to 50 times, while a zip bomb packs
// thousands of times (common practice, no source).
const (
	MaxWorkbookBytes    = 64 << 20
	MaxUnzippedBytes    = 64 << 20
	MaxXMLPartBytes     = 16 << 20
	MaxZipMembers       = 10000
	MaxCompressionRatio = 200
)

// ratioFloor is the unpacked size under which the ratio is not checked.
const ratioFloor = 1 << 20

// maxSheetCells bounds the cells (blank ones within a row included) that
// excelize is asked to return for one sheet: about a million rows of 32
// columns. A sheet whose rows reach far to the right costs excelize the
// whole width of every row, so a small file of rows ending in column XFD
// would otherwise take minutes (common practice, no source).
const maxSheetCells = 32 << 20

var (
	zipMagic = []byte("PK\x03\x04")
	oleMagic = []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}
)

// checkArchive opens path as a zip archive and checks its members against
// the limits, decompressing each to count its real size. The caller closes
// the returned reader.
func checkArchive(path string) (*zip.ReadCloser, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if fi.Size() > MaxWorkbookBytes {
		return nil, fmt.Errorf("%s is %d MiB; workbooks over %d MiB are not read: %w", path, fi.Size()>>20, MaxWorkbookBytes>>20, ErrInputTooLarge)
	}
	zr, err := zip.OpenReader(path)
	if err != nil {
		return nil, fmt.Errorf("%s is not a workbook (%v): %w", path, err, ErrUnsupportedInput)
	}
	fail := func(err error) (*zip.ReadCloser, error) {
		zr.Close()
		return nil, err
	}
	if len(zr.File) > MaxZipMembers {
		return fail(fmt.Errorf("%s holds %d parts; at most %d are read: %w", path, len(zr.File), MaxZipMembers, ErrInputTooLarge))
	}
	var total uint64
	for _, m := range zr.File {
		size := m.UncompressedSize64
		total += size
		switch {
		case size > MaxUnzippedBytes:
			return fail(fmt.Errorf("%s: part %q unpacks to %d MiB; at most %d MiB are read: %w", path, m.Name, size>>20, MaxUnzippedBytes>>20, ErrInputTooLarge))
		case total > MaxUnzippedBytes:
			return fail(fmt.Errorf("%s unpacks to more than %d MiB: %w", path, MaxUnzippedBytes>>20, ErrInputTooLarge))
		case size > ratioFloor && size > MaxCompressionRatio*(m.CompressedSize64+1):
			return fail(fmt.Errorf("%s: part %q is compressed %d to 1; more than %d to 1 looks like a zip bomb: %w",
				path, m.Name, size/(m.CompressedSize64+1), MaxCompressionRatio, ErrInputTooLarge))
		}
	}
	for _, m := range zr.File {
		if err := checkMember(m); err != nil {
			return fail(fmt.Errorf("%s: %w", path, err))
		}
	}
	return zr, nil
}

// checkMember decompresses a member's raw data itself, counting, to catch
// one that holds more than it declares; archive/zip would stop such a
// member with a bare format error, and excelize would then see no rows.
func checkMember(m *zip.File) error {
	if m.FileInfo().IsDir() {
		return nil
	}
	var r io.Reader
	switch m.Method {
	case zip.Store, zip.Deflate:
		raw, err := m.OpenRaw()
		if err != nil {
			return fmt.Errorf("part %q cannot be opened (%v): %w", m.Name, err, ErrUnsupportedInput)
		}
		r = raw
		if m.Method == zip.Deflate {
			fr := flate.NewReader(raw)
			defer fr.Close()
			r = fr
		}
	default:
		rc, err := m.Open()
		if err != nil {
			return fmt.Errorf("part %q cannot be opened (%v): %w", m.Name, err, ErrUnsupportedInput)
		}
		defer rc.Close()
		r = rc
	}
	n, err := io.Copy(io.Discard, io.LimitReader(r, int64(m.UncompressedSize64)+1))
	switch {
	case uint64(n) > m.UncompressedSize64:
		return fmt.Errorf("part %q holds more than the %d bytes it declares: %w", m.Name, m.UncompressedSize64, ErrInputTooLarge)
	case err != nil:
		return fmt.Errorf("part %q is damaged (%v): %w", m.Name, err, ErrUnsupportedInput)
	}
	return nil
}

// workbook is an open workbook: excelize for the values and the displayed
// text, and the archive for the cell types, which excelize's streaming rows
// do not report.
type workbook struct {
	path  string
	f     *excelize.File
	zr    *zip.ReadCloser
	parts map[string]string // sheet name → archive member
}

// openWorkbook checks and opens a workbook read-only. Nothing is ever
// written back: the file is opened with os.Open by both readers.
func openWorkbook(path string) (*workbook, error) {
	head := make([]byte, 8)
	fh, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	n, _ := io.ReadFull(fh, head)
	fh.Close()
	head = head[:n]
	if n == 0 {
		return nil, fmt.Errorf("%s is empty (0 bytes), not an .xlsx workbook: %w", path, ErrUnsupportedInput)
	}
	if bytes.Equal(head, oleMagic) {
		return nil, fmt.Errorf("%s is an old-format (.xls) or password-protected workbook; save it as an unprotected .xlsx: %w", path, ErrUnsupportedInput)
	}
	if !bytes.HasPrefix(head, zipMagic) {
		return nil, fmt.Errorf("%s is not an .xlsx workbook: %w", path, ErrUnsupportedInput)
	}
	zr, err := checkArchive(path)
	if err != nil {
		return nil, err
	}
	f, err := excelize.OpenFile(path, excelize.Options{UnzipSizeLimit: MaxUnzippedBytes, UnzipXMLSizeLimit: MaxXMLPartBytes})
	if err != nil {
		zr.Close()
		return nil, fmt.Errorf("%s cannot be opened as a workbook (%v): %w", path, err, ErrUnsupportedInput)
	}
	wb := &workbook{path: path, f: f, zr: zr}
	wb.parts = sheetParts(&zr.Reader)
	return wb, nil
}

// Close releases the workbook and excelize's temporary files.
func (w *workbook) Close() error {
	err := w.f.Close()
	if e := w.zr.Close(); err == nil {
		err = e
	}
	return err
}

// sheets lists the worksheets in workbook order.
func (w *workbook) sheets() []string { return w.f.GetSheetList() }

// source streams one sheet.
func (w *workbook) source(sheet string) (*xlsxSource, error) {
	raw, err := w.f.Rows(sheet)
	if err != nil {
		return nil, fmt.Errorf("%s, sheet %q cannot be read (%v): %w", w.path, sheet, err, ErrUnsupportedInput)
	}
	disp, err := w.f.Rows(sheet)
	if err != nil {
		raw.Close()
		return nil, fmt.Errorf("%s, sheet %q cannot be read (%v): %w", w.path, sheet, err, ErrUnsupportedInput)
	}
	s := &xlsxSource{raw: raw, disp: disp, file: w.path, sheet: sheet, cellBudget: maxSheetCells}
	if part, ok := w.parts[sheet]; ok {
		s.types = newCellTypes(&w.zr.Reader, part)
	}
	return s, nil
}

// xlsxSource streams a worksheet three times in step: the stored values, the
// displayed text, and the cell types.
type xlsxSource struct {
	raw, disp   *excelize.Rows
	types       *cellTypes
	file, sheet string
	n           int
	cells       int // the widths of the rows read so far, summed
	cellBudget  int // the most cells read before the sheet is refused
	rawOpts     excelize.Options
}

// Next reads the next row, blank rows included (a blank row ends a
// correlation table). A numeric cell carries its stored value and displayed
// text; a boolean, error or date cell its displayed text; a text cell what
// was typed. A row with content beyond MaxColumns gets a problem: when the
// cell types are known it is not read at all, since excelize would build
// the whole width (a row ending in column XFD costs a megabyte); otherwise
// its first MaxColumns cells are kept. Damaged sheet XML, which excelize
// reads as the end of the sheet, is an error, and so is a sheet whose rows
// add up to more than maxSheetCells cells.
func (s *xlsxSource) Next(row *sheetRow) error {
	if !s.raw.Next() {
		if err := s.raw.Error(); err != nil {
			return fmt.Errorf("%s, sheet %q cannot be read after row %d (%v): %w", s.file, s.sheet, s.n, err, ErrUnsupportedInput)
		}
		if s.types != nil && s.types.dec != nil {
			s.types.row(math.MaxInt) // read to the end, to see whether the XML is whole
			var se *xml.SyntaxError
			if errors.As(s.types.err, &se) {
				return fmt.Errorf("%s, sheet %q: the sheet's XML is damaged (%v), so the rows after row %d cannot be read: %w",
					s.file, s.sheet, se, s.n, ErrUnsupportedInput)
			}
		}
		return io.EOF
	}
	s.disp.Next()
	s.n++
	row.Row, row.Fields, row.Problem = s.n, 0, nil
	row.Cells = row.Cells[:0]
	var kinds []byte
	known := s.types != nil && s.types.err == nil
	if known {
		kinds = s.types.row(s.n)
		if w := s.types.valueWidth(s.n); w > MaxColumns {
			last, _ := excelize.ColumnNumberToName(w)
			row.Problem = fmt.Errorf("the row has a value in column %s, beyond the first %d columns that are read; the row is not read: %w", last, MaxColumns, ErrInputTooLarge)
			return nil
		}
	}
	s.rawOpts.RawCellValue = true
	rawCols, err := s.raw.Columns(s.rawOpts)
	if err != nil {
		row.Problem = fmt.Errorf("the row cannot be read (%v)", err)
	}
	dispCols, err := s.disp.Columns()
	if err != nil && row.Problem == nil {
		row.Problem = fmt.Errorf("the row cannot be read (%v)", err)
	}
	width := max(len(rawCols), len(dispCols))
	s.cells += width
	if s.cells > s.cellBudget {
		return &CellError{Position: Position{File: s.file, Sheet: s.sheet, Row: s.n},
			Err: fmt.Errorf("the sheet holds more than %d cells up to this row; its rows reach too far to the right or are too many: %w", s.cellBudget, ErrInputTooLarge)}
	}
	if width > MaxColumns {
		if row.Problem == nil {
			last, _ := excelize.ColumnNumberToName(width)
			row.Problem = fmt.Errorf("the row has cells up to column %s; only the first %d columns are read: %w", last, MaxColumns, ErrInputTooLarge)
		}
		width = MaxColumns
	}
	for i := 0; i < width; i++ {
		raw, disp := "", ""
		if i < len(rawCols) {
			raw = rawCols[i]
		}
		if i < len(dispCols) {
			disp = dispCols[i]
		}
		var kind byte
		if i < len(kinds) {
			kind = kinds[i]
		}
		var c sheetCell
		switch {
		case !known:
			// Without the types, a cell whose shown text differs from its
			// stored number is numeric; the rest are read as text.
			_, perr := strconv.ParseFloat(raw, 64)
			c = sheetCell{Text: raw, Display: disp, Numeric: raw != disp && perr == nil}
		case kind == xmlNumeric && raw != "":
			c = sheetCell{Text: raw, Display: disp, Numeric: true}
		case kind == xmlBool || kind == xmlError || kind == xmlDate:
			c = sheetCell{Text: disp}
		default:
			c = sheetCell{Text: raw}
		}
		row.Cells = append(row.Cells, c)
	}
	return nil
}

// Close closes the three streams.
func (s *xlsxSource) Close() error {
	err := s.raw.Close()
	if e := s.disp.Close(); err == nil {
		err = e
	}
	if s.types != nil {
		if e := s.types.Close(); err == nil {
			err = e
		}
	}
	return err
}

// isZipFile reports whether path starts like a zip archive (an .xlsx).
func isZipFile(path string) (bool, error) {
	f, err := os.Open(path)
	if err != nil {
		return false, err
	}
	defer f.Close()
	head := make([]byte, 8)
	n, err := io.ReadFull(f, head)
	if err != nil && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.Is(err, io.EOF) {
		return false, err
	}
	head = head[:n]
	return bytes.HasPrefix(head, zipMagic) || bytes.Equal(head, oleMagic), nil
}
