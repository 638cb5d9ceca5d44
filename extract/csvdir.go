package extract

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"unicode/utf8"
)

// Limits of the CSV reader. A field longer than MaxFieldBytes is a problem
// of its row (the cell is read as blank); a physical line longer than
// MaxLineBytes or a record longer than MaxRecordBytes stops the file with
// ErrInputTooLarge, since nothing after it can be trusted to line up. The
// reader never holds more than about MaxRecordBytes of a file at once. The
// sizes are far above any table a paper prints (common practice, no source).
//
// MaxColumns bounds the width of a row, in a CSV file and in a workbook:
// the cells beyond it are dropped, and a row with a value beyond it gets a
// problem (in a workbook, such a row is not read at all, since excelize
// would build its whole width first); blank cells beyond it lose nothing. A header beyond it is a problem of
// the sheet. It keeps what one row costs downstream (its unknown columns, a
// raw-data row's missing values) within what a person could read, whatever
// the header holds (common practice, no source).
const (
	MaxFieldBytes  = 1 << 20
	MaxLineBytes   = 4 << 20
	MaxRecordBytes = 16 << 20
	MaxColumns     = 1024
)

// csvBufferSize is the read-ahead of the CSV reader, the slack of the
// record limit.
const csvBufferSize = 64 << 10

// sizeError reports an input beyond the limits at a line of the file.
type sizeError struct {
	line   int
	reason string
}

func (e *sizeError) Error() string { return e.reason }

// limitReader refuses a line or a record beyond the limits before the CSV
// parser has buffered it whole, and counts lines to say where.
type limitReader struct {
	r           io.Reader
	line        int // 1-based line being delivered
	lineLen     int64
	delivered   int64
	recordStart int64
	err         error
}

func (l *limitReader) Read(p []byte) (int, error) {
	if l.err != nil {
		return 0, l.err
	}
	n, err := l.r.Read(p)
	chunk := p[:n]
	for len(chunk) > 0 {
		i := bytes.IndexByte(chunk, '\n')
		if i < 0 {
			l.lineLen += int64(len(chunk))
			break
		}
		l.lineLen += int64(i)
		if l.lineLen > MaxLineBytes {
			break
		}
		l.lineLen = 0
		l.line++
		chunk = chunk[i+1:]
	}
	l.delivered += int64(n)
	switch {
	case l.lineLen > MaxLineBytes:
		l.err = &sizeError{line: l.line, reason: fmt.Sprintf("line %d is longer than %d MiB", l.line, MaxLineBytes>>20)}
	case l.delivered-l.recordStart > MaxRecordBytes+csvBufferSize:
		l.err = &sizeError{line: l.line, reason: fmt.Sprintf("a record reaching line %d is longer than %d MiB", l.line, MaxRecordBytes>>20)}
	}
	if l.err != nil {
		return 0, l.err
	}
	return n, err
}

// lineEndReader turns every line end into \n: \r\n and a lone \r (the line
// end of old Mac files, which encoding/csv would keep inside a field and so
// merge lines into one record). A \r inside a quoted field becomes \n too.
type lineEndReader struct {
	r      io.Reader
	skipLF bool // the last byte delivered was a \r turned into \n
}

func (l *lineEndReader) Read(p []byte) (int, error) {
	for {
		n, err := l.r.Read(p)
		if n == 0 {
			return 0, err
		}
		if l.skipLF && p[0] != '\n' {
			l.skipLF = false
		}
		if !l.skipLF && bytes.IndexByte(p[:n], '\r') < 0 {
			return n, err
		}
		w := 0
		for _, b := range p[:n] {
			switch {
			case b == '\n' && l.skipLF:
				l.skipLF = false
				continue
			case b == '\r':
				b, l.skipLF = '\n', true
			default:
				l.skipLF = false
			}
			p[w] = b
			w++
		}
		if w > 0 || err != nil {
			return w, err
		}
	}
}

// fieldError is a problem of a row that one of its fields causes; field is
// 0-based, so that the sheet readers can name the column.
type fieldError struct {
	field int
	err   error
}

func (e *fieldError) Error() string { return e.err.Error() }
func (e *fieldError) Unwrap() error { return e.err }

// csvSource streams the rows of one CSV file. It reads encoding/csv's
// records (recordReader) into the rows every input form shares, not into
// tagged structs with gocarina/gocsv: see BenchmarkPairedFileGocsv for
// why.
type csvSource struct {
	file     string
	lim      *limitReader
	r        *recordReader
	closer   io.Closer
	lastLine int // the line on which the last record ended
}

// newCSVSource prepares a CSV stream: a UTF-8 byte order mark is dropped, a
// UTF-16 file (with or without its byte order mark) and a file that is not
// text are refused, CRLF and lone CR line ends are read as LF, and the
// delimiter is the one of comma, semicolon or tab that the first line with
// any content uses most (a semicolon for the CSV that spreadsheets write
// where the decimal mark is a comma). Quotes are strict and rows may be
// ragged.
func newCSVSource(r io.Reader, file string, closer io.Closer) (*csvSource, error) {
	lim := &limitReader{r: &lineEndReader{r: r}, line: 1}
	br := bufio.NewReaderSize(lim, csvBufferSize)
	head, err := br.Peek(csvBufferSize)
	if err != nil && err != io.EOF && err != bufio.ErrBufferFull {
		var se *sizeError
		if errors.As(err, &se) {
			return nil, &CellError{Position: Position{File: file, Row: se.line}, Err: fmt.Errorf("%s: %w", se.reason, ErrInputTooLarge)}
		}
		return nil, fmt.Errorf("%s: %w", file, err)
	}
	if bytes.HasPrefix(head, []byte{0xFF, 0xFE}) || bytes.HasPrefix(head, []byte{0xFE, 0xFF}) {
		return nil, fmt.Errorf("%s is UTF-16 text; save it as CSV UTF-8: %w", file, ErrUnsupportedInput)
	}
	if bytes.HasPrefix(head, []byte{0xEF, 0xBB, 0xBF}) {
		_, _ = br.Discard(3)
		head = head[3:]
	}
	if why := notText(head); why != "" {
		return nil, fmt.Errorf("%s %s; save it as CSV UTF-8: %w", file, why, ErrUnsupportedInput)
	}
	return &csvSource{file: file, lim: lim, r: newRecordReader(br, sniffDelimiter(head)), closer: closer}, nil
}

// csvPart reads the records of a part of a CSV file that starts at a line
// end, not at the file's start: no byte order mark or delimiter to find,
// the delimiter is the header's (comma), and line numbers count from the
// part's start, so that it is used where no position is reported.
func csvPart(r io.Reader, file string, comma rune) *csvSource {
	lim := &limitReader{r: &lineEndReader{r: r}, line: 1}
	return &csvSource{file: file, lim: lim, r: newRecordReader(bufio.NewReaderSize(lim, csvBufferSize), comma)}
}

// notText says why the first bytes of a file are not text, or returns "".
// Text in any 8-bit encoding or in UTF-8 has no NUL and almost no other
// control bytes; UTF-16 text of Latin letters and digits has a NUL in every
// other byte, and random binary data a control byte in about one byte of
// nine. Over 1 in 20 is read as not text (common practice, no source).
func notText(head []byte) string {
	if len(head) > 4096 {
		head = head[:4096]
	}
	var nul [2]int
	control := 0
	for i, b := range head {
		switch {
		case b == 0:
			nul[i%2]++
			control++
		case b < ' ' && b != '\t' && b != '\n' && b != '\f' && b != '\v' && b != 0x1a:
			control++
		}
	}
	half := len(head) / 2
	switch {
	case len(head) >= 4 && (nul[1] >= half*9/10 || nul[0] >= half*9/10):
		return "is UTF-16 text without a byte order mark"
	case control > 0 && control*20 > len(head):
		return fmt.Sprintf("is not a text file (%d of its first %d bytes are control bytes)", control, len(head))
	}
	return ""
}

// sniffDelimiter picks the delimiter of the first line with any content,
// skipping lines of spaces and separators only; comma when no line has any.
func sniffDelimiter(head []byte) rune {
	for {
		line, rest, found := bytes.Cut(head, []byte{'\n'})
		if len(bytes.TrimFunc(line, func(r rune) bool { return isSpace(r) || r == ',' || r == ';' })) > 0 {
			head = line
			break
		}
		if !found {
			head = nil
			break
		}
		head = rest
	}
	counts := map[byte]int{}
	quoted := false
	for _, b := range head {
		switch {
		case b == '"':
			quoted = !quoted
		case !quoted && (b == ',' || b == ';' || b == '\t'):
			counts[b]++
		}
	}
	best := byte(',')
	for _, b := range []byte{';', '\t'} {
		if counts[b] > counts[best] {
			best = b
		}
	}
	return rune(best)
}

// Next reads the next record. A record the CSV parser rejects (a stray
// quote) is still returned, with what could be read and a Problem.
func (s *csvSource) Next(row *sheetRow) error {
	rec, err := s.r.Read()
	if err == io.EOF {
		return io.EOF
	}
	row.Problem = nil
	if err != nil {
		return s.readError(err, rec, row)
	}
	row.Row = s.r.StartLine()
	return s.fill(rec, row, nil)
}

// readError turns what the CSV parser returned into a fatal error or a
// problem of the row.
func (s *csvSource) readError(err error, rec []string, row *sheetRow) error {
	var se *sizeError
	var pe *csv.ParseError
	switch {
	case errors.As(err, &se):
		return &CellError{Position: Position{File: s.file, Row: se.line}, Err: fmt.Errorf("%s: %w", se.reason, ErrInputTooLarge)}
	case errors.As(err, &pe):
		row.Row = pe.StartLine
		switch {
		case pe.Line > pe.StartLine && errors.Is(pe.Err, csv.ErrQuote):
			// A quote that opens a field and is never closed takes every
			// line after it into that field, up to the next quote.
			row.Problem = fmt.Errorf("the row has an unclosed quote: the quoted field opened on row %d does not end before line %d, so lines %d to %d were read as one row and the rows on lines %d to %d are lost; close or remove the quote on row %d",
				pe.StartLine, pe.Line, pe.StartLine, pe.Line, pe.StartLine+1, pe.Line, pe.StartLine)
		case pe.Line > pe.StartLine:
			row.Problem = fmt.Errorf("the row cannot be read as CSV (%v at line %d, column %d): lines %d to %d were read as one row, and the rows on them are lost",
				pe.Err, pe.Line, pe.Column, pe.StartLine, pe.Line)
		default:
			row.Problem = fmt.Errorf("the row cannot be read as CSV (%v at column %d); its cells may be incomplete", pe.Err, pe.Column)
		}
	default:
		return fmt.Errorf("%s: %w", s.file, err)
	}
	return s.fill(rec, row, err)
}

// fill copies a record into row.
func (s *csvSource) fill(rec []string, row *sheetRow, err error) error {
	s.lim.recordStart = s.r.InputOffset()
	row.AfterBlank = s.lastLine > 0 && row.Row > s.lastLine+1
	s.lastLine = row.Row
	if n := len(rec); n > 0 && err == nil {
		s.lastLine = s.r.EndLine()
	}
	row.Fields = len(rec)
	if row.Fields == 0 {
		row.Fields = 1
	}
	if len(rec) > MaxColumns {
		// Blank fields beyond the limit (a spreadsheet's trailing
		// separators) lose nothing when dropped: only a value there is a
		// problem, as in a workbook, and a row of separators stays blank.
		if row.Problem == nil && !fieldsAllBlank(rec[MaxColumns:]) {
			row.Problem = fmt.Errorf("the row has %d fields; only the first %d are read: %w", len(rec), MaxColumns, ErrInputTooLarge)
		}
		rec = rec[:MaxColumns]
	}
	cells := row.Cells[:0]
	for i, f := range rec {
		if why, kind := badField(f); why != "" {
			if row.Problem == nil {
				row.Problem = &fieldError{i, fmt.Errorf("field %d %s; it is read as blank: %w", i+1, why, kind)}
			}
			f = ""
		}
		cells = append(cells, sheetCell{Text: f})
	}
	row.Cells = cells
	return nil
}

// fieldsAllBlank reports whether every field is blank, as a blank cell
// is read (white space only).
func fieldsAllBlank(fields []string) bool {
	for _, f := range fields {
		if trimSpace(f) != "" {
			return false
		}
	}
	return true
}

// badField says why a CSV field cannot be read as text, or returns "": it
// is beyond MaxFieldBytes, holds a NUL byte (no text has one) or is not
// valid UTF-8 (the JSON and CSV reports would then disagree about its
// bytes).
func badField(f string) (why string, kind error) {
	switch {
	case len(f) > MaxFieldBytes:
		return fmt.Sprintf("is longer than %d MiB", MaxFieldBytes>>20), ErrInputTooLarge
	case strings.IndexByte(f, 0) >= 0:
		return "holds a NUL byte, which no text has (is the file damaged?)", ErrUnsupportedInput
	case !utf8.ValidString(f):
		return "is not valid UTF-8 text (save the file as CSV UTF-8)", ErrUnsupportedInput
	}
	return "", nil
}

// Close closes the file.
func (s *csvSource) Close() error {
	if s.closer == nil {
		return nil
	}
	return s.closer.Close()
}

// openCSV opens a CSV file as a row source.
func openCSV(path string) (*csvSource, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	src, err := newCSVSource(f, path, f)
	if err != nil {
		f.Close()
		return nil, err
	}
	return src, nil
}
