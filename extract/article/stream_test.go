package article

import (
	"bytes"
	"encoding/json"
	"io"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// memFile is a file of memFiles.
type memFile struct {
	bytes.Buffer
	closed bool
}

func (m *memFile) Close() error { m.closed = true; return nil }

// articlesAndNot writes an article in every format, with a regression and
// a correlation table whose sheet names clash, and a file that is not an
// article (pdf, the last of files).
func articlesAndNot(t *testing.T) (files []string, pdf string) {
	t.Helper()
	dir := t.TempDir()
	a := tarticle{author: "Quillon", year: "2026", paras: []string{
		"Garden hours predicted wellbeing for girls (β = .34, p < .001) and for boys (β = .12, p = .03); the association was stronger for girls than for boys.",
	}, tables: []ttable{layouts[0].table, correlationTable}}
	files = slices.Sorted(maps.Values(articleFormats(t, dir, "quillon", a)))
	pdf = filepath.Join(dir, "scan.pdf")
	if err := os.WriteFile(pdf, []byte("%PDF-1.4"), 0o600); err != nil {
		t.Fatal(err)
	}
	return append(files, pdf), pdf
}

// TestImportFolderAsSheets: the CSV files ImportFolder writes as it reads
// are, byte for byte, those of the Result Import holds whole (each sheet
// written by WriteCSV), for articles in every format with correlation
// tables whose sheet names clash, and a file that is not read; every file
// is closed.
func TestImportFolderAsSheets(t *testing.T) {
	files, _ := articlesAndNot(t)
	want := map[string]string{}
	for _, s := range Import(files, nil, nil).Sheets() {
		var b bytes.Buffer
		if err := WriteCSV(&b, s); err != nil {
			t.Fatal(err)
		}
		want[CSVName(s.Name)] = b.String()
	}
	got := map[string]*memFile{}
	res, err := ImportFolder(files, nil, nil, func(name string) (io.WriteCloser, error) {
		if got[name] != nil {
			t.Errorf("%s created twice", name)
		}
		got[name] = &memFile{}
		return got[name], nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Articles) != len(files)-1 || len(res.Failed) != 1 {
		t.Errorf("%d articles and %d failures, want %d and 1", len(res.Articles), len(res.Failed), len(files)-1)
	}
	if len(want) != 3+len(files)-1 { // coefficients, claims, to confirm and a table each
		t.Fatalf("the reference has %d sheets: %v", len(want), slices.Sorted(maps.Keys(want)))
	}
	for name, w := range want {
		g := got[name]
		switch {
		case g == nil:
			t.Errorf("%s not written", name)
		case !g.closed:
			t.Errorf("%s not closed", name)
		case g.String() != w:
			t.Errorf("%s:\n%s\nwant\n%s", name, g.String(), w)
		}
	}
	if len(got) != len(want) {
		t.Errorf("files %v, want %v", slices.Sorted(maps.Keys(got)), slices.Sorted(maps.Keys(want)))
	}
}

// TestImportWorkbookAndJSONAsWhole: the workbook ImportWorkbook streams
// holds, sheet by sheet and cell by cell, the sheets of the Result Import
// holds whole, in the order Sheets gives; the JSON ImportJSON streams is,
// byte for byte, that Result encoded whole with encoding/json's indent;
// and neither writes anything when no file is an article.
func TestImportWorkbookAndJSONAsWhole(t *testing.T) {
	files, pdf := articlesAndNot(t)
	whole := Import(files, nil, nil)

	var book bytes.Buffer
	if _, err := ImportWorkbook(files, nil, nil, &book, t.TempDir()); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(&book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var names []string
	for _, s := range whole.Sheets() {
		names = append(names, s.Name)
		rows, err := f.GetRows(s.Name)
		if err != nil {
			t.Fatalf("sheet %q: %v", s.Name, err)
		}
		if len(rows) != len(s.Rows) {
			t.Errorf("sheet %q: %d rows, want %d", s.Name, len(rows), len(s.Rows))
			continue
		}
		for i, want := range s.Rows {
			for len(want) > 0 && want[len(want)-1] == "" { // GetRows leaves trailing blanks out
				want = want[:len(want)-1]
			}
			if !slices.Equal(rows[i], want) {
				t.Errorf("sheet %q row %d: %q, want %q", s.Name, i+1, rows[i], want)
			}
		}
	}
	if got := f.GetSheetList(); !slices.Equal(got, names) {
		t.Errorf("sheets %q, want %q", got, names)
	}

	var want bytes.Buffer
	enc := json.NewEncoder(&want)
	enc.SetIndent("", "  ")
	if err := enc.Encode(whole); err != nil {
		t.Fatal(err)
	}
	var got bytes.Buffer
	if _, err := ImportJSON(files, nil, nil, &got); err != nil {
		t.Fatal(err)
	}
	if got.String() != want.String() {
		t.Errorf("streamed JSON:\n%s\nwant\n%s", got.String(), want.String())
	}

	book.Reset()
	got.Reset()
	if res, err := ImportWorkbook([]string{pdf}, nil, nil, &book, t.TempDir()); err != nil || len(res.Failed) != 1 || book.Len() != 0 {
		t.Errorf("workbook of no article: %v, %d bytes written", err, book.Len())
	}
	if res, err := ImportJSON([]string{pdf}, nil, nil, &got); err != nil || len(res.Failed) != 1 || got.Len() != 0 {
		t.Errorf("JSON of no article: %v, %d bytes written", err, got.Len())
	}
}

// TestWorkbookSheetRowLimit: a sheet that would pass the most rows a
// workbook's sheet holds (1,048,576, excelize.TotalRows) is an error that
// says to write a folder of CSV files instead; the rows up to the limit
// are written.
func TestWorkbookSheetRowLimit(t *testing.T) {
	f := excelize.NewFile()
	defer f.Close()
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		t.Fatal(err)
	}
	x := &xlsxSheet{name: "coefficients", sw: sw, rows: excelize.TotalRows - 1}
	err = x.write([][]string{{"last"}, {"one too many"}})
	if err == nil || !strings.Contains(err.Error(), "--out DIR") || !strings.Contains(err.Error(), `"coefficients"`) {
		t.Errorf("row %d: error %v, want one naming the sheet and --out DIR", excelize.TotalRows+1, err)
	}
	if x.rows != excelize.TotalRows {
		t.Errorf("%d rows written, want %d", x.rows, excelize.TotalRows)
	}
}
