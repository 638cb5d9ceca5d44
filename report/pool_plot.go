package report

import (
	"fmt"
	"io"
	"path/filepath"
	"slices"
	"strings"

	"coefaudit/extract"
	"coefaudit/pool"
	"coefaudit/report/forestplot"
)

// Plot formats for PoolPlotFile.Format.
const (
	PlotSVG = "svg"
	PlotPNG = "png"
)

// MaxPlotRows is the most claims one forest plot shows. A page of 60 rows
// with its notes is about 20 inches tall at the plot's 7.5-inch width;
// more would not print, nor be read on a screen (common practice, no
// source).
const MaxPlotRows = 60

// MaxPlotPages is the most pages a topic's forest plot runs to. A topic
// with more than MaxPlotPages × MaxPlotRows claims is drawn as one summary
// page instead: the MaxPlotRows claims of largest random-effects weight,
// in input order, with the pooled results of all of them.
const MaxPlotPages = 10

// PlotPage is one page of a topic's forest plot: the claims it shows, as
// indexes into pool.Topic.Studies, and where it stands.
type PlotPage struct {
	// Studies are the indexes of the claims drawn, in input order.
	Studies []int
	// Page and Pages number the page, from 1; a plot of one page has
	// Pages 1.
	Page, Pages int
	// Summary is set when the topic has too many claims for pages and
	// Studies are those of largest weight.
	Summary bool
}

// PlotPages splits a pooled topic's claims into forest-plot pages: one
// page of up to MaxPlotRows, up to MaxPlotPages pages of MaxPlotRows, or
// one summary page beyond.
func PlotPages(t pool.Topic) []PlotPage {
	n := len(t.Studies)
	all := make([]int, n)
	for i := range all {
		all[i] = i
	}
	switch {
	case n <= MaxPlotRows:
		return []PlotPage{{Studies: all, Page: 1, Pages: 1}}
	case n <= MaxPlotRows*MaxPlotPages:
		pages := (n + MaxPlotRows - 1) / MaxPlotRows
		out := make([]PlotPage, pages)
		for p := range out {
			out[p] = PlotPage{Studies: all[p*MaxPlotRows : min(n, (p+1)*MaxPlotRows)], Page: p + 1, Pages: pages}
		}
		return out
	}
	slices.SortStableFunc(all, func(a, b int) int {
		wa, wb := float64(t.Studies[a].WeightRandom), float64(t.Studies[b].WeightRandom)
		switch {
		case wa > wb:
			return -1
		case wa < wb:
			return 1
		}
		return 0
	})
	top := all[:MaxPlotRows]
	slices.Sort(top)
	return []PlotPage{{Studies: top, Page: 1, Pages: 1, Summary: true}}
}

// PoolPlotFile is one forest-plot file to write: page Page (an index into
// PlotPages) of topic Topic (an index into pool.Report.Topics), drawn as
// Format at Path.
type PoolPlotFile struct {
	Topic  int
	Page   int
	Format string
	Path   string
}

// DefaultMaxPlotTopics is how many pooled topics get forest plots unless
// the caller asks for more, so that an input of thousands of topics does
// not fill a folder by accident (common practice, no source).
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
	// Formats are the files drawn per page; PlotSVG and PlotPNG when nil.
	Formats []string
}

// PoolPlotFiles names the forest-plot files of the first o.MaxTopics pooled
// topics, and returns how many pooled topics were left out for that
// limit. Out results/pool.md gives results/pool-<slug>.svg and .png, or
// pool-<slug>-p1.svg, -p2.svg, ... for a plot of several pages; Dir
// replaces Out's folder. With neither set no plots are named, so plots are
// written only when asked for.
func PoolPlotFiles(rep *pool.Report, o PoolPlotOptions) (files []PoolPlotFile, leftOut int) {
	if o.Out == "" && o.Dir == "" {
		return nil, 0
	}
	if o.MaxTopics <= 0 {
		o.MaxTopics = DefaultMaxPlotTopics
	}
	formats := o.Formats
	if formats == nil {
		formats = []string{PlotSVG, PlotPNG}
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
		pages := PlotPages(t)
		for p, pg := range pages {
			name := prefix + "-" + t.Slug
			if pg.Pages > 1 {
				name += fmt.Sprintf("-p%d", pg.Page)
			}
			for _, f := range formats {
				files = append(files, PoolPlotFile{Topic: i, Page: p, Format: f, Path: filepath.Join(dir, name+"."+f)})
			}
		}
	}
	return files, leftOut
}

// WritePoolPlot draws page f.Page of topic t as a forest plot (PoolPlot)
// in format f.Format, PlotSVG or PlotPNG.
func WritePoolPlot(w io.Writer, t pool.Topic, level float64, f PoolPlotFile) error {
	pages := PlotPages(t)
	if f.Page < 0 || f.Page >= len(pages) {
		return fmt.Errorf("forest plot of %q: no page %d", t.Topic, f.Page+1)
	}
	p := PoolPlot(t, level, pages[f.Page])
	switch f.Format {
	case PlotSVG:
		return forestplot.WriteSVG(w, p)
	case PlotPNG:
		return forestplot.WritePNG(w, p)
	}
	return fmt.Errorf("forest plot of %q: unknown format %q (want %s or %s)", t.Topic, f.Format, PlotSVG, PlotPNG)
}

// PoolPlot returns one page of the forest plot of a topic: a row per
// claim of the page with its interval and random-effects weight, the
// random-effects estimate of all the topic's claims as the diamond with
// its Wald interval, its HKSJ interval and the prediction interval as
// bars, and the fixed effect and heterogeneity in the notes.
func PoolPlot(t pool.Topic, level float64, page PlotPage) forestplot.Plot {
	f := poolFormat(t.Decimals)
	// Weights are proportions of all the topic's claims: a page shows its
	// claims' share of the whole.
	p := forestplot.Plot{Topic: t.Topic, Scale: poolAxisLabel(t.Scale), Level: level, Decimals: t.Decimals, WeightTotal: 1}
	switch {
	case page.Summary:
		p.Topic += fmt.Sprintf(" (the %d of %d claims with the largest weights)", len(page.Studies), len(t.Studies))
	case page.Pages > 1:
		p.Topic += fmt.Sprintf(" (page %d of %d)", page.Page, page.Pages)
	}
	for _, i := range page.Studies {
		s := t.Studies[i]
		p.Rows = append(p.Rows, forestplot.Row{Label: fmt.Sprintf("%s, %s", s.Study, s.Claim),
			Estimate: float64(s.Estimate), Low: float64(s.CI[0]), High: float64(s.CI[1]), Weight: float64(s.WeightRandom)})
	}
	if t.Random == nil {
		p.Notes = append(p.Notes, fmt.Sprintf("Not pooled: %d claim(s) usable, 2 needed.", t.K))
		return p
	}
	p.Pooled = &forestplot.Pooled{Label: fmt.Sprintf("Random effects (%s)", t.Tau2Method),
		Estimate: float64(t.Random.Estimate), Low: float64(t.Random.CI[0]), High: float64(t.Random.CI[1]),
		HKSJLow: float64(t.HKSJ.CI[0]), HKSJHigh: float64(t.HKSJ.CI[1]), HasHKSJ: true}
	if t.Prediction != nil {
		p.Pooled.PredLow, p.Pooled.PredHigh, p.Pooled.HasPrediction = float64(t.Prediction.CI[0]), float64(t.Prediction.CI[1]), true
	}
	if page.Summary {
		p.Notes = append(p.Notes, fmt.Sprintf("%d claims are too many to draw: the %d with the largest random-effects weights are shown, in input order; the pooled results are those of all %d. The report lists every claim.",
			len(t.Studies), len(page.Studies), len(t.Studies)))
	}
	if page.Pages > 1 {
		p.Notes = append(p.Notes, fmt.Sprintf("Page %d of %d: claims %d to %d of %d; the pooled results on every page are those of all of them.",
			page.Page, page.Pages, page.Studies[0]+1, page.Studies[len(page.Studies)-1]+1, len(t.Studies)))
	}
	p.Notes = append(p.Notes, "Differences are first − second as entered.",
		fmt.Sprintf("Fixed effect %s %s.", f.num(t.Fixed.Estimate), f.ci(t.Fixed.CI)))
	p.Notes = append(p.Notes, poolHeterogeneitySentences(t, poolLevelText(level))...)
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
