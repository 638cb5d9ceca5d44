package report

import (
	"encoding/csv"
	"io"
	"os"
	"path/filepath"
	"testing"
	"time"

	"coefaudit/audit"
	"coefaudit/extract"
)

// The speed targets: a million paired claims checked to CSV in at most 6×
// the time encoding/csv takes merely to read and split the file, and to
// JSON in at most 10×. BenchmarkCheckMillionCSV and BenchmarkCheckMillionJSON
// measure both in one run and report their ratio as "x-read"; run them
// with -benchtime 1x. The file is the one the README's figures use,
//
//	go run ./fixtures/gen_paired.go -n 1000000 -o /tmp/paired.csv
//
// found at $COEFAUDIT_PAIRED_CSV or else paired.csv in the temporary
// folder; the benchmarks skip when it is absent.
func millionClaims(b *testing.B) string {
	path := os.Getenv("COEFAUDIT_PAIRED_CSV")
	if path == "" {
		path = filepath.Join(os.TempDir(), "paired.csv")
	}
	if _, err := os.Stat(path); err != nil {
		b.Skipf("%s: %v; write it with go run ./fixtures/gen_paired.go -n 1000000 -o %s", path, err, path)
	}
	return path
}

// BenchmarkReadSplitMillion only reads and splits the file with
// encoding/csv, the baseline of the speed targets.
func BenchmarkReadSplitMillion(b *testing.B) {
	path := millionClaims(b)
	for b.Loop() {
		readAndSplit(b, path)
	}
}

// BenchmarkAuditMillion reads and audits the million claims and writes
// nothing: what the reports' time is made of before any writer.
func BenchmarkAuditMillion(b *testing.B) {
	benchmarkMillion(b, func(path string) error {
		src, err := extract.Open(path)
		if err != nil {
			return err
		}
		defer src.Close()
		_, err = audit.Run(src.Studies(), audit.DefaultOptions, func(audit.StudyResult) error { return nil })
		return err
	})
}

func BenchmarkCheckMillionCSV(b *testing.B)  { benchmarkCheckMillion(b, "csv") }
func BenchmarkCheckMillionJSON(b *testing.B) { benchmarkCheckMillion(b, "json") }

// benchmarkCheckMillion checks the million claims to format, output
// discarded.
func benchmarkCheckMillion(b *testing.B, format string) {
	benchmarkMillion(b, func(path string) error {
		_, err := Check(path, io.Discard, format, Options{Audit: audit.DefaultOptions})
		return err
	})
}

// benchmarkMillion times check on the million claims' file and reports
// the time per claim, the baseline read (before and after, averaged: on a
// shared machine the speed drifts within a run) and their ratio.
func benchmarkMillion(b *testing.B, check func(path string) error) {
	path := millionClaims(b)
	before := readAndSplit(b, path) // warms the page cache too
	b.ResetTimer()
	for range b.N {
		if err := check(path); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	read := (before + readAndSplit(b, path)) / 2
	per := b.Elapsed().Seconds() / float64(b.N)
	b.ReportMetric(per*1e9/1e6, "ns/claim")
	b.ReportMetric(read, "read-s")
	b.ReportMetric(per/read, "x-read")
}

// readAndSplit reads path with encoding/csv (records reused, as fast as
// it goes) and returns the seconds it took.
func readAndSplit(b *testing.B, path string) float64 {
	f, err := os.Open(path)
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	start := time.Now()
	r := csv.NewReader(f)
	r.ReuseRecord = true
	for {
		if _, err := r.Read(); err == io.EOF {
			break
		} else if err != nil {
			b.Fatal(err)
		}
	}
	return time.Since(start).Seconds()
}
