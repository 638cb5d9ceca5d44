package main

import (
	"io"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"testing"
	"time"
)

// restoreCollector puts the collector's settings back as they were.
func restoreCollector(t testing.TB) {
	percent := debug.SetGCPercent(100)
	limit := debug.SetMemoryLimit(math.MaxInt64)
	t.Cleanup(func() {
		debug.SetGCPercent(percent)
		debug.SetMemoryLimit(limit)
	})
}

// TestSetCollector: the command's settings apply unless the environment
// names its own, each on its own.
func TestSetCollector(t *testing.T) {
	for _, tc := range []struct {
		env          map[string]string
		percent      int
		limitApplied bool
	}{
		{map[string]string{}, collectorPercent, true},
		{map[string]string{"GOGC": "50"}, 100, true},
		{map[string]string{"GOMEMLIMIT": "1GiB"}, collectorPercent, false},
	} {
		restoreCollector(t)
		setCollector(func(k string) string { return tc.env[k] })
		percent := debug.SetGCPercent(100)
		limit := debug.SetMemoryLimit(-1) // reads it
		if percent != tc.percent || (limit == collectorLimit) != tc.limitApplied {
			t.Errorf("env %v: GOGC %d, limit %d; want GOGC %d, the command's limit %v", tc.env, percent, limit, tc.percent, tc.limitApplied)
		}
	}
}

// BenchmarkCollector checks the million paired claims of
// BenchmarkCheckMillionCSV (package report; $COEFAUDIT_PAIRED_CSV) to a
// CSV file through the command, with the collector's default and with
// setCollector's settings, and reports the time a claim and the peak of
// the memory the runtime took from the system, sampled every 10 ms (an
// estimate of what /usr/bin/time -v reports). Run it with -benchtime 1x.
func BenchmarkCollector(b *testing.B) {
	path := os.Getenv("COEFAUDIT_PAIRED_CSV")
	if path == "" {
		path = filepath.Join(os.TempDir(), "paired.csv")
	}
	if _, err := os.Stat(path); err != nil {
		b.Skipf("%s: %v; write it with go run ./fixtures/gen_paired.go -n 1000000 -o %s", path, err, path)
	}
	out := filepath.Join(b.TempDir(), "audit.csv")
	for _, mode := range []string{"default", "command"} {
		b.Run(mode, func(b *testing.B) {
			restoreCollector(b)
			if mode == "command" {
				setCollector(func(string) string { return "" })
			}
			runtime.GC()
			peak := make(chan uint64)
			stop := make(chan struct{})
			go func() {
				var most uint64
				var ms runtime.MemStats
				for {
					runtime.ReadMemStats(&ms)
					most = max(most, ms.Sys-ms.HeapReleased)
					select {
					case <-stop:
						peak <- most
						return
					case <-time.After(10 * time.Millisecond):
					}
				}
			}()
			b.ResetTimer()
			for b.Loop() {
				if code := run([]string{"check", path, "--format", "csv", "--out", out, "--fail-on", "none"}, io.Discard, io.Discard); code != exitOK {
					b.Fatalf("check: exit %d", code)
				}
			}
			b.StopTimer()
			close(stop)
			b.ReportMetric(float64(<-peak)/1e6, "peak-MB")
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/1e6, "ns/claim")
		})
	}
}
