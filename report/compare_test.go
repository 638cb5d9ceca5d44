package report

import (
	"bytes"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
)

// typedComparison audits an invented comparison typed as printed: 0.41
// [0.30, 0.52] against 0.18 (0.05 to 0.31) from independent samples,
// published as a difference.
func typedComparison(t *testing.T) (*audit.Report, audit.Comparison) {
	t.Helper()
	c, err := audit.ParseComparison(audit.ComparisonText{First: "0.41 [0.30, 0.52]", Second: "0.18 (0.05 to 0.31)",
		Relation: audit.Independent, Published: extract.PublishedDiffer})
	if err != nil {
		t.Fatal(err)
	}
	rep, err := audit.CompareReported(c, audit.DefaultOptions)
	if err != nil {
		t.Fatal(err)
	}
	return rep, c
}

func TestWriteComparison(t *testing.T) {
	rep, c := typedComparison(t)
	var buf bytes.Buffer
	if err := WriteComparison(&buf, rep, c); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{"0.41 [0.30, 0.52]", "0.18 (0.05 to 0.31)", "independent samples", "independent-z",
		"Verdict:", strings.ToUpper(rep.Claims[0].Outcome), "Methods", "Cautions", audit.Cautions[0]} {
		if !strings.Contains(out, want) {
			t.Errorf("WriteComparison() lacks %q:\n%s", want, out)
		}
	}
}

// TestWriteComparisonEscapes: the estimates as typed, and the notes that
// quote them, reach the terminal with their control characters shown
// escaped.
func TestWriteComparisonEscapes(t *testing.T) {
	rep, c := typedComparison(t)
	c.First.Text = "0.41\x1b[2J [0.30,\t0.52]"
	rep.Claims[0].Notes = append(rep.Claims[0].Notes, "typed as \u202e0.41\n# 0.52")
	rep.Problems = append(rep.Problems, audit.Problem{Message: "cell \x9b\x1b]0;x\x07"})
	var buf bytes.Buffer
	if err := WriteComparison(&buf, rep, c); err != nil {
		t.Fatal(err)
	}
	checkVisible(t, "WriteComparison()", buf.String())
	for _, want := range []string{`0.41\x1b[2J [0.30,\t0.52]`, `typed as \u202e0.41\n# 0.52`, `cell \x9b\x1b]0;x\a`} {
		if !strings.Contains(buf.String(), want) {
			t.Errorf("WriteComparison() lacks %q:\n%s", want, buf.String())
		}
	}
}
