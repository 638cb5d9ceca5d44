package extract

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// sheetCell is one cell as a reader saw it. For a text cell (every CSV cell,
// and workbook cells holding text) Text is what was typed. For a numeric
// workbook cell Text is the stored value and Display the text the
// spreadsheet shows, from which the printed decimals are taken.
type sheetCell struct {
	Text    string
	Display string
	Numeric bool
}

// shown returns what a person sees in the cell.
func (c sheetCell) shown() string {
	if c.Numeric {
		return c.Display
	}
	return c.Text
}

// sheetRow is one row of a sheet. Row is the sheet's own row number (the
// line number on which the record starts in a CSV file). Fields is the number of fields a
// CSV record had, for the ragged-row check; 0 for a workbook, whose rows
// have no fixed width. Problem is what the reader found wrong with the row
// itself (a quote error), or nil.
type sheetRow struct {
	Row     int
	Cells   []sheetCell
	Fields  int
	Problem error
	// AfterBlank is set when blank lines, which a CSV reader skips, came
	// before this row; a correlation table ends at one.
	AfterBlank bool
}

// blank reports whether the row holds nothing.
func (r *sheetRow) blank() bool {
	if r.Problem != nil {
		return false
	}
	for _, c := range r.Cells {
		if c.Numeric || trimSpace(c.Text) != "" {
			return false
		}
	}
	return true
}

// rowSource streams the rows of one sheet. Next fills row, reusing its
// Cells, and returns io.EOF after the last row; any other error is fatal for
// the source (an input beyond the size limits, an unreadable file).
type rowSource interface {
	Next(row *sheetRow) error
	Close() error
}

// canonicalColumn folds a header name for matching: trimmed, lower-case, and
// a space or hyphen counted as an underscore ("CI low" is ci_low).
func canonicalColumn(name string) string {
	s := strings.ToLower(trimSpace(name))
	return strings.Map(func(r rune) rune {
		if r == ' ' || r == '-' || isSpace(r) {
			return '_'
		}
		return r
	}, s)
}

// columns is the header of a sheet: where each known column is, and the
// unknown ones kept in order for Extra.
type columns struct {
	pos        Position // File and Sheet; Row the header's
	names      []string // as written, trimmed
	index      map[string]int
	extra      []int
	extraNames []string
	width      int
	problems   []*CellError
}

// newColumns reads a header row. known lists the canonical names this sheet
// understands; other names go to Extra. A name given twice is a problem and
// the second copy is ignored.
func newColumns(row *sheetRow, pos Position, known map[string]bool) *columns {
	pos.Row = row.Row
	c := &columns{pos: pos, index: make(map[string]int), width: len(row.Cells)}
	if row.Problem != nil {
		// A header the reader had trouble with (a stray quote, too many
		// columns) is a problem of the sheet: no data row would show it.
		c.problems = append(c.problems, &CellError{Position: pos, Err: fmt.Errorf("the header row: %w", row.Problem)})
	}
	c.names = make([]string, len(row.Cells))
	for i, cell := range row.Cells {
		name := trimSpace(cell.shown())
		c.names[i] = name
		key := canonicalColumn(name)
		if key == "" {
			continue
		}
		if j, dup := c.index[key]; dup {
			p := pos
			p.Column = name
			c.problems = append(c.problems, &CellError{Position: p,
				Err: fmt.Errorf("column %q appears twice (columns %d and %d); the second is ignored: %w", name, j+1, i+1, ErrDuplicate)})
			continue
		}
		c.index[key] = i
		if !known[key] {
			c.extra = append(c.extra, i)
			c.extraNames = append(c.extraNames, name)
		}
	}
	return c
}

// col returns the index of a canonical column name, or −1.
func (c *columns) col(name string) int {
	if i, ok := c.index[name]; ok {
		return i
	}
	return -1
}

// require records a sheet-level problem for every required column that is
// missing and returns their names.
func (c *columns) require(names ...string) []string {
	var missing []string
	for _, n := range names {
		if c.col(n) < 0 {
			missing = append(missing, n)
			c.problems = append(c.problems, &CellError{Position: c.pos,
				Err: fmt.Errorf("the header has no column %q: %w", n, ErrMissingColumn)})
		}
	}
	return missing
}

// rowReading gathers the values and problems of one row.
type rowReading struct {
	pos      Position
	cols     *columns
	cells    []sheetCell
	problems []*CellError
}

// start prepares r for a new row, keeping nothing of the last one.
func (r *rowReading) start(cols *columns, row *sheetRow, pos Position) {
	pos.Row = row.Row
	r.pos, r.cols, r.cells, r.problems = pos, cols, row.Cells, nil
	if row.Problem != nil {
		var fe *fieldError
		if errors.As(row.Problem, &fe) {
			r.fail(fe.field, row.Problem)
		} else {
			r.problems = append(r.problems, &CellError{Position: pos, Err: row.Problem})
		}
	}
	if row.Fields > 0 && row.Fields != cols.width {
		r.problems = append(r.problems, &CellError{Position: pos,
			Err: fmt.Errorf("the row has %d fields and the header %d", row.Fields, cols.width)})
	}
}

func (r *rowReading) cell(i int) sheetCell {
	if i < 0 || i >= len(r.cells) {
		return sheetCell{}
	}
	return r.cells[i]
}

// text returns the trimmed text of column i ("" when absent). It is small
// enough to be inlined, so that the many absent columns of a row cost no
// call.
func (r *rowReading) text(i int) string {
	if i < 0 || i >= len(r.cells) {
		return ""
	}
	return r.cells[i].trimmed()
}

// trimmed returns what a person sees in the cell, trimmed.
func (c *sheetCell) trimmed() string {
	s := c.Text
	if c.Numeric {
		s = c.Display
	}
	if isTrimmed(s) {
		return s
	}
	return trimSpace(s)
}

// fail records a problem with column i (or with the row when i < 0),
// with the cell as typed.
func (r *rowReading) fail(i int, err error) {
	p := r.pos
	if i >= 0 && i < len(r.cols.names) {
		p.Column = r.cols.names[i]
	}
	r.problems = append(r.problems, &CellError{Position: p, Err: err, Text: r.text(i)})
}

// failNamed records a problem with a column named by its canonical name,
// which may be missing from the header.
func (r *rowReading) failNamed(name string, err error) {
	if i := r.cols.col(name); i >= 0 {
		r.fail(i, err)
		return
	}
	p := r.pos
	p.Column = name
	r.problems = append(r.problems, &CellError{Position: p, Err: err})
}

// numberKind selects how a cell is read as a number.
type numberKind int

const (
	kindNumber numberKind = iota // stars allowed
	kindLimit                    // no stars
	kindCount                    // n and df: thousands separators
	kindP                        // p-values
)

// number reads column i as a number of the given kind; a problem leaves an
// Absent value.
func (r *rowReading) number(i int, kind numberKind) Printed {
	var p Printed
	r.numberInto(&p, i, kind)
	return p
}

// numberInto is number writing into dst, which must be the zero Printed
// (Absent); a problem is recorded and leaves dst Absent.
func (r *rowReading) numberInto(dst *Printed, i int, kind numberKind) {
	if i < 0 || i >= len(r.cells) {
		return // a missing column reads as a blank cell
	}
	c := &r.cells[i]
	if !c.Numeric && c.trimmed() == "" {
		// Blank, Absent, as cellNumber would read it. Most cells of a wide
		// paired CSV are blank, and parsing them measurably slows
		// BenchmarkReconstructPairedFile.
		return
	}
	p, err := cellNumber(*c, kind)
	if err != nil {
		r.fail(i, err)
		return
	}
	*dst = p
}

// cellNumber reads a cell as a number. A text cell is parsed as written. A
// numeric cell takes its value from the stored number and its decimals from
// the displayed text, with DecimalsFromDisplay set.
func cellNumber(c sheetCell, kind numberKind) (Printed, error) {
	if !c.Numeric {
		switch kind {
		case kindLimit:
			return parsePrinted(c.Text, numberLimit, ErrMalformedNumber)
		case kindCount:
			return ParseCount(c.Text)
		case kindP:
			return ParseP(c.Text)
		}
		return ParseNumber(c.Text)
	}
	v, err := strconv.ParseFloat(trimSpace(c.Text), 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return Printed{}, &ParseError{Text: c.Display, Kind: ErrMalformedNumber, Reason: "the workbook's stored value is not a number"}
	}
	dec, reason := displayDecimals(c.Display, v)
	if reason != "" {
		return Printed{}, &ParseError{Text: c.Display, Kind: ErrMalformedNumber, Reason: reason}
	}
	p := Printed{Value: v, Decimals: int32(dec), Bound: Exact, DecimalsFromDisplay: true, Text: trimSpace(c.Display)}
	if kind == kindP && (v < 0 || v > 1) {
		return Printed{}, &ParseError{Text: p.Text, Kind: ErrMalformedP, Reason: "a p-value must lie between 0 and 1"}
	}
	return p, nil
}

// displayDecimals counts the decimals a numeric cell shows: "0.40" has 2,
// "4.0E-01" has 2, "40.0%" has 3 (0.400). The spreadsheet always writes a
// decimal point and groups thousands with commas in this text. It returns −1
// when the text shows no plain number (a currency or custom format), and a
// reason when the cell is formatted as a date or time, which no printed
// statistic is.
func displayDecimals(display string, v float64) (int, string) {
	s := trimSpace(display)
	if looksLikeDate(s) {
		return 0, "the cell is formatted as a date or time"
	}
	pct := 0
	if strings.HasSuffix(s, "%") {
		pct = 2
		s = trimSpace(strings.TrimSuffix(s, "%"))
	}
	exp := 0
	if i := strings.IndexAny(s, "eE"); i >= 0 {
		n, ok := parseExponent(s[i+1:])
		if !ok {
			return -1, ""
		}
		exp, s = n, s[:i]
	}
	s = strings.TrimPrefix(strings.TrimPrefix(s, "-"), "+")
	s = strings.ReplaceAll(s, ",", "")
	frac := 0
	if i := strings.IndexByte(s, '.'); i >= 0 {
		frac = len(s) - i - 1
	}
	shown, err := strconv.ParseFloat(s, 64)
	if err != nil || s == "" {
		return -1, ""
	}
	dec := frac + pct - exp
	if dec < 0 {
		return -1, ""
	}
	// The shown text must round the stored value; otherwise the format
	// scales it (thousands, custom text) and its decimals say nothing.
	shown = shown * math.Pow(10, float64(exp-pct))
	if math.Abs(math.Abs(v)-shown) > 0.5*math.Pow(10, -float64(dec))*(1+1e-9)+1e-15*math.Abs(v) {
		return -1, ""
	}
	return dec, ""
}

// looksLikeDate reports a displayed date or time: "1/2/20", "06:00",
// "01-02-20", "2-Jan-20" (a slash, a colon, or a dash after a digit).
func looksLikeDate(s string) bool {
	if strings.ContainsAny(s, "/:") {
		return true
	}
	for i := 1; i < len(s); i++ {
		if s[i] == '-' && s[i-1] >= '0' && s[i-1] <= '9' {
			return true
		}
	}
	return false
}
