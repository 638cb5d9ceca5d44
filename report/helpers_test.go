package report

import (
	"bytes"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/fixtures"
)

// printed reads a number as the input's reader does; the tests' numbers
// are well formed.
func printed(s string) extract.Printed {
	p, err := extract.ParseNumber(s)
	if err != nil {
		panic(err)
	}
	return p
}

// injectionTexts are text cells a spreadsheet would evaluate if they were
// written as they are: a formula, a sign, an at-sign, a leading tab or
// carriage return (the OWASP list of CSV-injection triggers).
var injectionTexts = []string{
	`=HYPERLINK("http://example.invalid","open me")`,
	"+SUM(1,2)",
	"-2+3",
	"@SUM(A1:A2)",
	"\t=1+1",
	"\r=1+1",
}

// reportInput is an invented input: one study per injection text, each with
// two independent coefficients and one claim whose study, claim id, first
// label and extra column carry the text. The second estimates vary so
// that several outcomes occur.
func reportInput() *extract.Input {
	in := &extract.Input{Source: "invented.xlsx"}
	seconds := []string{"0.18", "0.40", "0.05", "0.60", "0.30", "0.25"}
	published := []string{extract.PublishedDiffer, extract.PublishedDiffer, extract.PublishedNoDifference,
		extract.PublishedFirstLarger, extract.PublishedDiffer, extract.PublishedSecondLarger}
	for k, text := range injectionTexts {
		row := 2 + 2*k
		for i, est := range []string{"0.41", seconds[k]} {
			label := []string{text, "second"}[i]
			in.Coefficients = append(in.Coefficients, extract.Coefficient{
				Position: extract.Position{Sheet: "coefficients", Row: row + i},
				Study:    text, Label: label, Measure: extract.MeasureB, Group: []string{"women", "men"}[i], Model: "m",
				Estimate: printed(est), SE: printed("0.06"), CILevel: 95,
				Extra: extract.Extra{Names: []string{"comment"}, Values: []string{text}},
			})
		}
		in.Claims = append(in.Claims, extract.Claim{Position: extract.Position{Sheet: "claims", Row: k + 2},
			Study: text, Claim: text, First: text, Second: "second", Published: published[k],
			Basis: extract.BasisTest, Alpha: 0.05, Topic: "t",
			Extra: extract.Extra{Names: []string{"reviewer"}, Values: []string{text}}})
	}
	return in
}

// demoInput reads the bundled demo workbook (invented data).
func demoInput(t testing.TB) *extract.Input {
	t.Helper()
	path, cleanup, err := fixtures.DemoFile()
	if err != nil {
		t.Fatal(err)
	}
	defer cleanup()
	in, err := extract.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	in.Source = fixtures.DemoName
	return in
}

// demoReport audits the demo workbook into one report held in memory.
func demoReport(t testing.TB) (*audit.Report, *extract.Input) {
	t.Helper()
	in := demoInput(t)
	return audit.Audit(in, audit.DefaultOptions), in
}

// writeInput writes the report of an input held in memory in format, as
// Check writes that of a file: the writer sees the input's studies too.
func writeInput(t testing.TB, format string, in *extract.Input) []byte {
	t.Helper()
	var buf bytes.Buffer
	wr, err := New(format, &buf)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := run(extract.FromInput(in), wr, format, Options{}); err != nil {
		t.Fatalf("writing the %s report: %v", format, err)
	}
	return buf.Bytes()
}

// writeReport writes a report held in memory in format (Write).
func writeReport(t testing.TB, format string, rep *audit.Report) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := Write(format, &buf, rep); err != nil {
		t.Fatalf("Write(%s): %v", format, err)
	}
	return buf.Bytes()
}

// tenThousandClaims is the audit of reportInput repeated to 10,000 claims,
// numbered as rows of one sheet: the report the writers' benchmarks time.
func tenThousandClaims() *audit.Report {
	base := audit.Audit(reportInput(), audit.DefaultOptions)
	rep := &audit.Report{Alpha: base.Alpha, Cautions: audit.Cautions}
	for len(rep.Claims) < 10000 {
		for _, c := range base.Claims {
			c.Row = len(rep.Claims) + 2
			c.Index = len(rep.Claims)
			rep.Claims = append(rep.Claims, c)
		}
	}
	rep.Summary.Add(rep.Claims)
	return rep
}
