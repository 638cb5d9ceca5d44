package extract

import (
	"bufio"
	"os"
	"testing"

	"github.com/gocarina/gocsv"
)

// The claims and coefficients rows of a paired CSV or a CSV folder could be
// read into tagged structs of strings by gocarina/gocsv rather than through
// csvSource and the column lookups every input form shares. The reader
// keeps encoding/csv: BenchmarkPairedFileGocsv only maps the rows of the
// file BenchmarkPairedFile reads into a struct of strings, and takes longer
// a row than PairedReader.Next takes to read, map and parse a row whole
// (numbers, intervals, problems), on a path whose target the reports
// already miss (BenchmarkCheckMillionCSV). A struct's tags also cannot keep
// a row's unknown columns, which the reports pass through, nor say on which
// line a field stands.

// pairedCells is a row of writeBenchPaired's file as gocsv maps it.
type pairedCells struct {
	Study          string `csv:"study"`
	Claim          string `csv:"claim"`
	Published      string `csv:"published"`
	Basis          string `csv:"basis"`
	FirstLabel     string `csv:"first_label"`
	FirstMeasure   string `csv:"first_measure"`
	FirstGroup     string `csv:"first_group"`
	FirstEstimate  string `csv:"first_estimate"`
	FirstCILow     string `csv:"first_ci_low"`
	FirstCIHigh    string `csv:"first_ci_high"`
	FirstN         string `csv:"first_n"`
	SecondLabel    string `csv:"second_label"`
	SecondMeasure  string `csv:"second_measure"`
	SecondGroup    string `csv:"second_group"`
	SecondEstimate string `csv:"second_estimate"`
	SecondCILow    string `csv:"second_ci_low"`
	SecondCIHigh   string `csv:"second_ci_high"`
	SecondN        string `csv:"second_n"`
}

// BenchmarkPairedFileGocsv maps the rows of BenchmarkPairedFile's file into
// pairedCells with gocsv, and nothing more.
func BenchmarkPairedFileGocsv(b *testing.B) {
	benchPairedPasses(b, func(f *os.File) int {
		rows := 0
		err := gocsv.UnmarshalToCallback(bufio.NewReaderSize(f, csvBufferSize), func(c pairedCells) {
			if c.Study == "" {
				b.Fatalf("row %d has no study", rows+2)
			}
			rows++
		})
		if err != nil {
			b.Fatal(err)
		}
		return rows
	})
}
