package extract

import (
	"archive/zip"
	"bytes"
	"compress/flate"
	"errors"
	"fmt"
	"io"
	"os"
)

// Limits of the workbook reader. The archive's directory is checked before
// any part is read, and every member is then decompressed once with a
// counter, without parsing it, because a member that understates its size
// would otherwise be found out only after its rows had been read. Beyond a
// limit the workbook is refused with ErrInputTooLarge.
//
// MaxUnzippedBytes bounds each member and their sum, and also that sum
// with the shared strings the cells use, each counted every time a cell
// uses it: a short table of strings used over and over unpacks to any
// size. A workbook of 100,000 claims and their 200,000 coefficients, as a
// spreadsheet program writes it, comes to some 140 MiB that way.
// MaxCompressionRatio applies to members over 1 MiB unpacked: a worksheet
// of repetitive XML packs about 10 to 50 times, while a zip bomb packs
// thousands of times (common practice, no source).
const (
	MaxWorkbookBytes    = 64 << 20
	MaxUnzippedBytes    = 256 << 20
	MaxZipMembers       = 10000
	MaxCompressionRatio = 200
)

// ratioFloor is the unpacked size under which the ratio is not checked.
const ratioFloor = 1 << 20

// maxSheetCells bounds the cells (blank ones within a row included) read
// from one sheet: about a million rows of 32 columns. A row ending far to
// the right costs its whole width, so a small file of rows ending in column
// AMJ would otherwise take minutes (common practice, no source).
const maxSheetCells = 32 << 20

var (
	zipMagic = []byte("PK\x03\x04")
	oleMagic = []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}
)

// checkArchive opens path as a zip archive and checks its members against
// the limits, decompressing each to count its real size. It returns their
// sum; the caller closes the returned reader.
func checkArchive(path string) (*zip.ReadCloser, uint64, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return nil, 0, err
	}
	if fi.Size() > MaxWorkbookBytes {
		return nil, 0, fmt.Errorf("%s is %d MiB; workbooks and DOCX files over %d MiB are not read: %w", path, fi.Size()>>20, MaxWorkbookBytes>>20, ErrInputTooLarge)
	}
	zr, err := zip.OpenReader(path)
	if err != nil {
		return nil, 0, fmt.Errorf("%s is not a readable zip package, as a workbook or a DOCX file is (%v): %w", path, err, ErrUnsupportedInput)
	}
	fail := func(err error) (*zip.ReadCloser, uint64, error) {
		zr.Close()
		return nil, 0, err
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
	return zr, total, nil
}

// checkMember decompresses a member's raw data itself, counting, to catch
// one that holds more than it declares before anything of it is read;
// archive/zip would stop such a member with a bare format error only once
// the rows before that point had been read.
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

// workbook is an open workbook: the archive, what the package says of its
// sheets, the shared strings and the cell formats.
type workbook struct {
	path    string
	zr      *zip.ReadCloser
	pkg     *packageInfo
	sst     *sharedStrings
	display *numberDisplay
	// budget is what the cells' shared strings may still add to the
	// unpacked size before it passes MaxUnzippedBytes.
	budget int64
	// sheetXML bounds the XML of each sheet.
	sheetXML xmlLimits
}

// openWorkbook checks and opens a workbook read-only. Nothing is ever
// written back: the file is opened with os.Open.
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
	zr, total, err := checkArchive(path)
	if err != nil {
		return nil, err
	}
	wb := &workbook{path: path, zr: zr, budget: MaxUnzippedBytes - int64(total),
		sheetXML: xmlLimits{depth: maxXMLDepth, elements: maxSheetXMLElement}}
	if err := wb.readParts(); err != nil {
		zr.Close()
		return nil, fmt.Errorf("%s cannot be opened as a workbook: %w", path, err)
	}
	return wb, nil
}

// readParts reads the package, the cell formats and the shared strings.
func (w *workbook) readParts() error {
	pkg, err := readPackage(&w.zr.Reader)
	if err != nil {
		return err
	}
	styles, err := readStyles(pkg.styles)
	if err != nil {
		return err
	}
	sst, err := readSharedStrings(pkg.sharedStrings)
	if err != nil {
		return err
	}
	w.pkg, w.sst, w.display = pkg, sst, newNumberDisplay(styles, pkg.date1904)
	return nil
}

// Close releases the workbook.
func (w *workbook) Close() error {
	err := w.display.Close()
	if e := w.zr.Close(); err == nil {
		err = e
	}
	return err
}

// sheets lists the sheets in workbook order.
func (w *workbook) sheets() []string { return w.pkg.sheets }

// source streams one sheet.
func (w *workbook) source(sheet string) (*xlsxSource, error) {
	m := w.pkg.sheetPart[sheet]
	if m == nil {
		return nil, fmt.Errorf("%s, sheet %q cannot be read: the workbook lists it, but its part is missing: %w", w.path, sheet, ErrUnsupportedInput)
	}
	x, err := openPartXML(m, w.sheetXML)
	if err != nil {
		return nil, fmt.Errorf("%s, sheet %q: %w", w.path, sheet, err)
	}
	return &xlsxSource{wb: w, x: x, file: w.path, sheet: sheet, cellBudget: maxSheetCells}, nil
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
