package main

import "runtime/debug"

// The garbage collector's settings for a run of the command: the heap may
// grow to five times the live heap (GOGC 400), under a soft limit of
// collectorLimit. An audit allocates some 4 kB a claim that dies within
// its study while little stays live, so the collector's default (GOGC 100)
// runs it every few tens of megabytes and takes a fifth of the CPU of a
// million claims; and where a large input keeps much live (the HTML report
// of a large workbook, the xlsx report) the limit makes it collect before
// the heap doubles. BenchmarkCollector compares the run with and without
// them, on the million paired claims of BenchmarkCheckMillionCSV (package
// report): without them the time is some 20% more, and the peak memory of
// the large workbook's HTML report (BenchmarkReadWorkbook100k's 140,000
// claims, measured with /usr/bin/time -v) passes the 150 MB target. The
// limit leaves room for what the xlsx report cannot let go: excelize keeps
// each streamed sheet's buffer until the workbook is written, some 80 MiB
// at the end of a large workbook's report, and at 120 MiB the peak of the
// xlsx report of BenchmarkReadWorkbook100k's workbook passed the target in
// about one run in five (/usr/bin/time -v); a lower limit than this one
// slowed the largest workbook's xlsx report by half. They
// are set here, by the command, never by a library package; GOGC or
// GOMEMLIMIT in the environment wins.
const (
	collectorPercent = 400
	collectorLimit   = 110 << 20
)

// setCollector applies the settings that getenv does not override.
func setCollector(getenv func(string) string) {
	if getenv("GOGC") == "" {
		debug.SetGCPercent(collectorPercent)
	}
	if getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(collectorLimit)
	}
}
