package extract

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"strings"
	"unicode/utf8"
)

// recordReader reads the records of a CSV stream as encoding/csv reads
// them with strict quotes and ragged rows (a line that is only a line end
// is skipped), but splits a line that holds no quote itself: such lines
// are nearly every line of a paired CSV, and cutting them at the delimiter
// with strings.IndexByte takes about half the time encoding/csv takes
// (ReadHead, which needs only a line's first fields, also splits a line
// whose quotes all stand after them, in fields quoted whole). A record
// that starts on any other line with a quote, a line longer than the
// buffer, the last line when it has no line end, and every read error are
// left to encoding/csv, which reads from the same bufio.Reader: quoted
// fields and parse errors are its own, with their lines counted from the
// stream's start.
//
// It is an optimisation: BenchmarkCheckMillionCSV in package report, on
// same-sample claims, misses its target without it (see the README's
// speed section). TestRecordReaderAgreesWithEncodingCSV and
// FuzzRecordReader hold it to encoding/csv's records, lines, offsets and
// errors.
type recordReader struct {
	// Comma is the delimiter, one byte.
	Comma rune

	br  *bufio.Reader
	csv *csv.Reader // reads from br itself (its size is at least 4096)

	rec    []string
	line   int   // lines consumed
	offset int64 // bytes consumed
	// csvLines is the number of lines encoding/csv has consumed; its
	// lines are shifted by shift (line - csvLines) when it reads a record.
	csvLines int
	shift    int
	byCSV    bool // whether encoding/csv read the last record
}

// newRecordReader reads records from br, whose size must be at least 4096
// bytes so that encoding/csv reads from it and not from a buffer of its
// own; the reader reuses its record.
func newRecordReader(br *bufio.Reader, comma rune) *recordReader {
	cr := csv.NewReader(br)
	cr.Comma = comma
	cr.FieldsPerRecord = -1
	cr.ReuseRecord = true
	cr.LazyQuotes = false
	return &recordReader{Comma: comma, br: br, csv: cr}
}

// Read returns the next record, valid until the next call; at the end of
// the stream it returns io.EOF. A record encoding/csv rejects comes with
// what could be read of it and a *csv.ParseError whose lines count from
// the stream's start.
func (t *recordReader) Read() ([]string, error) {
	rec, _, err := t.read(-1)
	return rec, err
}

// ReadHead is Read for a caller that needs only a record's first n fields
// (n at least 1): of a line it splits itself it returns those fields and
// whether every field after them is blank (spaces only), without copying
// or splitting the rest; a record encoding/csv reads comes whole, with
// restBlank true. Lines, offsets and errors are Read's.
//
// It is an optimisation for the first pass over a paired CSV, which reads
// only the study and claim columns: nothing else starts until that pass
// ends, BenchmarkCheckMillionCSV in package report misses its target on
// independent claims, and BenchmarkCountPaired takes twice as long with
// Read.
func (t *recordReader) ReadHead(n int) (head []string, restBlank bool, err error) {
	return t.read(max(n, 1))
}

// read reads the next record; a line it splits itself is split up to its
// n-th delimiter when n > 0, and the rest's blankness is returned. Only
// then may the rest hold quotes, in fields that open and close on the
// line (restFields): the record is still that line.
func (t *recordReader) read(n int) ([]string, bool, error) {
	for {
		line, ok := t.peekLine()
		end, restBlank := 0, true // where the fields split end
		if ok {
			end, restBlank, ok = splitEnd(line[:len(line)-1], byte(t.Comma), n)
		}
		if !ok {
			rec, err := t.readByCSV()
			return rec, true, err
		}
		t.line++
		t.offset += int64(len(line))
		if len(line) == 1 { // a blank line, which encoding/csv skips
			_, _ = t.br.Discard(1)
			continue
		}
		s := string(line[:end])
		_, _ = t.br.Discard(len(line))
		rec := t.rec[:0]
		for {
			i := strings.IndexByte(s, byte(t.Comma))
			if i < 0 {
				rec = append(rec, s)
				break
			}
			rec = append(rec, s[:i])
			s = s[i+1:]
		}
		t.rec, t.byCSV = rec, false
		return rec, restBlank, nil
	}
}

// splitEnd says where the fields of text, a line without its line end,
// are to be split to: its end, or its n-th delimiter when n > 0, with
// whether the rest after that delimiter is blank (restFields); not ok
// when the line is encoding/csv's to read, for a quote among the fields
// to split or a rest whose quotes the record may not end with.
func splitEnd(text []byte, comma byte, n int) (end int, restBlank, ok bool) {
	end = len(text)
	if n > 0 {
		end = nthIndex(text, comma, n)
	}
	if bytes.IndexByte(text[:end], '"') >= 0 {
		return 0, false, false
	}
	if end == len(text) {
		return end, true, true
	}
	restBlank, ok = restFields(text[end+1:], comma)
	return end, restBlank, ok
}

// nthIndex is the index of the n-th c in b, or len(b) when b has fewer.
func nthIndex(b []byte, c byte, n int) int {
	at := -1
	for range n {
		i := bytes.IndexByte(b[at+1:], c)
		if i < 0 {
			return len(b)
		}
		at += i + 1
	}
	return at
}

// restFields reads b, the fields of a line after the first ones, as
// encoding/csv would with strict quotes: ok when every quote opens a field
// quoted whole and closes on the line (so the record ends with the line
// and encoding/csv would read it without error), and blank when every
// field's text is spaces only, as trimSpace sees them.
func restFields(b []byte, comma byte) (blank, ok bool) {
	for i := 0; ; {
		q := bytes.IndexByte(b[i:], '"')
		if q < 0 {
			break
		}
		q += i
		if q > 0 && b[q-1] != comma {
			return false, false // a quote inside an unquoted field
		}
		if i = afterQuotedField(b, q); i < 0 {
			return false, false // the quote closes on a later line, or never
		}
		if i < len(b) && b[i] != comma {
			return false, false // text after the closing quote
		}
	}
	// Nearly always a visible ASCII character says at once that the rest
	// is not blank; quotes and spaces leave it to the fields.
	for _, c := range b {
		switch {
		case c == comma || c == '"' || c == ' ' || c == '\t' || c == '\v' || c == '\f' || c == '\r':
		case c < utf8.RuneSelf:
			return false, true
		default:
			return fieldsBlank(b, comma), true
		}
	}
	return fieldsBlank(b, comma), true
}

// afterQuotedField returns the index just after the quote that closes the
// quoted field opening at b[open], its doubled quotes skipped, or -1 when
// b holds no closing quote.
func afterQuotedField(b []byte, open int) int {
	i := open + 1
	for {
		j := bytes.IndexByte(b[i:], '"')
		if j < 0 {
			return -1
		}
		i += j + 1
		if i == len(b) || b[i] != '"' {
			return i
		}
		i++ // a doubled quote
	}
}

// fieldsBlank reports whether every field of b, whose quotes restFields
// has found sound, is spaces only.
func fieldsBlank(b []byte, comma byte) bool {
	for len(b) > 0 {
		var field []byte
		if b[0] == '"' {
			i := afterQuotedField(b, 0)
			// The field's text with its doubled quotes still doubled: as
			// blank as the field is.
			field, b = b[1:i-1], b[i:]
		} else {
			j := bytes.IndexByte(b, comma)
			if j < 0 {
				j = len(b)
			}
			field, b = b[:j], b[j:]
		}
		if len(bytes.TrimFunc(field, isSpace)) > 0 {
			return false
		}
		if len(b) > 0 {
			b = b[1:] // the delimiter
		}
	}
	return true
}

// peekLine returns the next line with its line end, without consuming it;
// false when encoding/csv is to read the next record: the line has a \r
// before its line end (which encoding/csv drops), it is longer than the
// buffer, it is the last line and has no line end, or the stream failed.
// Whether its quotes leave it to encoding/csv is read's to say.
func (t *recordReader) peekLine() ([]byte, bool) {
	buf, _ := t.br.Peek(t.br.Buffered())
	i := bytes.IndexByte(buf, '\n')
	if i < 0 {
		// The stream's error, if any, is not lost: every reader under a
		// csvSource returns it again, to encoding/csv.
		buf, _ = t.br.Peek(t.br.Size())
		if i = bytes.IndexByte(buf, '\n'); i < 0 {
			return nil, false
		}
	}
	line := buf[:i+1]
	if i > 0 && line[i-1] == '\r' {
		return nil, false
	}
	return line, true
}

// readByCSV has encoding/csv read the next record and shifts its lines to
// count from the stream's start.
func (t *recordReader) readByCSV() ([]string, error) {
	start := t.csv.InputOffset()
	t.shift = t.line - t.csvLines
	rec, err := t.csv.Read()
	t.offset += t.csv.InputOffset() - start
	t.byCSV = true
	var pe *csv.ParseError
	switch {
	case err == nil && len(rec) > 0:
		// The record ends on its last field's line, plus the line ends
		// inside that field (a quoted field can hold them).
		last, _ := t.csv.FieldPos(len(rec) - 1)
		t.csvLines = last + strings.Count(rec[len(rec)-1], "\n")
	case errors.As(err, &pe):
		// encoding/csv reads the line it fails on to its end, and no
		// further.
		t.csvLines = pe.Line
		shifted := *pe
		shifted.StartLine += t.shift
		shifted.Line += t.shift
		err = &shifted
	}
	t.line = t.csvLines + t.shift
	return rec, err
}

// StartLine is the line on which the last record starts.
func (t *recordReader) StartLine() int {
	if !t.byCSV {
		return t.line // a split line is a record of one line
	}
	line, _ := t.csv.FieldPos(0)
	return line + t.shift
}

// EndLine is the line on which the last record, read whole, ends.
func (t *recordReader) EndLine() int { return t.line }

// InputOffset is the number of bytes consumed: the end of the last record.
func (t *recordReader) InputOffset() int64 { return t.offset }
