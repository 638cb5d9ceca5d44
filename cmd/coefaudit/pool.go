package main

import (
	"fmt"
	"io"
	"os"

	"coefaudit/audit"
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/report"

	"github.com/spf13/cobra"
)

// poolOptions are the flags of the pool command.
type poolOptions struct {
	input  string
	format string
	out    string
	plots  string
	method string
	level  float64
	adjust string
	stdout io.Writer
	files  *output.Files
}

func (o *poolOptions) validate() error {
	switch o.format {
	case "table", "json", "md":
	default:
		return flagErrorf("--format %q: want table, json or md", o.format)
	}
	switch o.method {
	case audit.PoolREML, audit.PoolDL:
	default:
		return flagErrorf("--method %q: want %s or %s", o.method, audit.PoolREML, audit.PoolDL)
	}
	if !(o.level > 0 && o.level < 100) {
		return flagErrorf("--level %v: want a percentage between 0 and 100, e.g. 95", o.level)
	}
	// The adjustment is checked as check checks it; the format is ours.
	if err := (&reportOptions{format: "table", adjust: o.adjust}).validate(); err != nil {
		return err
	}
	if o.plots != "" {
		if st, err := os.Stat(o.plots); err != nil || !st.IsDir() {
			return flagErrorf("--plots %s: not an existing folder", o.plots)
		}
	}
	return nil
}

// writer picks the report writer for the format.
func (o *poolOptions) writer() func(*output.Target, *audit.PoolReport) error {
	switch o.format {
	case "json":
		return func(t *output.Target, r *audit.PoolReport) error { return report.WritePoolJSON(t, r) }
	case "md":
		return func(t *output.Target, r *audit.PoolReport) error { return report.WritePoolMarkdown(t, r) }
	}
	return func(t *output.Target, r *audit.PoolReport) error { return report.WritePoolTable(t, r) }
}

func newPoolCmd(runF func(*poolOptions) error) *cobra.Command {
	o := &poolOptions{method: audit.DefaultPoolOptions.Method, level: 100 * audit.DefaultPoolOptions.Level}
	cmd := &cobra.Command{
		Use:   "pool INPUT",
		Short: "Pool the differences of claims that share a topic across studies",
		Long: `Audit INPUT as "check" does, then meta-analyse the differences of the
claims that share a topic (the claims column "topic"). Each difference is
first − second, as entered. Ratio measures are pooled on the log scale (the
log of the ratio of ratios), correlations on Fisher's z scale (a difference
of z values, not of r), other coefficients in their own units.

Per topic the report gives the fixed-effect (inverse-variance) estimate,
the random-effects estimate with τ² by REML (or DerSimonian-Laird with
--method dl) and its Wald and Hartung-Knapp-Sidik-Jonkman intervals,
Cochran's Q with I², τ² with its Q-profile interval, the prediction
interval and the estimates with each claim left out. Claims whose outcome
is incomplete or indeterminate, whose difference has no SE, or whose
measure or scale differs from most of the topic's claims are listed as left
out, with the reason. If REML does not converge, the topic is refitted with
DerSimonian-Laird and the report says so.

With --out, a forest plot of every pooled topic is written beside the
report as SVG and PNG: --out results/pool.md gives
results/pool-<topic>.svg and results/pool-<topic>.png. Without --out,
plots are written only into the folder given by --plots. The report lists
the files written.`,
		Example: `  coefaudit pool review.xlsx
  coefaudit pool review.xlsx --format md --out results/pool.md
  coefaudit pool extracted/ --method dl --level 90 --plots figures/
  coefaudit pool review.xlsx --format json > pool.json`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.validate(); err != nil {
				return err
			}
			o.input, o.stdout, o.files = args[0], cmd.OutOrStdout(), runFiles(cmd)
			if runF != nil {
				return runF(o)
			}
			return runPool(o)
		},
	}
	cmd.Flags().StringVarP(&o.format, "format", "f", "table", "output format: table, json or md")
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "write the report to this file (and the forest plots beside it)")
	cmd.Flags().StringVar(&o.plots, "plots", "", "write the forest plots into this existing folder")
	cmd.Flags().StringVar(&o.method, "method", o.method, "estimator of the between-study variance τ²: reml or dl")
	cmd.Flags().Float64Var(&o.level, "level", o.level, "confidence level of every interval, in percent")
	cmd.Flags().StringVar(&o.adjust, "adjust", audit.DefaultOptions.Adjust, "multiplicity adjustment deciding the claims' outcomes: none, holm or bh")
	return cmd
}

// runPool pools input, writes the forest plots and then the report, which
// lists the plots written. The plots and the report are put in place
// together, once all are complete.
func runPool(o *poolOptions) error {
	rep, err := report.PoolInput(o.input, report.Options{Audit: audit.Options{Adjust: o.adjust}},
		audit.PoolOptions{Method: o.method, Level: o.level / 100})
	if err != nil {
		return finish(o.files, err)
	}
	// The report's target is opened first, so that a bad --out stops the
	// run before any plot is written.
	t, err := o.files.Open(o.stdout, o.out, o.input)
	if err != nil {
		return finish(o.files, flagError{err})
	}
	for _, f := range report.PoolPlotFiles(rep, o.out, o.plots) {
		if err := writePlot(o, rep, f); err != nil {
			return finish(o.files, err)
		}
		rep.Plots = append(rep.Plots, f.Path)
	}
	if err := o.writer()(t, rep); err != nil {
		return finish(o.files, fmt.Errorf("writing the report: %w", err))
	}
	return finish(o.files, t.Close())
}

// writePlot writes one forest plot through the same safe writer as the
// report: never over the input, put in place with the report.
func writePlot(o *poolOptions, rep *audit.PoolReport, f report.PoolPlotFile) error {
	t, err := o.files.Open(o.stdout, f.Path, o.input)
	if err != nil {
		return flagError{err}
	}
	if err := report.WritePoolPlot(t, rep.Topics[f.Topic], rep.Level, f.Format); err != nil {
		return fmt.Errorf("writing %s: %w", f.Path, err)
	}
	return t.Close()
}
