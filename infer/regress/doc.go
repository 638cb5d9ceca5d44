// Package regress fits linear regressions, from raw data or from the summary
// statistics a paper prints, and gives the covariance of their coefficients
// so that two coefficients of one model can be compared.
//
// OLS fits raw data (with or without intercept) by Householder QR of the
// centred, scaled predictors, refined against the data with residuals in
// twice the working precision; it never forms or inverts XᵀX. It matches the
// NIST StRD linear-regression certified values to 13 or more digits, except
// Filip (about 8), and refuses constant or collinear predictors with a
// *PredictorError naming the column.
//
// FromSummary rebuilds the same regression from a correlation matrix (and,
// when given, SDs and means): standardized and unstandardized coefficients,
// R², classical covariance matrices, and for the standardized coefficients
// both the "standard method" covariance (fixed regressors) and the
// normal-theory delta-method covariance for random regressors (Yuan & Chan
// 2011; Jones & Waller 2013). DifferenceVariance and TestDifference compare
// two coefficients using the covariance matrix.
//
// The package does no I/O. Errors are values wrapping the sentinels in
// errors.go; non-fatal problems are returned in the results' Warnings.
package regress
