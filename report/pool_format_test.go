package report

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"regexp"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/pool"
	"coefaudit/report/forestplot"

	"golang.org/x/net/html"
)

// manyClaimsTopic pools n invented claims of one topic, their SEs growing
// with their row so that weights differ.
func manyClaimsTopic(t testing.TB, n int) pool.Topic {
	t.Helper()
	claims := make([]audit.ClaimResult, n)
	for i := range claims {
		claims[i] = audit.ClaimResult{Study: fmt.Sprintf("S%d", i+1), Claim: "c", Row: i + 2, Topic: "big", Outcome: audit.Consistent,
			Measure: extract.MeasureB, PoolScale: extract.ScaleAsPrinted, PoolEstimate: audit.Number(0.2 + 0.1*math.Sin(float64(i))),
			PoolSE: audit.Number(0.05 + 0.001*float64(i%97))}
	}
	rep, err := pool.Run(&audit.Report{Claims: claims}, pool.Options{Method: pool.DL})
	if err != nil {
		t.Fatal(err)
	}
	return rep.Topics[0]
}

// TestIssue20PlotPages: up to 60 claims make one page, up to 600 make
// pages of 60, more make one summary page of the 60 claims of largest
// weight in input order; 10,000 claims give a plot of print size (before:
// a 960 × 234,317 px PNG).
func TestIssue20PlotPages(t *testing.T) {
	for _, tt := range []struct {
		n, pages, lastRows int
		summary            bool
	}{{3, 1, 3, false}, {60, 1, 60, false}, {61, 2, 1, false}, {600, 10, 60, false}, {601, 1, 60, true}, {10000, 1, 60, true}} {
		tp := manyClaimsTopic(t, tt.n)
		pages := PlotPages(tp)
		last := pages[len(pages)-1]
		if len(pages) != tt.pages || len(last.Studies) != tt.lastRows || last.Summary != tt.summary || last.Pages != tt.pages {
			t.Errorf("PlotPages(%d claims) = %d pages, the last of %d rows (summary %v); want %d, %d, %v",
				tt.n, len(pages), len(last.Studies), last.Summary, tt.pages, tt.lastRows, tt.summary)
		}
		if tt.summary {
			minShown := math.Inf(1)
			shown := map[int]bool{}
			for k, i := range last.Studies {
				if k > 0 && i <= last.Studies[k-1] {
					t.Errorf("PlotPages(%d) summary rows not in input order: %v", tt.n, last.Studies)
				}
				shown[i] = true
				minShown = math.Min(minShown, float64(tp.Studies[i].WeightRandom))
			}
			for i, s := range tp.Studies {
				if !shown[i] && float64(s.WeightRandom) > minShown {
					t.Errorf("PlotPages(%d) summary leaves out claim %d of weight %v above a shown one's %v", tt.n, i, s.WeightRandom, minShown)
					break
				}
			}
		}
		_, h := forestplot.Size(PoolPlot(tp, 0.95, last))
		if in := h.Points() / 72; in > 22 {
			t.Errorf("PoolPlot(%d claims) is %.1f in tall, want a page of at most 22 in", tt.n, in)
		}
	}
}

// poolNumbers checks a pooled table's cells against the precision rule:
// estimates, SEs and intervals to the topic's decimals, statistics to 2,
// p as journals print it.
var (
	decimalsOf = regexp.MustCompile(`^−?\d+\.(\d+)$`)
	journalPRe = regexp.MustCompile(`^p (= \.\d{3}|< \.001|> \.999)$`)
	testRe     = regexp.MustCompile(`^(z|t\(\d+\)) = −?\d+\.\d{2}$`)
)

func checkPoolCells(t *testing.T, where string, dec int, cells []string) {
	t.Helper()
	num := func(s string) {
		if m := decimalsOf.FindStringSubmatch(s); m == nil || len(m[1]) != dec {
			t.Errorf("%s: %q is not a number with %d decimals", where, s, dec)
		}
	}
	// Model | Estimate | SE | CI | Test | p
	num(cells[1])
	num(cells[2])
	ci := strings.Split(strings.Trim(cells[3], "[]"), ", ")
	if len(ci) != 2 {
		t.Fatalf("%s: interval %q", where, cells[3])
	}
	num(ci[0])
	num(ci[1])
	if !testRe.MatchString(cells[4]) {
		t.Errorf("%s: test %q, want z or t(df) to 2 decimals", where, cells[4])
	}
	if !journalPRe.MatchString(cells[5]) {
		t.Errorf("%s: p %q, want p as journals print it", where, cells[5])
	}
}

// TestIssue20PoolPrecision: every number of the pooled results in the
// Markdown and HTML reports follows the rule, for topics printed with 1,
// 2 and 3 decimals; nothing prints as "-0.00", "NA" or "p = -".
func TestIssue20PoolPrecision(t *testing.T) {
	for _, printed := range []int{1, 2, 3} {
		rep := writersReport(t)
		tp := &rep.Topics[0]
		tp.Decimals = min(4, max(2, printed+1))
		doc := PoolDocument{Report: rep}
		var md, page bytes.Buffer
		if err := WritePoolMarkdown(&md, doc); err != nil {
			t.Fatal(err)
		}
		if err := WritePoolHTML(&page, doc); err != nil {
			t.Fatal(err)
		}
		rows := 0
		for _, line := range strings.Split(md.String(), "\n") {
			if strings.HasPrefix(line, "| Fixed effect") || strings.HasPrefix(line, "| Random effects") {
				cells := strings.Split(strings.Trim(line, "| "), " | ")
				checkPoolCells(t, fmt.Sprintf("markdown (printed %d)", printed), tp.Decimals, cells)
				rows++
			}
		}
		root, err := html.Parse(&page)
		if err != nil {
			t.Fatal(err)
		}
		for _, tr := range findAll(root, func(n *html.Node) bool { return n.Type == html.ElementNode && n.Data == "tr" }) {
			var cells []string
			for c := tr.FirstChild; c != nil; c = c.NextSibling {
				if c.Type == html.ElementNode {
					cells = append(cells, textOf(c))
				}
			}
			if len(cells) == 6 && (strings.HasPrefix(cells[0], "Fixed effect") || strings.HasPrefix(cells[0], "Random effects")) {
				checkPoolCells(t, fmt.Sprintf("html (printed %d)", printed), tp.Decimals, cells)
				rows++
			}
		}
		if rows != 6 {
			t.Errorf("found %d pooled rows in the Markdown and HTML, want 3 each", rows)
		}
		for _, bad := range []string{"-0.00", "−0.00 ", "NA", "p = -", "p = –"} {
			if strings.Contains(md.String(), bad) {
				t.Errorf("markdown (printed %d) holds %q", printed, bad)
			}
		}
	}
}

// TestIssue17PoolSensitivityShown: the sensitivity analysis stands beside
// the main result in every format.
func TestIssue17PoolSensitivityShown(t *testing.T) {
	claims := []audit.ClaimResult{}
	for i, d := range []float64{0.31, 0.25, 0.4} {
		claims = append(claims, audit.ClaimResult{Study: fmt.Sprintf("S%d", i), Claim: "c", Row: i + 2, Topic: "t", Outcome: audit.Consistent,
			Measure: extract.MeasureB, PoolScale: extract.ScaleAsPrinted, PoolEstimate: audit.Number(d), PoolSE: 0.1})
	}
	claims = append(claims, audit.ClaimResult{Study: "B", Claim: "c", Row: 9, Topic: "t", Outcome: audit.Indeterminate,
		Measure: extract.MeasureB, Scale: extract.ScaleAsPrinted, Method: "admissible-range", Difference: 0.5,
		PoolEstimate: audit.Number(math.NaN()), PoolSE: audit.Number(math.NaN()),
		First: audit.Side{SE: 0.1}, Second: audit.Side{SE: 0.2}})
	rep, err := pool.Run(&audit.Report{Claims: claims}, pool.Options{Covariance: pool.Covariance{Mode: pool.CovarianceBound}})
	if err != nil {
		t.Fatal(err)
	}
	doc := PoolDocument{Report: rep}
	for format, write := range map[string]func(io.Writer, PoolDocument) error{"table": WritePoolTable, "md": WritePoolMarkdown,
		"html": WritePoolHTML, "csv": WritePoolCSV, "json": WritePoolJSON, "xlsx": WritePoolXLSX} {
		var buf bytes.Buffer
		if err := write(&buf, doc); err != nil {
			t.Fatal(err)
		}
		out := buf.String()
		want := map[string]string{"csv": "sensitivity-random-wald", "json": `"sensitivity": {`}[format]
		if format == "xlsx" {
			out, want = string(xlsxCells(t, buf.Bytes())), "Sensitivity: random effects (REML), HKSJ interval"
		}
		if want == "" {
			want = "least favourable bound"
		}
		if !strings.Contains(out, want) {
			t.Errorf("%s report lacks %q", format, want)
		}
	}
}
