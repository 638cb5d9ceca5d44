package extract_test

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"coefaudit/extract"
)

// A printed estimate keeps its decimals, so the rounding it stands for is
// known. The values are as printed in Torgerson & Bell-Syer (2001), JAMA
// 285:2891, abstract.
func ExampleParseNumber() {
	p, err := extract.ParseNumber("0.67")
	if err != nil {
		fmt.Println(err)
		return
	}
	lo, hi := p.RoundingInterval()
	fmt.Printf("%v with %d decimals: [%.3f, %.3f]\n", p.Value, p.Decimals, lo, hi)

	p, _ = extract.ParseNumber("−.22**")
	fmt.Println(p.Value, p.Stars)

	_, err = extract.ParseNumber("0.4.3")
	fmt.Println(err)
	// Output:
	// 0.67 with 2 decimals: [0.665, 0.675]
	// -0.22 2
	// "0.4.3" is not a number (more than one decimal point; expected e.g. 0.43, .43, −0.43, 0,43)
}

func ExampleParseP() {
	for _, text := range []string{"P = .03", "p < .001", "> .05", "n.s."} {
		p, err := extract.ParseP(text)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%-9s %-6s %v\n", text, p.Bound, p.Value)
	}
	_, err := extract.ParseP("p = 1.2")
	fmt.Println(errors.Is(err, extract.ErrMalformedP), err)
	// Output:
	// P = .03   exact  0.03
	// p < .001  below  0.001
	// > .05     above  0.05
	// n.s.      ns     0
	// true "p = 1.2" is not a p-value (a p-value cannot exceed 1; expected e.g. p < .001, p = .03, .03, ns)
}

// Intervals as printed by Woodward (2019), Heart 105:1701, Table 4, and in a
// decimal-comma locale.
func ExampleParseIntervalLevel() {
	for _, text := range []string{"(1.33 to 3.47)", "95% CI −0.30 to −0.05", "0,12; 0,45", "(0.12 0.45"} {
		iv, level, err := extract.ParseIntervalLevel(text)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%v to %v (level %v)\n", iv.Low.Value, iv.High.Value, level)
	}
	// Output:
	// 1.33 to 3.47 (level 0)
	// -0.3 to -0.05 (level 95)
	// 0.12 to 0.45 (level 0)
	// "(0.12 0.45" is not a confidence interval (the opening "(" has no closing bracket; expected e.g. [0.12, 0.45], (.12–.45), 0.12 to 0.45)
}

// Read takes a workbook, a folder of CSV files or a paired CSV; here a
// folder of the CSV a spreadsheet writes where the decimal mark is a comma.
func ExampleRead() {
	in, err := extract.Read(filepath.Join("testdata", "folder-european"))
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range in.Coefficients {
		fmt.Printf("row %d: %s %v [%v, %v] n=%v\n", c.Row, c.Label, c.Estimate.Value, c.CI.Low.Value, c.CI.High.Value, c.N.Value)
	}
	for _, c := range in.Claims {
		fmt.Printf("claim %s: %s vs %s, published %s\n", c.Claim, c.First, c.Second, c.Published)
	}
	// Output:
	// row 2: a 0.43 [0.12, 0.45] n=1234
	// row 3: b 0.21 [0.05, 0.37] n=1200
	// claim c1: a vs b, published differ
}

// A paired CSV streams one claim at a time, with both coefficients.
func ExampleNewPairedReader() {
	csv := "study,claim,published,first_estimate,first_se,second_estimate,second_se\n" +
		"s,c1,differ,0.50,0.10,0.20,0.10\n" +
		"s,c2,no-difference,0.4.3,0.10,0.20,0.10\n"
	pr, err := extract.NewPairedReader(strings.NewReader(csv), "claims.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	for {
		pc, err := pr.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%s: %s = %v, %s = %v\n", pc.Claim.Claim, pc.First.Label, pc.First.Estimate.Value, pc.Second.Label, pc.Second.Estimate.Value)
		for _, p := range pc.First.Problems {
			fmt.Println(" ", p)
		}
	}
	// Output:
	// c1: c1/first = 0.5, c1/second = 0.2
	// c2: c2/first = 0, c2/second = 0.2
	//   claims.csv, row 3, column "first_estimate": "0.4.3" is not a number (more than one decimal point; expected e.g. 0.43, .43, −0.43, 0,43)
}

func ExampleWriteTemplate() {
	var buf bytes.Buffer
	if err := extract.WriteTemplate(&buf); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(bytes.HasPrefix(buf.Bytes(), []byte("PK")))
	// Output:
	// true
}
