package report

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"net/url"
	"strconv"
	"text/tabwriter"

	"coefaudit/pool"
)

// PoolInput reads and audits the input at path (Collect) and pools the
// claims of each topic across studies (pool.Run).
func PoolInput(path string, o Options, po pool.Options) (*pool.Report, error) {
	rep, err := Collect(path, o)
	if err != nil {
		return nil, err
	}
	return pool.Run(rep, po)
}

// PoolDocument is what the pooling writers write: the pooling, with the
// forest plots written (pool.Report.Plots) and a note on those that were
// not.
type PoolDocument struct {
	*pool.Report
	// PlotsNote says which forest plots were not written and why (a limit
	// on the topics drawn, a report with no folder beside it); empty when
	// every plot asked for was written.
	PlotsNote string `json:"plots_note,omitempty"`
	// Figures are, by topic index, the forest-plot files (one per page)
	// the Markdown report shows, as slash-separated paths relative to the
	// report's folder.
	Figures map[int][]string `json:"-"`
}

// WritePoolJSON writes the pooling report as JSON: the pool.Report fields
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
// topic with its claims, the pooled lines (the HKSJ interval beside the
// Wald one), the heterogeneity in sentences, the sensitivity analysis, the
// leave-one-out estimates, the claims left out and notes; then the plots
// written, the note on those not written, and the cautions. Numbers follow
// the rule of poolFormat.
func WritePoolTable(w io.Writer, doc PoolDocument) error {
	rep := doc.Report
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%s\n%s\n", EscapeControls(poolSummary(rep)), rep.Orientation)
	pct := poolLevelText(rep.Level)
	for _, t := range rep.Topics {
		f := poolFormat(t.Decimals)
		fmt.Fprintf(bw, "\nTOPIC %s  (%d pooled, %d left out)\n  %s\n", EscapeControls(t.Topic), t.K, len(t.LeftOut), t.ScaleNote)
		if len(t.Studies) > 0 {
			tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
			fmt.Fprintf(tw, "  ROW\tSTUDY\tCLAIM\tFIRST − SECOND\tDIFFERENCE\tSE\t%s CI\tWEIGHT FE\tWEIGHT RE\n", pct)
			for _, s := range t.Studies {
				fmt.Fprintf(tw, "  %d\t%s\t%s\t%s − %s\t%s\t%s\t%s\t%s\t%s\n", s.Row, EscapeControls(s.Study), EscapeControls(s.Claim),
					EscapeControls(s.First), EscapeControls(s.Second),
					f.num(s.Estimate), f.num(s.SE), f.ci(s.CI), percent(s.WeightFixed, 1), percent(s.WeightRandom, 1))
			}
			if err := tw.Flush(); err != nil {
				return err
			}
		}
		if t.Random != nil {
			tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
			fmt.Fprintf(tw, "  POOLED\tESTIMATE\tSE\t%s CI\tTEST\tP\n", pct)
			for _, l := range poolLines(t) {
				fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\n", l.name, f.num(l.p.Estimate), f.num(l.p.SE), f.ci(l.p.CI), poolTest(l.p), poolP(l.p.P))
			}
			if t.Prediction != nil {
				fmt.Fprintf(tw, "  Prediction interval\t\t\t%s\tt df %s\t\n", f.ci(t.Prediction.CI), strconv.FormatFloat(float64(t.Prediction.DF), 'f', -1, 64))
			}
			if err := tw.Flush(); err != nil {
				return err
			}
			if s := poolRatioLine(t); s != "" {
				fmt.Fprintf(bw, "  %s\n", s)
			}
			fmt.Fprintln(bw, "  Heterogeneity")
			for _, s := range poolHeterogeneitySentences(t, pct) {
				fmt.Fprintf(bw, "    %s\n", s)
			}
		}
		if s := poolSensitivityText(t, pct); s != "" {
			fmt.Fprintf(bw, "  Sensitivity analysis\n    %s\n", EscapeControls(s))
		}
		if len(t.LeaveOneOut) > 0 {
			tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
			fmt.Fprintf(tw, "  WITHOUT ROW\tSTUDY\tCLAIM\tESTIMATE\t%s CI\tTAU²\tI²\n", pct)
			for _, l := range t.LeaveOneOut {
				fmt.Fprintf(tw, "  %d\t%s\t%s\t%s\t%s\t%s\t%s\n", l.Row, EscapeControls(l.Study), EscapeControls(l.Claim),
					f.num(l.Estimate), f.ci(l.CI), sig2(l.Tau2), percent(l.I2, 0))
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
// topic with a table of its claims, the pooled results (the HKSJ interval
// beside the Wald one), its forest plot embedded by a path relative to the
// report (PoolDocument.Figures), the heterogeneity in sentences, the
// sensitivity analysis, the leave-one-out estimates, the claims left out
// and notes; then the plots written, the note on those not written, and
// the cautions. Numbers follow the rule of poolFormat.
func WritePoolMarkdown(w io.Writer, doc PoolDocument) error {
	rep := doc.Report
	bw := bufio.NewWriter(w)
	pct := poolLevelText(rep.Level)
	fmt.Fprintf(bw, "# Pooled differences\n\n%s %s\n", mdText(poolSummary(rep)), mdText(rep.Orientation))
	for i, t := range rep.Topics {
		f := poolFormat(t.Decimals)
		fmt.Fprintf(bw, "\n## %s\n\n%s\n", mdText(t.Topic), mdText(t.ScaleNote))
		if len(t.Studies) > 0 {
			fmt.Fprintf(bw, "\n| Row | Study | Claim | First − second | Difference | SE | %s CI | Weight (fixed) | Weight (random) |\n", pct)
			fmt.Fprintln(bw, "|---:|---|---|---|---:|---:|---|---:|---:|")
			for _, s := range t.Studies {
				fmt.Fprintf(bw, "| %d | %s | %s | %s − %s | %s | %s | %s | %s | %s |\n", s.Row, mdText(s.Study), mdText(s.Claim),
					mdText(s.First), mdText(s.Second), f.num(s.Estimate), f.num(s.SE), f.ci(s.CI),
					percent(s.WeightFixed, 1), percent(s.WeightRandom, 1))
			}
		}
		if t.Random != nil {
			fmt.Fprintf(bw, "\n### Pooled results\n\n| Model | Estimate | SE | %s CI | Test | p |\n|---|---:|---:|---|---|---|\n", pct)
			for _, l := range poolLines(t) {
				fmt.Fprintf(bw, "| %s | %s | %s | %s | %s | %s |\n", l.name, f.num(l.p.Estimate), f.num(l.p.SE), f.ci(l.p.CI), poolTest(l.p), poolP(l.p.P))
			}
			if t.Prediction != nil {
				fmt.Fprintf(bw, "| Prediction interval |  |  | %s | t df %s |  |\n", f.ci(t.Prediction.CI), strconv.FormatFloat(float64(t.Prediction.DF), 'f', -1, 64))
			}
			if s := poolRatioLine(t); s != "" {
				fmt.Fprintf(bw, "\n%s\n", s)
			}
			for _, fig := range doc.Figures[i] {
				fmt.Fprintf(bw, "\n![Forest plot of %s](%s)\n", mdText(t.Topic), mdLinkPath(fig))
			}
			fmt.Fprintln(bw, "\n### Heterogeneity")
			fmt.Fprintln(bw)
			for _, s := range poolHeterogeneitySentences(t, pct) {
				fmt.Fprintf(bw, "%s\n", mdText(s))
			}
		}
		if s := poolSensitivityText(t, pct); s != "" {
			fmt.Fprintf(bw, "\n### Sensitivity analysis\n\n%s\n", mdText(s))
		}
		if len(t.LeaveOneOut) > 0 {
			fmt.Fprintf(bw, "\n### Leave one out\n\n| Without row | Study | Claim | Estimate | %s CI | τ² | I² |\n|---:|---|---|---:|---|---:|---:|\n", pct)
			for _, l := range t.LeaveOneOut {
				fmt.Fprintf(bw, "| %d | %s | %s | %s | %s | %s | %s |\n", l.Row, mdText(l.Study), mdText(l.Claim),
					f.num(l.Estimate), f.ci(l.CI), sig2(l.Tau2), percent(l.I2, 0))
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

// mdLinkPath escapes a relative path for a Markdown link target: each
// segment percent-encoded as a URL path, so that spaces and parentheses
// cannot end the link.
func mdLinkPath(p string) string {
	return (&url.URL{Path: p}).EscapedPath()
}

type poolLine struct {
	name string
	p    *pool.Estimate
}

func poolLines(t pool.Topic) []poolLine {
	return []poolLine{
		{"Fixed effect (inverse variance)", t.Fixed},
		{fmt.Sprintf("Random effects (%s), Wald interval", t.Tau2Method), t.Random},
		{fmt.Sprintf("Random effects (%s), HKSJ interval", t.Tau2Method), t.HKSJ},
	}
}

func poolSummary(rep *pool.Report) string {
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
