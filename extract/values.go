package extract

import (
	"fmt"
	"strings"
)

// The allowed values of the measure, published and basis columns are matched
// after folding: lower-case, trimmed, with spaces and underscores read as
// hyphens, so "No difference", "no_difference" and "NO-DIFFERENCE" are all
// no-difference. On top of the canonical values these variants are accepted:
//
//	measure    b: coef, coefficient, unstandardized, unstandardised
//	           beta: β, std-beta, standardized, standardised,
//	                 standardized-beta, standardised-beta
//	           r: correlation;  or: odds-ratio;  rr: risk-ratio,
//	           relative-risk;  hr: hazard-ratio;  md: mean-difference
//	published  differ: differs, different;
//	           no-difference: nodifference, no-diff, not-different;
//	           first-larger: first-greater, first-stronger;
//	           second-larger: second-greater, second-stronger
//	basis      test: tested, formal-test;  overlap: ci-overlap,
//	           interval-overlap;  significance-split: sig-split;
//	           unstated: not-stated, unknown
var valueAliases = map[string]map[string]string{
	"measure": {
		"coef": MeasureB, "coefficient": MeasureB, "unstandardized": MeasureB, "unstandardised": MeasureB,
		"β": MeasureBeta, "std-beta": MeasureBeta, "standardized": MeasureBeta, "standardised": MeasureBeta,
		"standardized-beta": MeasureBeta, "standardised-beta": MeasureBeta,
		"correlation": MeasureR, "odds-ratio": MeasureOR, "risk-ratio": MeasureRR, "relative-risk": MeasureRR,
		"hazard-ratio": MeasureHR, "mean-difference": MeasureMD,
	},
	"published": {
		"differs": PublishedDiffer, "different": PublishedDiffer,
		"nodifference": PublishedNoDifference, "no-diff": PublishedNoDifference, "not-different": PublishedNoDifference,
		"first-greater": PublishedFirstLarger, "first-stronger": PublishedFirstLarger,
		"second-greater": PublishedSecondLarger, "second-stronger": PublishedSecondLarger,
	},
	"basis": {
		"tested": BasisTest, "formal-test": BasisTest,
		"ci-overlap": BasisOverlap, "interval-overlap": BasisOverlap,
		"sig-split":  BasisSignificanceSplit,
		"not-stated": BasisUnstated, "unknown": BasisUnstated,
	},
}

// allowedValues lists the canonical values of each column.
var allowedValues = map[string][]string{
	"measure":   Measures,
	"published": Verdicts,
	"basis":     Bases,
}

// foldValue lower-cases a value and reads spaces and underscores as hyphens.
func foldValue(s string) string {
	s = strings.ToLower(trimSpace(s))
	s = strings.Join(strings.FieldsFunc(s, func(r rune) bool { return isSpace(r) || r == '_' || r == '-' }), "-")
	return s
}

// allowedList returns allowedValues[column] without hashing the name, as
// every row of a large input asks for it.
func allowedList(column string) []string {
	switch column {
	case "measure":
		return Measures
	case "published":
		return Verdicts
	case "basis":
		return Bases
	}
	return allowedValues[column]
}

// allowedValue maps a cell of the measure, published or basis column to its
// canonical value. It fails with ErrUnknownValue naming the values allowed.
func allowedValue(column, text string) (string, error) {
	t := text
	if !isTrimmed(t) {
		t = trimSpace(t)
	}
	allowed := allowedList(column)
	for _, a := range allowed {
		if t == a {
			return a, nil
		}
	}
	v := foldValue(t)
	for _, a := range allowed {
		if v == a {
			return a, nil
		}
	}
	if a, ok := valueAliases[column][v]; ok {
		return a, nil
	}
	return "", fmt.Errorf("%q is not a %s value (allowed: %s): %w",
		trimSpace(text), column, strings.Join(allowedValues[column], ", "), ErrUnknownValue)
}
