package regress

import (
	"os"
	"path/filepath"
	"testing"

	"coefaudit/internal/nist"
)

// TestOLSNIST fits the eleven NIST StRD linear-regression datasets (NIST
// Information Technology Laboratory, Statistical Reference Datasets:
// Norris, Pontius, NoInt1–2, Filip, Longley, Wampler1–5; certified values
// computed in 500-digit arithmetic) and checks every coefficient, SE,
// the residual SD and R² against the certified values, in correct
// significant digits (McCullough 1998). The files are read from
// ../shared/reference/nist-strd; the test skips when they are absent.
// extract's TestReadDataNIST fits the same files through the raw-data
// reader the bootstrap command uses.
func TestOLSNIST(t *testing.T) {
	wd, _ := os.Getwd()
	dir := nist.ReferenceDir(wd)
	if dir == "" {
		t.Skip("NIST StRD folder not found (expected at ../shared/reference/nist-strd from the module root); skipping the certified-value checks")
	}
	for _, m := range nist.Models {
		t.Run(m.Name, func(t *testing.T) {
			d, err := nist.Read(filepath.Join(dir, m.Name+".dat"))
			if err != nil {
				t.Fatal(err)
			}
			y, x, err := d.Columns()
			if err != nil {
				t.Fatal(err)
			}
			if m.Degree > 0 {
				x = nist.Powers(x[0], m.Degree)
			}
			fit, err := OLS(y, x, Options{NoIntercept: m.NoIntercept})
			if err != nil {
				t.Fatalf("OLS(%s) error: %v", m.Name, err)
			}
			short, summary := d.Compare(m, fit.Coefficients, fit.StandardErrors, fit.ResidualSD, fit.RSquared)
			for _, s := range short {
				t.Errorf("OLS(%s): %s", m.Name, s)
			}
			t.Logf("%s; condition %.3g; warnings %q", summary, fit.ConditionNumber, fit.Warnings)
		})
	}
}

// longley reads the NIST StRD Longley data (response, six predictors), or
// skips the test when the reference files are absent.
func longley(t *testing.T) (y []float64, x [][]float64) {
	t.Helper()
	wd, _ := os.Getwd()
	dir := nist.ReferenceDir(wd)
	if dir == "" {
		t.Skip("../shared/reference/nist-strd not found; skipping the Longley checks")
	}
	d, err := nist.Read(filepath.Join(dir, "Longley.dat"))
	if err != nil {
		t.Fatal(err)
	}
	y, x, err = d.Columns()
	if err != nil {
		t.Fatal(err)
	}
	return y, x
}
