// Package audit turns claims into verdicts: for each published comparison
// it picks the test the design calls for (independent samples, one fitted
// model, one sample), runs it on the reconstructed estimates, compares the
// result with the published verdict allowing for rounding and for what was
// never printed, and explains the outcome in plain words. It also writes
// the reports: a terminal table, CSV and JSON.
//
// audit decides nothing about how numbers are read (package extract) and
// computes no statistics of its own (package infer).
package audit
