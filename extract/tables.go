package extract

import (
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
)

// maxTableVariables bounds a correlation table; papers print a few dozen at
// most, and the matrix grows with the square.
const maxTableVariables = 200

// TablePrefix starts the name of a sheet (or CSV file) holding one
// correlation table laid out as printed: "table 2", "Table Study A".
const TablePrefix = "table "

// tableName returns the part of a sheet or file name after "table ", and
// whether the name starts so (case-insensitive).
func tableName(sheet string) (string, bool) {
	s := trimSpace(sheet)
	if len(s) < len(TablePrefix) || !strings.EqualFold(s[:len(TablePrefix)], TablePrefix) {
		return "", false
	}
	return trimSpace(s[len(TablePrefix):]), true
}

// numberedLabel matches row labels such as "1. Anxiety", "1 Anxiety" and
// "2) Stress", capturing the number and the name.
var numberedLabel = regexp.MustCompile(`^(\d{1,3})(?:[.):]\s*|\s+)(\S.*)$`)

// tableRow is one variable row of a table, its cells copied.
type tableRow struct {
	row   int
	label string
	name  string
	num   int
	cells []sheetCell
}

// readTableSheet reads a correlation table laid out as papers print it:
//
//	study   | Smith 2020            (optional key rows: study, group, n)
//	group   | women
//	variable| n  | mean | sd  | 1    | 2    | 3
//	1. Anxiety | 120 | 3.1 | 0.8 | —  |      |
//	2. Stress  | 118 | 2.7 | 0.9 | .45** | — |
//	3. Sleep   | 120 | 6.5 | 1.2 | −.30 | −.22* | —
//
// The header row's first cell is "variable" or blank; n, mean and sd columns
// are optional and may come in any order; the other columns are the
// variables, by name or by number (1, 2, … refer to the numbered rows, or to
// the rows in order). Either triangle may be printed, or both when they
// agree; the diagonal may be blank, a dash or 1, or hold a reliability in
// parentheses, which is ignored. A blank row ends the table (notes below it
// are ignored, as is everything from a row starting "Note"). Without a study key row the study is name (the sheet name
// after "table ") and the group is blank. n comes from the n column, per
// variable, and where that is blank or absent from a key row "n".
//
// Problems with the layout (|r| > 1, a pair printed twice and differently, a
// pair not printed, no n) go to the table's Problems; positive definiteness
// is left to the statistics.
func readTableSheet(src rowSource, pos Position, name string) (CorrelationTable, error) {
	t := CorrelationTable{Position: pos, Name: name, Study: name}
	fail := func(row int, column string, err error) {
		p := pos
		p.Row, p.Column = row, column
		t.Problems = append(t.Problems, &CellError{Position: p, Err: err})
	}
	var (
		row        sheetRow
		header     []string
		headerRow  int
		keyN       = Printed{Bound: Absent}
		rows       []tableRow
		ended      bool
		studyGiven bool
	)
	for {
		err := src.Next(&row)
		if err == io.EOF {
			break
		}
		if err != nil {
			return t, err
		}
		if ended {
			continue
		}
		if row.Problem != nil {
			fail(row.Row, "", row.Problem)
		}
		first := ""
		if len(row.Cells) > 0 {
			first = trimSpace(row.Cells[0].shown())
		}
		if len(rows) > 0 && (row.AfterBlank || row.blank() || isNoteLabel(first)) {
			ended = true
			continue
		}
		if row.blank() {
			continue
		}
		if header == nil {
			second := ""
			if len(row.Cells) > 1 {
				second = trimSpace(row.Cells[1].shown())
			}
			switch canonicalColumn(first) {
			case "study":
				t.Study, studyGiven = second, true
				continue
			case "group":
				t.Group = second
				continue
			case "n":
				c := sheetCell{}
				if len(row.Cells) > 1 {
					c = row.Cells[1]
				}
				p, err := cellNumber(c, kindCount)
				if err == nil {
					p, err = checkSampleSize(p)
				}
				if err != nil {
					fail(row.Row, first, err) // the key, as written, names the cell
				} else {
					keyN = p
				}
				continue
			case "variable", "variables", "":
				header = make([]string, len(row.Cells))
				for i, c := range row.Cells {
					header[i] = trimSpace(c.shown())
				}
				headerRow = row.Row
				continue
			}
			if nonBlankCells(&row) > 1 {
				fail(row.Row, "", fmt.Errorf("expected a key row (study, group or n) or the header row, whose first cell is \"variable\" or blank; the row is ignored: %w", ErrUnknownValue))
			}
			continue // a title row
		}
		cells := make([]sheetCell, len(row.Cells))
		copy(cells, row.Cells)
		tr := tableRow{row: row.Row, label: first, name: first, cells: cells}
		if m := numberedLabel.FindStringSubmatch(first); m != nil {
			tr.num, _ = strconv.Atoi(m[1])
			tr.name = trimSpace(m[2])
		}
		rows = append(rows, tr)
	}
	if studyGiven && t.Study == "" {
		fail(0, "", fmt.Errorf("the study key row gives no study: %w", ErrMissingValue))
		t.Study = name
	}
	if header == nil {
		fail(0, "", fmt.Errorf("no header row (first cell \"variable\" or blank, then the variables): %w", ErrMissingValue))
		return t, nil
	}
	if len(rows) == 0 {
		fail(headerRow, "", fmt.Errorf("the table has a header but no variable rows: %w", ErrMissingValue))
		return t, nil
	}
	if len(rows) > maxTableVariables {
		fail(headerRow, "", fmt.Errorf("%d variables; at most %d are read: %w", len(rows), maxTableVariables, ErrInputTooLarge))
		return t, nil
	}
	k := len(rows)
	t.Variables = make([]string, k)
	for i, r := range rows {
		t.Variables[i] = r.name
	}

	// Map the header's columns.
	nCol, meanCol, sdCol := -1, -1, -1
	varOf := make(map[int]int) // cell index → variable
	colOf := make([]int, k)    // variable → cell index, −1 when not printed
	for i := range colOf {
		colOf[i] = -1
	}
	for ci := 1; ci < len(header); ci++ {
		h := header[ci]
		switch canonicalColumn(h) {
		case "":
			continue
		case "n":
			nCol = ci
			continue
		case "mean", "m":
			meanCol = ci
			continue
		case "sd", "s.d.", "s.d":
			sdCol = ci
			continue
		}
		j := matchTableColumn(h, rows)
		if j < 0 {
			fail(headerRow, h, fmt.Errorf("column head %q matches no variable row: %w", h, ErrUnknownValue))
			continue
		}
		if colOf[j] >= 0 {
			fail(headerRow, h, fmt.Errorf("columns %q and %q both refer to %s: %w", header[colOf[j]], h, t.Variables[j], ErrDuplicate))
			continue
		}
		colOf[j], varOf[ci] = ci, j
	}

	// Read the cells of the triangle(s).
	type entry struct {
		p   Printed
		row int
		col string
	}
	entries := make([][]entry, k)
	for i, r := range rows {
		entries[i] = make([]entry, k)
		for ci := 1; ci < len(r.cells); ci++ {
			c := r.cells[ci]
			text := trimSpace(c.shown())
			if text == "" {
				continue
			}
			j, ok := varOf[ci]
			if !ok {
				if ci >= len(header) || header[ci] == "" {
					fail(r.row, "", fmt.Errorf("a value (%q) under no column head: %w", text, ErrUnknownValue))
				}
				continue
			}
			if i == j {
				if !isDiagonalText(c) {
					fail(r.row, header[ci], fmt.Errorf("a diagonal cell should be blank, a dash, 1 or a reliability in parentheses, not %q: %w", text, ErrUnknownValue))
				}
				continue
			}
			if isDashText(text) {
				continue
			}
			p, err := cellNumber(c, kindNumber)
			if err != nil {
				fail(r.row, header[ci], err)
				continue
			}
			if math.Abs(p.Value) > 1 {
				fail(r.row, header[ci], fmt.Errorf("a correlation lies between −1 and 1 (%s): %w", p.Text, ErrOutOfRange))
				continue
			}
			entries[i][j] = entry{p: p, row: r.row, col: header[ci]}
		}
	}
	t.R = make([][]Printed, k)
	for i := range t.R {
		t.R[i] = make([]Printed, k)
		t.R[i][i] = Printed{Value: 1, Decimals: -1, Bound: Exact, Text: "1"}
	}
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			lower, upper := entries[j][i], entries[i][j]
			switch {
			case lower.p.Present() && upper.p.Present():
				if lower.p.Value != upper.p.Value {
					fail(lower.row, lower.col, fmt.Errorf("the correlation of %s and %s is printed twice and differently: %s (row %d, column %q) and %s (row %d, column %q); the first is used: %w",
						t.Variables[i], t.Variables[j], lower.p.Text, lower.row, lower.col, upper.p.Text, upper.row, upper.col, ErrDuplicate))
				}
				t.R[i][j], t.R[j][i] = lower.p, lower.p
			case lower.p.Present():
				t.R[i][j], t.R[j][i] = lower.p, lower.p
			case upper.p.Present():
				t.R[i][j], t.R[j][i] = upper.p, upper.p
			default:
				col := ""
				if colOf[i] >= 0 {
					col = header[colOf[i]]
				}
				fail(rows[j].row, col, fmt.Errorf("no correlation is printed for %s and %s: %w", t.Variables[i], t.Variables[j], ErrMissingValue))
				t.R[i][j], t.R[j][i] = Printed{Bound: Absent}, Printed{Bound: Absent}
			}
		}
	}

	// n, mean and sd per variable.
	t.N, t.Mean, t.SD = make([]Printed, k), make([]Printed, k), make([]Printed, k)
	for i, r := range rows {
		get := func(ci int, kind numberKind) Printed {
			if ci < 0 || ci >= len(r.cells) || trimSpace(r.cells[ci].shown()) == "" {
				return Printed{Bound: Absent}
			}
			p, err := cellNumber(r.cells[ci], kind)
			if err != nil {
				fail(r.row, header[ci], err)
				return Printed{Bound: Absent}
			}
			return p
		}
		n, err := checkSampleSize(get(nCol, kindCount))
		if err != nil {
			fail(r.row, header[nCol], err)
			n = Printed{Bound: Absent}
		}
		t.N[i] = n
		if !t.N[i].Present() {
			t.N[i] = keyN
		}
		t.Mean[i] = get(meanCol, kindLimit)
		t.SD[i] = get(sdCol, kindLimit)
		if t.SD[i].Present() && !(t.SD[i].Value > 0) {
			fail(r.row, header[sdCol], fmt.Errorf("an SD must be positive (%s): %w", t.SD[i].Text, ErrOutOfRange))
		}
	}
	for i := range t.N {
		if !t.N[i].Present() {
			fail(rows[i].row, "", fmt.Errorf("no n for %s: add an n column or a key row \"n\" above the header: %w", t.Variables[i], ErrMissingValue))
		}
	}
	return t, nil
}

// matchTableColumn finds the variable row a column head refers to: by
// number ("2", "(2)", "2.") to the row numbered so, or to the second row
// when the rows are not numbered; by name otherwise.
func matchTableColumn(h string, rows []tableRow) int {
	num := strings.TrimSuffix(strings.TrimSuffix(strings.TrimPrefix(h, "("), ")"), ".")
	if n, err := strconv.Atoi(trimSpace(num)); err == nil {
		numbered := false
		for j, r := range rows {
			if r.num > 0 {
				numbered = true
				if r.num == n {
					return j
				}
			}
		}
		if !numbered && n >= 1 && n <= len(rows) {
			return n - 1
		}
		if numbered {
			return -1
		}
	}
	for j, r := range rows {
		if strings.EqualFold(h, r.name) || strings.EqualFold(h, r.label) {
			return j
		}
	}
	if m := numberedLabel.FindStringSubmatch(h); m != nil {
		for j, r := range rows {
			if strings.EqualFold(trimSpace(m[2]), r.name) {
				return j
			}
		}
	}
	return -1
}

// isDashText reports a lone dash, printed for "not applicable".
func isDashText(s string) bool {
	switch s {
	case "-", "—", "–", "−", "‒":
		return true
	}
	return false
}

// isDiagonalText accepts what papers print on the diagonal.
func isDiagonalText(c sheetCell) bool {
	s := trimSpace(c.shown())
	if isDashText(s) {
		return true
	}
	if strings.HasPrefix(s, "(") && strings.HasSuffix(s, ")") {
		_, err := ParseNumber(s[1 : len(s)-1])
		return err == nil
	}
	p, err := cellNumber(c, kindLimit)
	return err == nil && p.Value == 1
}

// isNoteLabel recognizes the note printed under a table ("Note.", "Notes:").
func isNoteLabel(s string) bool {
	s = strings.ToLower(s)
	return strings.HasPrefix(s, "note.") || strings.HasPrefix(s, "note:") || strings.HasPrefix(s, "notes") || s == "note"
}

// nonBlankCells counts the cells with something in them.
func nonBlankCells(r *sheetRow) int {
	n := 0
	for _, c := range r.Cells {
		if c.Numeric || trimSpace(c.Text) != "" {
			n++
		}
	}
	return n
}
