package extract

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestWriteTemplate reopens the template with excelize and checks what a
// user relies on. Number format 49 is the built-in text format "@"
// (ECMA-376 Part 1 §18.8.30, as excelize documents its built-in formats).
func TestWriteTemplate(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteTemplate(&buf); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if got := strings.Join(f.GetSheetList(), ","); got != "instructions,coefficients,claims,correlations" {
		t.Errorf("sheets = %s, want instructions, coefficients, claims, correlations", got)
	}
	var instructionText strings.Builder
	rows, err := f.GetRows("instructions")
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows {
		instructionText.WriteString(strings.Join(r, " ") + "\n")
	}
	for _, ts := range templateSheets {
		t.Run(ts.name, func(t *testing.T) {
			for i, name := range ts.columns {
				cell, _ := excelize.CoordinatesToCellName(i+1, 1)
				if v, _ := f.GetCellValue(ts.name, cell); v != name {
					t.Errorf("%s!%s = %q, want header %q", ts.name, cell, v, name)
				}
				if !strings.Contains(instructionText.String(), name) {
					t.Errorf("the instructions never mention column %q of %s", name, ts.name)
				}
				col, _ := excelize.ColumnNumberToName(i + 1)
				id, err := f.GetColStyle(ts.name, col)
				if err != nil {
					t.Fatal(err)
				}
				st, err := f.GetStyle(id)
				if err != nil || st.NumFmt != 49 {
					t.Errorf("%s column %s style = %+v, %v, want number format 49 (text)", ts.name, col, st, err)
				}
			}
			id, _ := f.GetCellStyle(ts.name, "A1")
			if st, err := f.GetStyle(id); err != nil || st.Font == nil || !st.Font.Bold {
				t.Errorf("%s header style = %+v, %v, want bold", ts.name, st, err)
			}
			panes, err := f.GetPanes(ts.name)
			if err != nil || !panes.Freeze || panes.YSplit != 1 {
				t.Errorf("%s panes = %+v, %v, want the header row frozen", ts.name, panes, err)
			}
			dvs, err := f.GetDataValidations(ts.name)
			if err != nil {
				t.Fatal(err)
			}
			if len(dvs) != len(ts.lists) {
				t.Errorf("%s has %d validations, want %d", ts.name, len(dvs), len(ts.lists))
			}
			for name, values := range ts.lists {
				found := false
				for _, dv := range dvs {
					col, _ := excelize.ColumnNumberToName(indexOf(ts.columns, name) + 1)
					if strings.HasPrefix(dv.Sqref, col+"2:") && dv.Type == "list" && strings.Contains(dv.Formula1, strings.Join(values, ",")) {
						found = true
					}
				}
				if !found {
					t.Errorf("%s: no drop-down list of %v on column %q; validations %+v", ts.name, values, name, dvs)
				}
			}
		})
	}
	for _, want := range []string{"table", "variable", "blank", "p < .001", "0,43"} {
		if !strings.Contains(instructionText.String(), want) {
			t.Errorf("the instructions never mention %q", want)
		}
	}

	// Read accepts the blank template and says only that it has no claims.
	path := filepath.Join(t.TempDir(), "template.xlsx")
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	in, err := Read(path)
	if err != nil {
		t.Fatalf("Read(template) error %v", err)
	}
	if len(in.Claims)+len(in.Coefficients)+len(in.Correlations)+len(in.Tables) != 0 {
		t.Errorf("Read(template) found records: %+v", in)
	}
	if len(in.Problems) != 1 || !errors.Is(in.Problems[0], ErrMissingValue) || !strings.Contains(in.Problems[0].Error(), "no claims") {
		t.Errorf("Read(template) problems:%s, want only \"no claims\"", problemTexts(in.Problems))
	}
}

func indexOf(list []string, s string) int {
	for i, v := range list {
		if v == s {
			return i
		}
	}
	return -1
}
