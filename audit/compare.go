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
	// R13, R14, R23 and R24 are the other correlations of one sample for
	// comparing two dependent correlations, in the notation of Steiger
	// (1980): the first estimate is r12; with R23 alone the second is r13
	// (overlapping: variable 1 in both), with all four it is r34
	// (non-overlapping). Absent when not given.
	R13, R14, R23, R24 extract.Printed
}

// dependentCorrelations reports whether the comparison is of two
// correlations of one sample with their cross correlations, and whether
// they share a variable.
func (c *Comparison) dependentCorrelations() (given, overlapping bool) {
	four := c.R13.Present() || c.R14.Present() || c.R24.Present()
	return four || c.R23.Present(), !four
}

// CompareReported audits one comparison exactly as a claims row of a
// workbook is audited: it builds an input holding the two coefficients and
// one claim, placed on no sheet or row and in no study, so that no note
// speaks of a workbook (the two in separate groups when independent, in
// one group and one model for SameModel, one group and two models for
// SameSample; two correlations of one sample with their cross correlations
// R13, R14, R23, R24 as that sample's correlations), and runs Audit on it.
// The report holds one claim.
//
// Two correlations of one sample are compared as in a workbook: r12 and
// r13 with r23 by Williams' t (Steiger 1980, eq. 7), r12 and r34 with the
// four cross correlations by the ZPF test (Raghunathan, Rosenthal & Rubin
// 1996), each with Zou's (2007) interval.
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
	if c.Measure == "" || c.Measure == extract.MeasureOther {
		// The labels of the estimates ("OR 1.80", "β = .34") name the measure
		// when none was chosen.
		if m := c.First.Measure; m != "" && (m == c.Second.Measure || c.Second.Measure == "") {
			c.Measure = m
		} else if m := c.Second.Measure; m != "" && c.First.Measure == "" {
			c.Measure = m
		}
	}
	if given, _ := c.dependentCorrelations(); given && (c.Measure == "" || c.Measure == extract.MeasureOther) {
		c.Measure = extract.MeasureR
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
	for i, r := range []Reported{c.First, c.Second} {
		n := [2]extract.Printed{c.N1, c.N2}[i]
		label := [2]string{"first", "second"}[i]
		switch {
		case r.Measure != "" && r.Measure != c.Measure:
			return bad("the %s estimate is labelled as measure %s, but the measure is %s", label, r.Measure, c.Measure)
		case r.OnlyEstimate() && !(c.Measure == extract.MeasureR && n.IsExact()):
			return bad("the %s estimate is given alone; add its interval (\"%s [lo, hi]\"), its SE (\"%s, SE 0.05\"), its p (\"%s, p = .03\") or, for a correlation, n",
				label, r.Estimate.Text, r.Estimate.Text, r.Estimate.Text)
		}
	}
	in, err := c.input()
	if err != nil {
		return nil, err
	}
	return Audit(in, opts), nil
}

// input builds the workbook-shaped input of a comparison: two
// coefficients and one claim, none placed on a sheet or row (so that no
// note speaks of one), in two groups when independent, one group and one
// model for SameModel, one group and two models for SameSample; with the
// cross correlations as correlations rows of that sample.
func (c *Comparison) input() (*extract.Input, error) {
	groups, models := [2]string{"first sample", "second sample"}, [2]string{"model", "model"}
	switch c.Relation {
	case SameModel:
		groups = [2]string{"", ""}
	case SameSample:
		groups, models = [2]string{"", ""}, [2]string{"first model", "second model"}
	}
	// Variables of a correlation, in Steiger's numbering.
	vars := [2][2]string{{"", ""}, {"", ""}}
	in := &extract.Input{}
	if given, overlapping := c.dependentCorrelations(); given {
		switch {
		case c.Measure != extract.MeasureR:
			return nil, fmt.Errorf("correlations r13, r14, r23, r24 are given, but the measure is %s, not r: %w", c.Measure, ErrComparison)
		case c.Relation != SameSample:
			return nil, fmt.Errorf("correlations among the variables are given, but the two correlations are not from one sample (--same-sample): %w", ErrComparison)
		case !c.N1.IsExact():
			return nil, fmt.Errorf("two correlations of one sample need its n: %w", ErrComparison)
		case !overlapping && !(c.R13.Present() && c.R14.Present() && c.R23.Present() && c.R24.Present()):
			return nil, fmt.Errorf("two correlations without a shared variable (r12 and r34) need all four of r13, r14, r23 and r24: %w", ErrComparison)
		}
		vars = [2][2]string{{"1", "2"}, {"1", "3"}}
		cross := map[[2]string]extract.Printed{{"2", "3"}: c.R23}
		if !overlapping {
			vars[1] = [2]string{"3", "4"}
			cross = map[[2]string]extract.Printed{{"1", "3"}: c.R13, {"1", "4"}: c.R14, {"2", "3"}: c.R23, {"2", "4"}: c.R24}
		}
		for _, pair := range [][2]string{{"1", "3"}, {"1", "4"}, {"2", "3"}, {"2", "4"}} {
			r, ok := cross[pair]
			if !ok {
				continue
			}
			if !r.IsExact() || math.Abs(r.Value) > 1 {
				return nil, fmt.Errorf("r%s%s %q must be a correlation between −1 and 1: %w", pair[0], pair[1], r.Text, ErrComparison)
			}
			in.Correlations = append(in.Correlations, extract.Correlation{VarA: pair[0], VarB: pair[1], R: r, N: c.N1})
		}
	}
	for i, r := range []Reported{c.First, c.Second} {
		df := c.DF
		if r.DF.Present() {
			df = r.DF
		}
		in.Coefficients = append(in.Coefficients, extract.Coefficient{
			Label: [2]string{"first", "second"}[i], Measure: c.Measure, Group: groups[i], Model: models[i],
			Outcome: vars[i][0], Predictor: vars[i][1],
			Estimate: r.Estimate, CI: r.CI, CILevel: r.Level, SE: r.SE, Stat: r.Stat, P: r.P, DF: df,
			N: [2]extract.Printed{c.N1, c.N2}[i],
		})
	}
	in.Claims = []extract.Claim{{First: "first", Second: "second", Published: c.Published,
		Basis: extract.BasisUnstated, Alpha: c.Alpha, EstimateCorr: c.EstimateCorr}}
	return in, nil
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
	// R13, R14, R23 and R24 are the cross correlations of two dependent
	// correlations (see Comparison), "" when not given.
	R13, R14, R23, R24 string
}

// FieldError is a problem with one field of a ComparisonText. Field is the
// field's name in lower case (first, second, corr, n1, n2, n, df, r13,
// r14, r23, r24).
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
	for _, f := range []struct {
		name, text string
		to         *extract.Printed
	}{{"r13", t.R13, &c.R13}, {"r14", t.R14, &c.R14}, {"r23", t.R23, &c.R23}, {"r24", t.R24, &c.R24}} {
		if *f.to, err = extract.ParseNumber(f.text); err != nil {
			return Comparison{}, &FieldError{f.name, err}
		}
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
