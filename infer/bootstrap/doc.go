// Package bootstrap compares two coefficients of one linear regression
// fitted to raw data by the nonparametric (case-resampling) bootstrap: the
// percentile, BC and BCa intervals for the difference of their standardized
// (or unstandardized) coefficients, bootstrap p-values, and the
// delta-method test beside them (Efron 1987; DiCiccio & Efron 1996).
//
// It is built for speed on large samples: resamples are never copied — each
// accumulates the centred cross-product matrix of (outcome, predictors)
// from the data columns and solves a small Cholesky system — the work is
// spread over all cores with results stored by resample index, so a seed
// gives bit-identical results for any number of workers, and the jackknife
// for the BCa acceleration downdates the full cross-product matrix row by
// row instead of refitting. Each worker holds O(p²) numbers; nothing is
// allocated per resample.
//
// The package does no I/O: data arrive as columns, without missing values.
package bootstrap
