package extract

import (
	"errors"
	"strings"
	"testing"
)

func readTestTable(t *testing.T, lines ...string) CorrelationTable {
	t.Helper()
	tb, err := readTableSheet(&fakeSource{rows: csvRows(lines...)}, Position{File: "t.xlsx", Sheet: "table x"}, "x")
	if err != nil {
		t.Fatal(err)
	}
	return tb
}

// The layouts below are the ones papers print (APA Publication Manual 7th
// ed. (2020), sample correlation tables, from memory: numbered rows,
// numbered columns, the lower triangle, dashes on the diagonal); the values
// are invented for the reader and checked only for where they land.
func TestCorrelationTableLayouts(t *testing.T) {
	tests := []struct {
		name  string
		lines []string
		vars  string
		r01   float64
		r02   float64
		r12   float64
		n     []float64
	}{
		{"lower triangle numbered", []string{
			"n|100", "variable|1|2|3",
			"1. A|—", "2. B|.10|—", "3. C|.20|.30|—"},
			"A,B,C", 0.10, 0.20, 0.30, []float64{100, 100, 100}},
		{"upper triangle", []string{
			"n|100", "|1|2|3",
			"A|1|.10|.20", "B||1|.30", "C|||1"},
			"A,B,C", 0.10, 0.20, 0.30, []float64{100, 100, 100}},
		{"lower triangle without the last column", []string{
			"n|100", "variable|1|2",
			"1 A", "2 B|.10", "3 C|.20|.30"},
			"A,B,C", 0.10, 0.20, 0.30, []float64{100, 100, 100}},
		{"upper triangle without the first column", []string{
			"n|100", "variable|2|3",
			"1) A|.10|.20", "2) B|—|.30", "3) C||—"},
			"A,B,C", 0.10, 0.20, 0.30, []float64{100, 100, 100}},
		{"named columns any case", []string{
			"variable|N|SD|Mean|a|b|c",
			"A|50|1.0|2.0|1.00", "B|60|1.1|2.1|−.10|1.00", "C|70|1.2|2.2|.20|.30*|1.00"},
			"A,B,C", -0.10, 0.20, 0.30, []float64{50, 60, 70}},
		{"both triangles agreeing", []string{
			"n|100", "variable|1|2|3",
			"A|1|.10|.20", "B|.10|1|.30", "C|.20|.30|1"},
			"A,B,C", 0.10, 0.20, 0.30, []float64{100, 100, 100}},
		{"reliabilities on the diagonal", []string{
			"n|100", "variable|1|2|3",
			"1. A|(.85)", "2. B|.10|(.79)", "3. C|.20|.30|(.90)"},
			"A,B,C", 0.10, 0.20, 0.30, []float64{100, 100, 100}},
		{"title and key rows", []string{
			"Table 3. Correlations", "study|Smith 2020", "group|women", "n|1,234",
			"variable|1|2|3", "1. A|—", "2. B|.10|—", "3. C|.20|.30|—", "", "Note. invented"},
			"A,B,C", 0.10, 0.20, 0.30, []float64{1234, 1234, 1234}},
		{"n column with key n filling blanks", []string{
			"n|90", "variable|n|1|2|3",
			"1. A|80|—", "2. B||.10|—", "3. C|85|.20|.30|—"},
			"A,B,C", 0.10, 0.20, 0.30, []float64{80, 90, 85}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tb := readTestTable(t, tt.lines...)
			if len(tb.Problems) != 0 {
				t.Fatalf("problems:%s", problemTexts(tb.Problems))
			}
			if got := strings.Join(tb.Variables, ","); got != tt.vars {
				t.Errorf("variables = %s, want %s", got, tt.vars)
			}
			r := tb.R
			if r[0][1].Value != tt.r01 || r[1][0].Value != tt.r01 || r[0][2].Value != tt.r02 || r[2][0].Value != tt.r02 ||
				r[1][2].Value != tt.r12 || r[2][1].Value != tt.r12 || r[0][0].Value != 1 || r[2][2].Value != 1 {
				t.Errorf("R = %v, want r01 %v r02 %v r12 %v, symmetric, 1 on the diagonal", tableValues(tb), tt.r01, tt.r02, tt.r12)
			}
			for i, n := range tt.n {
				if tb.N[i].Value != n {
					t.Errorf("N[%d] = %v, want %v", i, tb.N[i].Value, n)
				}
			}
		})
	}
}

func TestCorrelationTableKeys(t *testing.T) {
	tb := readTestTable(t, "study|Smith 2020", "group|women", "n|100", "variable|1|2", "1. A|—", "2. B|.45**|—")
	if tb.Study != "Smith 2020" || tb.Group != "women" || tb.Name != "x" || tb.R[0][1].Stars != 2 {
		t.Errorf("table = study %q group %q name %q stars %d, want Smith 2020, women, x, 2", tb.Study, tb.Group, tb.Name, tb.R[0][1].Stars)
	}
	tb = readTestTable(t, "n|100", "variable|1|2", "1. A|—", "2. B|.45|—")
	if tb.Study != "x" || tb.Group != "" {
		t.Errorf("table without key rows: study %q group %q, want the sheet name x and no group", tb.Study, tb.Group)
	}
}

func TestCorrelationTableProblems(t *testing.T) {
	tests := []struct {
		name   string
		lines  []string
		target error
		text   string
		row    int
		column string
	}{
		{"triangles disagree", []string{"n|100", "variable|1|2", "A|1|.45", "B|.47|1"}, ErrDuplicate,
			`.47 (row 4, column "1") and .45 (row 3, column "2")`, 4, "1"},
		{"pair missing", []string{"n|100", "variable|1|2|3", "1. A|—", "2. B|.10|—", "3. C||.30|—"}, ErrMissingValue,
			"no correlation is printed for A and C", 5, "1"},
		{"r above one", []string{"n|100", "variable|1|2", "1. A|—", "2. B|1.45|—"}, ErrOutOfRange, "between −1 and 1", 4, "1"},
		{"not a number", []string{"n|100", "variable|1|2", "1. A|—", "2. B|.4.5|—"}, ErrMalformedNumber, `".4.5" is not a number`, 4, "1"},
		{"no n", []string{"variable|1|2", "1. A|—", "2. B|.45|—"}, ErrMissingValue, "no n for A", 2, ""},
		{"bad diagonal", []string{"n|100", "variable|1|2", "1. A|.5", "2. B|.45|—"}, ErrUnknownValue, "diagonal", 3, "1"},
		{"no header", []string{"n|100", "1. A|x|y"}, ErrUnknownValue, "expected a key row", 2, ""},
		{"unmatched head", []string{"n|100", "variable|1|2|9", "1. A|—", "2. B|.45|—"}, ErrUnknownValue, `column head "9"`, 2, "9"},
		{"value under no head", []string{"n|100", "variable|1|2", "1. A|—", "2. B|.45|—|.3"}, ErrUnknownValue, "under no column head", 4, ""},
		{"n not whole", []string{"n|100.5", "variable|1|2", "1. A|—", "2. B|.45|—"}, ErrOutOfRange, "whole number", 1, "n"},
		{"header but no rows", []string{"n|100", "variable|1|2"}, ErrMissingValue, "no variable rows", 2, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tb := readTestTable(t, tt.lines...)
			found := false
			for _, p := range tb.Problems {
				if (tt.target == nil || errors.Is(p, tt.target)) && strings.Contains(p.Error(), tt.text) && p.Row == tt.row && p.Column == tt.column {
					found = true
				}
			}
			if !found {
				t.Errorf("problems:%s\nwant %v saying %q at row %d, column %q", problemTexts(tb.Problems), tt.target, tt.text, tt.row, tt.column)
			}
		})
	}
	tb := readTestTable(t)
	if !hasProblem(tb.Problems, ErrMissingValue, "no header row") {
		t.Errorf("empty table problems:%s, want no header row", problemTexts(tb.Problems))
	}
}

// TestCorrelationTableWorkbook reads a table sheet whose correlations are
// numeric cells, as a table pasted into a spreadsheet often has.
func TestCorrelationTableWorkbook(t *testing.T) {
	dir := t.TempDir()
	path := writeWorkbook(t, dir, "table.xlsx",
		xsheet{"claims", [][]xcell{claimHeader}},
		xsheet{"table study A", [][]xcell{
			xrow("n", "200"),
			xcells(xtxt("variable"), xnum(1, 0), xnum(2, 0)),
			xcells(xtxt("1. A"), xnum(1, 2)),
			xcells(xtxt("2. B"), xnum(0.45, 2), xnum(1, 2)),
		}})
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Tables) != 1 {
		t.Fatalf("got %d tables, want 1", len(in.Tables))
	}
	tb := in.Tables[0]
	if len(tb.Problems) != 0 || tb.Name != "study A" || tb.R[0][1].Value != 0.45 || tb.R[0][1].Decimals != 2 || !tb.R[0][1].DecimalsFromDisplay || tb.N[0].Value != 200 {
		t.Errorf("table = %+v%s, want study A with r .45 (2 decimals shown) and n 200", tb, problemTexts(tb.Problems))
	}
}
