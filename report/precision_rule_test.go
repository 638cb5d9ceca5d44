package report

import (
	"bytes"
	"fmt"
	"regexp"
	"strings"
	"testing"

	"golang.org/x/net/html"

	"coefaudit/audit"
	"coefaudit/extract"
)

// The precision rule (audit/precision.go, README "Numbers as a paper prints them"):
// estimates, differences and intervals to the printed decimals plus one,
// at least 2 and at most 4; statistics to 2 decimals; p as journals print
// it (APA Publication Manual, 7th ed., 2020, §6.36, from memory): ".043",
// "< .001", no leading zero, never a negative zero.
var (
	// anyNumber is a decimal number in running text.
	anyNumber = regexp.MustCompile(`[-−]?\d*\.\d+`)
	// negativeZero is "-0.00" and its kin.
	negativeZero = regexp.MustCompile(`(^|[^\d.])[-−]0\.0+([^\d]|$)`)
	// pStatement is "p = .043", "p < .001", "p ≈ .560" with what follows.
	pStatement = regexp.MustCompile(`\bp\s*(=|<|>|≈|≤)\s*([^\s,;)]+)`)
	// statistic is "z = 2.67" or "t(246) = 4.64".
	statistic = regexp.MustCompile(`\b(?:z|t\(\d+(?:\.\d)?\)) = ([-−]?\d+(?:\.\d+)?)`)
	// journalP is a p as printed by the rule.
	journalP = regexp.MustCompile(`^(\.\d{3}|< \.001|> \.999)$`)
)

// checkTextPrecision checks the rules that hold for every number of a
// report's text and returns what breaks them.
func checkTextPrecision(text string) []string {
	var bad []string
	for _, n := range anyNumber.FindAllString(text, -1) {
		if frac := n[strings.IndexByte(n, '.')+1:]; len(frac) > 4 {
			bad = append(bad, fmt.Sprintf("%s has more than 4 decimals", n))
		}
	}
	for _, m := range negativeZero.FindAllString(text, -1) {
		bad = append(bad, fmt.Sprintf("negative zero %q", m))
	}
	for _, m := range pStatement.FindAllStringSubmatch(text, -1) {
		op, v := m[1], m[2]
		if len(v) > 1 {
			v = strings.TrimSuffix(v, ".") // the sentence's full stop
		}
		switch {
		case strings.HasPrefix(v, "0."):
			bad = append(bad, fmt.Sprintf("%q has a leading zero", m[0]))
		case (op == "=" || op == "≈") && !regexp.MustCompile(`^\.\d{3}$`).MatchString(v):
			bad = append(bad, fmt.Sprintf("%q is not p to three decimals", m[0]))
		case !strings.HasPrefix(v, "."):
			bad = append(bad, fmt.Sprintf("%q is not a p as journals print it", m[0]))
		}
	}
	for _, m := range statistic.FindAllStringSubmatch(text, -1) {
		if i := strings.IndexByte(m[1], '.'); i < 0 || len(m[1])-i-1 != 2 {
			bad = append(bad, fmt.Sprintf("statistic %q is not to 2 decimals", m[0]))
		}
	}
	for _, banned := range []string{"< 0.001", "p = -", "from < .001 to < .001", "from below .001 to < .001"} {
		if strings.Contains(text, banned) {
			bad = append(bad, fmt.Sprintf("%q appears", banned))
		}
	}
	return bad
}

// printedDecimals counts the digits after the decimal separator of a
// number as printed ("0.40" has 2, "12" none), read from its text alone.
func printedDecimals(text string) int {
	text = strings.TrimSpace(strings.TrimRight(text, "*"))
	i := strings.LastIndexAny(text, ".,")
	if i < 0 {
		return 0
	}
	n := 0
	for _, r := range text[i+1:] {
		if r < '0' || r > '9' {
			break
		}
		n++
	}
	return n
}

// expectedDecimals is the rule worked out from the input's text: for each
// claims row, the most decimals printed among the estimates and interval
// limits of its two coefficients, plus one, within [2, 4].
func expectedDecimals(in *extract.Input) map[int]int {
	type key struct{ study, label string }
	coefs := map[key]*extract.Coefficient{}
	for i := range in.Coefficients {
		c := &in.Coefficients[i]
		coefs[key{c.Study, c.Label}] = c
	}
	out := map[int]int{}
	for _, cl := range in.Claims {
		most := -1
		for _, label := range []string{cl.First, cl.Second} {
			c, ok := coefs[key{cl.Study, label}]
			if !ok {
				continue
			}
			for _, p := range []extract.Printed{c.Estimate, c.CI.Low, c.CI.High} {
				if p.Text != "" {
					most = max(most, printedDecimals(p.Text))
				}
			}
		}
		if most < 0 {
			most = 2
		}
		out[cl.Row] = min(max(most+1, 2), 4)
	}
	return out
}

// checkCells checks a claims table's cells: each number of the difference
// cell has the row's decimals, the p cell and the p range are journal p.
func checkCells(row int, difference, p string, want map[int]int) []string {
	var bad []string
	if difference != "-" {
		for _, n := range anyNumber.FindAllString(difference, -1) {
			if got := len(n) - strings.IndexByte(n, '.') - 1; got != want[row] {
				bad = append(bad, fmt.Sprintf("row %d: %s in %q has %d decimals, want %d", row, n, difference, got, want[row]))
			}
		}
	}
	for _, part := range strings.Split(p, "–") {
		if p != "-" && !journalP.MatchString(part) {
			bad = append(bad, fmt.Sprintf("row %d: p cell %q is not p as journals print it", row, p))
		}
	}
	return bad
}

// TestIssue20PrecisionRuleMarkdown: every number of the Markdown report of
// the demo workbook follows the precision rule, and the claims tables'
// difference cells have exactly the decimals worked out from the input's
// printed text.
func TestIssue20PrecisionRuleMarkdown(t *testing.T) {
	in := demoInput(t)
	want := expectedDecimals(in)
	md := string(writeInput(t, "md", in))
	for _, b := range checkTextPrecision(md) {
		t.Error(b)
	}
	rows := 0
	for _, line := range strings.Split(md, "\n") {
		cells := strings.Split(line, " | ")
		var row int
		if len(cells) != 10 || !strings.HasPrefix(line, "| ") {
			continue
		}
		if _, err := fmt.Sscanf(cells[0], "| %d", &row); err != nil {
			continue
		}
		rows++
		// | row | study | claim | relation | method | difference [CI] | p | p range | published | outcome |
		for _, b := range checkCells(row, cells[5], cells[6], want) {
			t.Error(b)
		}
		for _, b := range checkCells(row, "-", cells[7], want) {
			t.Error(b)
		}
	}
	if rows != len(in.Claims) {
		t.Errorf("found %d claims lines in the Markdown tables, want %d", rows, len(in.Claims))
	}
}

// TestIssue20PrecisionRuleHTML: the same for the HTML page's text (cards,
// notes, methods text, chart titles) and its claims-at-a-glance table,
// which shows each claim's difference with its interval and p.
func TestIssue20PrecisionRuleHTML(t *testing.T) {
	in := demoInput(t)
	want := expectedDecimals(in)
	page := writeInput(t, "html", in)
	doc, err := html.Parse(bytes.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	var text strings.Builder
	rows := 0
	var walk func(n *html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.ElementNode && (n.Data == "script" || n.Data == "style") {
			return
		}
		if n.Type == html.TextNode {
			text.WriteString(n.Data)
			text.WriteString(" ")
		}
		if n.Type == html.ElementNode && n.Data == "tr" && hasClassAncestor(n, "glance") {
			var cells []string
			for c := n.FirstChild; c != nil; c = c.NextSibling {
				if c.Type == html.ElementNode && c.Data == "td" {
					cells = append(cells, strings.TrimSpace(textOf(c)))
				}
			}
			var row int
			if len(cells) == 8 {
				if _, err := fmt.Sscanf(cells[0], "%d", &row); err == nil {
					rows++
					for _, b := range checkCells(row, cells[6], cells[7], want) {
						t.Error(b)
					}
				}
			}
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(doc)
	if rows != len(in.Claims) {
		t.Errorf("found %d claims in the glance table with a difference and p column, want %d", rows, len(in.Claims))
	}
	for _, b := range checkTextPrecision(text.String()) {
		t.Error(b)
	}
}

func hasClassAncestor(n *html.Node, class string) bool {
	for p := n.Parent; p != nil; p = p.Parent {
		if v, ok := attr(p, "class"); ok && strings.Contains(" "+v+" ", " "+class+" ") {
			return true
		}
	}
	return false
}

// TestIssue20CheckTextPrecisionCatches: the checker finds what the rule
// forbids, so that the two tests above can fail.
func TestIssue20CheckTextPrecisionCatches(t *testing.T) {
	for _, text := range []string{"difference 0.06362", "p = 0.043", "p from < 0.001 to < 0.001", "estimate -0.0000",
		"z = 2.6712", "p = -", "p = .04"} {
		if len(checkTextPrecision(text)) == 0 {
			t.Errorf("checkTextPrecision(%q) finds nothing wrong", text)
		}
	}
	if bad := checkTextPrecision("p = .043 (difference 0.240, 95% CI 0.064 to 0.416), z = 2.67, p < .001"); len(bad) > 0 {
		t.Errorf("checkTextPrecision flags a good text: %v", bad)
	}
}

// TestIssue20PrecisionRuleTable: the terminal table follows the rule too.
func TestIssue20PrecisionRuleTable(t *testing.T) {
	for _, b := range checkTextPrecision(string(writeInput(t, "table", demoInput(t)))) {
		t.Error(b)
	}
}

// TestIssue20CorrelationsShownAsR: a comparison of correlations shows each
// estimate as r (the JSON keeps Fisher's z) and labels the SEs, which stay
// on Fisher's z, so; the difference is r₁ − r₂.
func TestIssue20CorrelationsShownAsR(t *testing.T) {
	rep, in := demoReport(t)
	printedR := map[string]extract.Printed{}
	for _, c := range in.Coefficients {
		if c.Measure == extract.MeasureR {
			printedR[c.Study+"\x00"+c.Label] = c.Estimate
		}
	}
	seen := 0
	for i := range rep.Claims {
		c := &rep.Claims[i]
		if c.Measure != extract.MeasureR || !c.First.Estimate.Known() {
			continue
		}
		seen++
		for _, s := range []audit.Side{c.First, c.Second} {
			r, ok := printedR[c.Study+"\x00"+s.Label]
			if !ok {
				continue
			}
			// The printed r with one decimal more: ".30" is shown as
			// "0.300", whatever Fisher's z of it is.
			want := fmt.Sprintf("%.*f", printedDecimals(r.Text)+1, r.Value)
			if got := estimateCell(c, s); got != want {
				t.Errorf("claim %s, %s: estimate shown as %q, want r = %q", c.Claim, s.Label, got, want)
			}
			if got := seCell(c, s); !strings.HasSuffix(got, "(Fisher z)") {
				t.Errorf("claim %s, %s: SE shown as %q, want it labelled Fisher z", c.Claim, s.Label, got)
			}
		}
		if c.Shown().Name != "difference r₁ − r₂" {
			t.Errorf("claim %s: the difference is shown as %q, want r₁ − r₂", c.Claim, c.Shown().Name)
		}
	}
	if seen == 0 {
		t.Fatal("the demo has no comparison of correlations; the test needs one")
	}
}
