package audit

import (
	"bufio"
	"crypto/sha256"
	_ "embed"
	"encoding/base64"
	"fmt"
	"html/template"
	"io"
	"strings"
)

//go:embed htmlreport.tmpl
var htmlReportTemplate string

//go:embed htmlreport.css
var htmlReportCSS string

//go:embed htmlreport.js
var htmlReportJS string

var htmlReport = template.Must(template.New("report").Funcs(template.FuncMap{
	"upper": strings.ToUpper,
}).Parse(htmlReportTemplate))

// WriteHTML writes the report as one self-contained HTML page for a
// review to publish or circulate: the cautions, a summary by outcome and
// by study, one section per claim with its numbers, an interval chart
// (inline SVG), its notes and methods paragraph, and the problems of the
// input. Styles and the small filtering script are inline and the page's
// Content-Security-Policy forbids every network request, so the file
// opens offline and leaks nothing. Everything taken from the input is
// escaped by html/template.
//
// The page filters its sections by outcome and by study, and reads an
// initial filter from the URL fragment or query:
//
//	report.html#outcome=unsupported,missed&study=Lee%202019
//
// Sections filtered out carry the hidden attribute and
// data-filtered="out"; without JavaScript every section is shown. When
// printed, the filters are left out and no section is split across pages.
//
// Each claim's chart draws, on the scale the difference is on, the two
// estimates with the Wald intervals rebuilt from their SEs and the
// difference with its interval [1], against a line at zero:
//
//	estimate ± z₀.₉₇₅ · SE          difference: its CI, or d ± z₁₋α/₂ · SE(d)
//
// Intervals are drawn, not their overlap judged: overlapping 95% intervals
// do not mean no difference [1].
//
// [1] Cumming G, Finch S (2005). Inference by eye: confidence intervals
// and how to read pictures of data. American Psychologist 60(2):170–180.
func WriteHTML(w io.Writer, rep *Report) error {
	v := newHTMLView(rep)
	bw := bufio.NewWriter(w)
	if err := htmlReport.Execute(bw, v); err != nil {
		return fmt.Errorf("html report: %w", err)
	}
	return bw.Flush()
}

// htmlView is what the template shows.
type htmlView struct {
	Title, Source string
	SummaryLine   string
	Claims        int
	Counts        []htmlCount
	Outcomes      []string
	Studies       []htmlStudy
	Sections      []htmlClaim
	Problems      []string
	Cautions      []string
	Alpha         string
	CSS           template.CSS
	JS            template.JS
	CSP           string
}

type htmlCount struct {
	Outcome string
	Count   int
}

// htmlStudy is one row of the study × outcome table; Counts follow Outcomes.
type htmlStudy struct {
	Study  string
	Counts []int
	Total  int
}

type htmlSide struct {
	Role, Label, Estimate, SE, SEFrom string
}

type htmlClaim struct {
	ID, Study, Claim, Outcome string
	Row                       int
	Sides                     []htmlSide
	Facts                     [][2]string
	// Glance is the published and the recomputed verdict, for the index.
	Glance  [2]string
	Notes   []string
	Methods string
	Chart   template.HTML
}

func newHTMLView(rep *Report) htmlView {
	css := paletteCSS() + htmlReportCSS
	v := htmlView{Title: "Audit of published comparisons", Source: rep.Source, SummaryLine: summaryLine(rep),
		Claims: len(rep.Claims), Cautions: rep.Cautions, Alpha: formatAlpha(rep.Alpha),
		CSS: template.CSS(css), JS: template.JS(htmlReportJS)}
	if len(v.Cautions) == 0 {
		v.Cautions = Cautions
	}
	v.CSP = fmt.Sprintf("default-src 'none'; style-src '%s'; script-src '%s'; img-src data:; base-uri 'none'; form-action 'none'",
		cspHash(css), cspHash(htmlReportJS))
	counts, studies := tallyClaims(rep)
	v.Outcomes = outcomesShown(counts)
	for _, o := range v.Outcomes {
		v.Counts = append(v.Counts, htmlCount{Outcome: o, Count: counts[o]})
	}
	for _, s := range studies {
		h := htmlStudy{Study: s.Study, Total: s.Total}
		for _, o := range v.Outcomes {
			h.Counts = append(h.Counts, s.Counts[o])
		}
		v.Studies = append(v.Studies, h)
	}
	for i := range rep.Claims {
		v.Sections = append(v.Sections, newHTMLClaim(i, &rep.Claims[i]))
	}
	for _, p := range rep.Problems {
		v.Problems = append(v.Problems, problemText(p))
	}
	return v
}

// outcomesShown lists the outcomes of the palette in their order, then any
// outcome outside it, keeping only those that occur.
func outcomesShown(counts map[string]int) []string {
	var out []string
	known := map[string]bool{}
	for _, o := range Outcomes {
		known[o] = true
		if counts[o] > 0 {
			out = append(out, o)
		}
	}
	for o := range counts {
		if !known[o] {
			out = append(out, o)
		}
	}
	return out
}

func newHTMLClaim(i int, c *ClaimResult) htmlClaim {
	h := htmlClaim{ID: fmt.Sprintf("claim-%d", i+1), Study: c.Study, Claim: c.Claim, Outcome: c.Outcome,
		Row: c.Row, Notes: c.Notes, Methods: strings.TrimSpace(c.Methods), Chart: template.HTML(intervalChartSVG(c))}
	if h.Outcome == "" {
		h.Outcome = Incomplete
	}
	h.Glance = [2]string{dash(c.Published), dash(c.Recomputed)}
	for k, s := range []Side{c.First, c.Second} {
		h.Sides = append(h.Sides, htmlSide{Role: []string{"First", "Second"}[k], Label: s.Label,
			Estimate: numberOrDash(s.Estimate), SE: numberOrDash(s.SE), SEFrom: s.SEFrom})
	}
	add := func(name, value string) {
		if value != "" && value != "-" {
			h.Facts = append(h.Facts, [2]string{name, value})
		}
	}
	add("Published", c.Published)
	add("Recomputed", c.Recomputed)
	add("Basis", c.Basis)
	add("Relation", c.Relation)
	add("Method", c.Method)
	if c.Scale != "" {
		add("Scale", c.Scale)
	}
	add("Difference [CI]", differenceCell(*c))
	add("p", pCell(c.P))
	add("p range", pRangeCell(c.PRange))
	if q := adjustedP(c, AdjustHolm); q.Known() {
		add("p, Holm within study", pCell(q))
	}
	if q := adjustedP(c, AdjustBH); q.Known() {
		add("p, BH within study", pCell(q))
	}
	if c.Statistic.Known() {
		add("Statistic", formatNum(float64(c.Statistic)))
	}
	if c.DF.Known() {
		add("df", formatNum(float64(c.DF)))
	}
	if c.Alpha > 0 {
		add("α", formatAlpha(c.Alpha))
	}
	if c.Overlap != nil && c.Overlap.Proportion.Known() {
		add("CI overlap", fmt.Sprintf("%.2f of the mean margin of error (implies p ≈ %s if independent)",
			float64(c.Overlap.Proportion), pCell(c.Overlap.ImpliedP)))
	}
	for _, a := range c.Alternatives {
		add("Also: "+a.Method, "p = "+pCell(a.P))
	}
	return h
}

func numberOrDash(n Number) string {
	if !n.Known() {
		return "–"
	}
	return formatNum(float64(n))
}

// cspHash is the Content-Security-Policy source expression allowing one
// inline element: 'sha256-…' of its exact text.
func cspHash(s string) string {
	sum := sha256.Sum256([]byte(s))
	return "sha256-" + base64.StdEncoding.EncodeToString(sum[:])
}
