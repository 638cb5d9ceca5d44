package main

import (
	"errors"
	"fmt"
	"io"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/report"

	"github.com/spf13/cobra"
)

// compareOptions are the flags of the compare command.
type compareOptions struct {
	text                               audit.ComparisonText
	independent, sameModel, sameSample bool
	format                             string
	report                             reportOptions // for --fail-on
	stdout                             io.Writer
}

func (o *compareOptions) validate() error {
	switch {
	case o.independent:
		o.text.Relation = audit.Independent
	case o.sameModel:
		o.text.Relation = audit.SameModel
	case o.sameSample:
		o.text.Relation = audit.SameSample
	}
	switch o.format {
	case "text", "json":
	default:
		return flagErrorf("--format %q: want text or json", o.format)
	}
	var err error
	o.report.failOn, err = validateFailOn(o.report.failOn)
	return err
}

func newCompareCmd(runF func(*compareOptions) error) *cobra.Command {
	o := &compareOptions{format: "text"}
	cmd := &cobra.Command{
		Use:   "compare --first EST --second EST (--independent | --same-model | --same-sample)",
		Short: "Test one claim from two numbers typed on the command line",
		Long: `Test one published comparison of two estimates, for an editor or referee
with the two numbers in front of them. Each estimate is written as printed,
with its interval, its SE or its p:

  "0.41 [0.30, 0.52]"   "0.18 (0.05 to 0.31)"   "0.41 (95% CI 0.30-0.52)"
  "0.41, SE 0.05"       "0.41 (SE 0.05)"        "0.41, p = .003"
  "b = 0.41, SE = 0.12" "β = .34, p < .01"      "OR 1.80 (1.21–2.68)"
  "0.41, t(120) = 3.2"  "0.41***" (stars: p < .05, .01, .001)

A label (b, β, r, OR, RR, HR, MD) names the measure when --measure is not
given.
Say how the two are related: --independent (two samples), --same-model
(two coefficients of one fitted model) or --same-sample (one sample, two
models). For the last two, --corr gives the sampling correlation of the
two estimates if the paper printed it; without it the p is given over
every admissible correlation. Ratios (--measure or, rr, hr) are tested on
the log scale; correlations (--measure r) need --n1 and --n2 (or --n), and
nothing else ("r = .45"). Two correlations of one sample (--same-sample
--n N) are compared with the sample's other correlations, numbered as in
Steiger (1980): --first r12 and --second r13 with --r23 (overlapping,
Williams' t), or --first r12 and --second r34 with --r13, --r14, --r23 and
--r24 (non-overlapping, the ZPF test).

The claim goes through exactly the check that "coefaudit check" runs on a
claims row, and the command prints the test, the verdict, the notes and a
methods paragraph. The exit status is that of check: 0, 1 when the outcome
is listed in --fail-on, 2 for a usage error.`,
		Example: `  coefaudit compare --first "0.41 [0.30, 0.52]" --second "0.18 (0.05 to 0.31)" --independent
  coefaudit compare --first "0.41, SE 0.05" --second "0.18, SE 0.06" --same-model --corr 0.35 --df 120
  coefaudit compare --first "0.67 (0.46 to 0.98)" --second "0.88 (0.71 to 1.08)" --independent \
      --measure rr --published no-difference
  coefaudit compare --first "r = .80" --second "r = .72" --same-sample --n 26 --r23 .89`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.validate(); err != nil {
				return err
			}
			o.stdout = cmd.OutOrStdout()
			if runF != nil {
				return runF(o)
			}
			return runCompare(o)
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.text.First, "first", "", "the first estimate as printed, with its interval, SE or p")
	f.StringVar(&o.text.Second, "second", "", "the second estimate as printed, with its interval, SE or p")
	f.BoolVar(&o.independent, "independent", false, "the estimates come from independent samples")
	f.BoolVar(&o.sameModel, "same-model", false, "the estimates are coefficients of one fitted model")
	f.BoolVar(&o.sameSample, "same-sample", false, "the estimates come from one sample (different models)")
	f.StringVar(&o.text.Corr, "corr", "", "sampling correlation of the two estimates, as printed (same model or sample)")
	f.StringVar(&o.text.Published, "published", extract.PublishedDiffer, "the paper's verdict: differ, no-difference, first-larger, second-larger (signed), first-stronger or second-stronger (magnitude)")
	f.StringVar(&o.text.Measure, "measure", extract.MeasureOther, "the estimates' measure: b, beta, r, or, rr, hr, md or other")
	f.Float64Var(&o.text.Alpha, "alpha", extract.DefaultAlpha, "significance level of the test")
	f.StringVar(&o.text.N1, "n1", "", "sample size of the first estimate")
	f.StringVar(&o.text.N2, "n2", "", "sample size of the second estimate")
	f.StringVar(&o.text.N, "n", "", "sample size of both (one sample)")
	f.StringVar(&o.text.DF, "df", "", "residual degrees of freedom, for a t test")
	f.StringVar(&o.text.R23, "r23", "", "correlations of one sample: r23, with --first r12 and --second r13 (overlapping) or r34")
	f.StringVar(&o.text.R13, "r13", "", "correlations of one sample: r13, with --first r12 and --second r34 (non-overlapping)")
	f.StringVar(&o.text.R14, "r14", "", "correlations of one sample: r14 (non-overlapping)")
	f.StringVar(&o.text.R24, "r24", "", "correlations of one sample: r24 (non-overlapping)")
	f.StringVarP(&o.format, "format", "f", "text", "output format: text or json")
	o.report.bindFailOn(cmd)
	cmd.MarkFlagRequired("first")
	cmd.MarkFlagRequired("second")
	cmd.MarkFlagsMutuallyExclusive("independent", "same-model", "same-sample")
	cmd.MarkFlagsOneRequired("independent", "same-model", "same-sample")
	cmd.RegisterFlagCompletionFunc("published", cobra.FixedCompletions(extract.Verdicts, cobra.ShellCompDirectiveNoFileComp))
	cmd.RegisterFlagCompletionFunc("measure", cobra.FixedCompletions(extract.Measures, cobra.ShellCompDirectiveNoFileComp))
	cmd.RegisterFlagCompletionFunc("format", cobra.FixedCompletions([]string{"text", "json"}, cobra.ShellCompDirectiveNoFileComp))
	return cmd
}

// runCompare parses and audits the comparison and prints the result.
func runCompare(o *compareOptions) error {
	c, err := audit.ParseComparison(o.text)
	if err != nil {
		var fe *audit.FieldError
		if errors.As(err, &fe) {
			return flagErrorf("--%s: %v", fe.Field, fe.Err)
		}
		return flagError{err}
	}
	rep, err := audit.CompareReported(c, audit.DefaultOptions)
	if err != nil {
		return flagError{err}
	}
	if o.format == "json" {
		err = report.Write("json", o.stdout, rep)
	} else {
		err = report.WriteComparison(o.stdout, rep, c)
	}
	if err != nil {
		return fmt.Errorf("writing the result: %w", err)
	}
	if flagged(rep.Summary, o.report.failOn) {
		return errFlagged
	}
	return nil
}
