package report

import (
	"bufio"
	"bytes"
	_ "embed"
	"encoding/base64"
	"fmt"
	"html/template"
	"io"
	"strconv"

	"coefaudit/pool"
	"coefaudit/report/forestplot"

	"codeberg.org/go-fonts/liberation/liberationsansbold"
	"codeberg.org/go-fonts/liberation/liberationsansregular"
)

//go:embed pool.tmpl
var poolHTMLTemplate string

//go:embed pool.css
var poolHTMLStyles string

// poolHTMLCSS is the page's style sheet with the two fonts the forest
// plots are set in, Liberation Sans regular and bold (SIL Open Font
// License), as data: a browser without them would set the plots' text in
// another font, whose other widths make labels and figures overlap.
var poolHTMLCSS = poolHTMLStyles +
	"@font-face{font-family:\"Liberation Sans\";font-weight:normal;src:url(data:font/ttf;base64," + base64.StdEncoding.EncodeToString(liberationsansregular.TTF) + ")}\n" +
	"@font-face{font-family:\"Liberation Sans\";font-weight:bold;src:url(data:font/ttf;base64," + base64.StdEncoding.EncodeToString(liberationsansbold.TTF) + ")}\n"

var poolHTML = template.Must(template.New("pool").Funcs(template.FuncMap{
	// numeric says which columns of the claims table hold numbers.
	"numeric": func(i int) bool { return i == 0 || i >= 4 && i != 6 },
}).Parse(poolHTMLTemplate))

// poolHTMLPage is what the pooling page's template shows.
type poolHTMLPage struct {
	Source, Summary, Orientation, Pct, PlotsNote string
	CSS                                          template.CSS
	CSP                                          string
	Cautions, Plots                              []string
	Topics                                       []poolHTMLTopic
}

type poolHTMLTopic struct {
	ID, Topic, ScaleNote     string
	K, LeftOutCount          int
	Lines                    []poolHTMLLine
	Prediction, PredictionDF string
	RatioLine, Sensitivity   string
	Heterogeneity            []string
	Figures                  []template.HTML
	FigureNote               string
	Studies, LeaveOneOut     [][]string
	LeftOut, Notes           []string
}

type poolHTMLLine struct{ Name, Estimate, SE, CI, Test, P string }

// WritePoolHTML writes the pooling report as one self-contained HTML page:
// per topic the pooled results (the HKSJ interval beside the Wald one),
// the heterogeneity in sentences, the sensitivity analysis, the forest
// plot inline as SVG (its pages, or its summary), the claims pooled, the
// leave-one-out estimates, the claims left out and the notes; then the
// cautions. Forest plots are drawn for the first DefaultMaxPlotTopics
// pooled topics. The page loads nothing: its Content-Security-Policy
// allows no script and no request, only its own style sheet (with the
// plots' fonts) and the plots' style attributes. Everything taken from the input is escaped
// (html/template; the plots' text by the SVG writer). Numbers follow the
// rule of poolFormat.
func WritePoolHTML(w io.Writer, doc PoolDocument) error {
	rep := doc.Report
	pct := poolLevelText(rep.Level)
	page := poolHTMLPage{Source: rep.Source, Summary: poolSummary(rep), Orientation: rep.Orientation, Pct: pct,
		PlotsNote: doc.PlotsNote, CSS: template.CSS(poolHTMLCSS), Cautions: rep.Cautions, Plots: rep.Plots,
		CSP: "default-src 'none'; style-src-elem '" + cspHash(poolHTMLCSS) + "'; style-src-attr 'unsafe-inline'; font-src data:; img-src data:; base-uri 'none'; form-action 'none'"}
	drawn := 0
	for _, t := range rep.Topics {
		ht, err := poolHTMLTopicOf(t, rep.Level, pct, drawn < DefaultMaxPlotTopics)
		if err != nil {
			return err
		}
		if t.Random != nil {
			drawn++
		}
		page.Topics = append(page.Topics, ht)
	}
	bw := bufio.NewWriter(w)
	if err := poolHTML.Execute(bw, page); err != nil {
		return err
	}
	return bw.Flush()
}

func poolHTMLTopicOf(t pool.Topic, level float64, pct string, draw bool) (poolHTMLTopic, error) {
	f := poolFormat(t.Decimals)
	ht := poolHTMLTopic{ID: "topic-" + t.Slug, Topic: t.Topic, ScaleNote: t.ScaleNote, K: t.K, LeftOutCount: len(t.LeftOut),
		RatioLine: poolRatioLine(t), Sensitivity: poolSensitivityText(t, pct), Heterogeneity: poolHeterogeneitySentences(t, pct),
		Notes: t.Notes}
	if t.Random != nil {
		for _, l := range poolLines(t) {
			ht.Lines = append(ht.Lines, poolHTMLLine{Name: l.name, Estimate: f.num(l.p.Estimate), SE: f.num(l.p.SE), CI: f.ci(l.p.CI),
				Test: poolTest(l.p), P: poolP(l.p.P)})
		}
		if t.Prediction != nil {
			ht.Prediction, ht.PredictionDF = f.ci(t.Prediction.CI), "t df "+strconv.FormatFloat(float64(t.Prediction.DF), 'f', -1, 64)
		}
		if draw {
			for _, pg := range PlotPages(t) {
				var buf bytes.Buffer
				if err := forestplot.WriteSVG(&buf, PoolPlot(t, level, pg)); err != nil {
					return ht, fmt.Errorf("forest plot of %q: %w", t.Topic, err)
				}
				ht.Figures = append(ht.Figures, inlineSVG(buf.Bytes()))
			}
		} else {
			ht.FigureNote = fmt.Sprintf("No forest plot is drawn for this topic: the page draws the first %d pooled topics.", DefaultMaxPlotTopics)
		}
	}
	for _, s := range t.Studies {
		ht.Studies = append(ht.Studies, []string{strconv.Itoa(s.Row), s.Study, s.Claim, s.First + " − " + s.Second,
			f.num(s.Estimate), f.num(s.SE), f.ci(s.CI), percent(s.WeightFixed, 1), percent(s.WeightRandom, 1)})
	}
	for _, l := range t.LeaveOneOut {
		ht.LeaveOneOut = append(ht.LeaveOneOut, []string{strconv.Itoa(l.Row), l.Study, l.Claim, f.num(l.Estimate), f.ci(l.CI),
			sig2(l.Tau2), percent(l.I2, 0)})
	}
	for _, l := range t.LeftOut {
		ht.LeftOut = append(ht.LeftOut, fmt.Sprintf("Row %d (%s, %s): %s.", l.Row, l.Study, l.Claim, l.Reason))
	}
	return ht, nil
}

// inlineSVG is an SVG document as an element to put inside an HTML page:
// without the XML declaration and comment before the <svg> tag. The SVG
// writer escapes every text it draws, so the markup is safe to insert.
func inlineSVG(svg []byte) template.HTML {
	if i := bytes.Index(svg, []byte("<svg")); i >= 0 {
		svg = svg[i:]
	}
	return template.HTML(svg)
}
