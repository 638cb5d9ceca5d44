package extract

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// sharedDir finds /work/shared as ../shared of the module root, skipping
// the test when it is absent.
func sharedDir(t *testing.T) string {
	t.Helper()
	dir, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			break
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			t.Skip("no go.mod above the package directory; cannot find the shared reference files")
		}
		dir = parent
	}
	shared := filepath.Join(dir, "..", "shared")
	if _, err := os.Stat(shared); err != nil {
		t.Skipf("shared reference files not found at %s: %v", shared, err)
	}
	return shared
}

// longley reads the data block of NIST StRD Longley.dat (lines 61 to 76:
// y and x1 … x6 for 16 years), as the file prints it.
func longley(t *testing.T) (names []string, rows [][]string) {
	t.Helper()
	path := filepath.Join(sharedDir(t), "reference", "nist-strd", "Longley.dat")
	b, err := os.ReadFile(path)
	if err != nil {
		t.Skipf("NIST Longley data not available: %v", err)
	}
	lines := strings.Split(strings.ReplaceAll(string(b), "\r\n", "\n"), "\n")
	if len(lines) < 76 {
		t.Fatalf("%s has %d lines, want the data on lines 61 to 76", path, len(lines))
	}
	for _, l := range lines[60:76] {
		rows = append(rows, strings.Fields(l))
	}
	return []string{"y", "x1", "x2", "x3", "x4", "x5", "x6"}, rows
}

// TestReadDataLongley reads the NIST Longley data written as a CSV file and
// as a workbook of numeric cells, and compares every value with the number
// printed in Longley.dat (NIST/ITL StRD; Longley JW (1967). JASA 62:819–841).
func TestReadDataLongley(t *testing.T) {
	names, rows := longley(t)
	dir := t.TempDir()
	var csv strings.Builder
	csv.WriteString(strings.Join(names, ",") + "\n")
	sheet := [][]xcell{xrow(names...)}
	for _, r := range rows {
		csv.WriteString(strings.Join(r, ",") + "\n")
		cells := make([]xcell, len(r))
		for j, f := range r {
			v, err := strconv.ParseFloat(f, 64)
			if err != nil {
				t.Fatal(err)
			}
			cells[j] = xnum(v, 0)
		}
		sheet = append(sheet, cells)
	}
	csvPath := filepath.Join(dir, "longley.csv")
	if err := os.WriteFile(csvPath, []byte(csv.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	xlsxPath := writeWorkbook(t, dir, "longley.xlsx", xsheet{"Longley", sheet})
	for _, path := range []string{csvPath, xlsxPath} {
		t.Run(filepath.Ext(path), func(t *testing.T) {
			d, err := ReadData(path, "")
			if err != nil {
				t.Fatal(err)
			}
			if d.Rows != 16 || strings.Join(d.Names, ",") != strings.Join(names, ",") || len(d.TextColumns) != 0 {
				t.Fatalf("ReadData(%s) = %d rows, columns %v, want 16 rows of %v", path, d.Rows, d.Names, names)
			}
			for i, r := range rows {
				for j, f := range r {
					want, _ := strconv.ParseFloat(f, 64)
					if got := d.Columns[j][i]; got != want {
						t.Errorf("ReadData(%s) %s[%d] = %v, want %v as printed in Longley.dat", path, names[j], i, got, want)
					}
				}
			}
			cols, dropped, err := d.Complete([]string{"Y", "x6"})
			firstX6, _ := strconv.ParseFloat(rows[0][6], 64)
			lastY, _ := strconv.ParseFloat(rows[15][0], 64)
			if err != nil || dropped != 0 || len(cols) != 2 || len(cols[0]) != 16 || cols[1][0] != firstX6 || cols[0][15] != lastY {
				t.Errorf("Complete(y, x6) = %d columns, dropped %d, %v; want 16 complete rows, x6 from %v, y ending %v", len(cols), dropped, err, firstX6, lastY)
			}
		})
	}
}

func writeTemp(t *testing.T, name, content string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestReadDataMissing(t *testing.T) {
	path := writeTemp(t, "d.csv", "id,a,b\nS01,1,2\nS02,NA,3\nS03,4,.\nS04,na,NaN\nS05,5,\nS06,−6,7\n,,\nS07,1.5e1,8\n")
	d, err := ReadData(path, "ignored for CSV")
	if err != nil {
		t.Fatal(err)
	}
	if d.Rows != 7 || strings.Join(d.Names, ",") != "a,b" || strings.Join(d.TextColumns, ",") != "id" {
		t.Fatalf("ReadData = %d rows, names %v, text %v; want 7 rows, a and b numeric, id text", d.Rows, d.Names, d.TextColumns)
	}
	a, _ := d.Column("a")
	for i, want := range []float64{1, math.NaN(), 4, math.NaN(), 5, -6, 15} {
		if got := a[i]; got != want && !(math.IsNaN(got) && math.IsNaN(want)) {
			t.Errorf("a[%d] = %v, want %v", i, got, want)
		}
	}
	cols, dropped, err := d.Complete([]string{"a", "b"})
	if err != nil || dropped != 4 || len(cols[0]) != 3 || cols[0][1] != -6 || cols[1][2] != 8 {
		t.Errorf("Complete(a, b) = %v, dropped %d, %v; want rows 1, 6, 7 kept (4 dropped)", cols, dropped, err)
	}
	if _, _, err := d.Complete([]string{"a", "zzz"}); !errors.Is(err, ErrMissingColumn) || !strings.Contains(err.Error(), `"zzz"`) {
		t.Errorf("Complete(a, zzz) error = %v, want ErrMissingColumn naming zzz", err)
	}
	if _, _, err := d.Complete([]string{"id"}); !errors.Is(err, ErrUnknownValue) || !strings.Contains(err.Error(), "holds text") {
		t.Errorf("Complete(id) error = %v, want the text column refused", err)
	}
}

func TestReadDataErrors(t *testing.T) {
	path := writeTemp(t, "bad.csv", "x,y\n1,2\n3,abc\n0.21*,4\n")
	_, err := ReadData(path, "")
	var ce *CellError
	if !errors.As(err, &ce) || ce.Row != 3 || ce.Column != "y" || ce.File != path || !errors.Is(err, ErrMalformedNumber) {
		t.Fatalf("ReadData(bad) error = %v, want a CellError at row 3, column y", err)
	}
	if !strings.Contains(err.Error(), `row 4, column "x": "0.21*" is not a number`) {
		t.Errorf("ReadData(bad) error = %v, want the starred cell refused too", err)
	}

	var b strings.Builder
	b.WriteString("x\n1\n")
	for i := 0; i < 50; i++ {
		fmt.Fprintf(&b, "bad%d\n", i)
	}
	_, err = ReadData(writeTemp(t, "many.csv", b.String()), "")
	if n := strings.Count(err.Error(), "is not a number"); n != maxDataErrors {
		t.Errorf("ReadData(50 bad cells) reported %d, want %d", n, maxDataErrors)
	}

	dup := writeTemp(t, "dup.csv", "x,X\n1,2\n")
	if _, err := ReadData(dup, ""); !errors.Is(err, ErrDuplicate) {
		t.Errorf("ReadData(duplicate names) error = %v, want ErrDuplicate", err)
	}
	wb := writeWorkbook(t, t.TempDir(), "d.xlsx", xsheet{"one", [][]xcell{xrow("x")}}, xsheet{"two", [][]xcell{xrow("y"), xcells(xnum(2, 0))}})
	d, err := ReadData(wb, "TWO")
	if err != nil || d.Sheet != "two" || d.Columns[0][0] != 2 {
		t.Errorf("ReadData(workbook, TWO) = %+v, %v; want sheet two read", d, err)
	}
	if _, err := ReadData(wb, "three"); !errors.Is(err, ErrMissingSheet) {
		t.Errorf("ReadData(workbook, three) error = %v, want ErrMissingSheet", err)
	}
}
