package audit_test

import (
	"bytes"
	"fmt"
	"strings"

	"coefaudit/audit"
	"coefaudit/extract"

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

func ExampleWriteXLSX() {
	in := exampleInput()
	rep := audit.Audit(in, audit.DefaultOptions)
	var buf bytes.Buffer
	if err := audit.WriteXLSX(&buf, rep, in); err != nil {
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
	// [summary claims coefficients methods]
}

func ExampleWriteHTML() {
	rep := audit.Audit(exampleInput(), audit.DefaultOptions)
	var buf bytes.Buffer
	if err := audit.WriteHTML(&buf, rep); err != nil {
		fmt.Println(err)
		return
	}
	page := buf.String()
	fmt.Println(strings.Count(page, `<section class="claim `), "claim section;", strings.Count(page, "<svg"), "chart")
	fmt.Println(strings.Contains(page, `http-equiv="Content-Security-Policy"`))
	// Output:
	// 1 claim section; 1 chart
	// true
}
