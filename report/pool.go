package report

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"text/tabwriter"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/report/forestplot"
)

// PoolInput reads and audits the input at path (Collect) and pools the
// claims of each topic across studies (audit.Pool).
func PoolInput(path string, o Options, po audit.PoolOptions) (*audit.PoolReport, error) {
	rep, err := Collect(path, o)
	if err != nil {
		return nil, err
	}
	return audit.Pool(rep, po)
}

// PoolDocument is what the pooling writers write: the pooling, with the
// forest plots written (PoolReport.Plots) and a note on those that were
// not.
type PoolDocument struct {
	*audit.PoolReport
	// PlotsNote says which forest plots were not written and why (a limit
	// on the topics drawn, a report with no folder beside it); empty when
	// every plot asked for was written.
	PlotsNote string `json:"plots_note,omitempty"`
}

// WritePoolJSON writes the pooling report as JSON: the PoolReport fields
// under their json names, every interval as [low, high], proportions (not
// percentages) for levels, weights and I², and null for a number that is
// not known (NaN or infinite; a df of null means the standard normal);
// then plots_note, when there is one.
func WritePoolJSON(w io.Writer, doc PoolDocument) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(doc)
}

// WritePoolTable writes the pooling report for the terminal: a block per
// topic with its claims, the pooled lines, heterogeneity, leave-one-out
// estimates, the claims left out and notes; then the plots written, the
// note on those not written, and the cautions.
func WritePoolTable(w io.Writer, doc PoolDocument) error {
	rep := doc.PoolReport
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%s\n%s\n", EscapeControls(poolSummary(rep)), rep.Orientation)
	pct := poolLevelText(rep.Level)
	for _, t := range rep.Topics {
		fmt.Fprintf(bw, "\nTOPIC %s  (%d pooled, %d left out)\n  %s\n", EscapeControls(t.Topic), t.K, len(t.LeftOut), t.ScaleNote)
		if len(t.Studies) > 0 {
			tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
			fmt.Fprintf(tw, "  ROW\tSTUDY\tCLAIM\tFIRST − SECOND\tDIFFERENCE\tSE\t%s CI\tWEIGHT FE\tWEIGHT RE\n", pct)
			for _, s := range t.Studies {
				fmt.Fprintf(tw, "  %d\t%s\t%s\t%s − %s\t%s\t%s\t%s\t%s\t%s\n", s.Row, EscapeControls(s.Study), EscapeControls(s.Claim),
					EscapeControls(s.First), EscapeControls(s.Second),
					poolNum(s.Estimate), poolNum(s.SE), poolCI(s.CI), poolPercent(s.WeightFixed), poolPercent(s.WeightRandom))
			}
			if err := tw.Flush(); err != nil {
				return err
			}
		}
		if t.Random != nil {
			tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
			fmt.Fprintf(tw, "  POOLED\tESTIMATE\tSE\t%s CI\tTEST\tP\n", pct)
			for _, l := range poolLines(t) {
				fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\n", l.name, poolNum(l.p.Estimate), poolNum(l.p.SE), poolCI(l.p.CI), poolStat(l.p), pCell(l.p.P))
			}
			if t.Prediction != nil {
				fmt.Fprintf(tw, "  Prediction interval\t\t\t%s\tt df %s\t\n", poolCI(t.Prediction.CI), poolNum(t.Prediction.DF))
			}
			if err := tw.Flush(); err != nil {
				return err
			}
			if s := poolRatioLine(t); s != "" {
				fmt.Fprintf(bw, "  %s\n", s)
			}
			fmt.Fprintf(bw, "  Heterogeneity: %s\n", poolHeterogeneityText(t, pct))
		}
		if s := poolSensitivityText(t, pct); s != "" {
			fmt.Fprintf(bw, "  %s\n", EscapeControls(s))
		}
		if len(t.LeaveOneOut) > 0 {
			tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
			fmt.Fprintf(tw, "  WITHOUT ROW\tSTUDY\tCLAIM\tESTIMATE\t%s CI\tTAU²\tI²\n", pct)
			for _, l := range t.LeaveOneOut {
				fmt.Fprintf(tw, "  %d\t%s\t%s\t%s\t%s\t%s\t%s\n", l.Row, EscapeControls(l.Study), EscapeControls(l.Claim),
					poolNum(l.Estimate), poolCI(l.CI), poolNum(l.Tau2), poolPercent(l.I2))
			}
			if err := tw.Flush(); err != nil {
				return err
			}
		}
		if len(t.LeftOut) > 0 {
			fmt.Fprintln(bw, "  Left out")
			for _, l := range t.LeftOut {
				fmt.Fprintf(bw, "    - row %d (%s, %s): %s.\n", l.Row, EscapeControls(l.Study), EscapeControls(l.Claim), EscapeControls(l.Reason))
			}
		}
		if len(t.Notes) > 0 {
			fmt.Fprintln(bw, "  Notes")
			for _, n := range t.Notes {
				fmt.Fprintf(bw, "    - %s\n", EscapeControls(n))
			}
		}
	}
	if len(rep.Plots) > 0 {
		fmt.Fprintln(bw, "\nForest plots written")
		for _, p := range rep.Plots {
			fmt.Fprintf(bw, "  - %s\n", EscapeControls(p))
		}
	}
	if doc.PlotsNote != "" {
		fmt.Fprintf(bw, "\n%s\n", EscapeControls(doc.PlotsNote))
	}
	fmt.Fprintln(bw, "\nCautions")
	for _, c := range rep.Cautions {
		fmt.Fprintf(bw, "  - %s\n", c)
	}
	return bw.Flush()
}

// WritePoolMarkdown writes the pooling report as Markdown: a heading per
// topic with a table of its claims, the pooled results, the heterogeneity,
// the leave-one-out estimates, the claims left out and notes; then the
// plots written, the note on those not written, and the cautions.
func WritePoolMarkdown(w io.Writer, doc PoolDocument) error {
	rep := doc.PoolReport
	bw := bufio.NewWriter(w)
	pct := poolLevelText(rep.Level)
	fmt.Fprintf(bw, "# Pooled differences\n\n%s %s\n", mdText(poolSummary(rep)), mdText(rep.Orientation))
	for _, t := range rep.Topics {
		fmt.Fprintf(bw, "\n## %s\n\n%s\n", mdText(t.Topic), mdText(t.ScaleNote))
		if len(t.Studies) > 0 {
			fmt.Fprintf(bw, "\n| Row | Study | Claim | First − second | Difference | SE | %s CI | Weight (fixed) | Weight (random) |\n", pct)
			fmt.Fprintln(bw, "|---:|---|---|---|---:|---:|---|---:|---:|")
			for _, s := range t.Studies {
				fmt.Fprintf(bw, "| %d | %s | %s | %s − %s | %s | %s | %s | %s | %s |\n", s.Row, mdText(s.Study), mdText(s.Claim),
					mdText(s.First), mdText(s.Second), poolNum(s.Estimate), poolNum(s.SE), poolCI(s.CI),
					poolPercent(s.WeightFixed), poolPercent(s.WeightRandom))
			}
		}
		if t.Random != nil {
			fmt.Fprintf(bw, "\n### Pooled results\n\n| Model | Estimate | SE | %s CI | Test | p |\n|---|---:|---:|---|---|---:|\n", pct)
			for _, l := range poolLines(t) {
				fmt.Fprintf(bw, "| %s | %s | %s | %s | %s | %s |\n", l.name, poolNum(l.p.Estimate), poolNum(l.p.SE), poolCI(l.p.CI), poolStat(l.p), pCell(l.p.P))
			}
			if t.Prediction != nil {
				fmt.Fprintf(bw, "| Prediction interval |  |  | %s | t df %s |  |\n", poolCI(t.Prediction.CI), poolNum(t.Prediction.DF))
			}
			if s := poolRatioLine(t); s != "" {
				fmt.Fprintf(bw, "\n%s\n", s)
			}
			fmt.Fprintf(bw, "\n### Heterogeneity\n\n%s\n", mdText(poolHeterogeneityText(t, pct)))
		}
		if s := poolSensitivityText(t, pct); s != "" {
			fmt.Fprintf(bw, "\n### Sensitivity analysis\n\n%s\n", mdText(s))
		}
		if len(t.LeaveOneOut) > 0 {
			fmt.Fprintf(bw, "\n### Leave one out\n\n| Without row | Study | Claim | Estimate | %s CI | τ² | I² |\n|---:|---|---|---:|---|---:|---:|\n", pct)
			for _, l := range t.LeaveOneOut {
				fmt.Fprintf(bw, "| %d | %s | %s | %s | %s | %s | %s |\n", l.Row, mdText(l.Study), mdText(l.Claim),
					poolNum(l.Estimate), poolCI(l.CI), poolNum(l.Tau2), poolPercent(l.I2))
			}
		}
		if len(t.LeftOut) > 0 {
			fmt.Fprintln(bw, "\n### Left out")
			fmt.Fprintln(bw)
			for _, l := range t.LeftOut {
				fmt.Fprintf(bw, "- Row %d (%s, %s): %s.\n", l.Row, mdText(l.Study), mdText(l.Claim), mdText(l.Reason))
			}
		}
		if len(t.Notes) > 0 {
			fmt.Fprintln(bw, "\n### Notes")
			fmt.Fprintln(bw)
			for _, n := range t.Notes {
				fmt.Fprintf(bw, "- %s\n", mdText(n))
			}
		}
	}
	if len(rep.Plots) > 0 || doc.PlotsNote != "" {
		fmt.Fprintln(bw, "\n## Forest plots")
		fmt.Fprintln(bw)
		for _, p := range rep.Plots {
			fmt.Fprintf(bw, "- %s\n", mdText(p))
		}
		if doc.PlotsNote != "" {
			if len(rep.Plots) > 0 {
				fmt.Fprintln(bw)
			}
			fmt.Fprintln(bw, mdText(doc.PlotsNote))
		}
	}
	fmt.Fprintln(bw, "\n## Cautions")
	fmt.Fprintln(bw)
	for _, c := range rep.Cautions {
		fmt.Fprintf(bw, "- %s\n", mdText(c))
	}
	return bw.Flush()
}

// Plot formats for PoolPlotFile.Format.
const (
	PlotSVG = "svg"
	PlotPNG = "png"
)

// PoolPlotFile is one forest-plot file to write: topic Topic (an index into
// PoolReport.Topics) drawn as Format at Path.
type PoolPlotFile struct {
	Topic  int
	Format string
	Path   string
}

// DefaultMaxPlotTopics is how many pooled topics get forest plots unless
// the caller asks for more. Each topic is an SVG and a PNG (1,000 topics
// took 18 s and 92 MB), so that an input of thousands of topics does not
// fill a folder by accident (common practice, no source).
const DefaultMaxPlotTopics = 200

// PoolPlotOptions say where PoolPlotFiles puts the forest plots, and how
// many.
type PoolPlotOptions struct {
	// Out is the report's file: the plots go beside it and take its name
	// without the extension as a prefix. Leave it empty when the report is
	// not a regular file (standard output, a device, a FIFO), which has no
	// folder of its own for them.
	Out string
	// Dir, when set, is the folder of the plots, in place of Out's.
	Dir string
	// MaxTopics is how many pooled topics are drawn, the first in the
	// report's order; DefaultMaxPlotTopics when 0.
	MaxTopics int
}

// PoolPlotFiles names an SVG and a PNG forest plot for each of the first
// o.MaxTopics pooled topics, and returns how many pooled topics were left
// out for that limit. Out results/pool.md gives results/pool-<slug>.svg
// and .png; Dir replaces Out's folder. With neither set no plots are
// named, so plots are written only when asked for.
func PoolPlotFiles(rep *audit.PoolReport, o PoolPlotOptions) (files []PoolPlotFile, leftOut int) {
	if o.Out == "" && o.Dir == "" {
		return nil, 0
	}
	if o.MaxTopics <= 0 {
		o.MaxTopics = DefaultMaxPlotTopics
	}
	prefix, dir := "pool", o.Dir
	if o.Out != "" {
		base := filepath.Base(o.Out)
		if p := strings.TrimSuffix(base, filepath.Ext(base)); p != "" {
			prefix = p
		}
		if dir == "" {
			dir = filepath.Dir(o.Out)
		}
	}
	drawn := 0
	for i, t := range rep.Topics {
		if t.Random == nil {
			continue
		}
		if drawn == o.MaxTopics {
			leftOut++
			continue
		}
		drawn++
		for _, f := range []string{PlotSVG, PlotPNG} {
			files = append(files, PoolPlotFile{Topic: i, Format: f, Path: filepath.Join(dir, prefix+"-"+t.Slug+"."+f)})
		}
	}
	return files, leftOut
}

// WritePoolPlot draws topic t as a forest plot (PoolPlot) in format
// PlotSVG or PlotPNG.
func WritePoolPlot(w io.Writer, t audit.TopicPool, level float64, format string) error {
	p := PoolPlot(t, level)
	switch format {
	case PlotSVG:
		return forestplot.WriteSVG(w, p)
	case PlotPNG:
		return forestplot.WritePNG(w, p)
	}
	return fmt.Errorf("forest plot of %q: unknown format %q (want %s or %s)", t.Topic, format, PlotSVG, PlotPNG)
}

// PoolPlot returns the forest plot of a topic: one row per pooled claim
// with its interval and random-effects weight, the random-effects estimate
// as the diamond with its Wald interval and the prediction interval, and
// the HKSJ interval, τ², I² and Q in the notes.
func PoolPlot(t audit.TopicPool, level float64) forestplot.Plot {
	p := forestplot.Plot{Topic: t.Topic, Scale: poolAxisLabel(t.Scale), Level: level}
	for _, s := range t.Studies {
		p.Rows = append(p.Rows, forestplot.Row{Label: fmt.Sprintf("%s, %s", s.Study, s.Claim),
			Estimate: float64(s.Estimate), Low: float64(s.CI[0]), High: float64(s.CI[1]), Weight: float64(s.WeightRandom)})
	}
	if t.Random == nil {
		p.Notes = append(p.Notes, fmt.Sprintf("Not pooled: %d claim(s) usable, 2 needed.", t.K))
		return p
	}
	p.Pooled = &forestplot.Pooled{Label: fmt.Sprintf("Random effects (%s)", t.Tau2Method),
		Estimate: float64(t.Random.Estimate), Low: float64(t.Random.CI[0]), High: float64(t.Random.CI[1])}
	if t.Prediction != nil {
		p.Pooled.PredLow, p.Pooled.PredHigh, p.Pooled.HasPrediction = float64(t.Prediction.CI[0]), float64(t.Prediction.CI[1]), true
	}
	p.Notes = append(p.Notes, "Differences are first − second as entered.",
		fmt.Sprintf("HKSJ interval %s; fixed effect %s %s.", poolCI(t.HKSJ.CI), poolNum(t.Fixed.Estimate), poolCI(t.Fixed.CI)),
		poolHeterogeneityText(t, poolLevelText(level)))
	if len(t.LeftOut) > 0 {
		p.Notes = append(p.Notes, fmt.Sprintf("%d claim(s) of this topic left out; see the report.", len(t.LeftOut)))
	}
	return p
}

func poolAxisLabel(scale string) string {
	switch scale {
	case extract.ScaleLog:
		return "difference first − second (log scale: log of the ratio of ratios)"
	case extract.ScaleFisherZ:
		return "difference first − second (Fisher z scale: z1 − z2, not r1 − r2)"
	}
	return "difference first − second (coefficients' own units)"
}

type poolLine struct {
	name string
	p    *audit.PooledEstimate
}

func poolLines(t audit.TopicPool) []poolLine {
	return []poolLine{
		{"Fixed effect (inverse variance)", t.Fixed},
		{fmt.Sprintf("Random effects (%s), Wald", t.Tau2Method), t.Random},
		{fmt.Sprintf("Random effects (%s), HKSJ", t.Tau2Method), t.HKSJ},
	}
}

// poolRatioLine gives the pooled ratio of ratios for a topic on the log scale.
func poolRatioLine(t audit.TopicPool) string {
	if t.Scale != extract.ScaleLog || t.Random == nil {
		return ""
	}
	e := func(n audit.Number) audit.Number { return audit.Number(math.Exp(float64(n))) }
	return fmt.Sprintf("Ratio of ratios, exp(random-effects estimate): %s %s (HKSJ %s).", poolNum(e(t.Random.Estimate)),
		poolCI([2]audit.Number{e(t.Random.CI[0]), e(t.Random.CI[1])}), poolCI([2]audit.Number{e(t.HKSJ.CI[0]), e(t.HKSJ.CI[1])}))
}

func poolHeterogeneityText(t audit.TopicPool, pct string) string {
	h := t.Heterogeneity
	if h == nil {
		return ""
	}
	tau2 := "τ² = " + poolNum(h.Tau2)
	if h.Tau2SE.Known() {
		tau2 += " (SE " + poolNum(h.Tau2SE) + ")"
	}
	return fmt.Sprintf("Q = %s on %d df, p %s; I² = %s (from τ²: %s); %s by %s, %s Q-profile CI %s.",
		poolNum(h.Q), h.DF, poolPText(h.P), poolPercent(h.I2), poolPercent(h.I2Tau2), tau2, t.Tau2Method, pct, poolCI(h.Tau2CI))
}

// poolSensitivityText says what the sensitivity analysis of a topic
// assumed and found, or "" when there is none.
func poolSensitivityText(t audit.TopicPool, pct string) string {
	s := t.Sensitivity
	if s == nil {
		return ""
	}
	var rows []string
	for _, a := range s.Added {
		rows = append(rows, fmt.Sprint(a.Row))
	}
	head := fmt.Sprintf("Sensitivity analysis, with %s: row(s) %s added, %d claims pooled", s.Assumption, strings.Join(rows, ", "), s.K)
	if s.Random == nil {
		return head + "; not pooled: " + s.Error + "."
	}
	return fmt.Sprintf("%s; random effects (%s) %s, %s CI %s (Wald), %s (HKSJ); fixed effect %s %s; τ² = %s, I² = %s.", head, s.Tau2Method,
		poolNum(s.Random.Estimate), pct, poolCI(s.Random.CI), poolCI(s.HKSJ.CI), poolNum(s.Fixed.Estimate), poolCI(s.Fixed.CI),
		poolNum(s.Tau2), poolPercent(s.I2))
}

func poolSummary(rep *audit.PoolReport) string {
	pooled := 0
	for _, t := range rep.Topics {
		if t.Random != nil {
			pooled++
		}
	}
	src := ""
	if rep.Source != "" {
		src = " in " + rep.Source
	}
	s := fmt.Sprintf("%d topic(s)%s, %d pooled; τ² by %s; intervals at %s.", len(rep.Topics), src, pooled, rep.Method, poolLevelText(rep.Level))
	if rep.ClaimsWithoutTopic > 0 {
		s += fmt.Sprintf(" %d claim(s) have no topic and are not pooled.", rep.ClaimsWithoutTopic)
	}
	return s
}

func poolLevelText(level float64) string { return strconv.FormatFloat(100*level, 'f', -1, 64) + "%" }

func poolNum(n audit.Number) string {
	if !n.Known() {
		return "-"
	}
	return audit.FormatNum(float64(n))
}

func poolCI(ci [2]audit.Number) string {
	if !ci[0].Known() && !ci[1].Known() {
		return "-"
	}
	return "[" + poolNum(ci[0]) + ", " + poolNum(ci[1]) + "]"
}

func poolPercent(n audit.Number) string {
	if !n.Known() {
		return "-"
	}
	return strconv.FormatFloat(100*float64(n), 'f', 1, 64) + "%"
}

func poolStat(p *audit.PooledEstimate) string {
	if !p.Statistic.Known() {
		return "-"
	}
	if !p.DF.Known() {
		return "z = " + audit.FormatNum(float64(p.Statistic))
	}
	return fmt.Sprintf("t(%s) = %s", audit.FormatNum(float64(p.DF)), audit.FormatNum(float64(p.Statistic)))
}

// poolPText writes "= 0.012" or "< 0.001".
func poolPText(p audit.Number) string {
	if !p.Known() {
		return "unknown"
	}
	if p < 0.001 {
		return audit.FormatP(float64(p))
	}
	return "= " + audit.FormatP(float64(p))
}
