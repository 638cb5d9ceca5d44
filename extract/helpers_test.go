package extract

import (
	"errors"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// xcell is a cell of a test workbook: a string is written as text; a
// numeric cell is written as a number with the given built-in number format
// (0 General, 2 "0.00", 10 "0.00%", 14 a date; ECMA-376 Part 1 §18.8.30,
// as excelize documents its built-in formats) or the custom format code.
type xcell struct {
	text    string
	num     float64
	numeric bool
	fmtID   int
	custom  string
}

func xnum(v float64, fmtID int) xcell      { return xcell{num: v, numeric: true, fmtID: fmtID} }
func xnumFmt(v float64, code string) xcell { return xcell{num: v, numeric: true, custom: code} }
func xtxt(s string) xcell                  { return xcell{text: s} }
func xrow(cells ...string) []xcell         { return xtextCells(cells) }
func xtextCells(cells []string) []xcell {
	out := make([]xcell, len(cells))
	for i, c := range cells {
		out[i] = xtxt(c)
	}
	return out
}
func xcells(cells ...xcell) []xcell { return cells }

// xsheet is a named sheet of rows.
type xsheet struct {
	name string
	rows [][]xcell
}

// writeWorkbook writes a workbook with the sheets in order, in dir.
func writeWorkbook(t testing.TB, dir, file string, sheets ...xsheet) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	styles := map[string]int{}
	style := func(c xcell) int {
		key := c.custom + "|" + strconv.Itoa(c.fmtID)
		if id, ok := styles[key]; ok {
			return id
		}
		st := &excelize.Style{NumFmt: c.fmtID}
		if c.custom != "" {
			code := c.custom
			st = &excelize.Style{CustomNumFmt: &code}
		}
		id, err := f.NewStyle(st)
		if err != nil {
			t.Fatal(err)
		}
		styles[key] = id
		return id
	}
	for i, sh := range sheets {
		if i == 0 {
			if err := f.SetSheetName("Sheet1", sh.name); err != nil {
				t.Fatal(err)
			}
		} else if _, err := f.NewSheet(sh.name); err != nil {
			t.Fatal(err)
		}
		for r, row := range sh.rows {
			for c, cell := range row {
				ref, _ := excelize.CoordinatesToCellName(c+1, r+1)
				if !cell.numeric {
					if cell.text == "" {
						continue
					}
					if err := f.SetCellStr(sh.name, ref, cell.text); err != nil {
						t.Fatal(err)
					}
					continue
				}
				if err := f.SetCellFloat(sh.name, ref, cell.num, -1, 64); err != nil {
					t.Fatal(err)
				}
				if cell.fmtID != 0 || cell.custom != "" {
					if err := f.SetCellStyle(sh.name, ref, ref, style(cell)); err != nil {
						t.Fatal(err)
					}
				}
			}
		}
	}
	path := filepath.Join(dir, file)
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

// fakeSource is a rowSource over fixed text rows, for the sheet readers:
// the one ReadTextSheets reads.
type fakeSource = textSource

// csvRows splits "a,b|c,d" style test tables into rows and cells.
func csvRows(lines ...string) [][]string {
	out := make([][]string, len(lines))
	for i, l := range lines {
		if l == "" {
			out[i] = nil
			continue
		}
		out[i] = strings.Split(l, "|")
	}
	return out
}

// hasProblem reports whether some problem wraps target (any, when nil)
// and mentions text.
func hasProblem(problems []*CellError, target error, text string) bool {
	for _, p := range problems {
		if (target == nil || errors.Is(p, target)) && strings.Contains(p.Error(), text) {
			return true
		}
	}
	return false
}

// problemTexts lists problems for failure messages.
func problemTexts(problems []*CellError) string {
	var b strings.Builder
	for _, p := range problems {
		b.WriteString("\n\t")
		b.WriteString(p.Error())
	}
	return b.String()
}

// pairedProblems lists the problems of a paired row, its claim's and both
// coefficients', as problemTexts does; "" when there are none.
func pairedProblems(pc PairedClaim) string {
	return problemTexts(pc.Claim.Problems) + problemTexts(pc.First.Problems) + problemTexts(pc.Second.Problems)
}
