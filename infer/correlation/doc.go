// Package correlation compares two correlation coefficients: the Fisher z
// of one correlation and its interval, and the tests and intervals for the
// difference between two correlations in the three designs a paper can
// have:
//
//   - independent: r1 and r2 come from different samples (CompareIndependent);
//   - overlapping: r(j,k) and r(j,h) come from one sample and share the
//     variable j (CompareOverlapping);
//   - non-overlapping: r(j,k) and r(h,m) come from one sample and share no
//     variable (CompareNonOverlapping).
//
// Each entry point returns a Comparison: the primary method of the design,
// the other published methods as alternatives, the difference r1 − r2 and
// Zou's (2007) interval for ρ1 − ρ2. The primary methods are Fisher's z for
// independent samples, Williams' t for overlapping correlations and the ZPF
// statistic for non-overlapping ones; the doc comment of each entry point
// says why.
//
// Every method assumes multivariate normal data and is a large-sample
// approximation: the tests refer their statistic to the normal distribution
// (Williams' t to Student's t with n − 3 df). Nothing here corrects for
// non-normality, rounding of the printed correlations or pairwise deletion
// (a different n behind each correlation); the caller says so in its notes.
//
// The package is pure: numbers in, result structs and errors out. It reads
// no files, prints nothing and imports only the standard library, gonum and
// coefaudit/infer. Levels are proportions (0.95 for 95%). Invalid input
// gives an error wrapping one of the sentinels ErrCorrelationRange,
// ErrSampleSize, ErrNotPositiveDefinite or infer.ErrProbability (a level
// outside (0, 1)); problems that do not stop the computation are reported in
// each Result's Warnings.
//
// References
//
//	[1] Fisher RA (1921). On the "probable error" of a coefficient of
//	    correlation deduced from a small sample. Metron 1:3–32.
//	[2] Pearson K, Filon LNG (1898). Mathematical contributions to the theory
//	    of evolution. IV. On the probable errors of frequency constants and
//	    on the influence of random selection on variation and correlation.
//	    Philosophical Transactions of the Royal Society A 191:229–311.
//	[3] Williams EJ (1959). The comparison of regression variables. Journal
//	    of the Royal Statistical Society B 21(2):396–399.
//	[4] Dunn OJ, Clark V (1969). Correlation coefficients measured on the
//	    same individuals. Journal of the American Statistical Association
//	    64(325):366–377.
//	[5] Steiger JH (1980). Tests for comparing elements of a correlation
//	    matrix. Psychological Bulletin 87(2):245–251.
//	[6] Meng X-L, Rosenthal R, Rubin DB (1992). Comparing correlated
//	    correlation coefficients. Psychological Bulletin 111(1):172–175.
//	[7] Raghunathan TE, Rosenthal R, Rubin DB (1996). Comparing correlated
//	    but nonoverlapping correlations. Psychological Methods 1(2):178–183.
//	[8] Hittner JB, May K, Silver NC (2003). A Monte Carlo evaluation of
//	    tests for comparing dependent correlations. Journal of General
//	    Psychology 130(2):149–168.
//	[9] Zou GY (2007). Toward using confidence intervals to compare
//	    correlations. Psychological Methods 12(4):399–413.
package correlation
