package extract

import (
	"archive/zip"
	"fmt"
	"io"
	"path/filepath"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestWorkbookCellsAsExcelize reads cells of every kind and compares each
// with what excelize, the reader this one replaced, reads from the same
// file: a text cell's text and a numeric cell's stored value as its raw
// value, a numeric cell's displayed text, and a boolean's or an error's
// text as its formatted value. The first sheet is written by excelize (number
// formats, rich text, booleans, a carriage return); the second is XML as
// other writers write it (cells and rows without references, formula
// results, errors, inline strings in runs, escapes, a prefix).
func TestWorkbookCellsAsExcelize(t *testing.T) {
	dir := t.TempDir()
	f := excelize.NewFile()
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	nums := []struct {
		v    float64
		code string
	}{
		{0.4, "0.00"}, {0.4349, "0.000"}, {0.125, "0.0%"}, {1234567.891, "#,##0.00"}, {0.000023, "0.00E+00"},
		{43832, "yyyy-mm-dd"}, {0.1 + 0.2, ""}, {1e-7, ""}, {-2.5, "0.0;(0.0)"}, {12345678901234567, ""}, {0.123456789012, "General"},
	}
	for i, n := range nums {
		ref, _ := excelize.CoordinatesToCellName(i+1, 1)
		must(f.SetCellFloat("Sheet1", ref, n.v, -1, 64))
		if n.code != "" {
			code := n.code
			id, err := f.NewStyle(&excelize.Style{CustomNumFmt: &code})
			must(err)
			must(f.SetCellStyle("Sheet1", ref, ref, id))
		}
	}
	must(f.SetCellBool("Sheet1", "A2", true))
	must(f.SetCellBool("Sheet1", "B2", false))
	must(f.SetCellRichText("Sheet1", "C2", []excelize.RichTextRun{{Text: "rich "}, {Text: "text", Font: &excelize.Font{Bold: true}}}))
	must(f.SetCellStr("Sheet1", "D2", "line\r\nbreak"))
	must(f.SetCellStr("Sheet1", "F2", " spaced "))
	must(f.SetCellInt("Sheet1", "G4", 2020))
	_, err := f.NewSheet("xml")
	must(err)
	path := filepath.Join(dir, "cells.xlsx")
	must(f.SaveAs(path))
	must(f.Close())

	// The second sheet, rebuilt as XML: a prefixed namespace, a row and
	// cells without references, each kind of cell.
	zr, err := zip.OpenReader(path)
	must(err)
	var names []string
	data := map[string][]byte{}
	for _, m := range zr.File {
		rc, err := m.Open()
		must(err)
		b, err := io.ReadAll(rc)
		rc.Close()
		must(err)
		names = append(names, m.Name)
		data[m.Name] = b
	}
	zr.Close()
	sheetXML := `<x:worksheet xmlns:x="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><x:sheetData>` +
		`<x:row r="2"><x:c t="inlineStr"><x:is><x:r><x:t>in</x:t></x:r><x:r><x:t xml:space="preserve">line </x:t></x:r><x:rPh><x:t>phonetic</x:t></x:rPh></x:is></x:c>` +
		`<x:c t="str"><x:f>A1&amp;"x"</x:f><x:v>formula text</x:v></x:c><x:c t="e"><x:v>#N/A</x:v></x:c><x:c><x:v>7</x:v></x:c>` +
		`<x:c r="F2" t="inlineStr"><x:is><x:t>tab_x0009_here_x005F_x0041_</x:t></x:is></x:c><x:c r="G2"><x:f>1+1</x:f></x:c><x:c r="H2" s="0"/></x:row>` +
		`<x:row><x:c r="B3" t="b"><x:v>1</x:v></x:c><x:c r="D3"><x:v>0.5</x:v></x:c></x:row>` +
		`</x:sheetData></x:worksheet>`
	rebuilt := filepath.Join(dir, "rebuilt.xlsx")
	rebuildWorkbook(t, rebuilt, names, data, "xl/worksheets/sheet2.xml", []byte(sheetXML))

	ref, err := excelize.OpenFile(rebuilt)
	must(err)
	defer ref.Close()
	wb, err := openWorkbook(rebuilt)
	must(err)
	defer wb.Close()
	compared := 0
	for _, sheet := range []string{"Sheet1", "xml"} {
		raw, err := ref.GetRows(sheet, excelize.Options{RawCellValue: true})
		must(err)
		shown, err := ref.GetRows(sheet)
		must(err)
		src, err := wb.source(sheet)
		must(err)
		got := map[int]*sheetRow{}
		for {
			row := &sheetRow{}
			err := src.Next(row)
			if err == io.EOF {
				break
			}
			must(err)
			if row.Problem != nil {
				t.Errorf("%s row %d: problem %v", sheet, row.Row, row.Problem)
			}
			got[row.Row] = row
		}
		src.Close()
		for r := range raw {
			row := got[r+1]
			var cells []sheetCell
			if row != nil {
				cells = row.Cells
			}
			if len(cells) != len(raw[r]) {
				t.Errorf("%s row %d: %d cells, want %d as excelize reads it (%q)", sheet, r+1, len(cells), len(raw[r]), raw[r])
				continue
			}
			for c := range raw[r] {
				cell, want := cells[c], sheetCell{Text: raw[r][c]}
				ctype, err := ref.GetCellType(sheet, must2(excelize.CoordinatesToCellName(c+1, r+1)))
				must(err)
				switch ctype {
				case excelize.CellTypeNumber, excelize.CellTypeUnset:
					if raw[r][c] != "" {
						want = sheetCell{Text: raw[r][c], Display: shown[r][c], Numeric: true}
					}
				case excelize.CellTypeBool, excelize.CellTypeError:
					want = sheetCell{Text: shown[r][c]}
				}
				if cell != want {
					t.Errorf("%s row %d column %d (%v) = %+v, want %+v", sheet, r+1, c+1, ctype, cell, want)
				}
				compared++
			}
		}
	}
	if compared < 25 {
		t.Errorf("compared %d cells, want all 25 written", compared)
	}
}

// must2 returns v, for a call whose error cannot happen.
func must2[T any](v T, _ error) T { return v }

// TestWorkbookRowOrder reads a claims sheet whose XML numbers a row before
// the row it follows, and gives a cell a reference outside a sheet: rows
// keep increasing numbers and every claim is read, the misplaced row and
// cell with a problem saying where they were read.
func TestWorkbookRowOrder(t *testing.T) {
	row := func(r int, ref, claim string) string {
		return fmt.Sprintf(`<row r="%d"><c r="A%d" t="inlineStr"><is><t>s</t></is></c><c r="%s" t="inlineStr"><is><t>%s</t></is></c>`+
			`<c t="inlineStr"><is><t>a</t></is></c><c t="inlineStr"><is><t>b</t></is></c><c t="inlineStr"><is><t>differ</t></is></c></row>`, r, r, ref, claim)
	}
	path := filepath.Join(t.TempDir(), "order.xlsx")
	names, data := workbookParts(t)
	rebuildWorkbook(t, path, names, data, claimsPart, claimsSheetXML(row(5, "B5", "c5")+row(4, "B4", "c4")+row(7, "AAAA7", "c7"), 8))
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	want := []struct {
		row            int
		claim, problem string
	}{
		{2, "c1", ""},
		{5, "c5", ""},
		{6, "c4", `row 6: the sheet's XML numbers this row 4, after row 5; it is read as row 6`},
		{7, "c7", `row 7: cell "AAAA7" of the sheet's XML has no place in a sheet`},
		{8, "c2", ""},
	}
	if len(in.Claims) != len(want) {
		t.Fatalf("Read = %d claims, want %d", len(in.Claims), len(want))
	}
	for i, w := range want {
		c := in.Claims[i]
		placed := len(c.Problems) == 0
		if w.problem != "" {
			placed = hasProblem(c.Problems, nil, path+`, sheet "claims", `+w.problem)
		}
		if c.Row != w.row || c.Claim != w.claim || !placed {
			t.Errorf("claim %d = %q on row %d%s, want %q on row %d with a problem saying %q", i, c.Claim, c.Row, problemTexts(c.Problems), w.claim, w.row, w.problem)
		}
	}
}
