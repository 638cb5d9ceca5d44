// Package extract reads what a paper printed: the coefficients, claims and
// correlation sheets of a workbook, a folder of CSV files or a single paired
// CSV, and the raw data a bootstrap needs. Every number is kept as printed
// (value and decimals, so that "0.43" is known to stand for [0.425, 0.435)),
// and every problem carries the file, sheet, row and column it came from.
//
// It also reconstructs a coefficient's standard error from the numbers that
// were printed (reconstruct.go), recording which ones were used.
//
// extract never decides a verdict: that is package audit's job.
package extract
