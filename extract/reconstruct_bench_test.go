package extract

import (
	"os"
	"testing"
)

// benchCoefficients reads the coefficients of a generated paired CSV (see
// writeBenchPaired) and adds, for each common way an SE is printed, a copy
// of each coefficient with that way only: the SE itself, the t statistic,
// an exact p and a p bound, so that every common path of Reconstruct runs.
func benchCoefficients(b *testing.B, rows int) []Coefficient {
	b.Helper()
	var out []Coefficient
	readPairedClaims(b, writeBenchPaired(b, rows), func(pc PairedClaim) {
		for _, c := range []Coefficient{pc.First, pc.Second} {
			out = append(out, c)
			bare := c
			bare.CI = Interval{}
			withSE, withStat, withP, withBound := bare, bare, bare, bare
			withSE.SE = Printed{Value: 0.07, Decimals: 2, Bound: Exact, Text: "0.07"}
			withStat.Stat = Printed{Value: 2.41, Decimals: 2, Bound: Exact, Text: "2.41"}
			withP.P = Printed{Value: 0.032, Decimals: 3, Bound: Exact, Text: "0.032"}
			withBound.P = Printed{Value: 0.001, Decimals: 3, Bound: Below, Text: "p < .001"}
			out = append(out, withSE)
			if c.Estimate.Value != 0 {
				// A zero estimate fixes no SE from its statistic or p.
				out = append(out, withStat, withP, withBound)
			}
		}
	})
	return out
}

// BenchmarkReconstruct rebuilds the SE of coefficients read from a
// generated paired CSV, through every common path, and reports the cost of
// one coefficient.
func BenchmarkReconstruct(b *testing.B) {
	cs := benchCoefficients(b, 2000)
	b.ReportAllocs()
	m := startPerRow()
	done := 0
	for b.Loop() {
		for i := range cs {
			if _, err := Reconstruct(&cs[i], 4); err != nil {
				b.Fatal(err)
			}
		}
		done += len(cs)
	}
	if done > 0 {
		b.StopTimer()
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(done), "ns/coefficient")
		b.ReportMetric(float64(m.mallocsSince())/float64(done), "allocs/coefficient")
	}
}

// BenchmarkReconstructPairedFile streams the paired CSV named by the
// environment variable COEFAUDIT_PAIRED_CSV through PairedReader and
// rebuilds the SE of both sides of every row, the extract half of an audit
// of a large literature. It is skipped when the variable is unset or the
// file is absent; the README's file of a million invented claims is made by
//
//	go run ./fixtures/gen_paired.go -n 1000000 -o /tmp/paired-x.csv
//
// Each coefficient is taken to come from a model of two listed
// coefficients (the two sides of a claim), which sets the df derived as
// n − k − 1 for a regression coefficient without a printed df.
func BenchmarkReconstructPairedFile(b *testing.B) {
	path := os.Getenv("COEFAUDIT_PAIRED_CSV")
	if path == "" {
		b.Skip("COEFAUDIT_PAIRED_CSV is not set")
	}
	if _, err := os.Stat(path); err != nil {
		b.Skipf("no paired CSV: %v", err)
	}
	b.ReportAllocs()
	rows, rebuilt := 0, 0
	m := startPerRow()
	for b.Loop() {
		rows += readPairedClaims(b, path, func(pc PairedClaim) {
			for _, c := range []*Coefficient{&pc.First, &pc.Second} {
				// Rows with nothing to rebuild from, or broken on purpose,
				// give an error, as they would in an audit.
				if _, err := Reconstruct(c, 2); err == nil {
					rebuilt++
				}
			}
		})
	}
	if rows > 0 {
		b.ReportMetric(float64(rebuilt)/float64(2*rows), "rebuilt/side")
	}
	m.report(b, rows)
}
