package main

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// templateExampleWorkbook writes the blank template with the correlation
// table of its instructions copied, cell for cell, into a sheet "table 1",
// and an invented study using it: the standardized coefficients of Sleep on
// Anxiety and Stress printed with stars only (no SE, interval or p), as
// papers print them, in group "all", and one claim that anxiety matters
// more. From the example's correlations (Cohen, Cohen, West & Aiken 2003,
// eq. 3.2.4, from memory): β_anxiety = (−.30 − (−.22)(.45))/(1 − .45²) =
// −0.2520 and β_stress = (−.22 − (−.30)(.45))/(1 − .45²) = −0.1066,
// printed −.25** and −.11.
func templateExampleWorkbook(t *testing.T) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "example.xlsx")
	if _, stderr, code := runCLI(t, "template", path); code != exitOK {
		t.Fatalf("template: %s", stderr)
	}
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows("instructions")
	if err != nil {
		t.Fatal(err)
	}
	// The example runs from its "study" key row to the row of variable 3.
	var example [][]string
	for _, row := range rows {
		if len(example) == 0 && (len(row) < 2 || row[0] != "study") {
			continue
		}
		example = append(example, row)
		if strings.HasPrefix(row[0], "3.") {
			break
		}
	}
	if len(example) < 5 {
		t.Fatalf("no table example in the instructions sheet: %q", example)
	}
	if _, err := f.NewSheet("table 1"); err != nil {
		t.Fatal(err)
	}
	for i, row := range example {
		cells := make([]any, len(row))
		for j, c := range row {
			cells[j] = c
		}
		if err := f.SetSheetRow("table 1", "A"+strconv.Itoa(i+1), &cells); err != nil {
			t.Fatal(err)
		}
	}
	fill := func(sheet string, values []map[string]string) {
		header, err := f.GetRows(sheet)
		if err != nil {
			t.Fatal(err)
		}
		for i, v := range values {
			for j, name := range header[0] {
				cell, _ := excelize.CoordinatesToCellName(j+1, i+2)
				if err := f.SetCellStr(sheet, cell, v[name]); err != nil {
					t.Fatal(err)
				}
			}
		}
	}
	fill("coefficients", []map[string]string{
		{"study": "Smith 2020", "label": "anxiety", "measure": "beta", "outcome": "Sleep", "predictor": "Anxiety", "group": "all", "model": "m1", "estimate": "−.25**"},
		{"study": "Smith 2020", "label": "stress", "measure": "beta", "outcome": "Sleep", "predictor": "Stress", "group": "all", "model": "m1", "estimate": "−.11"},
	})
	fill("claims", []map[string]string{
		{"study": "Smith 2020", "claim": "S1", "first": "anxiety", "second": "stress", "published": "first-stronger", "basis": "significance-split"},
	})
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestTemplateExampleGolden: the template's own table example, copied as
// printed, beside bare standardized coefficients of group "all", must be
// used (issue 17: it matched nothing, and the note said no table was
// printed). The whole CLI's report is compared with
// testdata/template_example.stdout.golden; -update rewrites it.
func TestTemplateExampleGolden(t *testing.T) {
	path := templateExampleWorkbook(t)
	stdout, stderr, code := runCLI(t, "check", path)
	if code == exitError {
		t.Fatalf("check: %s", stderr)
	}
	stdout = strings.ReplaceAll(stdout, filepath.Dir(path), "TMP")
	golden := filepath.Join("testdata", "template_example.stdout.golden")
	if *update {
		if err := os.WriteFile(golden, []byte(stdout), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil || string(want) != stdout {
		t.Errorf("check of the template's example differs from %s (%v; go test -run Golden -update rewrites it):\n%s", golden, err, stdout)
	}
	if !strings.Contains(stdout, "z-delta-from-correlation-table") {
		t.Errorf("the table of the template's example was not used:\n%s", stdout)
	}
}
