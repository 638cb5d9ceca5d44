package report

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	_ "embed"
	"encoding/base64"
	"fmt"
	"html/template"
	"io"
	"strings"

	"coefaudit/audit"
)

//go:embed html.tmpl
var htmlReportTemplate string

//go:embed html.css
var htmlReportCSS string

//go:embed html.js
var htmlReportJS string

var htmlReport = template.Must(template.New("report").Funcs(template.FuncMap{
	"upper": strings.ToUpper,
}).Parse(htmlReportTemplate))

// HTMLCards is the most flagged claims (outcome other than consistent)
// the HTML report gives a card of their own, with the numbers, the chart,
// the notes and the methods paragraph. Every claim has its line in the
// table of claims; past this many cards a page takes long to open, and a
// review reads the cards of a large input in the xlsx or Markdown report
// (common practice, no source).
const HTMLCards = 500

// htmlChunkLines is the most lines of one table of claims. The lines
// stand in tables of this many, each of which the browser lays out only
// when it is scrolled into view (content-visibility): one table of 100,000
// lines took headless Chromium over 20 s to open, tables of 1,000 under 2 s
// (measured with chromium --headless --dump-dom; see README, Speed and
// memory).
const htmlChunkLines = 1000

// htmlWriter writes the report as one self-contained HTML page for a
// review to publish or circulate, as the claims arrive: the cautions, a
// table with a line for every claim, a card for each of the first
// HTMLCards flagged claims with its numbers, an interval chart (inline
// SVG), its notes and methods paragraph, the problems of the input, and a
// summary by outcome and by study, which the page's script shows first.
// Styles and the small filtering script are inline and the page's
// Content-Security-Policy forbids every network request, so the file
// opens offline and leaks nothing. Everything taken from the input is
// escaped by html/template.
//
// The page filters its lines and cards by outcome and by study, and reads
// an initial filter from the URL fragment or query:
//
//	report.html#outcome=unsupported,missed&study=Lee%202019
//
// Items filtered out carry the hidden attribute and data-filtered="out";
// without JavaScript everything is shown. When printed, the filters are
// left out and no card is split across pages.
//
// Each card's chart draws, on the scale the difference is on, the two
// estimates with the Wald intervals rebuilt from their SEs and the
// difference with its interval [1], against a line at zero:
//
//	estimate ± z₀.₉₇₅ · SE          difference: its CI, or d ± z₁₋α/₂ · SE(d)
//
// Intervals are drawn, not their overlap judged: overlapping 95% intervals
// do not mean no difference [1].
//
// The cards, at most HTMLCards of them, are held until the table is
// closed; nothing else of the claims is held but a count per study.
//
// [1] Cumming G, Finch S (2005). Inference by eye: confidence intervals
// and how to read pictures of data. American Psychologist 60(2):170–180.
type htmlWriter struct {
	bw       *bufio.Writer
	h        Header
	claims   int // claims written so far
	chunk    int // lines in the table being written
	flagged  int
	cards    bytes.Buffer // the cards written, at most HTMLCards
	tally    tallies
	problems heldProblems
	css      string
}

func newHTMLWriter(w io.Writer) *htmlWriter {
	return &htmlWriter{bw: bufio.NewWriterSize(w, 1<<16), css: paletteCSS() + htmlReportCSS}
}

// htmlHead is what the page shows before the claims.
type htmlHead struct {
	Title, Source, Alpha string
	Cautions             []string
	CSS                  template.CSS
	CSP                  string
}

// Begin implements Writer: the page's head, the cautions and the start of
// the table of claims.
func (h *htmlWriter) Begin(hd Header) error {
	h.h = hd
	v := htmlHead{Title: reportTitle, Source: hd.Source, Alpha: audit.FormatAlpha(hd.Alpha),
		Cautions: hd.cautions(), CSS: template.CSS(h.css),
		CSP: fmt.Sprintf("default-src 'none'; style-src '%s'; script-src '%s'; img-src data:; base-uri 'none'; form-action 'none'",
			cspHash(h.css), cspHash(htmlReportJS))}
	return h.execute("begin", v)
}

func (h *htmlWriter) execute(name string, v any) error {
	if err := htmlReport.ExecuteTemplate(h.bw, name, v); err != nil {
		return fmt.Errorf("html report: %w", err)
	}
	return nil
}

// htmlLine is a claim's line in the table of claims; ID is set when the
// claim has a card.
type htmlLine struct {
	ID, Study, Claim, Outcome string
	Row                       int
	Published, Recomputed     string
	// Difference is the difference with its interval, P its p (or the
	// range of p when there is no point p), by the precision rule.
	Difference, P string
}

// Study implements Writer: the claims' lines, and the cards of the flagged
// ones while there is room.
func (h *htmlWriter) Study(res audit.StudyResult) error {
	h.problems.add(res.Problems)
	h.tally.add(res.Claims)
	lines := make([]htmlLine, len(res.Claims))
	for i := range res.Claims {
		c := &res.Claims[i]
		h.claims++
		l := htmlLine{Study: c.Study, Claim: c.Claim, Outcome: outcomeOrIncomplete(c.Outcome), Row: c.Row,
			Published: dash(c.Published), Recomputed: dash(c.Recomputed), Difference: differenceCell(c), P: pOrRange(c)}
		if c.Outcome != audit.Consistent {
			h.flagged++
			if h.flagged <= HTMLCards {
				l.ID = fmt.Sprintf("claim-%d", h.claims)
				if err := htmlReport.ExecuteTemplate(&h.cards, "card", newHTMLCard(l.ID, c)); err != nil {
					return fmt.Errorf("html report: %w", err)
				}
			}
		}
		lines[i] = l
	}
	for len(lines) > 0 {
		if h.chunk == 0 {
			if err := h.execute("chunk-open", nil); err != nil {
				return err
			}
		}
		n := min(len(lines), htmlChunkLines-h.chunk)
		if err := h.execute("lines", lines[:n]); err != nil {
			return err
		}
		lines, h.chunk = lines[n:], h.chunk+n
		if h.chunk == htmlChunkLines {
			if err := h.closeChunk(); err != nil {
				return err
			}
		}
	}
	return nil
}

// closeChunk ends the table of lines being written, if one is.
func (h *htmlWriter) closeChunk() error {
	if h.chunk == 0 {
		return nil
	}
	h.chunk = 0
	return h.execute("chunk-close", nil)
}

// htmlTail is what the page shows after the claims.
type htmlTail struct {
	Claims, Flagged, Cards, LeftOut, Limit int
	CardsHTML                              template.HTML
	Problems                               []string
	SummaryLine                            string
	Counts                                 []htmlCount
	Cautions                               []string
	JS                                     template.JS
}

type htmlCount struct {
	Outcome string
	Count   int
}

// htmlStudies is one table of the study × outcome summary; each study's
// Counts follow Outcomes.
type htmlStudies struct {
	First    bool
	Outcomes []string
	Studies  []htmlStudy
}

type htmlStudy struct {
	Study  string
	Counts []int
	Total  int
}

// End implements Writer: the cards, the problems, the summary and the
// filters. The study × outcome table and the filter's list of studies are
// written htmlChunkLines studies at a time, from the tallies.
func (h *htmlWriter) End(f Footer) error {
	problems := h.problems.all(f)
	cards := min(h.flagged, HTMLCards)
	v := htmlTail{Claims: h.claims, Flagged: h.flagged, Cards: cards, LeftOut: h.flagged - cards, Limit: HTMLCards,
		CardsHTML:   template.HTML(h.cards.String()), // written by the card template, escaped there
		SummaryLine: summaryLine(h.h.Source, f.Summary, len(problems)), Cautions: h.h.cautions(), JS: template.JS(htmlReportJS)}
	for _, p := range problems {
		v.Problems = append(v.Problems, problemText(p))
	}
	outcomes := outcomesShown(f.Summary.Counts)
	for _, o := range outcomes {
		v.Counts = append(v.Counts, htmlCount{Outcome: o, Count: f.Summary.Counts[o]})
	}
	if err := h.closeChunk(); err != nil {
		return err
	}
	if err := h.execute("end", v); err != nil {
		return err
	}
	for start := 0; start < h.tally.len(); start += htmlChunkLines {
		var studies []htmlStudy
		for k := start; k < min(start+htmlChunkLines, h.tally.len()); k++ {
			row := htmlStudy{Study: h.tally.names[k], Total: h.tally.total(k)}
			for _, o := range outcomes {
				row.Counts = append(row.Counts, h.tally.count(k, o))
			}
			studies = append(studies, row)
		}
		if err := h.execute("study-chunk", htmlStudies{First: start == 0, Outcomes: outcomes, Studies: studies}); err != nil {
			return err
		}
	}
	if err := h.execute("filters", v); err != nil {
		return err
	}
	for names := h.tally.names; len(names) > 0; {
		n := min(len(names), htmlChunkLines)
		if err := h.execute("study-options", names[:n]); err != nil {
			return err
		}
		names = names[n:]
	}
	if err := h.execute("close", v); err != nil {
		return err
	}
	return h.bw.Flush()
}

func outcomeOrIncomplete(o string) string {
	if o == "" {
		return audit.Incomplete
	}
	return o
}

type htmlSide struct {
	Role, Label, Estimate, SE, SEFrom string
}

// htmlCard is what a flagged claim's card shows. Sides is empty when
// neither coefficient has an estimate, Chart when nothing can be drawn,
// so that a card shows no empty area.
type htmlCard struct {
	ID, Study, Claim, Outcome string
	Row                       int
	Sides                     []htmlSide
	Facts                     [][2]string
	Notes                     []string
	Methods                   string
	Chart                     template.HTML
	// ChartCaption says what the chart draws, and nothing it does not.
	ChartCaption string
	// Alternatives are the other tests of the same comparison.
	Alternatives []alternativeRow
}

func newHTMLCard(id string, c *audit.ClaimResult) htmlCard {
	h := htmlCard{ID: id, Study: c.Study, Claim: c.Claim, Outcome: outcomeOrIncomplete(c.Outcome),
		Row: c.Row, Notes: c.Notes, Methods: strings.TrimSpace(methodsText(c)), Chart: template.HTML(intervalChartSVG(c)),
		ChartCaption: chartCaption(c), Alternatives: alternativeRows(c)}
	if c.First.Estimate.Known() || c.Second.Estimate.Known() {
		for k, s := range []audit.Side{c.First, c.Second} {
			h.Sides = append(h.Sides, htmlSide{Role: []string{"First", "Second"}[k], Label: s.Label,
				Estimate: estimateCell(c, s), SE: seCell(c, s), SEFrom: s.SEFrom})
		}
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
	add("Scale", shownScale(c))
	add("Difference [CI]", differenceCell(c))
	add("p", pCell(c.P))
	add("p range", pRangeCell(c.PRange))
	if q := adjustedP(c, audit.AdjustHolm); q.Known() {
		add("p, Holm within study", pCell(q))
	}
	if q := adjustedP(c, audit.AdjustBH); q.Known() {
		add("p, BH within study", pCell(q))
	}
	add("df", dfCell(c.DF))
	if c.Alpha > 0 {
		add("α", audit.FormatAlpha(c.Alpha))
	}
	if c.Overlap != nil && c.Overlap.Proportion.Known() {
		add("CI overlap", fmt.Sprintf("%.2f of the mean margin of error (implies p ≈ %s if independent)",
			float64(c.Overlap.Proportion), pCell(c.Overlap.ImpliedP)))
	}
	return h
}

// cspHash is the Content-Security-Policy source expression allowing one
// inline element: 'sha256-…' of its exact text.
func cspHash(s string) string {
	sum := sha256.Sum256([]byte(s))
	return "sha256-" + base64.StdEncoding.EncodeToString(sum[:])
}
