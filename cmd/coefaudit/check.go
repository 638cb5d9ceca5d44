package main

import (
	"fmt"

	"coefaudit/audit"
	"coefaudit/cmd/coefaudit/internal/output"

	"github.com/spf13/cobra"
)

// reportOptions are the flags every auditing command shares.
type reportOptions struct {
	format string
	out    string
	adjust string
}

func (o *reportOptions) bind(cmd *cobra.Command) {
	cmd.Flags().StringVarP(&o.format, "format", "f", "table", "output format: table, json or csv")
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "write the report to this file instead of standard output")
	cmd.Flags().StringVar(&o.adjust, "adjust", audit.DefaultOptions.Adjust, "multiplicity adjustment deciding outcomes: none, holm or bh")
}

func (o *reportOptions) validate() error {
	switch o.format {
	case "table", "json", "csv":
	default:
		return flagErrorf("--format %q: want table, json or csv", o.format)
	}
	switch o.adjust {
	case audit.AdjustNone, audit.AdjustHolm, audit.AdjustBH:
	default:
		return flagErrorf("--adjust %q: want none, holm or bh", o.adjust)
	}
	return nil
}

// writer picks the report writer for the format.
func (o *reportOptions) writer() func(*output.Target, *audit.Report) error {
	switch o.format {
	case "json":
		return func(t *output.Target, r *audit.Report) error { return audit.WriteJSON(t, r) }
	case "csv":
		return func(t *output.Target, r *audit.Report) error { return audit.WriteCSV(t, r) }
	}
	return func(t *output.Target, r *audit.Report) error { return audit.WriteTable(t, r) }
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
or incomplete, and notes saying why.`,
		Example: `  coefaudit check review.xlsx
  coefaudit check review.xlsx --format json --out audit.json
  coefaudit check extracted/ --format csv > audit.csv`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.validate(); err != nil {
				return err
			}
			return runReport(cmd, args[0], args[0], o)
		},
	}
	o.bind(cmd)
	return cmd
}

// runReport audits input and writes the report; shown names the input in
// the report (the demo shows its embedded name, not a temporary path).
func runReport(cmd *cobra.Command, input, shown string, o reportOptions) error {
	rep, err := audit.Check(input, audit.Options{Adjust: o.adjust})
	if err != nil {
		return err
	}
	rep.Source = shown
	t, err := output.Open(cmd.OutOrStdout(), o.out, input)
	if err != nil {
		return flagError{err}
	}
	if err := o.writer()(t, rep); err != nil {
		t.Abort()
		return fmt.Errorf("writing the report: %w", err)
	}
	return t.Close()
}
