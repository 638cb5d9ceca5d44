package main

import (
	"fmt"
	"io"
	"slices"
	"strings"
	"sync/atomic"
	"time"

	"coefaudit/audit"
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/cmd/coefaudit/internal/progress"
	"coefaudit/extract"

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

// reportFormats are the values of --format.
var reportFormats = []string{"table", "json", "csv", "md", "xlsx", "html"}

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
	cmd.RegisterFlagCompletionFunc("format", cobra.FixedCompletions(reportFormats, cobra.ShellCompDirectiveNoFileComp))
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

// flagged reports whether a claim of the report has an outcome of failOn.
func flagged(rep *audit.Report, failOn []string) bool {
	for _, c := range rep.Claims {
		if slices.Contains(failOn, c.Outcome) {
			return true
		}
	}
	return false
}

func (o *reportOptions) validate() error {
	switch o.format {
	case "table", "json", "csv", "md", "html":
	case "xlsx":
		if o.out == "" {
			return flagErrorf("--format xlsx writes a binary workbook, which is not sent to standard output: give --out FILE.xlsx")
		}
	default:
		return flagErrorf("--format %q: want table, json, csv, md, xlsx or html", o.format)
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

// writer picks the report writer for the format; the workbook also shows
// the input.
func (o *reportOptions) writer() func(*output.Target, *audit.Report, *extract.Input) error {
	switch o.format {
	case "json":
		return func(t *output.Target, r *audit.Report, _ *extract.Input) error { return audit.WriteJSON(t, r) }
	case "csv":
		return func(t *output.Target, r *audit.Report, _ *extract.Input) error { return audit.WriteCSV(t, r) }
	case "xlsx":
		return func(t *output.Target, r *audit.Report, in *extract.Input) error { return audit.WriteXLSX(t, r, in) }
	case "html":
		return func(t *output.Target, r *audit.Report, _ *extract.Input) error { return audit.WriteHTML(t, r) }
	case "md":
		return func(t *output.Target, r *audit.Report, _ *extract.Input) error { return audit.WriteMarkdown(t, r) }
	}
	return func(t *output.Target, r *audit.Report, _ *extract.Input) error { return audit.WriteTable(t, r) }
}

func newCheckCmd() *cobra.Command {
	var o reportOptions
	cmd := &cobra.Command{
		Use:   "check INPUT",
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

Every claims row appears once in the report, in input order, with an
outcome: consistent, unsupported, missed, reversed, indeterminate, conflict
or incomplete, and notes saying why.

Formats: table (the terminal), json (the output contract), csv, md (one
Markdown document: a summary table and each claim's methods paragraph), xlsx (the
input sheets with the audit's columns beside each claim, a summary and the
methods text; needs --out) and html (one self-contained page with charts
and filters, to publish or print).

Exit status: 0 when no claim has an outcome listed in --fail-on, 1 when one
has (the report is written either way), 2 for a usage error or an input
that cannot be read. By default --fail-on is unsupported, missed, reversed
and conflict; indeterminate and incomplete do not fail the run, since they
mean that what was printed cannot decide the claim: add them with
--fail-on, or give --fail-on none to exit 0 whatever the outcomes. A
malformed row is a problem in the report, not an input error: its claim is
incomplete.

A paired CSV written as csv or json is streamed: its rows are read,
audited on every CPU (up to four) and written in input order, in memory
that does not grow with the file, so a whole literature of claims can be
checked at once. A study's claims are then taken together (for the
multiplicity adjustment, and for the k of a df derived as n − k − 1) only
while its rows are contiguous, and at most 1,000 in a row; sort the file
by study first.`,
		Example: `  coefaudit check review.xlsx
  coefaudit check review.xlsx --format json --out audit.json
  coefaudit check extracted/ --format csv > audit.csv
  coefaudit check literature.csv --format csv --out audit.csv   # a paired CSV, streamed
  coefaudit check review.xlsx --format xlsx --out audit.xlsx
  coefaudit check review.xlsx --format html --out audit.html
  coefaudit check review.xlsx --fail-on unsupported,missed,reversed,conflict,indeterminate`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.validate(); err != nil {
				return err
			}
			return runReport(cmd, args[0], args[0], o)
		},
	}
	o.bind(cmd)
	o.bindFailOn(cmd)
	return cmd
}

// runReport audits input and writes the report; shown names the input in
// the report (the demo shows its embedded name, not a temporary path).
func runReport(cmd *cobra.Command, input, shown string, o reportOptions) error {
	phase, stop := showPhases(cmd.ErrOrStderr(), "coefaudit: reading, auditing, writing")
	defer stop()
	in, err := extract.Read(input)
	if err != nil {
		return err
	}
	phase(1)
	rep, err := audit.Check(input, audit.Options{Adjust: o.adjust})
	if err != nil {
		return err
	}
	rep.Source = shown
	t, err := output.Open(cmd.OutOrStdout(), o.out, input)
	if err != nil {
		return flagError{err}
	}
	phase(2)
	if o.out == "" {
		stop() // the report and the bar may share a terminal
	}
	if err := o.writer()(t, rep, in); err != nil {
		t.Abort()
		return fmt.Errorf("writing the report: %w", err)
	}
	if err := t.Close(); err != nil {
		return err
	}
	if flagged(rep, o.failOn) {
		return errFlagged
	}
	return nil
}

// showPhases draws the progress bar on a terminal's standard error while a
// run reads (0%), audits (33%) and writes (67%), and nothing when stderr
// is not a terminal or the run ends within a moment. phase(k) moves to
// phase k of 3; stop clears the bar and may be called more than once.
func showPhases(stderr io.Writer, label string) (phase func(int), stop func()) {
	bar := progress.New(stderr, label)
	if bar == nil {
		return func(int) {}, func() {}
	}
	var current atomic.Int32
	done := make(chan struct{})
	finished := make(chan struct{})
	go func() {
		defer close(finished)
		tick := time.NewTicker(200 * time.Millisecond)
		defer tick.Stop()
		for {
			select {
			case <-done:
				bar.Done()
				return
			case <-tick.C:
				bar.Update(int(current.Load()), 3)
			}
		}
	}()
	var stopped atomic.Bool
	return func(k int) { current.Store(int32(k)) }, func() {
		if stopped.CompareAndSwap(false, true) {
			close(done)
			<-finished
		}
	}
}
