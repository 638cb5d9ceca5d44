package article

import (
	"path/filepath"
	"reflect"
	"testing"
)

// correlationTable is an invented lower-triangle correlation table with
// "M (SD)" in one column and numbered variables.
var correlationTable = ttable{label: "Table 8", caption: "Means, standard deviations and correlations (N = 412)",
	head: [][]tcell{cells("Variable", "M (SD)", "1", "2", "3")},
	body: [][]tcell{cells("1. Wellbeing", "3.10 (0.80)", "—", "", ""),
		cells("2. Garden hours", "2.70 (0.90)", ".45**", "—", ""),
		cells("3. Screen time", "6.50 (1.20)", "−.30**", "−.22*", "—")},
	foot: []string{"*p < .05. **p < .01."}}

// TestCorrelationTableInEveryFormat reads the correlation table from each
// format into a "table …" sheet with every cell as printed.
func TestCorrelationTableInEveryFormat(t *testing.T) {
	a := tarticle{author: "Quillon", year: "2026", tables: []ttable{correlationTable}}
	for format, file := range articleFormats(t, t.TempDir(), "corr", a) {
		f, err := ReadFile(file, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(f.Tables) != 1 || len(f.Coefficients) != 0 {
			t.Fatalf("%s: %d correlation tables and %d coefficients, want 1 and 0", format, len(f.Tables), len(f.Coefficients))
		}
		want := [][]string{{"study", f.Study}, {"n", "412"}, {"variable", "mean", "sd", "1", "2", "3"},
			{"1. Wellbeing", "3.10", "0.80", "—", "", ""},
			{"2. Garden hours", "2.70", "0.90", ".45**", "—", ""},
			{"3. Screen time", "6.50", "1.20", "−.30**", "−.22*", "—"}}
		if got := f.Tables[0].Rows; !reflect.DeepEqual(got, want) {
			t.Errorf("%s (%s): rows\n%q\nwant\n%q", format, filepath.Base(file), got, want)
		}
	}
}
