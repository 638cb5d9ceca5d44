package extract

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"strings"
)

// recordReader reads the records of a CSV stream as encoding/csv reads
// them with strict quotes and ragged rows (a line that is only a line end
// is skipped), but splits a line that holds no quote itself: such lines
// are nearly every line of a paired CSV, and cutting them at the delimiter
// with strings.IndexByte takes about half the time encoding/csv takes. A
// record that starts on a line with a quote, a line longer than the
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
	for {
		line, ok := t.peekLine()
		if !ok {
			return t.readByCSV()
		}
		t.line++
		t.offset += int64(len(line))
		if len(line) == 1 { // a blank line, which encoding/csv skips
			_, _ = t.br.Discard(1)
			continue
		}
		s := string(line[:len(line)-1])
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
		return rec, nil
	}
}

// peekLine returns the next line with its line end, without consuming it;
// false when encoding/csv is to read the next record: the line holds a
// quote or a \r before its line end (which encoding/csv drops), it is
// longer than the buffer, it is the last line and has no line end, or the
// stream failed.
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
	if bytes.IndexByte(line, '"') >= 0 || (i > 0 && line[i-1] == '\r') {
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
