package extract

import (
	"bufio"
	"encoding/csv"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"testing"
)

// benchPairedRows is the size of the generated paired CSV of the
// benchmarks: large enough that the per-row figures are not set by the
// header and the buffers' first growth.
const benchPairedRows = 200000

// writeBenchPaired writes a paired CSV of n invented claims (fixed seed) in
// the shape of an audit's input: claim columns, then each side's label,
// measure, group, estimate, interval limits and n, all printed with two
// decimals as tables print them. It returns the file's path.
func writeBenchPaired(tb testing.TB, n int) string {
	tb.Helper()
	path := filepath.Join(tb.TempDir(), "paired.csv")
	f, err := os.Create(path)
	if err != nil {
		tb.Fatal(err)
	}
	w := bufio.NewWriter(f)
	w.WriteString("study,claim,published,basis,first_label,first_measure,first_group,first_estimate,first_ci_low,first_ci_high,first_n," +
		"second_label,second_measure,second_group,second_estimate,second_ci_low,second_ci_high,second_n\n")
	rng := rand.New(rand.NewPCG(7, 11))
	verdicts := []string{PublishedDiffer, PublishedNoDifference, PublishedFirstLarger, PublishedSecondLarger}
	two := func(x float64) string { return strconv.FormatFloat(x, 'f', 2, 64) }
	var line []byte
	for i := range n {
		line = line[:0]
		line = append(line, 'S')
		line = strconv.AppendInt(line, int64(i/4), 10)
		line = append(line, ",c"...)
		line = strconv.AppendInt(line, int64(i), 10)
		line = append(line, ',')
		line = append(line, verdicts[i%4]...)
		line = append(line, ",test"...)
		for side, label := range []string{"a", "b"} {
			est := rng.Float64() - 0.1
			n := 30 + rng.IntN(900)
			half := 1.96 * (0.5 + rng.Float64()) / math.Sqrt(float64(n)) * 3
			line = append(line, ',')
			line = append(line, label...)
			line = append(line, ",b,g"...)
			line = strconv.AppendInt(line, int64(side+1), 10)
			line = append(line, ',')
			line = append(line, two(est)...)
			line = append(line, ',')
			line = append(line, two(est-half)...)
			line = append(line, ',')
			line = append(line, two(est+half)...)
			line = append(line, ',')
			line = strconv.AppendInt(line, int64(n), 10)
		}
		line = append(line, '\n')
		w.Write(line)
	}
	if err := w.Flush(); err != nil {
		tb.Fatal(err)
	}
	if err := f.Close(); err != nil {
		tb.Fatal(err)
	}
	return path
}

// BenchmarkPairedFile streams a generated paired CSV of benchPairedRows
// claims through PairedReader and reports the cost of one row: the time and
// the allocations of Next, the CSV reading included.
func BenchmarkPairedFile(b *testing.B) {
	path := writeBenchPaired(b, benchPairedRows)
	b.ReportAllocs()
	rows := 0
	m := startPerRow()
	for b.Loop() {
		rows += readPairedClaims(b, path, func(pc PairedClaim) {
			if p := pairedProblems(pc); p != "" {
				b.Fatalf("row %d has problems:%s", pc.Claim.Row, p)
			}
		})
	}
	m.report(b, rows)
}

// readPairedClaims streams the paired CSV at path through PairedReader,
// handing each claim to use, and returns the number of claims. The claim
// is passed by value so that it stays on the stack, as a caller of Next
// would keep it.
func readPairedClaims(b *testing.B, path string, use func(PairedClaim)) int {
	b.Helper()
	f, err := os.Open(path)
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	pr, err := NewPairedReader(f, path)
	if err != nil {
		b.Fatal(err)
	}
	rows := 0
	for {
		pc, err := pr.Next()
		if err == io.EOF {
			return rows
		}
		if err != nil {
			b.Fatal(err)
		}
		use(pc)
		rows++
	}
}

// BenchmarkPairedFileCSVOnly reads the same file with encoding/csv alone
// (ReuseRecord), the floor the reader's cost is measured against.
func BenchmarkPairedFileCSVOnly(b *testing.B) {
	benchPairedPasses(b, func(f *os.File) int {
		cr := csv.NewReader(bufio.NewReaderSize(f, csvBufferSize))
		cr.ReuseRecord = true
		rows := 0
		for {
			if _, err := cr.Read(); err != nil {
				if err != io.EOF {
					b.Fatal(err)
				}
				return rows
			}
			rows++
		}
	})
}

// benchPairedPasses reads BenchmarkPairedFile's file with pass, once an
// iteration, and reports the cost of a row; pass returns the rows it read.
func benchPairedPasses(b *testing.B, pass func(*os.File) int) {
	path := writeBenchPaired(b, benchPairedRows)
	b.ReportAllocs()
	rows := 0
	m := startPerRow()
	for b.Loop() {
		f, err := os.Open(path)
		if err != nil {
			b.Fatal(err)
		}
		rows += pass(f)
		f.Close()
	}
	m.report(b, rows)
}

// perRow measures the mallocs of a benchmark's loop, to report them per
// row rather than per pass over the file.
type perRow struct{ mallocs uint64 }

func startPerRow() perRow {
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	return perRow{mallocs: ms.Mallocs}
}

// mallocsSince returns the mallocs since startPerRow.
func (m perRow) mallocsSince() uint64 {
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	return ms.Mallocs - m.mallocs
}

// report reports ns/row and allocs/row over all passes' rows.
func (m perRow) report(b *testing.B, rows int) {
	b.Helper()
	if rows == 0 {
		return
	}
	b.StopTimer()
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(rows), "ns/row")
	b.ReportMetric(float64(m.mallocsSince())/float64(rows), "allocs/row")
}

// BenchmarkCountPaired runs the first pass over a generated paired CSV of
// benchPairedRows claims (countPaired): nothing else of a paired CSV's
// reading starts before it ends, so its time adds to a check's whole.
func BenchmarkCountPaired(b *testing.B) {
	path := writeBenchPaired(b, benchPairedRows)
	for b.Loop() {
		if _, _, _, _, _, err := countPaired(path); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchPairedRows), "ns/row")
}
