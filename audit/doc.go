// Package audit turns claims into verdicts: for each published comparison
// it picks the test the design calls for (independent samples, one fitted
// model, one sample), runs it on the reconstructed estimates, compares the
// result with the published verdict allowing for rounding and for what was
// never printed, and explains the outcome in plain words.
//
// Beyond the per-claim audit (AuditStudy, Run, and Audit for an input held
// in memory) it runs the bootstrap comparison on raw data already read
// (Bootstrap). Pooling the claims of a topic across studies is package
// coefaudit/pool, which takes audit's results. audit reads and writes no
// file: package coefaudit/report reads the input, streams studies through
// Run and writes every report.
//
// The range of p under rounding (p_range) is computed three ways, and the
// notes say which: exactly at the corners of the rounding box when the test
// statistic is monotone in each printed number and the SEs come from
// printed SEs or intervals; as a safe outer bound (interval arithmetic on the
// difference and its SE) when an SE was taken from the estimate's own p or
// statistic, or with a printed sampling correlation where the variance of
// the difference is not monotone over the box; and, for dependent
// correlations and regressions rebuilt from a correlation table, by
// evaluating a grid (every rounding limit and midpoint for correlations, 256
// corners drawn with a fixed seed for a table), which is not a proven bound.
//
// audit decides nothing about how numbers are read (package extract) and
// computes no statistics of its own (package infer).
package audit
