package report

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestIssue17TippingInEveryFormat: the demo's claim G1 (one model, its
// estimates' correlation not printed) is indeterminate; where its verdict
// flips is in every format, and in the JSON as tipping_corr.
func TestIssue17TippingInEveryFormat(t *testing.T) {
	in := demoInput(t)
	const phrase = "(the tipping correlation)"
	for _, format := range []string{"table", "csv", "md", "html", "json", "xlsx"} {
		out := writeInput(t, format, in)
		text := string(out)
		if format == "xlsx" {
			f, err := excelize.OpenReader(bytes.NewReader(out))
			if err != nil {
				t.Fatal(err)
			}
			var b strings.Builder
			for _, sheet := range f.GetSheetList() {
				rows, _ := f.GetRows(sheet)
				for _, row := range rows {
					b.WriteString(strings.Join(row, " "))
				}
			}
			text = b.String()
		}
		if !strings.Contains(text, phrase) {
			t.Errorf("%s report lacks %q", format, phrase)
		}
		if format != "json" {
			continue
		}
		var doc struct {
			Claims []struct {
				Claim       string
				TippingCorr []float64 `json:"tipping_corr"`
			}
		}
		if err := json.Unmarshal(out, &doc); err != nil {
			t.Fatal(err)
		}
		found := false
		for _, c := range doc.Claims {
			if c.Claim == "G1" {
				found = len(c.TippingCorr) == 1 && c.TippingCorr[0] > -1 && c.TippingCorr[0] < 1
			}
		}
		if !found {
			t.Errorf("JSON claim G1 has no tipping_corr in (−1, 1):\n%s", out)
		}
	}
}
