// Package pool pools a literature's differences: the claims of many
// studies that share a topic are meta-analysed with the random-effects
// methods of package coefaudit/infer/meta (inverse-variance fixed effect,
// τ² by REML or DerSimonian–Laird, Wald and Hartung–Knapp–Sidik–Jonkman
// intervals, Cochran's Q and I², the Q-profile interval of τ², the
// prediction interval and leave-one-out estimates), with the claims that
// cannot be pooled listed with the reason, and a sensitivity analysis for
// the claims whose SE of the difference is only bounded.
//
// It sits above package audit because it takes audit's results: Run reads
// the ClaimResults of an audit.Report (each claim's difference and SE on
// its pooling scale, its outcome and topic) and pools them. audit decides
// each claim's verdict and knows nothing of pooling; package report writes
// the pooling reports and forest plots. Like audit, pool reads and writes
// no file.
package pool
