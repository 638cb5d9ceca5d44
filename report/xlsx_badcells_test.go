package report

import (
	"bytes"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestIssue20XLSXKeepsBadCellsAsTyped: a cell the reader could not read
// used to be left blank on the xlsx report's input sheets, its problem in
// a column at the row's end. The cell now keeps what was typed, marked in
// red, with the problem as its comment; the good cells stay as they were.
func TestIssue20XLSXKeepsBadCellsAsTyped(t *testing.T) {
	path := filepath.Join("..", "extract", "testdata", "folder")
	var buf bytes.Buffer
	if _, err := Check(path, &buf, "xlsx", Options{TempDir: t.TempDir()}); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(&buf)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for _, tt := range []struct {
		sheet     string
		sourceRow int
		column    string
		typed     string
		problem   string
	}{
		{"coefficients", 8, "estimate", "0.4.3", "not a number"},
		{"coefficients", 8, "se", "-1", "cannot be negative"},
		{"coefficients", 8, "p", "p < 0", "not a p-value"},
		{"claims", 7, "published", "maybe", "not a published value"},
		{"claims", 7, "alpha", "1.5", "alpha must lie strictly between 0 and 1"},
	} {
		t.Run(tt.sheet+"/"+tt.column, func(t *testing.T) {
			cell := findInputCell(t, f, tt.sheet, tt.sourceRow, tt.column)
			if got, _ := f.GetCellValue(tt.sheet, cell); got != tt.typed {
				t.Errorf("%s!%s = %q, want %q as typed", tt.sheet, cell, got, tt.typed)
			}
			id, _ := f.GetCellStyle(tt.sheet, cell)
			st, _ := f.GetStyle(id)
			if st == nil || len(st.Fill.Color) == 0 || !strings.EqualFold(st.Fill.Color[0], "FFC7CE") {
				t.Errorf("%s!%s is not marked as a bad cell: style %+v", tt.sheet, cell, st)
			}
			comments, err := f.GetComments(tt.sheet)
			if err != nil {
				t.Fatal(err)
			}
			found := false
			for _, c := range comments {
				if c.Cell == cell && strings.Contains(commentText(c), tt.problem) {
					found = true
				}
			}
			if !found {
				t.Errorf("%s!%s has no comment saying %q (comments %+v)", tt.sheet, cell, tt.problem, comments)
			}
		})
	}
	// A good cell of the same row is plain text, unmarked.
	cell := findInputCell(t, f, "coefficients", 8, "label")
	id, _ := f.GetCellStyle("coefficients", cell)
	if st, _ := f.GetStyle(id); st != nil && len(st.Fill.Color) > 0 {
		t.Errorf("the good cell %s is marked: %+v", cell, st.Fill)
	}
}

// findInputCell returns the cell of column on the row of an input sheet
// whose source_row is sourceRow.
func findInputCell(t *testing.T, f *excelize.File, sheet string, sourceRow int, column string) string {
	t.Helper()
	rows, err := f.GetRows(sheet)
	if err != nil || len(rows) == 0 {
		t.Fatalf("sheet %s: %v", sheet, err)
	}
	col, src := -1, -1
	for i, h := range rows[0] {
		switch h {
		case column:
			col = i
		case "source_row":
			src = i
		}
	}
	if col < 0 || src < 0 {
		t.Fatalf("sheet %s has no column %q or source_row: %q", sheet, column, rows[0])
	}
	for r, row := range rows[1:] {
		if src < len(row) && row[src] == strconv.Itoa(sourceRow) {
			name, _ := excelize.CoordinatesToCellName(col+1, r+2)
			return name
		}
	}
	t.Fatalf("sheet %s has no row from source row %d", sheet, sourceRow)
	return ""
}

func commentText(c excelize.Comment) string {
	s := c.Text
	for _, p := range c.Paragraph {
		s += p.Text
	}
	return s
}

// TestIssue20XLSXDecimals: on the claims sheet the difference and its
// interval are shown to the claim's decimals (the printed decimals plus
// one, worked out from the input's text by expectedDecimals), as a ratio
// of ratios for ratio measures, while the cell holds the full value.
func TestIssue20XLSXDecimals(t *testing.T) {
	in := demoInput(t)
	want := expectedDecimals(in)
	rep, _ := demoReport(t)
	f, err := excelize.OpenReader(bytes.NewReader(writeInput(t, "xlsx", in)))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	checked := 0
	for i := range rep.Claims {
		c := &rep.Claims[i]
		if !c.Difference.Known() {
			continue
		}
		cell := findInputCell(t, f, "claims", c.Row, "difference")
		id, _ := f.GetCellStyle("claims", cell)
		st, _ := f.GetStyle(id)
		format := "0." + strings.Repeat("0", want[c.Row])
		if st == nil || st.CustomNumFmt == nil || *st.CustomNumFmt != format {
			t.Errorf("claims row %d: difference cell %s format %v, want %s", c.Row, cell, st.CustomNumFmt, format)
		}
		raw, _ := f.GetCellValue("claims", cell, excelize.Options{RawCellValue: true})
		v, err := strconv.ParseFloat(raw, 64)
		// Excel keeps 15 significant digits (its specification limits).
		if w := c.Shown().Estimate; err != nil || math.Abs(v-w) > 1e-14*math.Abs(w) {
			t.Errorf("claims row %d: difference cell holds %q, want the full %v", c.Row, raw, w)
		}
		checked++
	}
	if checked < 10 {
		t.Fatalf("only %d claims checked", checked)
	}
}
