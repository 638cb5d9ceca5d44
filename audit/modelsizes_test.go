package audit

import (
	"fmt"
	"testing"

	"coefaudit/extract"
)

// TestModelSizesCountsAsAMap checks the list-then-map count of a run's
// regression coefficients against a plain map count, for runs of a few
// models and of more than fewModels, with a row's second coefficient
// repeating its first (not counted again) and a non-regression measure
// (not counted).
func TestModelSizesCountsAsAMap(t *testing.T) {
	for _, models := range []int{1, 3, fewModels, fewModels + 1, 3 * fewModels} {
		var rows []extract.PairedClaim
		want := map[modelKey]int{}
		for i := range 4 * models {
			m := fmt.Sprintf("m%d", i%models)
			measure := extract.MeasureB
			if i%5 == 4 {
				measure = extract.MeasureR
			}
			first := extract.Coefficient{Study: "S", Group: "g", Model: m, Label: fmt.Sprintf("a%d", i), Measure: measure}
			second := first
			if i%3 != 0 {
				second.Label, second.Model = fmt.Sprintf("b%d", i), fmt.Sprintf("m%d", (i+1)%models)
			}
			rows = append(rows, extract.PairedClaim{First: first, Second: second})
			for k, c := range []extract.Coefficient{first, second} {
				if extract.IsRegressionMeasure(c.Measure) && (k == 0 || c.Label != first.Label) {
					want[modelOf(&c)]++
				}
			}
		}
		var got modelSizes
		got.count(rows[:1]) // a count before is forgotten
		got.count(rows)
		for k, n := range want {
			if g := got.of(k); g != n {
				t.Errorf("%d models: model %v counted %d, want %d", models, k, g, n)
			}
		}
		if g := got.of(modelKey{"S", "g", "absent"}); g != 0 {
			t.Errorf("%d models: an absent model counted %d", models, g)
		}
	}
}
