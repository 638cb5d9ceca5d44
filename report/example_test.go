package report_test

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"strings"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/report"

	"github.com/xuri/excelize/v2"
)

// exampleInput is an invented study with two independent estimates and
// one claim.
func exampleInput() *extract.Input {
	num := func(s string, v float64) extract.Printed {
		return extract.Printed{Value: v, Decimals: int32(len(s) - strings.IndexByte(s, '.') - 1), Bound: extract.Exact, Text: s}
	}
	coef := func(row int, label, group, est string, e float64, se string, s float64) extract.Coefficient {
		return extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: row}, Study: "Invented 2024",
			Label: label, Measure: extract.MeasureB, Group: group, Estimate: num(est, e), SE: num(se, s), CILevel: 95}
	}
	return &extract.Input{Source: "invented.xlsx",
		Coefficients: []extract.Coefficient{coef(2, "women", "w", "0.41", 0.41, "0.05", 0.05), coef(3, "men", "m", "0.18", 0.18, "0.06", 0.06)},
		Claims: []extract.Claim{{Position: extract.Position{Sheet: "claims", Row: 2}, Study: "Invented 2024", Claim: "1",
			First: "women", Second: "men", Published: extract.PublishedFirstLarger, Basis: extract.BasisTest, Alpha: 0.05}}}
}

// A Writer takes the results as audit.Run hands them on, as Check does
// with an input it opens.
func ExampleNew() {
	in := exampleInput()
	var buf bytes.Buffer
	wr, err := report.New("csv", &buf)
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := wr.Begin(report.Header{Source: in.Source, Alpha: extract.DefaultAlpha}); err != nil {
		fmt.Println(err)
		return
	}
	sum, err := audit.Run(extract.FromInput(in).Studies(), audit.DefaultOptions, wr.Study)
	if err == nil {
		err = wr.End(report.Footer{Summary: sum})
	}
	if err != nil {
		fmt.Println(err)
		return
	}
	records, _ := csv.NewReader(&buf).ReadAll()
	for _, r := range records {
		fmt.Println(r[0], r[2], r[12], r[20], r[27])
	}
	// z = (0.41 − 0.18)/√(0.05² + 0.06²) = 2.945, two-sided p = 0.00323
	// (Altman & Bland 2003).

	// Output:
	// row claim method p outcome
	// 2 1 independent-z 0.003231131067255686 consistent
}

// Write writes a report held in memory; without the input, the workbook
// has no input sheets.
func ExampleWrite() {
	rep := audit.Audit(exampleInput(), audit.DefaultOptions)
	var buf bytes.Buffer
	if err := report.Write("xlsx", &buf, rep); err != nil {
		fmt.Println(err)
		return
	}
	f, err := excelize.OpenReader(&buf)
	if err != nil {
		fmt.Println(err)
		return
	}
	defer f.Close()
	fmt.Println(f.GetSheetList())
	// Output:
	// [summary claims methods]
}

func ExampleWrite_html() {
	rep := audit.Audit(exampleInput(), audit.DefaultOptions)
	var buf bytes.Buffer
	if err := report.Write("html", &buf, rep); err != nil {
		fmt.Println(err)
		return
	}
	page := buf.String()
	fmt.Println(strings.Count(page, `<tr data-outcome=`), "line;", strings.Count(page, `<section class="claim `), "card;", strings.Count(page, "<svg"), "chart")
	fmt.Println(strings.Contains(page, `http-equiv="Content-Security-Policy"`))
	// Output:
	// 1 line; 0 card; 0 chart
	// true
}
