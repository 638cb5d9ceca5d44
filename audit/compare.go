package audit

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"coefaudit/extract"
)

// ErrComparison is wrapped by the errors of CompareReported that concern
// the design: a relation, measure or verdict not in its list, a
// correlation where none can be, a value out of range.
var ErrComparison = errors.New("invalid comparison")

// Comparison is one claim typed in by hand: two reported estimates, how
// they are related and what the paper concluded.
type Comparison struct {
	First, Second Reported
	// Relation is Independent, SameModel or SameSample.
	Relation string
	// EstimateCorr is the sampling correlation of the two estimates, as
	// printed (Absent when unknown); only for SameModel and SameSample.
	EstimateCorr extract.Printed
	// Published is one of extract.Verdicts; Measure one of
	// extract.Measures; Alpha in (0, 1).
	Published, Measure string
	Alpha              float64
	// N1, N2 are the samples' sizes, DF the residual df, as printed
	// (Absent when not known).
	N1, N2, DF extract.Printed
}

// CompareReported audits one comparison exactly as a claims row of a
// workbook is audited: it builds an input holding the two coefficients and
// one claim (study "compare"; the two in separate groups when independent,
// in one group and one model for SameModel, one group and two models for
// SameSample) and runs Audit on it. The report holds one claim.
//
// The test is the one the design calls for, as in a workbook: for
// independent estimates [1]
//
//	z = (b₁ − b₂) / √(SE₁² + SE₂²)
//
// (on the log scale for ratio measures; Fisher's z for correlations with
// n); for two estimates of one model or sample with a printed sampling
// correlation ρ [2]
//
//	z = (b₁ − b₂) / √(SE₁² + SE₂² − 2ρ·SE₁·SE₂)
//
// (a t test on DF when it is given); and without ρ the range of p over
// every admissible ρ in [−1, 1].
//
// It fails with an error wrapping ErrComparison for a relation, measure or
// published verdict not in its list, an alpha outside (0, 1), a sampling
// correlation outside [−1, 1] or given for independent estimates, or an n
// or df that is not positive.
//
// [1] Altman DG, Bland JM (2003). Interaction revisited: the difference
// between two estimates. BMJ 326:219.
// [2] Clogg CC, Petkova E, Haritou A (1995). Statistical methods for
// comparing regression coefficients between models. American Journal of
// Sociology 100(5):1261–1293.
func CompareReported(c Comparison, opts Options) (*Report, error) {
	bad := func(format string, a ...any) (*Report, error) {
		return nil, fmt.Errorf("%s: %w", fmt.Sprintf(format, a...), ErrComparison)
	}
	if c.Measure == "" {
		c.Measure = extract.MeasureOther
	}
	if c.Published == "" {
		c.Published = extract.PublishedDiffer
	}
	if c.Alpha == 0 {
		c.Alpha = extract.DefaultAlpha
	}
	switch {
	case !oneOf(c.Relation, Independent, SameModel, SameSample):
		return bad("relation %q: want %s, %s or %s", c.Relation, Independent, SameModel, SameSample)
	case !oneOf(c.Measure, extract.Measures...):
		return bad("measure %q: want one of %s", c.Measure, strings.Join(extract.Measures, ", "))
	case !oneOf(c.Published, extract.Verdicts...):
		return bad("published %q: want one of %s", c.Published, strings.Join(extract.Verdicts, ", "))
	case !(c.Alpha > 0 && c.Alpha < 1):
		return bad("alpha %g: want a level between 0 and 1, e.g. 0.05", c.Alpha)
	case c.EstimateCorr.Present() && c.Relation == Independent:
		return bad("a sampling correlation of the estimates is given, but independent estimates have none")
	case c.EstimateCorr.Present() && (!c.EstimateCorr.IsExact() || math.Abs(c.EstimateCorr.Value) > 1):
		return bad("the sampling correlation %q must lie between −1 and 1", c.EstimateCorr.Text)
	}
	for _, p := range []struct {
		name string
		v    extract.Printed
	}{{"n of the first", c.N1}, {"n of the second", c.N2}, {"df", c.DF}} {
		if p.v.Present() && (!p.v.IsExact() || p.v.Value <= 0) {
			return bad("%s %q must be a positive number", p.name, p.v.Text)
		}
	}
	groups, models := [2]string{"first", "second"}, [2]string{"model", "model"}
	switch c.Relation {
	case SameModel:
		groups = [2]string{"sample", "sample"}
	case SameSample:
		groups, models = [2]string{"sample", "sample"}, [2]string{"first model", "second model"}
	}
	in := &extract.Input{Source: "compare"}
	for i, r := range []Reported{c.First, c.Second} {
		label := [2]string{"first", "second"}[i]
		n := [2]extract.Printed{c.N1, c.N2}[i]
		in.Coefficients = append(in.Coefficients, extract.Coefficient{
			Position: extract.Position{Sheet: "compare", Row: i + 2, Column: ""},
			Study:    "compare", Label: label, Measure: c.Measure, Group: groups[i], Model: models[i],
			Estimate: r.Estimate, CI: r.CI, CILevel: r.Level, SE: r.SE, P: r.P, DF: c.DF, N: n,
		})
	}
	in.Claims = []extract.Claim{{Position: extract.Position{Sheet: "compare", Row: 2},
		Study: "compare", Claim: "1", First: "first", Second: "second", Published: c.Published,
		Basis: extract.BasisUnstated, Alpha: c.Alpha, EstimateCorr: c.EstimateCorr}}
	return Audit(in, opts), nil
}

// ComparisonText is a comparison as typed on a command line: the two
// estimates as ParseReported reads them and the design's numbers as
// printed.
type ComparisonText struct {
	First, Second string
	// Relation is Independent, SameModel or SameSample.
	Relation string
	// Corr is the printed sampling correlation of the two estimates ("" when
	// unknown).
	Corr               string
	Published, Measure string
	Alpha              float64
	// N1 and N2 are the samples' sizes; N is one size for both, for one
	// sample; DF the residual df. "" when not known.
	N1, N2, N, DF string
}

// FieldError is a problem with one field of a ComparisonText. Field is the
// field's name in lower case (first, second, corr, n1, n2, n, df).
type FieldError struct {
	Field string
	Err   error
}

// Error implements error.
func (e *FieldError) Error() string { return e.Field + ": " + e.Err.Error() }

// Unwrap returns the underlying error.
func (e *FieldError) Unwrap() error { return e.Err }

// ParseComparison reads a ComparisonText into a Comparison: the estimates
// with ParseReported, the correlation with ParseCorrelation, n and df with
// extract.ParseCount. Errors are *FieldError naming the field; N given
// together with N1 or N2 is an error of the field n. The design itself is
// checked by CompareReported.
func ParseComparison(t ComparisonText) (Comparison, error) {
	c := Comparison{Relation: t.Relation, Published: t.Published, Measure: t.Measure, Alpha: t.Alpha}
	var err error
	if c.First, err = ParseReported(t.First); err != nil {
		return Comparison{}, &FieldError{"first", err}
	}
	if c.Second, err = ParseReported(t.Second); err != nil {
		return Comparison{}, &FieldError{"second", err}
	}
	if c.EstimateCorr, err = ParseCorrelation(t.Corr); err != nil {
		return Comparison{}, &FieldError{"corr", err}
	}
	if t.N != "" && (t.N1 != "" || t.N2 != "") {
		return Comparison{}, &FieldError{"n", fmt.Errorf("give n for one sample, or n1 and n2 for two, not both: %w", ErrComparison)}
	}
	if t.N != "" {
		t.N1, t.N2 = t.N, t.N
	}
	for _, f := range []struct {
		name string
		text string
		to   *extract.Printed
	}{{"n1", t.N1, &c.N1}, {"n2", t.N2, &c.N2}, {"df", t.DF, &c.DF}} {
		p, err := extract.ParseCount(f.text)
		if err != nil {
			return Comparison{}, &FieldError{f.name, err}
		}
		*f.to = p
	}
	return c, nil
}

func oneOf(s string, list ...string) bool {
	for _, l := range list {
		if s == l {
			return true
		}
	}
	return false
}

// ParseCorrelation reads the printed sampling correlation of two estimates
// for Comparison.EstimateCorr: a number as printed, blank for none.
func ParseCorrelation(text string) (extract.Printed, error) {
	p, err := extract.ParseNumber(text)
	if err != nil {
		return extract.Printed{}, fmt.Errorf("the sampling correlation: %w", err)
	}
	if p.Present() && math.Abs(p.Value) > 1 {
		return extract.Printed{}, fmt.Errorf("the sampling correlation %s must lie between −1 and 1: %w", strconv.Quote(p.Text), ErrComparison)
	}
	return p, nil
}
