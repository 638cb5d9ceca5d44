package audit

import (
	"bytes"
	"fmt"
	"io"
	"regexp"
	"strings"
	"testing"

	"coefaudit/extract"
	"coefaudit/fixtures"

	"golang.org/x/net/html"
)

// demoReport audits the bundled demo workbook (invented data).
func demoReport(t *testing.T) (*Report, *extract.Input) {
	t.Helper()
	path, cleanup, err := fixtures.DemoFile()
	if err != nil {
		t.Fatal(err)
	}
	defer cleanup()
	in, err := extract.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	rep := Audit(in, DefaultOptions)
	rep.Source = fixtures.DemoName
	return rep, in
}

func writeHTMLForTest(t *testing.T, rep *Report) string {
	t.Helper()
	var buf bytes.Buffer
	if err := WriteHTML(&buf, rep); err != nil {
		t.Fatalf("WriteHTML: %v", err)
	}
	return buf.String()
}

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

// claimSections returns the page's claim sections.
func claimSections(doc *html.Node) []*html.Node {
	return findAll(doc, func(n *html.Node) bool {
		c, _ := attr(n, "class")
		return n.Data == "section" && strings.HasPrefix(c, "claim ")
	})
}

func TestWriteHTMLContent(t *testing.T) {
	rep, _ := demoReport(t)
	page := writeHTMLForTest(t, rep)
	doc, err := html.Parse(strings.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	sections := claimSections(doc)
	if len(sections) != len(rep.Claims) {
		t.Fatalf("page has %d claim sections, want %d", len(sections), len(rep.Claims))
	}
	for i, s := range sections {
		c := rep.Claims[i]
		if o, _ := attr(s, "data-outcome"); o != c.Outcome {
			t.Errorf("section %d data-outcome = %q, want %q", i, o, c.Outcome)
		}
		if st, _ := attr(s, "data-study"); st != c.Study {
			t.Errorf("section %d data-study = %q, want %q", i, st, c.Study)
		}
		text := textOf(s)
		if !strings.Contains(text, c.Claim) || !strings.Contains(text, strings.ToUpper(c.Outcome)) {
			t.Errorf("section %d does not name claim %s and outcome %s", i, c.Claim, c.Outcome)
		}
		svgs := findAll(s, func(n *html.Node) bool { return n.Data == "svg" })
		if c.Difference.Known() && len(svgs) != 1 {
			t.Errorf("section %d (claim %s) has %d charts, want 1", i, c.Claim, len(svgs))
		}
		methods := findAll(s, func(n *html.Node) bool { cl, _ := attr(n, "class"); return cl == "methods" })
		if want := strings.TrimSpace(c.Methods) != ""; want != (len(methods) == 1) {
			t.Errorf("section %d: %d methods blocks, want one exactly when the claim has a methods text", i, len(methods))
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
	if len(cautions) != 1 || !strings.Contains(textOf(cautions[0]), Cautions[0]) {
		t.Error("the cautions are not shown in their own box")
	}
}

// TestWriteHTMLSelfContained checks that the page fetches nothing: no
// external scripts, styles, fonts or images, and a Content-Security-Policy
// whose hashes match the inline style and script exactly (so the browser
// runs them and nothing else).
func TestWriteHTMLSelfContained(t *testing.T) {
	rep, _ := demoReport(t)
	page := writeHTMLForTest(t, rep)
	for _, bad := range []*regexp.Regexp{
		regexp.MustCompile(`(?i)<(script|img|iframe|link)[^>]*\s(src|href)\s*=`),
		regexp.MustCompile(`(?i)@import|url\(|@font-face`),
	} {
		if m := bad.FindString(page); m != "" {
			t.Errorf("the page refers to an external resource: %q", m)
		}
	}
	doc, _ := html.Parse(strings.NewReader(page))
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
	for i := range in.Coefficients[:2] {
		in.Coefficients[i].Study = evil
	}
	rep := Audit(in, DefaultOptions)
	rep.Source = evil
	rep.Claims[0].Methods = evil
	page := writeHTMLForTest(t, rep)
	if strings.Contains(page, `<script>alert`) || strings.Contains(page, `<img src=x`) {
		t.Fatal("markup from the input reached the page unescaped")
	}
	if !strings.Contains(page, `&lt;script&gt;alert(&#34;x&#34;)&lt;/script&gt;&amp;`) {
		t.Error("the study name is not shown, escaped, on the page")
	}
	doc, err := html.Parse(strings.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	if n := len(findAll(doc, func(n *html.Node) bool { return n.Data == "script" })); n != 1 {
		t.Errorf("page has %d script elements, want only its own", n)
	}
	if st, _ := attr(claimSections(doc)[0], "data-study"); st != evil {
		t.Errorf("data-study = %q, want the study name as written", st)
	}
}

func TestWriteHTMLEmptyMethods(t *testing.T) {
	rep := Audit(reportInput(), DefaultOptions)
	for i := range rep.Claims {
		rep.Claims[i].Methods = ""
	}
	rep.Claims[1].Methods = "Paragraph for the second claim."
	doc, _ := html.Parse(strings.NewReader(writeHTMLForTest(t, rep)))
	blocks := findAll(doc, func(n *html.Node) bool { cl, _ := attr(n, "class"); return cl == "methods" })
	if len(blocks) != 1 || textOf(blocks[0]) != "Paragraph for the second claim." {
		t.Errorf("%d methods blocks, want only the second claim's", len(blocks))
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
		if err := WriteHTML(io.Discard, rep); err != nil {
			b.Fatal(err)
		}
	}
}
