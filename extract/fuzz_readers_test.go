package extract

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The fuzz targets below feed arbitrary bytes to the row readers: the
// coefficients and claims CSV of a folder, a correlation table laid out as
// printed, a paired CSV, raw data and the sheet XML of a workbook. Each
// checks that nothing panics, that a refused input gets an error naming the
// file, that every problem is placed (file, row, and column when a cell is
// to blame), and, for text without quotes, that every non-blank record of
// the file comes back exactly once with its own line number. Seed corpora
// are in testdata/fuzz/<target>/; .ci/fuzz runs every target.

// csvLines splits CSV text into its physical lines, ending a line at \n,
// \r\n or a lone \r, as the input contract reads line ends.
func csvLines(data []byte) []string {
	s := strings.ReplaceAll(string(data), "\r\n", "\n")
	s = strings.ReplaceAll(s, "\r", "\n")
	return strings.Split(s, "\n")
}

// blankUnder reports whether a quote-free line holds only empty cells when
// split at delim (cells trimmed as the readers trim them).
func blankUnder(line string, delim rune) bool {
	for _, cell := range strings.Split(line, string(delim)) {
		if strings.TrimFunc(cell, isSpace) != "" {
			return false
		}
	}
	return true
}

// blankRecord reports whether every field of a record is empty once trimmed.
func blankRecord(rec []string) bool {
	for _, f := range rec {
		if strings.TrimFunc(f, isSpace) != "" {
			return false
		}
	}
	return true
}

// expectedRecords gives the line numbers of the records a reader must
// return: every non-blank record after the first non-blank one, the header.
// The delimiter is the one of comma, semicolon and tab used most (outside
// quotes) on the first line with any content, comma on a tie, as
// newCSVSource documents. Text without quotes is split into lines here;
// text with quotes is split into records by encoding/csv, every record it
// refuses counting as one; a NUL byte is content like any other (the
// reader reads its cell as blank but flags the row). It is meant for a file
// the reader did not refuse (as UTF-16, or not text).
func expectedRecords(data []byte) (rows []int, ok bool) {
	data = bytes.TrimPrefix(data, []byte{0xEF, 0xBB, 0xBF})
	lines := csvLines(data)
	delim := ','
	for _, l := range lines {
		if strings.TrimFunc(l, func(r rune) bool { return isSpace(r) || r == ',' || r == ';' }) == "" {
			continue
		}
		counts := map[rune]int{}
		quoted := false
		for _, r := range l {
			switch {
			case r == '"':
				quoted = !quoted
			case !quoted:
				counts[r]++
			}
		}
		for _, d := range []rune{';', '\t'} {
			if counts[d] > counts[delim] {
				delim = d
			}
		}
		break
	}
	if bytes.IndexByte(data, '"') >= 0 {
		return csvRecords(strings.Join(lines, "\n"), delim)
	}
	header := false
	for i, l := range lines {
		if blankUnder(l, delim) {
			continue
		}
		if !header {
			header = true
			continue
		}
		rows = append(rows, i+1)
	}
	return rows, true
}

// csvRecords lists the starting lines of the non-blank records of text
// after the header, as encoding/csv splits it.
func csvRecords(text string, delim rune) (rows []int, ok bool) {
	r := csv.NewReader(strings.NewReader(text))
	r.Comma, r.FieldsPerRecord = delim, -1
	header := false
	for {
		rec, err := r.Read()
		if err == io.EOF {
			return rows, true
		}
		row := 0
		var pe *csv.ParseError
		switch {
		case errors.As(err, &pe):
			row = pe.StartLine
		case err != nil:
			return nil, false
		case blankRecord(rec):
			continue
		default:
			row, _ = r.FieldPos(0)
		}
		if !header {
			header = true
			continue
		}
		rows = append(rows, row)
	}
}

// checkPlaced checks that a problem names its file (and row, when the row
// is known) and, when a cell could not be parsed, its column, and that its
// message starts with that position.
func checkPlaced(t *testing.T, p *CellError, file string, row int) {
	t.Helper()
	if p == nil || p.Err == nil {
		t.Fatalf("a nil problem or a problem without an error: %#v", p)
	}
	if p.File != file {
		t.Errorf("problem %q names file %q, want %q", p.Error(), p.File, file)
	}
	if row > 0 && p.Row != row {
		t.Errorf("problem %q is on row %d, want the record's row %d", p.Error(), p.Row, row)
	}
	if !strings.HasPrefix(p.Error(), p.Position.String()+": ") {
		t.Errorf("problem %q does not start with its position %q", p.Error(), p.Position.String())
	}
	var pe *ParseError
	if errors.As(p.Err, &pe) && p.Column == "" {
		t.Errorf("problem %q is about a cell (%q) but names no column", p.Error(), pe.Text)
	}
}

// checkRefusal checks the error of an input that was refused as a whole:
// one of the kinds a caller can tell apart, naming the file.
func checkRefusal(t *testing.T, err error, names []string, kinds ...error) {
	t.Helper()
	known := false
	for _, k := range kinds {
		known = known || errors.Is(err, k)
	}
	named := false
	for _, n := range names {
		named = named || strings.Contains(err.Error(), n)
	}
	if !known || !named {
		t.Fatalf("refused with %q, want one of %v naming one of %q", err, kinds, names)
	}
}

// checkRows compares the rows of the records read with the rows expected.
func checkRows(t *testing.T, what string, got []int, data []byte) {
	t.Helper()
	want, ok := expectedRecords(data)
	if !ok {
		for i := 1; i < len(got); i++ {
			if got[i] <= got[i-1] {
				t.Fatalf("%s: rows %v are not increasing", what, got)
			}
		}
		return
	}
	if len(got) != len(want) {
		t.Fatalf("%s: %d records on rows %v, want %d on rows %v (one per non-blank record after the header)", what, len(got), got, len(want), want)
	}
	for i := range got {
		if got[i] != want[i] {
			t.Fatalf("%s: record rows %v, want %v", what, got, want)
		}
	}
}

const (
	seedCoefficients = "study,label,measure,estimate,ci_low,ci_high,se,p,n\n" +
		"s,a,b,0.43,0.12,0.74,,p < .01,120\n" +
		"s,b,r,.21*,,,,,3\n" +
		"s,c,or,1.5,\"[1.1, 2.0]\",,-0.1,,\n"
	seedClaims = "study,claim,first,second,published,basis,alpha\n" +
		"s,c1,a,b,differ,test,5%\n\n" +
		"s,c2,a,a,maybe,,2\r\n" +
		"s,c3,a,c\rs,c4"
)

func FuzzReadFolder(f *testing.F) {
	f.Add([]byte(seedCoefficients), []byte(seedClaims))
	f.Fuzz(func(t *testing.T, coefficients, claims []byte) {
		dir := t.TempDir()
		coefPath := filepath.Join(dir, "coefficients.csv")
		claimPath := filepath.Join(dir, "claims.csv")
		if err := os.WriteFile(coefPath, coefficients, 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(claimPath, claims, 0o644); err != nil {
			t.Fatal(err)
		}
		in, err := Read(dir)
		if err != nil {
			checkRefusal(t, err, []string{coefPath, claimPath}, ErrUnsupportedInput, ErrInputTooLarge)
			return
		}
		for _, p := range in.Problems {
			if p.File != coefPath && p.File != claimPath {
				t.Errorf("sheet problem %q names neither CSV file", p.Error())
			}
			checkPlaced(t, p, p.File, 0)
		}
		rows := make([]int, len(in.Coefficients))
		for i, c := range in.Coefficients {
			rows[i] = c.Row
			if c.File != coefPath {
				t.Errorf("coefficient on row %d names file %q, want %q", c.Row, c.File, coefPath)
			}
			for _, p := range c.Problems {
				checkPlaced(t, p, coefPath, c.Row)
			}
		}
		checkRows(t, "coefficients.csv", rows, coefficients)
		rows = make([]int, len(in.Claims))
		for i, c := range in.Claims {
			rows[i] = c.Row
			if c.File != claimPath {
				t.Errorf("claim on row %d names file %q, want %q", c.Row, c.File, claimPath)
			}
			if !(c.Alpha > 0 && c.Alpha < 1) {
				t.Errorf("claim on row %d has alpha %v, want a level in (0, 1)", c.Row, c.Alpha)
			}
			for _, p := range c.Problems {
				checkPlaced(t, p, claimPath, c.Row)
			}
		}
		checkRows(t, "claims.csv", rows, claims)
	})
}

const seedTable = "Table 2. Correlations\nstudy,demo\nn,100\n" +
	"variable,n,mean,sd,1,2,3\n" +
	"1. A,120,3.1,0.8,—,,\n" +
	"2. B,,2.7,0.9,.45**,—,\n" +
	"3. C,80,6.5,-1,−.30,1.2,(.9)\n\nNote. invented\n"

func FuzzReadTable(f *testing.F) {
	f.Add([]byte(seedTable))
	f.Fuzz(func(t *testing.T, data []byte) {
		const name = "table T.csv"
		src, err := newCSVSource(bytes.NewReader(data), name, nil)
		if err != nil {
			checkRefusal(t, err, []string{name}, ErrUnsupportedInput, ErrInputTooLarge)
			return
		}
		tb, err := readTableSheet(src, Position{File: name}, "T")
		if err != nil {
			checkRefusal(t, err, []string{name}, ErrInputTooLarge)
			return
		}
		for _, p := range tb.Problems {
			checkPlaced(t, p, name, 0)
		}
		k := len(tb.Variables)
		if k == 0 {
			if len(tb.Problems) == 0 {
				t.Fatalf("a table without variables and without a problem")
			}
			return
		}
		if len(tb.R) != k || len(tb.N) != k || len(tb.Mean) != k || len(tb.SD) != k {
			t.Fatalf("%d variables but R %d, N %d, Mean %d, SD %d", k, len(tb.R), len(tb.N), len(tb.Mean), len(tb.SD))
		}
		absent, noN := 0, 0
		for i := range tb.R {
			if len(tb.R[i]) != k || tb.R[i][i].Value != 1 {
				t.Fatalf("R row %d = %v, want %d values with 1 on the diagonal", i, tb.R[i], k)
			}
			for j := range tb.R[i] {
				a, b := tb.R[i][j], tb.R[j][i]
				if a.Bound != b.Bound || a.Value != b.Value {
					t.Fatalf("R[%d][%d] = %+v but R[%d][%d] = %+v, want a symmetric matrix", i, j, a, j, i, b)
				}
				if a.Present() && !(math.Abs(a.Value) <= 1) {
					t.Fatalf("R[%d][%d] = %v, outside [−1, 1]", i, j, a.Value)
				}
				if j > i && !a.Present() {
					absent++
				}
			}
			if !tb.N[i].Present() {
				noN++
			} else if !(tb.N[i].Value > 0) || tb.N[i].Value != math.Trunc(tb.N[i].Value) {
				t.Fatalf("N[%d] = %v, want a positive whole number", i, tb.N[i].Value)
			}
		}
		if got := countProblems(tb.Problems, ErrMissingValue, "no correlation is printed for"); got != absent {
			t.Errorf("%d pairs not printed but %d problems saying so:%s", absent, got, problemTexts(tb.Problems))
		}
		if got := countProblems(tb.Problems, ErrMissingValue, ": no n for "); got != noN {
			t.Errorf("%d variables without n but %d problems saying so:%s", noN, got, problemTexts(tb.Problems))
		}
	})
}

// countProblems counts the problems wrapping target whose message holds text.
func countProblems(problems []*CellError, target error, text string) int {
	n := 0
	for _, p := range problems {
		if errors.Is(p, target) && strings.Contains(p.Error(), text) {
			n++
		}
	}
	return n
}

const seedPaired = "study,claim,published,measure,first_estimate,first_ci,first_n,second_label,second_estimate,second_se\n" +
	"s,c1,differ,b,0.50,\"(.1–.9)\",120,x,0.20,0.10\n" +
	"s,c1,no-difference,r,1.5,,2,first,,\n,,,,,,,,,\n"

func FuzzPairedReader(f *testing.F) {
	f.Add([]byte(seedPaired))
	f.Fuzz(func(t *testing.T, data []byte) {
		const name = "paired.csv"
		pr, err := NewPairedReader(bytes.NewReader(data), name)
		if err != nil {
			checkRefusal(t, err, []string{name}, ErrUnsupportedInput, ErrMissingColumn, ErrInputTooLarge)
			return
		}
		for _, p := range pr.Problems() {
			checkPlaced(t, p, name, 0)
		}
		var rows []int
		for {
			pc, err := pr.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				checkRefusal(t, err, []string{name}, ErrInputTooLarge)
				return
			}
			row := pc.Claim.Row
			rows = append(rows, row)
			if pc.First.Row != row || pc.Second.Row != row {
				t.Fatalf("claim row %d has coefficients on rows %d and %d", row, pc.First.Row, pc.Second.Row)
			}
			if pc.Claim.First != pc.First.Label || pc.Claim.Second != pc.Second.Label {
				t.Fatalf("claim row %d names %q and %q, its coefficients are %q and %q", row, pc.Claim.First, pc.Claim.Second, pc.First.Label, pc.Second.Label)
			}
			if pc.First.Label == pc.Second.Label && !hasProblem(pc.Claim.Problems, ErrDuplicate, "both") {
				t.Fatalf("claim row %d has two coefficients labelled %q and no problem", row, pc.First.Label)
			}
			for _, ps := range [][]*CellError{pc.Claim.Problems, pc.First.Problems, pc.Second.Problems} {
				for _, p := range ps {
					checkPlaced(t, p, name, row)
				}
			}
		}
		checkRows(t, name, rows, data)
	})
}

const seedData = "id,x,y\nS01,1,2\nS02,NA,.5e1\n\nS03,−6,7\n"

func FuzzReadData(f *testing.F) {
	f.Add([]byte(seedData))
	f.Fuzz(func(t *testing.T, data []byte) {
		path := filepath.Join(t.TempDir(), "data.csv")
		if err := os.WriteFile(path, data, 0o644); err != nil {
			t.Fatal(err)
		}
		d, err := ReadData(path, "")
		if err != nil {
			joined, ok := err.(interface{ Unwrap() []error })
			if !ok {
				checkRefusal(t, err, []string{path}, ErrUnsupportedInput, ErrInputTooLarge, ErrMissingColumn, ErrDuplicate)
				return
			}
			errs := joined.Unwrap()
			if len(errs) == 0 || len(errs) > maxDataErrors {
				t.Fatalf("ReadData joined %d errors, want 1 to %d", len(errs), maxDataErrors)
			}
			for _, e := range errs {
				var ce *CellError
				if !errors.As(e, &ce) || ce.Row < 1 {
					t.Fatalf("ReadData error %q is not a CellError with a row", e)
				}
				checkPlaced(t, ce, path, 0)
			}
			return
		}
		if len(d.Names) != len(d.Columns) {
			t.Fatalf("%d names, %d columns", len(d.Names), len(d.Columns))
		}
		for j, c := range d.Columns {
			if len(c) != d.Rows {
				t.Fatalf("column %q has %d values, want Rows = %d", d.Names[j], len(c), d.Rows)
			}
		}
		if want, ok := expectedRecords(data); ok && d.Rows != len(want) {
			t.Fatalf("ReadData read %d rows, want %d (the non-blank lines after the header, on rows %v)", d.Rows, len(want), want)
		}
	})
}
