package report

import (
	"fmt"
	"io"
	"regexp"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"

	"golang.org/x/net/html"
)

// findAll walks a parsed page and returns the elements for which keep is true.
func findAll(n *html.Node, keep func(*html.Node) bool) []*html.Node {
	var out []*html.Node
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.ElementNode && keep(n) {
			out = append(out, n)
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(n)
	return out
}

func attr(n *html.Node, key string) (string, bool) {
	for _, a := range n.Attr {
		if a.Key == key {
			return a.Val, true
		}
	}
	return "", false
}

func textOf(n *html.Node) string {
	var b strings.Builder
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.TextNode {
			b.WriteString(n.Data)
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(n)
	return b.String()
}

// claimSections returns the page's claim cards.
func claimSections(doc *html.Node) []*html.Node {
	return findAll(doc, func(n *html.Node) bool {
		c, _ := attr(n, "class")
		return n.Data == "section" && strings.HasPrefix(c, "claim ")
	})
}

// claimLines returns the lines of the table of claims.
func claimLines(doc *html.Node) []*html.Node {
	return findAll(doc, func(n *html.Node) bool {
		_, ok := attr(n, "data-outcome")
		return n.Data == "tr" && ok
	})
}

// flaggedClaims are the claims of a report that get a card.
func flaggedClaims(rep *audit.Report) []audit.ClaimResult {
	var out []audit.ClaimResult
	for _, c := range rep.Claims {
		if c.Outcome != audit.Consistent && len(out) < HTMLCards {
			out = append(out, c)
		}
	}
	return out
}

func parseHTML(t testing.TB, page []byte) *html.Node {
	t.Helper()
	doc, err := html.Parse(strings.NewReader(string(page)))
	if err != nil {
		t.Fatal(err)
	}
	return doc
}

func TestWriteHTMLContent(t *testing.T) {
	rep, in := demoReport(t)
	doc := parseHTML(t, writeInput(t, "html", in))
	lines := claimLines(doc)
	if len(lines) != len(rep.Claims) {
		t.Fatalf("page has %d lines of claims, want %d", len(lines), len(rep.Claims))
	}
	for i, l := range lines {
		c := rep.Claims[i]
		if o, _ := attr(l, "data-outcome"); o != c.Outcome {
			t.Errorf("line %d data-outcome = %q, want %q", i, o, c.Outcome)
		}
		if st, _ := attr(l, "data-study"); st != c.Study {
			t.Errorf("line %d data-study = %q, want %q", i, st, c.Study)
		}
		links := findAll(l, func(n *html.Node) bool { return n.Data == "a" })
		if want := c.Outcome != audit.Consistent; want != (len(links) == 1) {
			t.Errorf("line %d (%s): %d links to a card, want one exactly when flagged", i, c.Outcome, len(links))
		}
	}
	flagged := flaggedClaims(rep)
	sections := claimSections(doc)
	if len(sections) != len(flagged) || len(flagged) == 0 {
		t.Fatalf("page has %d claim cards, want one per flagged claim (%d)", len(sections), len(flagged))
	}
	for i, s := range sections {
		c := &flagged[i]
		if o, _ := attr(s, "data-outcome"); o != c.Outcome {
			t.Errorf("card %d data-outcome = %q, want %q", i, o, c.Outcome)
		}
		text := textOf(s)
		if !strings.Contains(text, c.Claim) || !strings.Contains(text, strings.ToUpper(c.Outcome)) {
			t.Errorf("card %d does not name claim %s and outcome %s", i, c.Claim, c.Outcome)
		}
		svgs := findAll(s, func(n *html.Node) bool { return n.Data == "svg" })
		if c.Difference.Known() && len(svgs) != 1 {
			t.Errorf("card %d (claim %s) has %d charts, want 1", i, c.Claim, len(svgs))
		}
		methods := findAll(s, func(n *html.Node) bool { cl, _ := attr(n, "class"); return cl == "methods" })
		if len(methods) != 1 || textOf(methods[0]) != methodsText(c) {
			t.Errorf("card %d: %d methods blocks, want the claim's methods text", i, len(methods))
		}
	}
	// The tally shows each outcome's count.
	for o, n := range rep.Summary.Counts {
		chips := findAll(doc, func(e *html.Node) bool { v, _ := attr(e, "data-tally"); return v == o })
		if len(chips) != 1 || !strings.Contains(textOf(chips[0]), fmt.Sprint(n)) {
			t.Errorf("tally of %s: %d chips, want one showing %d", o, len(chips), n)
		}
	}
	cautions := findAll(doc, func(n *html.Node) bool { cl, _ := attr(n, "class"); return cl == "cautions" })
	if len(cautions) != 1 || !strings.Contains(textOf(cautions[0]), audit.Cautions[0]) {
		t.Error("the cautions are not shown in their own box")
	}
}

// TestWriteHTMLCardLimit writes more flagged claims than the page has
// cards for: every claim keeps its line, the first HTMLCards flagged ones
// get a card, and the page says how many were left without one.
func TestWriteHTMLCardLimit(t *testing.T) {
	rep := tenThousandClaims()
	flagged := 0
	for _, c := range rep.Claims {
		if c.Outcome != audit.Consistent {
			flagged++
		}
	}
	if flagged <= HTMLCards {
		t.Fatalf("the test input has %d flagged claims, want more than %d", flagged, HTMLCards)
	}
	doc := parseHTML(t, writeReport(t, "html", rep))
	if n := len(claimLines(doc)); n != len(rep.Claims) {
		t.Errorf("%d lines, want one per claim (%d)", n, len(rep.Claims))
	}
	if n := len(claimSections(doc)); n != HTMLCards {
		t.Errorf("%d cards, want %d", n, HTMLCards)
	}
	note := findAll(doc, func(n *html.Node) bool { id, _ := attr(n, "id"); return id == "cards-note" })
	want := fmt.Sprintf("the other %d flagged claims", flagged-HTMLCards)
	if len(note) != 1 || !strings.Contains(textOf(note[0]), want) || !strings.Contains(textOf(note[0]), fmt.Sprint(HTMLCards)) {
		t.Errorf("the note on the cards does not say %q and the limit %d", want, HTMLCards)
	}
}

// TestWriteHTMLSelfContained checks that the page fetches nothing: no
// external scripts, styles, fonts or images, and a Content-Security-Policy
// whose hashes match the inline style and script exactly (so the browser
// runs them and nothing else).
func TestWriteHTMLSelfContained(t *testing.T) {
	_, in := demoReport(t)
	page := string(writeInput(t, "html", in))
	for _, bad := range []*regexp.Regexp{
		regexp.MustCompile(`(?i)<(script|img|iframe|link)[^>]*\s(src|href)\s*=`),
		regexp.MustCompile(`(?i)@import|url\(|@font-face`),
	} {
		if m := bad.FindString(page); m != "" {
			t.Errorf("the page refers to an external resource: %q", m)
		}
	}
	doc := parseHTML(t, []byte(page))
	var csp string
	for _, m := range findAll(doc, func(n *html.Node) bool { return n.Data == "meta" }) {
		if v, _ := attr(m, "http-equiv"); v == "Content-Security-Policy" {
			csp, _ = attr(m, "content")
		}
	}
	if !strings.Contains(csp, "default-src 'none'") {
		t.Fatalf("CSP %q does not forbid network access by default", csp)
	}
	for _, tag := range []string{"style", "script"} {
		els := findAll(doc, func(n *html.Node) bool { return n.Data == tag })
		if len(els) != 1 {
			t.Fatalf("%d %s elements, want 1", len(els), tag)
		}
		if h := cspHash(textOf(els[0])); !strings.Contains(csp, "'"+h+"'") {
			t.Errorf("the CSP does not allow the page's own %s (%s)", tag, h)
		}
	}
}

// TestWriteHTMLEscapes puts markup in every text the input controls.
func TestWriteHTMLEscapes(t *testing.T) {
	in := reportInput()
	evil := `<script>alert("x")</script>&<img src=x onerror=alert(1)>`
	in.Claims[0].Study, in.Claims[0].Claim = evil, evil
	in.Claims[0].Published = extract.PublishedNoDifference // flagged: a card shows it too
	for i := range in.Coefficients[:2] {
		in.Coefficients[i].Study = evil
	}
	in.Source = evil
	page := string(writeInput(t, "html", in))
	if strings.Contains(page, `<script>alert`) || strings.Contains(page, `<img src=x`) {
		t.Fatal("markup from the input reached the page unescaped")
	}
	if !strings.Contains(page, `&lt;script&gt;alert(&#34;x&#34;)&lt;/script&gt;&amp;`) {
		t.Error("the study name is not shown, escaped, on the page")
	}
	doc := parseHTML(t, []byte(page))
	if n := len(findAll(doc, func(n *html.Node) bool { return n.Data == "script" })); n != 1 {
		t.Errorf("page has %d script elements, want only its own", n)
	}
	if st, _ := attr(claimLines(doc)[0], "data-study"); st != evil {
		t.Errorf("data-study = %q, want the study name as written", st)
	}
	cards := claimSections(doc)
	if len(cards) == 0 {
		t.Fatal("no card: the test needs the flagged claim's card")
	}
	if st, _ := attr(cards[0], "data-study"); st != evil {
		t.Errorf("the card's data-study = %q, want the study name as written", st)
	}
}

// TestHTMLPrintStylesheet checks the print rules: the filters are left out
// and no claim section is split across pages.
func TestHTMLPrintStylesheet(t *testing.T) {
	i := strings.Index(htmlReportCSS, "@media print{")
	if i < 0 {
		t.Fatal("the stylesheet has no @media print block")
	}
	print := htmlReportCSS[i:]
	for _, rule := range []*regexp.Regexp{
		regexp.MustCompile(`\.filters[^{]*\{display:none!important\}`),
		regexp.MustCompile(`\.claim[,{][^}]*break-inside:avoid`),
		regexp.MustCompile(`print-color-adjust:exact`),
	} {
		if !rule.MatchString(print) {
			t.Errorf("the print block lacks a rule matching %s", rule)
		}
	}
}

// BenchmarkWriteHTML measures the page of 10,000 claims.
func BenchmarkWriteHTML(b *testing.B) {
	rep := tenThousandClaims()
	b.ReportAllocs()
	for b.Loop() {
		if err := Write("html", io.Discard, rep); err != nil {
			b.Fatal(err)
		}
	}
}
