package extract

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"coefaudit/infer/regress"
	"coefaudit/internal/nist"
)

// TestReadDataNIST passes the eleven NIST StRD linear-regression datasets
// (NIST Information Technology Laboratory, Statistical Reference Datasets;
// certified values in 500-digit arithmetic) through ReadData, the reader of
// the bootstrap command, as CSV files holding the data exactly as NIST
// prints it (Wampler3's "760.", "-2042."), fits them and checks the
// certified coefficients, SEs, residual SD and R² (McCullough 1998, correct
// significant digits). Before, the reader refused "760." as a number.
func TestReadDataNIST(t *testing.T) {
	wd, _ := os.Getwd()
	dir := nist.ReferenceDir(wd)
	if dir == "" {
		t.Skip("NIST StRD folder not found (expected at ../shared/reference/nist-strd from the module root)")
	}
	for _, m := range nist.Models {
		t.Run(m.Name, func(t *testing.T) {
			d, err := nist.Read(filepath.Join(dir, m.Name+".dat"))
			if err != nil {
				t.Fatal(err)
			}
			names := []string{"y"}
			for j := 1; j < len(d.Rows[0]); j++ {
				names = append(names, "x"+string(rune('0'+j)))
			}
			var b strings.Builder
			b.WriteString(strings.Join(names, ",") + "\n")
			for _, r := range d.Rows {
				b.WriteString(strings.Join(r, ",") + "\n")
			}
			path := filepath.Join(t.TempDir(), m.Name+".csv")
			if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
				t.Fatal(err)
			}
			table, err := ReadData(path, "")
			if err != nil {
				t.Fatalf("ReadData(%s): %v", m.Name, err)
			}
			cols, dropped, err := table.Complete(names)
			if err != nil || dropped != 0 {
				t.Fatalf("Complete(%s): %d rows dropped, %v", m.Name, dropped, err)
			}
			x := cols[1:]
			if m.Degree > 0 {
				x = nist.Powers(cols[1], m.Degree)
			}
			fit, err := regress.OLS(cols[0], x, regress.Options{NoIntercept: m.NoIntercept})
			if err != nil {
				t.Fatalf("OLS(%s): %v", m.Name, err)
			}
			short, summary := d.Compare(m, fit.Coefficients, fit.StandardErrors, fit.ResidualSD, fit.RSquared)
			for _, s := range short {
				t.Errorf("%s through ReadData: %s", m.Name, s)
			}
			t.Log(summary)
		})
	}
}
