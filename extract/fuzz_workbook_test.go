package extract

import (
	"archive/zip"
	"bytes"
	"io"
	"os"
	"path/filepath"
	"testing"
)

// workbookParts writes a small workbook (a coefficients and a claims sheet)
// with excelize and returns its members, in archive order, so that a test
// can rebuild it with one part replaced.
func workbookParts(t testing.TB) (names []string, data map[string][]byte) {
	t.Helper()
	path := writeWorkbook(t, t.TempDir(), "base.xlsx",
		xsheet{"coefficients", [][]xcell{coefficientHeader,
			xrow("s", "a", "b", "0.43", "0.12", "0.74", "", "p < .01", "120"),
			xcells(xtxt("s"), xtxt("b"), xtxt("r"), xnum(0.21, 2), xtxt(""), xtxt(""), xtxt(""), xtxt(""), xnum(80, 0))}},
		xsheet{"claims", [][]xcell{claimHeader, xrow("s", "c1", "a", "b", "differ", "test")}})
	zr, err := zip.OpenReader(path)
	if err != nil {
		t.Fatal(err)
	}
	defer zr.Close()
	data = map[string][]byte{}
	for _, m := range zr.File {
		rc, err := m.Open()
		if err != nil {
			t.Fatal(err)
		}
		b, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		names = append(names, m.Name)
		data[m.Name] = b
	}
	return names, data
}

// claimsPart is the archive member excelize writes the second sheet to.
const claimsPart = "xl/worksheets/sheet2.xml"

// rebuildWorkbook writes the members to path, deflated, with replace in
// place of the part of that name.
func rebuildWorkbook(t testing.TB, path string, names []string, data map[string][]byte, part string, replace []byte) {
	t.Helper()
	writeWorkbookParts(t, path, names, data, map[string][]byte{part: replace}, zip.Deflate)
}

// writeWorkbookParts writes the members to path, with the parts in
// replace in place of theirs, each compressed with method (zip.Deflate, or
// zip.Store for none).
func writeWorkbookParts(t testing.TB, path string, names []string, data map[string][]byte, replace map[string][]byte, method uint16) {
	t.Helper()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, n := range names {
		w, err := zw.CreateHeader(&zip.FileHeader{Name: n, Method: method})
		if err != nil {
			t.Fatal(err)
		}
		b := data[n]
		if r, ok := replace[n]; ok {
			b = r
		}
		if _, err := w.Write(b); err != nil {
			t.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

// FuzzWorkbookSheet fuzzes the XML of a workbook's claims sheet: whatever
// the XML, Read must not panic, must refuse with a placed error or return
// claims on increasing rows of that sheet, with every problem placed.
func FuzzWorkbookSheet(f *testing.F) {
	names, data := workbookParts(f)
	f.Add(data[claimsPart])
	f.Add([]byte(`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>` +
		`<row r="1"><c r="A1" t="inlineStr"><is><t>study</t></is></c><c r="B1" t="inlineStr"><is><t>claim</t></is></c></row>` +
		`<row><c t="n"><v>2020</v></c><c r="C2" t="b"><v>1</v></c></row>` +
		`<row r="1048576"><c r="XFD1048576" t="e"><v>#N/A</v></c></row></sheetData></worksheet>`))
	// Shared strings in and out of the table, rich text with a phonetic
	// run, escapes, formulas, a row numbered before the one it follows.
	f.Add([]byte(`<x:worksheet xmlns:x="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><x:sheetData>` +
		`<x:row r="1"><x:c r="A1" t="s"><x:v>0</x:v></x:c><x:c t="s"><x:v>18</x:v></x:c><x:c t="s"><x:v>99999</x:v></x:c></x:row>` +
		`<x:row r="3"><x:c t="inlineStr"><x:is><x:r><x:t>a_x000D_</x:t></x:r><x:rPh><x:t>b</x:t></x:rPh></x:is></x:c>` +
		`<x:c t="str"><x:f>1</x:f><x:v>x</x:v></x:c><x:c s="1"><x:v>0.5</x:v></x:c><x:c t="b"><x:v>1</x:v></x:c></x:row>` +
		`<x:row r="2"><x:c r="ZZZZ2"><x:v>1</x:v></x:c></x:row></x:sheetData></x:worksheet>`))
	f.Fuzz(func(t *testing.T, sheetXML []byte) {
		path := filepath.Join(t.TempDir(), "fuzz.xlsx")
		rebuildWorkbook(t, path, names, data, claimsPart, sheetXML)
		in, err := Read(path)
		if err != nil {
			checkRefusal(t, err, []string{path}, ErrUnsupportedInput, ErrInputTooLarge, ErrMissingSheet)
			return
		}
		for _, p := range in.Problems {
			checkPlaced(t, p, path, 0)
		}
		last := 0
		for _, c := range in.Claims {
			if c.Sheet != "claims" || c.File != path || c.Row <= last {
				t.Fatalf("claim at %v after row %d, want sheet claims of %s on increasing rows", c.Position, last, path)
			}
			last = c.Row
			for _, p := range c.Problems {
				checkPlaced(t, p, path, c.Row)
			}
		}
	})
}
