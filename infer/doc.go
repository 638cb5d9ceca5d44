// Package infer holds the statistics of coefaudit: numbers in, numbers and
// errors out. It reads no files, prints nothing and imports nothing of the
// rest of the project.
//
// It provides accurate distribution tails (distributions.go), standard errors
// reconstructed from what a paper printed (standarderror.go), the test of the
// difference between two estimates, independent or correlated, with the
// range of p over rounding and over every admissible correlation of the two
// (difference.go), the confidence-interval overlap rule of Cumming & Finch
// (overlap.go) and multiplicity adjustments (multiplicity.go). Comparisons of correlations,
// regression from summary statistics, the bootstrap and meta-analysis live in
// the subpackages correlation, regress, bootstrap and meta.
//
// This package is opinionated: it gives the large-sample tests a reader can
// run from printed numbers, and says in Warnings where an approximation was
// made.
package infer
