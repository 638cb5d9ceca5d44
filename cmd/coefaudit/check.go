package main

import (
	"io"
	"slices"
	"strings"

	"coefaudit/audit"
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/cmd/coefaudit/internal/progress"
	"coefaudit/extract/article"
	"coefaudit/report"

	"github.com/spf13/cobra"
)

// reportOptions are the flags every auditing command shares.
type reportOptions struct {
	format string
	out    string
	adjust string
	// failOn lists the outcomes that make the run exit with status 1
	// (exitFlagged); empty, as for the demo, never does.
	failOn []string
}

// defaultFailOn are the outcomes that fail a check by default: those that
// say the published verdict is wrong or the printed numbers contradict
// each other. indeterminate and incomplete are left out: they say the
// printed numbers cannot decide the claim, which is a reason to ask the
// authors, not evidence against the paper; add them with --fail-on.
var defaultFailOn = []string{audit.Unsupported, audit.Missed, audit.Reversed, audit.Conflict}

func (o *reportOptions) bind(cmd *cobra.Command) {
	cmd.Flags().StringVarP(&o.format, "format", "f", "table", "output format: table, json, csv, md, xlsx (needs --out) or html")
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "write the report to this file (- or nothing: standard output; a device or FIFO is written in place)")
	cmd.Flags().StringVar(&o.adjust, "adjust", audit.DefaultOptions.Adjust, "multiplicity adjustment deciding outcomes: none, holm or bh")
	cmd.RegisterFlagCompletionFunc("format", cobra.FixedCompletions(report.Formats(), cobra.ShellCompDirectiveNoFileComp))
	cmd.RegisterFlagCompletionFunc("adjust", cobra.FixedCompletions([]string{audit.AdjustNone, audit.AdjustHolm, audit.AdjustBH}, cobra.ShellCompDirectiveNoFileComp))
}

// bindFailOn adds --fail-on, for the commands whose exit status reports
// flagged claims.
func (o *reportOptions) bindFailOn(cmd *cobra.Command) {
	cmd.Flags().StringSliceVar(&o.failOn, "fail-on", defaultFailOn,
		"outcomes that make the exit status 1 (comma-separated), or none")
	cmd.RegisterFlagCompletionFunc("fail-on", cobra.FixedCompletions(append(slices.Clone(audit.Outcomes), "none"), cobra.ShellCompDirectiveNoFileComp))
}

// validateFailOn checks --fail-on and turns "none" into an empty list.
func validateFailOn(failOn []string) ([]string, error) {
	var out []string
	for _, f := range failOn {
		f = strings.ToLower(strings.TrimSpace(f))
		switch {
		case f == "none" && len(failOn) == 1:
			return nil, nil
		case slices.Contains(audit.Outcomes, f):
			out = append(out, f)
		default:
			return nil, flagErrorf("--fail-on %q: want outcomes among %s, or none alone", f, strings.Join(audit.Outcomes, ", "))
		}
	}
	return out, nil
}

// flagged reports whether a claim counted in the summary has an outcome of
// failOn.
func flagged(sum audit.Summary, failOn []string) bool {
	for _, o := range failOn {
		if sum.Counts[o] > 0 {
			return true
		}
	}
	return false
}

func (o *reportOptions) validate() error {
	switch {
	case o.format == "xlsx" && o.out == "":
		return flagErrorf("--format xlsx writes a binary workbook, which is not sent to standard output: give --out FILE.xlsx")
	case !slices.Contains(report.Formats(), o.format):
		return flagErrorf("--format %q: want %s", o.format, strings.Join(report.Formats(), ", "))
	}
	switch o.adjust {
	case audit.AdjustNone, audit.AdjustHolm, audit.AdjustBH:
	default:
		return flagErrorf("--adjust %q: want none, holm or bh", o.adjust)
	}
	var err error
	o.failOn, err = validateFailOn(o.failOn)
	return err
}

// checkOptions are what check (and demo) run with: the input, the name the
// report gives it, the flags and the output stream.
type checkOptions struct {
	input, shown string
	// articles are the articles to import and check at once, when the
	// inputs are articles (article.IsArticleInput) rather than a workbook.
	articles []string
	stdin    io.Reader
	stderr   io.Writer
	report   reportOptions
	stdout   io.Writer
	files    *output.Files
}

func newCheckCmd(runF func(*checkOptions) error) *cobra.Command {
	o := &checkOptions{}
	cmd := &cobra.Command{
		Use:   "check INPUT | ARTICLE...",
		Short: "Audit the claims of a workbook, a folder of CSVs or a paired CSV",
		Long: `Audit every claim of INPUT and say whether its published verdict stands.

INPUT is one of
  - an .xlsx workbook with the sheets "coefficients" and "claims" (and
    optionally "correlations" and "table ..." sheets);
  - a folder holding coefficients.csv and claims.csv (and optionally
    correlations.csv);
  - a single paired CSV with one row per claim and both coefficients inline
    (columns first_estimate, first_ci_low, ..., second_estimate, ...).
"coefaudit template FILE.xlsx" writes a blank workbook that explains every
column.

Given articles instead (JATS XML, HTML, DOCX or text files, "-", or a
folder of them, as "coefaudit import" reads them), check imports them and
audits what was read in one step, to screen a literature: every result is
marked as read automatically, and files that cannot be read are listed
among the problems. Confirm what a screening flags with "coefaudit import"
before acting on it.

Every claims row appears once in the report, in input order, with an
outcome: consistent, unsupported, missed, reversed (the test shows the
opposite direction at alpha; an opposite point estimate alone is
unsupported), indeterminate (with the tipping correlation where only the
estimates' correlation is missing), conflict or incomplete, and notes
saying why. The published verdict is differ, no-difference, first-larger
or second-larger (signed), first-stronger or second-stronger (magnitude).

Formats: table (the terminal), json (the output contract), csv, md (one
Markdown document: a table and each claim's methods paragraph), xlsx (the
input sheets with the audit's columns beside each claim, a summary and the
methods text; needs --out; at most 1,048,575 claims, a sheet's rows) and
html (one self-contained page with a line for every claim and, for the
first 500 flagged claims, a card with a chart, to publish or print).

Exit status: 0 when no claim has an outcome listed in --fail-on, 1 when one
has (the report is written either way), 2 for a usage error or an input
that cannot be read. By default --fail-on is unsupported, missed, reversed
and conflict; indeterminate and incomplete do not fail the run, since they
mean that what was printed cannot decide the claim: add them with
--fail-on, or give --fail-on none to exit 0 whatever the outcomes. A
malformed row is a problem in the report, not an input error: its claim is
incomplete. Interrupted (Ctrl-C) or terminated, the run exits with 130 or
143 and keeps no file it was writing.

The input is audited one study at a time and the report written as it
goes, so memory holds a study, not the file, and a whole literature of
claims can be checked at once. A study's claims are one family (for the
multiplicity adjustment, and for the k of a df derived as n − k − 1)
wherever its rows stand, up to 1,000 claims; a paired CSV is read twice,
to count each study's rows first. The summary follows the claims.`,
		Example: `  coefaudit check review.xlsx
  coefaudit check review.xlsx --format json --out audit.json
  coefaudit check extracted/ --format csv > audit.csv
  coefaudit check literature.csv --format csv --out audit.csv   # a paired CSV
  coefaudit check review.xlsx --format xlsx --out audit.xlsx
  coefaudit check review.xlsx --format html --out audit.html
  coefaudit check review.xlsx --fail-on unsupported,missed,reversed,conflict,indeterminate
  coefaudit check articles/ --format csv --out screening.csv   # a folder of articles`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.report.validate(); err != nil {
				return err
			}
			if len(args) > 1 || article.IsArticleInput(args[0]) {
				o.articles = args
			}
			o.input, o.shown, o.stdout, o.files = args[0], args[0], cmd.OutOrStdout(), runFiles(cmd)
			o.stdin, o.stderr = cmd.InOrStdin(), cmd.ErrOrStderr()
			if runF != nil {
				return runF(o)
			}
			return runCheck(o)
		},
	}
	o.report.bind(cmd)
	o.report.bindFailOn(cmd)
	return cmd
}

// runCheck audits the input and writes the report as it goes; a report
// file is put in place only once it is complete.
func runCheck(o *checkOptions) error {
	t, err := o.files.Open(o.stdout, o.report.out, o.input)
	if err != nil {
		return finish(o.files, flagError{err})
	}
	ro := report.Options{Audit: audit.Options{Adjust: o.report.adjust}, Source: o.shown}
	if o.report.format == "xlsx" {
		// excelize keeps long sheets in temporary files: in the run's
		// folder, so that an interrupted run removes them with it.
		if ro.TempDir, err = o.files.TempDir(); err != nil {
			return finish(o.files, err)
		}
	}
	var sum audit.Summary
	if len(o.articles) > 0 {
		sum, err = checkArticles(o, t, ro)
	} else {
		sum, err = report.Check(o.input, t, o.report.format, ro)
	}
	if err == nil {
		err = t.Close()
	}
	if err == nil && flagged(sum, o.report.failOn) {
		err = errFlagged
	}
	return finish(o.files, err)
}

// checkArticles imports the articles and audits what was read, with the
// caution that it was read automatically.
func checkArticles(o *checkOptions, w io.Writer, ro report.Options) (audit.Summary, error) {
	bar := progress.New(o.stderr, "reading articles")
	src, _, err := article.Open(o.articles, o.stdin, bar.Update)
	bar.Done()
	if err != nil {
		return audit.Summary{}, err
	}
	ro.Cautions = append(ro.Cautions, article.Caution)
	return report.CheckSource(src, w, o.report.format, ro)
}
