package article

import (
	"os"
	"path/filepath"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
)

// knownCoefficients is an invented review of one study of allotment
// gardening, as a reviewer would type it: two independent samples (girls,
// boys), three predictors, printed B, SE and p.
var knownCoefficients = [][]string{
	{"study", "label", "measure", "outcome", "predictor", "group", "model", "estimate", "se", "p", "n"},
	{"Ashby 2025", "garden-girls", "b", "wellbeing", "Garden hours", "Girls", "m", "0.52", "0.10", "<.001", "240"},
	{"Ashby 2025", "garden-boys", "b", "wellbeing", "Garden hours", "Boys", "m", "0.18", "0.11", ".10", "240"},
	{"Ashby 2025", "screen-girls", "b", "wellbeing", "Screen time", "Girls", "m", "−0.21", "0.08", ".009", "240"},
	{"Ashby 2025", "screen-boys", "b", "wellbeing", "Screen time", "Boys", "m", "−0.25", "0.09", ".006", "240"},
	{"Ashby 2025", "sleep-girls", "b", "wellbeing", "Sleep", "Girls", "m", "0.30", "0.09", ".001", "240"},
	{"Ashby 2025", "sleep-boys", "b", "wellbeing", "Sleep", "Boys", "m", "0.05", "0.12", ".68", "240"},
}

// knownClaims pairs each claims row with the sentence the article prints
// for it.
var knownClaims = []struct {
	row      []string
	sentence string
}{
	{[]string{"Ashby 2025", "C1", "garden-girls", "garden-boys", "first-larger", "unstated"},
		"The association of garden hours with wellbeing was stronger for girls than for boys."},
	{[]string{"Ashby 2025", "C2", "screen-girls", "screen-boys", "no-difference", "unstated"},
		"Screen time did not differ in its association with wellbeing between girls and boys."},
	{[]string{"Ashby 2025", "C3", "sleep-girls", "sleep-boys", "differ", "significance-split"},
		"Sleep was significant for girls but not for boys."},
}

// articleOf prints the known workbook as an article: one table with the
// girls' and boys' columns side by side, and a sentence per claim.
func articleOf() tarticle {
	t := ttable{label: "Table 2", caption: "Regressions predicting wellbeing (N = 240 in each group)",
		head: [][]tcell{{{text: "", span: 1}, {text: "Girls", span: 3}, {text: "Boys", span: 3}},
			cells("Predictor", "B", "SE", "p", "B", "SE", "p")}}
	for i := 1; i < len(knownCoefficients); i += 2 {
		g, b := knownCoefficients[i], knownCoefficients[i+1]
		t.body = append(t.body, cells(g[4], g[7], g[8], g[9], b[7], b[8], b[9]))
	}
	t.foot = []string{"Note. N = 240."}
	a := tarticle{author: "Ashby", year: "2025", tables: []ttable{t}}
	for _, c := range knownClaims {
		a.paras = append(a.paras, c.sentence)
	}
	return a
}

// outcomes audits a source and returns each claim's outcome in order.
func outcomes(t *testing.T, src *extract.Source) []string {
	t.Helper()
	rep, err := audit.Collect(src, audit.DefaultOptions)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, c := range rep.Claims {
		out = append(out, c.Outcome)
	}
	return out
}

// TestRoundTrip writes an article from a known workbook in JATS, HTML and
// DOCX, imports it and checks it: the same verdicts, claim by claim, as
// checking the workbook itself.
func TestRoundTrip(t *testing.T) {
	claims := [][]string{{"study", "claim", "first", "second", "published", "basis"}}
	for _, c := range knownClaims {
		claims = append(claims, c.row)
	}
	in, err := extract.ReadTextSheets("known", []extract.TextSheet{{Name: "coefficients", Rows: knownCoefficients}, {Name: "claims", Rows: claims}})
	if err != nil {
		t.Fatal(err)
	}
	want := outcomes(t, extract.FromInput(in))
	if len(want) != len(knownClaims) {
		t.Fatalf("the workbook gives %d outcomes, want %d", len(want), len(knownClaims))
	}
	t.Logf("outcomes of the workbook: %v", want)
	dir := t.TempDir()
	for format, file := range articleFormats(t, dir, "ashby", articleOf()) {
		src, res, err := Open([]string{file}, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		got := outcomes(t, src)
		if len(res.Articles) != 1 {
			t.Fatalf("%s: %d articles read, want 1", format, len(res.Articles))
		}
		if len(got) != len(want) {
			t.Fatalf("%s: %d claims read, want %d", format, len(got), len(want))
		}
		for i := range want {
			if i >= len(got) || got[i] != want[i] {
				t.Errorf("%s: outcomes %v, want %v as from the workbook", format, got, want)
				break
			}
		}
	}
}

// TestOpenFolderOfArticles imports a folder holding an article in each
// format and a file that is not one: the articles are read, the other file
// is a problem of the input naming it.
func TestOpenFolderOfArticles(t *testing.T) {
	dir := t.TempDir()
	formats := len(articleFormats(t, dir, "ashby", articleOf()))
	if err := os.WriteFile(filepath.Join(dir, "scan.pdf"), []byte("%PDF-1.4"), 0o600); err != nil {
		t.Fatal(err)
	}
	if !IsArticleInput(dir) {
		t.Fatal("a folder of articles is not taken as articles")
	}
	src, res, err := Open([]string{dir}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if got := len(outcomes(t, src)); got != formats*len(knownClaims) {
		t.Errorf("%d claims audited, want %d", got, formats*len(knownClaims))
	}
	if len(res.Articles) != formats || len(res.Failed) != 1 {
		t.Fatalf("%d articles and %d failures, want %d and 1", len(res.Articles), len(res.Failed), formats)
	}
	studies := map[string]bool{}
	for _, f := range res.Articles {
		studies[f.Study] = true
	}
	if len(studies) != formats {
		t.Errorf("studies %v: two articles share one", studies)
	}
	found := false
	for _, p := range src.Problems() {
		found = found || p.File == filepath.Join(dir, "scan.pdf")
	}
	if !found {
		t.Errorf("the PDF is not among the problems: %v", src.Problems())
	}
}
