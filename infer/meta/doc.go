// Package meta pools differences between coefficients across studies: the
// inverse-variance fixed-effect estimate, Cochran's Q with I² and H², the
// random-effects model with the between-study variance τ² estimated by
// DerSimonian–Laird or by restricted maximum likelihood (REML), the
// Hartung–Knapp–Sidik–Jonkman interval, the Q-profile confidence interval
// for τ², the prediction interval for the effect in a new study, and a
// leave-one-out analysis.
//
// Every study contributes one effect y_i (on a scale common to all studies,
// e.g. a difference of log ratios or of standardized coefficients) and its
// sampling variance v_i, which is treated as known. The studies are assumed
// independent of each other. The package does no I/O: numbers in, result
// structs and errors out; Analyze is the entry point that runs everything.
//
// What it does not do: meta-regression, multivariate pooling of correlated
// estimates, small-sample corrections of the v_i, or any estimator of τ²
// other than DerSimonian–Laird and REML. It does not choose between the
// fixed-effect and random-effects models for the caller; Analysis reports
// both and says in Warnings where an interval is known to mislead.
//
// Levels are proportions (0.95 for 95%), and so are I² values (0.92 for
// 92%). Study indices in errors are 0-based positions in the input slice.
//
// References
//
//	[1] DerSimonian R, Laird N (1986). Meta-analysis in clinical trials.
//	    Controlled Clinical Trials 7(3):177-188.
//	[2] Higgins JPT, Thompson SG (2002). Quantifying heterogeneity in a
//	    meta-analysis. Statistics in Medicine 21(11):1539-1558.
//	[3] Viechtbauer W (2005). Bias and efficiency of meta-analytic variance
//	    estimators in the random-effects model. Journal of Educational and
//	    Behavioral Statistics 30(3):261-293.
//	[4] Viechtbauer W (2007). Confidence intervals for the amount of
//	    heterogeneity in meta-analysis. Statistics in Medicine 26(1):37-52.
//	[5] Hartung J, Knapp G (2001). A refined method for the meta-analysis of
//	    controlled clinical trials with binary outcome. Statistics in
//	    Medicine 20(24):3875-3889.
//	[6] Sidik K, Jonkman JN (2002). A simple confidence interval for
//	    meta-analysis. Statistics in Medicine 21(21):3153-3159.
//	[7] IntHout J, Ioannidis JPA, Borm GF (2014). The Hartung-Knapp-Sidik-
//	    Jonkman method for random effects meta-analysis is straightforward
//	    and considerably outperforms the standard DerSimonian-Laird method.
//	    BMC Medical Research Methodology 14:25.
//	[8] Higgins JPT, Thompson SG, Spiegelhalter DJ (2009). A re-evaluation of
//	    random-effects meta-analysis. Journal of the Royal Statistical
//	    Society A 172(1):137-159.
package meta
