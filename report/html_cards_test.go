package report

import (
	"math"
	"regexp"
	"strings"
	"testing"
)

// TestIssue20ChartCaptionDescribesOnlyWhatIsDrawn: the legend under a
// claim's chart used to name the estimates' dots, the difference's diamond
// and its interval whatever the chart held. It now names what chartRows
// draws and nothing else.
func TestIssue20ChartCaptionDescribesOnlyWhatIsDrawn(t *testing.T) {
	rep, _ := demoReport(t)
	checked := 0
	for i := range rep.Claims {
		c := &rep.Claims[i]
		rows := chartRows(c)
		caption := chartCaption(c)
		diamond, diamondCI, dotCI := false, false, false
		for _, r := range rows {
			if r.difference {
				diamond, diamondCI = true, !math.IsNaN(r.lo)
			} else if !math.IsNaN(r.lo) {
				dotCI = true
			}
		}
		if len(rows) == 0 {
			if caption != "" {
				t.Errorf("claim %s: nothing drawn, caption %q", c.Claim, caption)
			}
			continue
		}
		checked++
		if got := strings.Contains(caption, "Diamond"); got != diamond {
			t.Errorf("claim %s: caption %q names a diamond = %v, drawn = %v", c.Claim, caption, got, diamond)
		}
		sentence := ""
		if i := strings.Index(caption, "Diamond:"); i >= 0 {
			sentence, _, _ = strings.Cut(caption[i:], ". ")
		}
		if diamond && strings.Contains(sentence, " with its ") != diamondCI {
			t.Errorf("claim %s: caption %q vs difference interval drawn = %v", c.Claim, caption, diamondCI)
		}
		if got := strings.Contains(caption, "each with its") || strings.Contains(caption, "estimate, with its"); got != dotCI {
			t.Errorf("claim %s: caption %q names the estimates' intervals = %v, drawn = %v", c.Claim, caption, got, dotCI)
		}
	}
	if checked < 5 {
		t.Fatalf("only %d claims of the demo have a chart; the test needs several", checked)
	}
}

// TestIssue20CardsHaveNoEmptyAreas: a card of a claim with no estimate
// (a label not found, a row that could not be read) used to show a table
// of dashes and an empty list of facts. The HTML page of the demo now has
// no empty table, list or card body, and no sides table of dashes alone.
func TestIssue20CardsHaveNoEmptyAreas(t *testing.T) {
	page := string(writeInput(t, "html", demoInput(t)))
	for _, empty := range []*regexp.Regexp{
		regexp.MustCompile(`<dl class="facts">\s*</dl>`),
		regexp.MustCompile(`<div class="claim-body">\s*</div>`),
		regexp.MustCompile(`<tbody>\s*</tbody>`),
		regexp.MustCompile(`<ul class="notes">\s*</ul>`),
		regexp.MustCompile(`<td class="num">–</td><td class="num">–</td><td class="from"></td></tr>\s*<tr><th scope="row">Second</th><td>[^<]*</td><td class="num">–</td><td class="num">–</td>`),
		regexp.MustCompile(`<figcaption>\s*</figcaption>`),
	} {
		if m := empty.FindString(page); m != "" {
			t.Errorf("the page has an empty area: %q", m)
		}
	}
	if !strings.Contains(page, `id="claim-`) {
		t.Fatal("the page has no cards; the test needs the demo's flagged claims")
	}
}

// TestIssue20AlternativeTestsTable: the other tests of a comparison of
// correlations are a table naming each method in full with its source
// (author, year), not a run of method codes.
func TestIssue20AlternativeTestsTable(t *testing.T) {
	rep, _ := demoReport(t)
	seen := 0
	for i := range rep.Claims {
		c := &rep.Claims[i]
		rows := alternativeRows(c)
		if len(rows) != len(c.Alternatives) {
			t.Errorf("claim %s: %d rows for %d alternatives", c.Claim, len(rows), len(c.Alternatives))
		}
		for k, r := range rows {
			seen++
			code := c.Alternatives[k].Method
			if strings.Contains(r.Name, code) || len(r.Name) < 20 {
				t.Errorf("claim %s: %s is named %q, want its full name", c.Claim, code, r.Name)
			}
			if !regexp.MustCompile(`[A-Z][a-z]+.* (18|19|20)\d\d`).MatchString(r.Source) {
				t.Errorf("claim %s: %s has source %q, want author and year", c.Claim, code, r.Source)
			}
		}
	}
	if seen == 0 {
		t.Fatal("the demo has no alternative tests; the test needs its comparisons of correlations")
	}
	page := string(writeInput(t, "html", demoInput(t)))
	if !strings.Contains(page, `<caption>Other tests of the same comparison</caption>`) || strings.Contains(page, "Also: ") {
		t.Error("the HTML page does not list the other tests as a table")
	}
	md := string(writeInput(t, "md", demoInput(t)))
	if !strings.Contains(md, "| test | source | statistic | p |") {
		t.Error("the Markdown report does not list the other tests as a table")
	}
}
