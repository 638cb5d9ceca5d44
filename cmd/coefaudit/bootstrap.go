package main

import (
	"fmt"
	"io"
	"strings"

	"coefaudit/audit"
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/cmd/coefaudit/internal/progress"
	"coefaudit/report"

	"github.com/spf13/cobra"
)

// bootstrapOptions are the flags of the bootstrap command; opts is filled
// from them by validate.
type bootstrapOptions struct {
	opts           audit.BootstrapOptions
	predictors     string
	compare        string
	level          float64
	format         string
	out            string
	stdout, stderr io.Writer
	files          *output.Files
}

// validate checks the flags and fills o.opts from them and the data's
// path.
func (f *bootstrapOptions) validate(data string) error {
	o := &f.opts
	o.Data = data
	o.Predictors = splitList(f.predictors)
	cmp := splitList(f.compare)
	if o.Outcome == "" || len(o.Predictors) < 2 {
		return flagErrorf("--outcome and at least two --predictors are required")
	}
	if len(cmp) != 2 {
		return flagErrorf("--compare needs two predictors, e.g. --compare a,b")
	}
	o.Compare = [2]string{cmp[0], cmp[1]}
	if !(f.level > 0 && f.level < 100) {
		return flagErrorf("--level %v: want a percentage between 0 and 100, e.g. 95", f.level)
	}
	o.Level = f.level / 100
	if o.Resamples < 100 {
		return flagErrorf("--resamples %d: want at least 100", o.Resamples)
	}
	if f.format != "table" && f.format != "json" {
		return flagErrorf("--format %q: want table or json", f.format)
	}
	return nil
}

func newBootstrapCmd(runF func(*bootstrapOptions) error) *cobra.Command {
	f := &bootstrapOptions{opts: audit.DefaultBootstrapOptions}
	cmd := &cobra.Command{
		Use:   "bootstrap DATA",
		Short: "Bootstrap the difference between two coefficients from raw data",
		Long: `Fit the OLS regression of --outcome on --predictors to the raw data in DATA
(a CSV file, or an .xlsx workbook: its first sheet unless --sheet is given;
the first row holds the column names) and compare the coefficients of the two
--compare predictors: by default their standardized coefficients, with
--unstandardized the coefficients in the variables' units.

Reported: the coefficients with classical SEs, the standardized coefficients,
the difference with its percentile, BC and BCa intervals (Efron 1987;
DiCiccio & Efron 1996; the acceleration from the jackknife), a bootstrap
p-value, and the large-sample (delta-method) result beside it.

Rows with a missing value (blank, NA, ., NaN) in a model column are dropped
and counted. For a given --seed the result is the same on any machine and
any number of cores.`,
		Example: `  coefaudit bootstrap survey.csv --outcome attention --predictors outdoor,screen,sleep --compare outdoor,screen
  coefaudit bootstrap trial.xlsx --sheet data --outcome y --predictors a,b,c --compare a,b --resamples 20000 --seed 7 --format json`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := f.validate(args[0]); err != nil {
				return err
			}
			f.stdout, f.stderr, f.files = cmd.OutOrStdout(), cmd.ErrOrStderr(), runFiles(cmd)
			if runF != nil {
				return runF(f)
			}
			return runBootstrap(f)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.opts.Outcome, "outcome", "", "the outcome column (required)")
	fl.StringVar(&f.predictors, "predictors", "", "the predictor columns, comma-separated (required)")
	fl.StringVar(&f.compare, "compare", "", "the two predictors whose coefficients are compared, first,second (required)")
	fl.StringVar(&f.opts.Sheet, "sheet", "", "the sheet of an .xlsx DATA (default: the first)")
	fl.IntVar(&f.opts.Resamples, "resamples", audit.DefaultBootstrapOptions.Resamples, "number of bootstrap resamples")
	fl.Float64Var(&f.level, "level", 100*audit.DefaultBootstrapOptions.Level, "confidence level of the intervals, in percent")
	fl.Uint64Var(&f.opts.Seed, "seed", audit.DefaultBootstrapOptions.Seed, "random seed; the same seed gives the same result")
	fl.BoolVar(&f.opts.Unstandardized, "unstandardized", false, "compare the coefficients in the variables' units instead of standardized ones")
	fl.IntVar(&f.opts.Workers, "workers", 0, "goroutines to use (default: every core); the result does not depend on it")
	fl.StringVarP(&f.format, "format", "f", "table", "output format: table or json")
	fl.StringVarP(&f.out, "out", "o", "", "write the report to this file (- or nothing: standard output; a device or FIFO is written in place)")
	return cmd
}

// runBootstrap reads the data, bootstraps the comparison with a progress
// bar on a terminal's standard error, and writes the report.
func runBootstrap(f *bootstrapOptions) error {
	o := f.opts
	bar := progress.New(f.stderr, "resampling")
	o.Progress = bar.Update
	rep, err := report.Bootstrap(o)
	bar.Done()
	if err != nil {
		return err
	}
	t, err := f.files.Open(f.stdout, f.out, o.Data)
	if err != nil {
		return finish(f.files, flagError{err})
	}
	write := report.WriteBootstrapTable
	if f.format == "json" {
		write = report.WriteBootstrapJSON
	}
	if err := write(t, rep); err != nil {
		return finish(f.files, fmt.Errorf("writing the report: %w", err))
	}
	return finish(f.files, t.Close())
}

func splitList(s string) []string {
	var out []string
	for _, p := range strings.Split(s, ",") {
		if p = strings.TrimSpace(p); p != "" {
			out = append(out, p)
		}
	}
	return out
}
