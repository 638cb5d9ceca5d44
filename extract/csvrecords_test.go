package extract

import (
	"bufio"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
	"testing/iotest"
)

// readEvent is what one Read gives: the record, its error, the lines on
// which it starts and ends (for a record read whole) and the offset after
// it.
type readEvent struct {
	rec         []string
	err         string
	first, last int
	offset      int64
}

func (e readEvent) String() string {
	return fmt.Sprintf("%q err=%s lines %d-%d offset %d", e.rec, e.err, e.first, e.last, e.offset)
}

// errText names an error by what a caller reads of it.
func errText(err error) string {
	var pe *csv.ParseError
	switch {
	case err == nil:
		return ""
	case errors.As(err, &pe):
		return fmt.Sprintf("parse %d-%d col %d: %v", pe.StartLine, pe.Line, pe.Column, pe.Err)
	default:
		return err.Error()
	}
}

// readEvents reads records with read until io.EOF; lines gives the lines
// on which a record read whole starts and ends, offset the offset after a
// record.
func readEvents(read func() ([]string, error), lines func(rec []string) (start, end int), offset func() int64) []readEvent {
	var out []readEvent
	for {
		rec, err := read()
		if err == io.EOF {
			return out
		}
		e := readEvent{rec: slices.Clone(rec), err: errText(err), offset: offset()}
		if err == nil {
			e.first, e.last = lines(rec)
		}
		out = append(out, e)
		if len(out) > 1<<20 {
			panic("the reader does not end")
		}
	}
}

// encodingCSVEvents reads text with encoding/csv alone, as csvSource read
// it before recordReader: the reference.
func encodingCSVEvents(text string, comma rune) []readEvent {
	r := csv.NewReader(strings.NewReader(text))
	r.Comma, r.FieldsPerRecord, r.ReuseRecord = comma, -1, true
	return readEvents(r.Read, func(rec []string) (int, int) {
		start, _ := r.FieldPos(0)
		last, _ := r.FieldPos(len(rec) - 1)
		return start, last + strings.Count(rec[len(rec)-1], "\n")
	}, r.InputOffset)
}

// recordReaderEvents reads text with recordReader, its buffer as small as
// encoding/csv allows, the stream delivered in pieces by wrap.
func recordReaderEvents(text string, comma rune, wrap func(io.Reader) io.Reader) []readEvent {
	r := newRecordReader(bufio.NewReaderSize(wrap(strings.NewReader(text)), 4096), comma)
	return readEvents(r.Read, func([]string) (int, int) { return r.StartLine(), r.EndLine() }, r.InputOffset)
}

// checkHeadAgreesWithEncodingCSV fails t when recordReader.ReadHead(n)
// reads text otherwise than encoding/csv does: its head must be the
// record's first n fields or more (a record encoding/csv reads comes
// whole), restBlank must say whether the fields after the head are all
// blank, and lines, offsets and errors must be the same.
func checkHeadAgreesWithEncodingCSV(t *testing.T, text string, comma rune, n int) {
	t.Helper()
	want := encodingCSVEvents(text, comma)
	for name, wrap := range map[string]func(io.Reader) io.Reader{
		"whole":    func(r io.Reader) io.Reader { return r },
		"one byte": iotest.OneByteReader,
	} {
		r := newRecordReader(bufio.NewReaderSize(wrap(strings.NewReader(text)), 4096), comma)
		for i := 0; ; i++ {
			head, restBlank, err := r.ReadHead(n)
			if err == io.EOF {
				if i != len(want) {
					t.Fatalf("%s, ReadHead(%d) of %q: %d records, want %d", name, n, text, i, len(want))
				}
				break
			}
			if i >= len(want) {
				t.Fatalf("%s, ReadHead(%d) of %q: more than %d records", name, n, text, len(want))
			}
			w := want[i]
			g := readEvent{rec: w.rec, err: errText(err), offset: r.InputOffset()}
			if err == nil {
				g.first, g.last = r.StartLine(), r.EndLine()
			}
			blank := true
			for _, f := range w.rec[min(len(head), len(w.rec)):] {
				blank = blank && trimSpace(f) == ""
			}
			if g.String() != w.String() || len(head) < min(n, len(w.rec)) || !slices.Equal(head, w.rec[:min(len(head), len(w.rec))]) || restBlank != blank {
				t.Fatalf("%s, ReadHead(%d), record %d of %q:\n got head %q rest blank %v, %v\nwant %v, rest blank %v", name, n, i, text, head, restBlank, g, w, blank)
			}
		}
	}
}

// checkAgreesWithEncodingCSV fails t when recordReader reads text otherwise
// than encoding/csv does, whatever pieces the stream comes in.
func checkAgreesWithEncodingCSV(t *testing.T, text string, comma rune) {
	t.Helper()
	want := encodingCSVEvents(text, comma)
	for name, wrap := range map[string]func(io.Reader) io.Reader{
		"whole":     func(r io.Reader) io.Reader { return r },
		"one byte":  iotest.OneByteReader,
		"half read": iotest.HalfReader,
	} {
		got := recordReaderEvents(text, comma, wrap)
		for i := range max(len(got), len(want)) {
			var g, w readEvent
			if i < len(got) {
				g = got[i]
			}
			if i < len(want) {
				w = want[i]
			}
			if g.String() != w.String() {
				t.Fatalf("%s, record %d of %q:\n got %v\nwant %v", name, i, text, g, w)
			}
		}
	}
}

// randomCSV builds a text from the pieces CSV files are made of: plain
// and quoted fields, doubled and stray quotes, line ends of every kind,
// blank lines, delimiters of every kind and lines longer than the buffer.
func randomCSV(rng *rand.Rand) string {
	pieces := []string{"a", "b1", " ", "0.25", ",", ",", ",", ";", "\t", "\n", "\n", "\r\n", "\r", `"`, `""`,
		`"x,y"`, `"multi` + "\n" + `line"`, `"q""q"`, "é", "\n\n"}
	var b strings.Builder
	for range rng.IntN(60) {
		if rng.IntN(40) == 0 {
			b.WriteString(strings.Repeat("long", 1100+rng.IntN(2000)))
			continue
		}
		b.WriteString(pieces[rng.IntN(len(pieces))])
	}
	return b.String()
}

// TestRecordReaderAgreesWithEncodingCSV holds recordReader to encoding/csv
// (strict quotes, ragged rows): the same records, the same lines of their
// first and last fields, the same offsets and the same parse errors, on
// hand-made texts and on 3,000 random ones.
func TestRecordReaderAgreesWithEncodingCSV(t *testing.T) {
	texts := []string{
		"", "\n", "a", "a,b\n", "a,b\nc,d", "a,b\n\n\nc,d\n", "a,\"b\nc\",d\ne,f\n",
		"a,b\"c\nd,e\n", "\"abc\"x,d\ne\n", "a,\"unclosed\nb,c\nd\n", "a,b\r\nc,d\r\n", "a\rb,c\n",
		"a,b\r", "\"a\"\"b\",c\n", ",\n,,\n", "x,y\n" + strings.Repeat("z", 9000) + ",w\nlast,row\n",
		"h\n\"" + strings.Repeat("q", 5000) + "\n\"\n1,2\n", "a;b\nc;\"d;e\"\n",
		// quotes after the first fields, which ReadHead may split around
		"a,b,\"x, y\"\n", "a,b,\"x\"\"y\",z\n", "a,b,\"x\"y\nc\n", "a,b, \"x\"\nc\n", "a,b,\"open\nclose\",c\nd\n",
		",,\" \"\n", ",,\"\"\"\"\n", ",, ,\"\",\n", "a,b,\"x\",\n", "a,b,\"\"\n", "a,b,c\"\n", "a,b,\"x\"\r\n",
	}
	for _, text := range texts {
		checkAgreesWithEncodingCSV(t, text, ',')
		checkAgreesWithEncodingCSV(t, text, ';')
		for n := range 4 {
			checkHeadAgreesWithEncodingCSV(t, text, ',', n)
		}
	}
	rng := rand.New(rand.NewPCG(7, 11))
	for range 3000 {
		comma := []rune{',', ';', '\t'}[rng.IntN(3)]
		text := randomCSV(rng)
		checkAgreesWithEncodingCSV(t, text, comma)
		checkHeadAgreesWithEncodingCSV(t, text, comma, 1+rng.IntN(3))
	}
}

// FuzzRecordReader holds recordReader to encoding/csv on any text.
func FuzzRecordReader(f *testing.F) {
	f.Add("a,b\n\"c\nd\",e\n\nf\"g,h\n")
	f.Add("\"x\"y,z\r\n" + strings.Repeat("w", 5000))
	f.Fuzz(func(t *testing.T, text string) {
		checkAgreesWithEncodingCSV(t, text, ',')
		checkHeadAgreesWithEncodingCSV(t, text, ',', 2)
	})
}
