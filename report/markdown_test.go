package report

import (
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
)

// mdInput is one invented claim whose study and claim names hold Markdown
// markup: x (0.42 [0.30, 0.54]) against y (0.18 [0.05, 0.31]) from
// independent groups.
func mdInput() *extract.Input {
	coef := func(row int, label, group, est, lo, hi string) extract.Coefficient {
		return extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: row}, Study: "S*1", Label: label,
			Measure: extract.MeasureB, Group: group, Estimate: printed(est),
			CI: extract.Interval{Low: printed(lo), High: printed(hi)}, CILevel: 95}
	}
	return &extract.Input{
		Coefficients: []extract.Coefficient{coef(2, "x", "g", "0.42", "0.30", "0.54"), coef(3, "y", "h", "0.18", "0.05", "0.31")},
		Claims: []extract.Claim{{Position: extract.Position{Sheet: "claims", Row: 2}, Study: "S*1", Claim: "c|1\nsecond line",
			First: "x", Second: "y", Published: extract.PublishedFirstLarger, Basis: extract.BasisTest, Alpha: 0.05}},
	}
}

func TestWriteMarkdown(t *testing.T) {
	md := string(writeInput(t, "md", mdInput()))
	for _, want := range []string{"# Audit of published comparisons", "| consistent | 1 |", `S\*1`, `c\|1\nsecond line`,
		"#### Claim", "## Summary", "## Cautions", audit.Cautions[0]} {
		if !strings.Contains(md, want) {
			t.Errorf("Markdown lacks %q:\n%s", want, md)
		}
	}
	if strings.Contains(md, "S*1") {
		t.Errorf("Markdown holds the input's emphasis mark unescaped:\n%s", md)
	}
	for _, line := range strings.Split(md, "\n") {
		if (strings.HasPrefix(line, "|") || strings.HasPrefix(line, "#")) && strings.Contains(line, "c|1") {
			t.Errorf("a table row or heading holds the input's | unescaped: %q", line)
		}
	}
	// The summary and the cautions follow the claims.
	if strings.Index(md, "#### Claim") > strings.Index(md, "## Summary") || strings.Index(md, "## Summary") > strings.Index(md, "## Cautions") {
		t.Errorf("Markdown sections out of order:\n%s", md)
	}
}

// TestWriteTable checks the terminal table: every claim's line and notes,
// the summary line and the cautions, and control characters from the input
// shown escaped (\x1b, \t) so that they neither move the columns nor reach
// the terminal.
func TestWriteTable(t *testing.T) {
	in := mdInput()
	in.Claims[0].Claim = "c1\x1b[31m\tred"
	out := string(writeInput(t, "table", in))
	for _, want := range []string{"ROW", "CONSISTENT", `row 2 (S*1, c1\x1b[31m\tred): consistent`, "1 claim audited", "Cautions", audit.Cautions[0]} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
	if strings.ContainsAny(out, "\x1b\t") {
		t.Errorf("table holds a control character of the input:\n%q", out)
	}
}
