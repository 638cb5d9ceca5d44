package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"coefaudit/audit"
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/pool"
	"coefaudit/report"

	"github.com/spf13/cobra"
)

// poolOptions are the flags of the pool command.
type poolOptions struct {
	input  string
	format string
	out    string
	plots  string
	// maxPlots is how many pooled topics get forest plots.
	maxPlots int
	method   string
	level    float64
	adjust   string
	// covariance is how claims with an unknown covariance are pooled.
	covariance pool.Covariance
	covText    string
	stdout     io.Writer
	files      *output.Files
}

func (o *poolOptions) validate() error {
	o.format = strings.ToLower(o.format)
	if !slices.Contains(report.PoolFormats(), o.format) {
		return flagErrorf("--format %q: want one of %s", o.format, strings.Join(report.PoolFormats(), ", "))
	}
	switch o.method {
	case pool.REML, pool.DL:
	default:
		return flagErrorf("--method %q: want %s or %s", o.method, pool.REML, pool.DL)
	}
	if !(o.level > 0 && o.level < 100) {
		return flagErrorf("--level %v: want a percentage between 0 and 100, e.g. 95", o.level)
	}
	// The adjustment is checked as check checks it; the format is ours.
	if err := (&reportOptions{format: "table", adjust: o.adjust}).validate(); err != nil {
		return err
	}
	cov, err := pool.ParseCovariance(o.covText)
	if err != nil {
		return flagErrorf("--covariance %q: want omit, bound, or a correlation between -1 and 1, e.g. 0.5", o.covText)
	}
	o.covariance = cov
	if o.plots != "" && o.plots != plotsNone {
		if st, err := os.Stat(o.plots); err != nil || !st.IsDir() {
			return flagErrorf("--plots %s: not an existing folder (or none)", o.plots)
		}
	}
	if o.maxPlots < 1 {
		return flagErrorf("--max-plots %d: want at least 1 (--plots none draws none)", o.maxPlots)
	}
	return nil
}

// plotsNone is the --plots value that draws no forest plot.
const plotsNone = "none"

// writer picks the report writer for the format.
func (o *poolOptions) writer() func(io.Writer, report.PoolDocument) error {
	switch o.format {
	case "json":
		return report.WritePoolJSON
	case "csv":
		return report.WritePoolCSV
	case "md":
		return report.WritePoolMarkdown
	case "html":
		return report.WritePoolHTML
	case "xlsx":
		return report.WritePoolXLSX
	}
	return report.WritePoolTable
}

// plotsBeside reports whether the format's report has its forest plots
// written beside it unasked: the table and Markdown, which show or embed
// them. The HTML page holds its plots inline; JSON, CSV and xlsx are for
// programs, and get plot files only with --plots DIR.
func (o *poolOptions) plotsBeside() bool { return o.format == "table" || o.format == "md" }

func newPoolCmd(runF func(*poolOptions) error) *cobra.Command {
	o := &poolOptions{method: pool.DefaultOptions.Method, level: 100 * pool.DefaultOptions.Level, maxPlots: report.DefaultMaxPlotTopics}
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
interval and the estimates with each claim left out. A claim is left out,
with the reason, only when its difference or its SE is not known, or when
its measure or scale differs from most of the topic's claims; a claim
indeterminate for the rounding of its printed numbers is pooled. A claim
whose two estimates share a sample whose covariance was not printed has an
SE known only within bounds: it is left out of the main result, and
--covariance 0.5 (any correlation from -1 to 1) or --covariance bound (the
least favourable bound, correlation -1) pools it in a sensitivity analysis
shown beside the main result. If REML does not converge, the topic is
refitted with DerSimonian-Laird and the report says so.

--format picks table (the default), json, csv, md, html or xlsx. Numbers
meant for people (table, md, html, xlsx, plots) give differences and
intervals to one decimal more than the estimates were printed with (2 to
4), statistics to 2 decimals and p as journals print it (p = .043,
p < .001); json and csv keep every digit. The heterogeneity is said in
sentences, with the HKSJ interval beside the Wald one.

A forest plot shows up to 60 claims; a topic of up to 600 claims is drawn
in pages of 60, a larger one as one summary page of the 60 claims with the
largest weights. Plots are 7.5 inches wide, SVG and PNG at 300 dpi. The
html page holds its plots inline as SVG. With --format table or md and
--out FILE, the plots are written beside the report (the Markdown embeds
them by relative path): --out results/pool.md gives
results/pool-<topic>.svg and .png (pool-<topic>-p1.svg, ... for pages).
--plots DIR writes them into DIR instead, for any format; json, csv, xlsx
and html get plot files only then. Without --out, or when --out is not a
regular file (-, a device, a FIFO), they are written only into --plots
DIR. --plots none writes none. At most the first --max-plots pooled topics
are drawn (200 by default); the report lists the files written and says
which were not. All files are put in place together, once the report is complete.`,
		Example: `  coefaudit pool review.xlsx
  coefaudit pool review.xlsx --format md --out results/pool.md
  coefaudit pool extracted/ --method dl --level 90 --plots figures/
  coefaudit pool review.xlsx --format html --out pool.html
  coefaudit pool review.xlsx --covariance 0.5
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
	cmd.Flags().StringVarP(&o.format, "format", "f", "table", "output format: "+strings.Join(report.PoolFormats(), ", "))
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "write the report to this file (and the forest plots beside it, if it is a regular file)")
	cmd.Flags().StringVar(&o.plots, "plots", "", "write the forest plots into this existing folder, or none")
	cmd.Flags().IntVar(&o.maxPlots, "max-plots", report.DefaultMaxPlotTopics, "draw forest plots for at most this many pooled topics, the first in the report")
	cmd.Flags().StringVar(&o.method, "method", o.method, "estimator of the between-study variance τ²: reml or dl")
	cmd.Flags().Float64Var(&o.level, "level", o.level, "confidence level of every interval, in percent")
	cmd.Flags().StringVar(&o.covText, "covariance", pool.CovarianceOmit, "claims whose two estimates share a sample with no printed covariance: omit, or pool them in a sensitivity analysis at a correlation (e.g. 0.5) or at the least favourable bound (bound)")
	cmd.Flags().StringVar(&o.adjust, "adjust", audit.DefaultOptions.Adjust, "multiplicity adjustment deciding the claims' outcomes: none, holm or bh")
	return cmd
}

// runPool pools input, writes the forest plots and then the report, which
// lists the plots written. The plots and the report are put in place
// together, once all are complete.
func runPool(o *poolOptions) error {
	rep, err := report.PoolInput(o.input, report.Options{Audit: audit.Options{Adjust: o.adjust}},
		pool.Options{Method: o.method, Level: o.level / 100, Covariance: o.covariance})
	if err != nil {
		return finish(o.files, err)
	}
	// The report's target is opened first, so that a bad --out stops the
	// run before any plot is written.
	t, err := o.files.Open(o.stdout, o.out, o.input)
	if err != nil {
		return finish(o.files, flagError{err})
	}
	po := report.PoolPlotOptions{Dir: o.plots, MaxTopics: o.maxPlots}
	if o.plots == plotsNone {
		po.Dir = ""
	}
	if t.Regular() && (o.plotsBeside() || po.Dir != "") {
		po.Out = o.out
	}
	var files []report.PoolPlotFile
	leftOut := 0
	if o.plots != plotsNone {
		files, leftOut = report.PoolPlotFiles(rep, po)
	}
	doc := report.PoolDocument{Report: rep, Figures: map[int][]string{}}
	for _, f := range files {
		if err := writePlot(o, rep, f); err != nil {
			return finish(o.files, err)
		}
		rep.Plots = append(rep.Plots, f.Path)
		if f.Format == report.PlotSVG {
			doc.Figures[f.Topic] = append(doc.Figures[f.Topic], o.figurePath(po, f.Path))
		}
	}
	doc.PlotsNote = o.plotsNote(po, leftOut)
	if err := o.writer()(t, doc); err != nil {
		return finish(o.files, fmt.Errorf("writing the report: %w", err))
	}
	return finish(o.files, t.Close())
}

// figurePath is a plot's path as the Markdown report links it: relative to
// the report's folder when the report is a file, as written otherwise.
func (o *poolOptions) figurePath(po report.PoolPlotOptions, path string) string {
	if po.Out != "" || (o.out != "" && o.out != "-") {
		if rel, err := filepath.Rel(filepath.Dir(o.out), path); err == nil {
			return filepath.ToSlash(rel)
		}
	}
	return filepath.ToSlash(path)
}

// plotsNote says which forest plots were not written and why, or nothing
// when every plot asked for was.
func (o *poolOptions) plotsNote(po report.PoolPlotOptions, leftOut int) string {
	switch {
	case o.plots == plotsNone:
		return "No forest plots were drawn (--plots none)."
	case o.plots == "" && !o.plotsBeside():
		if o.format == "html" {
			return ""
		}
		return fmt.Sprintf("No forest plots were written: a %s report gets them only when asked, with --plots DIR.", o.format)
	case o.out != "" && po.Out == "" && po.Dir == "":
		where := "standard output"
		if o.out != "-" {
			where = o.out + ", which is not a regular file"
		}
		return fmt.Sprintf("No forest plots were written: the report goes to %s, with no folder beside it for them; give --plots DIR to write them into DIR.", where)
	case leftOut == 1:
		return fmt.Sprintf("Forest plots were drawn for the first %d pooled topics; 1 more was left out. Give --max-plots to draw more, or pool an input holding only the topics to draw.", po.MaxTopics)
	case leftOut > 1:
		return fmt.Sprintf("Forest plots were drawn for the first %d pooled topics; %d more were left out. Give --max-plots to draw more, or pool an input holding only the topics to draw.", po.MaxTopics, leftOut)
	}
	return ""
}

// writePlot writes one forest plot through the same safe writer as the
// report: never over the input, put in place with the report.
func writePlot(o *poolOptions, rep *pool.Report, f report.PoolPlotFile) error {
	t, err := o.files.Open(o.stdout, f.Path, o.input)
	if err != nil {
		return flagError{err}
	}
	if err := report.WritePoolPlot(t, rep.Topics[f.Topic], rep.Level, f); err != nil {
		return fmt.Errorf("writing %s: %w", f.Path, err)
	}
	return t.Close()
}
