package extract

import (
	"fmt"
	"strconv"
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
//	           first-larger: first-greater;  second-larger: second-greater;
//	           first-stronger: first-larger-magnitude;
//	           second-stronger: second-larger-magnitude
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
		"first-greater": PublishedFirstLarger, "second-greater": PublishedSecondLarger,
		"first-larger-magnitude": PublishedFirstStronger, "second-larger-magnitude": PublishedSecondStronger,
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

// allowedValue maps a cell of the measure, published or basis column to its
// canonical value. It fails with ErrUnknownValue naming the values allowed.
func allowedValue(column, text string) (string, error) {
	if len(text) > maxAllowedText {
		// No allowed value is this long; folding a huge cell would copy it.
		return "", fmt.Errorf("%s is not a %s value (allowed: %s): %w",
			quoteShort(text), column, strings.Join(allowedValues[column], ", "), ErrUnknownValue)
	}
	t := trimSpace(text)
	allowed := allowedValues[column]
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
	return "", fmt.Errorf("%s is not a %s value (allowed: %s): %w",
		quoteShort(t), column, strings.Join(allowedValues[column], ", "), ErrUnknownValue)
}

// maxAllowedText is longer than any allowed value or alias of one.
const maxAllowedText = 64

// quoteShort quotes a cell for a message, cut to its first 60 characters:
// a message names the cell, it need not repeat a megabyte of it.
func quoteShort(s string) string {
	s = trimSpace(s)
	n := 0
	for i := range s {
		if n == 60 {
			return strconv.Quote(s[:i]) + fmt.Sprintf("… (%d bytes)", len(s))
		}
		n++
	}
	return strconv.Quote(s)
}
