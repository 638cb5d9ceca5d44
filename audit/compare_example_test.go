package audit_test

import (
	"fmt"

	"coefaudit/audit"
	"coefaudit/extract"
)

// Two risk ratios from independent subgroups (Altman & Bland 2003, BMJ
// 326:219): the paper found no difference between them, and the test of
// the difference agrees.
func ExampleCompareReported() {
	first, err := audit.ParseReported("0.67 (0.46 to 0.98)")
	if err != nil {
		fmt.Println(err)
		return
	}
	second, err := audit.ParseReported("0.88 (0.71 to 1.08)")
	if err != nil {
		fmt.Println(err)
		return
	}
	rep, err := audit.CompareReported(audit.Comparison{First: first, Second: second, Relation: audit.Independent,
		Measure: extract.MeasureRR, Published: extract.PublishedNoDifference}, audit.DefaultOptions)
	if err != nil {
		fmt.Println(err)
		return
	}
	c := rep.Claims[0]
	fmt.Printf("%s: log difference %.4f, SE %.4f, p = %.3f: %s\n", c.Method, float64(c.Difference), float64(c.DifferenceSE), float64(c.P), c.Outcome)
	// Output:
	// independent-z: log difference -0.2726, SE 0.2206, p = 0.217: consistent
}

func ExampleParseReported() {
	for _, s := range []string{"0.41 [0.30, 0.52]", "0.18, SE 0.06", "0.41, p = .003", "0.41 ± 0.05"} {
		r, err := audit.ParseReported(s)
		if err != nil {
			fmt.Println("error:", err)
			continue
		}
		fmt.Printf("estimate %s, interval %q to %q, SE %q, p %q\n", r.Estimate.Text, r.CI.Low.Text, r.CI.High.Text, r.SE.Text, r.P.Text)
	}
	// Output:
	// estimate 0.41, interval "0.30" to "0.52", SE "", p ""
	// estimate 0.18, interval "" to "", SE "0.06", p ""
	// estimate 0.41, interval "" to "", SE "", p "p = .003"
	// error: "0.41 ± 0.05": "±" may be an SE, an SD or a margin of error; write "0.41, SE 0.05" or the interval "0.41 [0.31, 0.51]": not an estimate with its interval, SE or p
}
