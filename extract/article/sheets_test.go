package article

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"coefaudit/extract"
)

// importAll writes the layouts and a results paragraph as one JATS article
// and imports it.
func importAll(t *testing.T) *Result {
	t.Helper()
	res := Import(allLayoutsArticle(t), nil, nil)
	if len(res.Failed) > 0 {
		t.Fatal(res.Failed[0].Err)
	}
	return res
}

// allLayoutsArticle writes a JATS article with a table in every layout
// and a correlation table, and returns its file as a list of one.
func allLayoutsArticle(t *testing.T) []string {
	t.Helper()
	dir := t.TempDir()
	a := tarticle{author: "Quillon", year: "2026", paras: []string{
		"Garden hours predicted wellbeing for girls (β = .34, 95% CI [.21, .47], p < .001) and for boys (β = .12, 95% CI [.01, .23], p = .03); the association was stronger for girls than for boys.",
	}}
	for _, l := range layouts {
		a.tables = append(a.tables, l.table)
	}
	a.tables = append(a.tables, correlationTable)
	file := filepath.Join(dir, "quillon.xml")
	if err := os.WriteFile(file, []byte(jatsArticle(a)), 0o600); err != nil {
		t.Fatal(err)
	}
	return []string{file}
}

// TestSheetsReadBackCleanly reads the sheets an import writes through
// extract's own readers: every coefficients row, claim and correlation
// table is read without a problem, numbers as printed.
func TestSheetsReadBackCleanly(t *testing.T) {
	res := importAll(t)
	in, err := extract.ReadTextSheets("import", res.Sheets())
	if err != nil {
		t.Fatal(err)
	}
	if want := len(res.Articles[0].Coefficients); len(in.Coefficients) != want {
		t.Errorf("%d coefficients read back, want %d", len(in.Coefficients), want)
	}
	for _, c := range in.Coefficients {
		for _, p := range c.Problems {
			t.Errorf("coefficient %q: %v", c.Label, p)
		}
	}
	if len(in.Claims) != 1 {
		t.Fatalf("%d claims, want 1", len(in.Claims))
	}
	for _, p := range in.Claims[0].Problems {
		t.Errorf("claim: %v", p)
	}
	if len(in.Tables) != 1 {
		t.Fatalf("%d correlation tables, want 1", len(in.Tables))
	}
	for _, p := range in.Tables[0].Problems {
		t.Errorf("table: %v", p)
	}
	for _, p := range in.Problems {
		t.Errorf("input: %v", p)
	}
	if got := in.Tables[0].R[2][1].Text; got != "−.22*" {
		t.Errorf("r(3, 2) = %q, want −.22* as printed", got)
	}
	if got := in.Tables[0].SD[0].Text; got != "0.80" {
		t.Errorf("sd of variable 1 = %q, want 0.80 from the M (SD) column", got)
	}
}

// TestWorkbookAndFolderReadBack writes the sheets as a workbook (streamed
// by ImportWorkbook) and as a folder of CSV files and reads both with
// extract.Read: the rows of the sheets in memory.
func TestWorkbookAndFolderReadBack(t *testing.T) {
	files := allLayoutsArticle(t)
	sheets := Import(files, nil, nil).Sheets()
	dir := t.TempDir()
	var buf bytes.Buffer
	if _, err := ImportWorkbook(files, nil, nil, &buf, t.TempDir()); err != nil {
		t.Fatal(err)
	}
	book := filepath.Join(dir, "review.xlsx")
	if err := os.WriteFile(book, buf.Bytes(), 0o600); err != nil {
		t.Fatal(err)
	}
	folder := filepath.Join(dir, "review")
	if err := os.Mkdir(folder, 0o700); err != nil {
		t.Fatal(err)
	}
	for _, s := range sheets {
		var b bytes.Buffer
		if err := WriteCSV(&b, s); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(folder, CSVName(s.Name)), b.Bytes(), 0o600); err != nil {
			t.Fatal(err)
		}
	}
	mem, err := extract.ReadTextSheets("import", sheets)
	if err != nil {
		t.Fatal(err)
	}
	for _, path := range []string{book, folder} {
		in, err := extract.Read(path)
		if err != nil {
			t.Fatal(err)
		}
		if len(in.Coefficients) != len(mem.Coefficients) || len(in.Claims) != len(mem.Claims) || len(in.Tables) != len(mem.Tables) {
			t.Fatalf("%s: %d coefficients, %d claims, %d tables; in memory %d, %d, %d", path,
				len(in.Coefficients), len(in.Claims), len(in.Tables), len(mem.Coefficients), len(mem.Claims), len(mem.Tables))
		}
		for i := range in.Coefficients {
			a, b := in.Coefficients[i], mem.Coefficients[i]
			if a.Estimate.Text != b.Estimate.Text || a.SE.Text != b.SE.Text || a.P.Text != b.P.Text || a.CI.Low.Text != b.CI.Low.Text {
				t.Errorf("%s row %d: %q %q %q %q, in memory %q %q %q %q", path, i+2, a.Estimate.Text, a.SE.Text, a.P.Text, a.CI.Low.Text,
					b.Estimate.Text, b.SE.Text, b.P.Text, b.CI.Low.Text)
			}
		}
	}
}
