package article

import (
	"slices"
	"strings"
	"testing"
)

// TestParseReported reads results as APA style (Publication Manual, 7th
// ed., §6.43–6.46, from memory) and medical journals print them; every
// number is kept as printed.
func TestParseReported(t *testing.T) {
	tests := []struct {
		sentence string
		want     []Reported
		orphans  []string
	}{
		{"Outdoor time predicted attention (β = .34, 95% CI [.21, .47], p < .001).",
			[]Reported{{Symbol: "β", Measure: "beta", Estimate: ".34", CI: "[.21, .47]", CILevel: "95", P: "< .001", Name: "Outdoor time predicted attention"}}, nil},
		{"Sleep was associated with mood, b = 0.41, SE = 0.12, t(120) = 3.20, p = .002.",
			[]Reported{{Symbol: "b", Measure: "b", Estimate: "0.41", SE: "0.12", Stat: "3.20", StatDF: "120", P: ".002", Name: "Sleep was associated with mood"}}, nil},
		{"Stress correlated with sleep, r(198) = −.45, p < .001.",
			[]Reported{{Symbol: "r", Measure: "r", DF: "198", Estimate: "−.45", P: "< .001", Name: "Stress correlated with sleep"}}, nil},
		{"Daily play lowered the odds of problems (OR = 1.80, 95% CI 1.21–2.68).",
			[]Reported{{Symbol: "OR", Measure: "or", Estimate: "1.80", CI: "1.21–2.68", CILevel: "95", Name: "Daily play lowered the odds of problems"}}, nil},
		{"The groups differed, t(120) = 3.20, p = .002.", nil, []string{"t(120) = 3.20", "p = .002"}},
		{"Girls (β = .30, p = .01) and boys (β = .10, p = .20) differed.",
			[]Reported{{Symbol: "β", Measure: "beta", Estimate: ".30", P: ".01", Name: "Girls"},
				{Symbol: "β", Measure: "beta", Estimate: ".10", P: ".20", Name: "boys"}}, nil},
		{"Hazard was higher in cohort A (HR = 1.45, 95% CI 1.13 to 1.86).",
			[]Reported{{Symbol: "HR", Measure: "hr", Estimate: "1.45", CI: "1.13 to 1.86", CILevel: "95", Name: "Hazard was higher in cohort A"}}, nil},
		{"No statistics here, only 3 groups and 12 schools.", nil, nil},
	}
	for _, tt := range tests {
		got, orphans := ParseReported(tt.sentence)
		if len(got) != len(tt.want) {
			t.Errorf("ParseReported(%q) = %d results, want %d: %+v", tt.sentence, len(got), len(tt.want), got)
			continue
		}
		for i := range got {
			g := got[i]
			g.Start, g.End = 0, 0
			if g != tt.want[i] {
				t.Errorf("ParseReported(%q)[%d] =\n%+v, want\n%+v", tt.sentence, i, g, tt.want[i])
			}
		}
		if strings.Join(orphans, ";") != strings.Join(tt.orphans, ";") {
			t.Errorf("ParseReported(%q) orphans = %q, want %q", tt.sentence, orphans, tt.orphans)
		}
	}
}

// TestSentences splits a paragraph into sentences, not at "e.g.", "et
// al." or a decimal point.
func TestSentences(t *testing.T) {
	p := "Effects were larger (e.g. for sleep, β = .34). Smith et al. found p < .001. 12 schools took part."
	want := []string{"Effects were larger (e.g. for sleep, β = .34).", "Smith et al. found p < .001.", "12 schools took part."}
	got := Sentences(p)
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("Sentences = %q, want %q", got, want)
	}
}

// TestTextClaims reads a pasted results section: the results of each
// sentence, claims whose two coefficients the sentence reports, and a
// comparison that cannot be matched listed to confirm, never guessed.
func TestTextClaims(t *testing.T) {
	text := `Outdoor time predicted attention for girls (β = .34, 95% CI [.21, .47], p < .001)
and for boys (β = .12, 95% CI [.01, .23], p = .03), and the association was stronger for girls than for boys.

The effect of sleep was significant for girls (b = 0.41, SE = 0.12) but not for boys (b = 0.09, SE = 0.10).

The two programmes did not differ in their effects on reading.

The confidence intervals of the two sites overlapped (OR = 1.80, 95% CI 1.21–2.68; OR = 1.40, 95% CI 0.95–2.06).`
	a, err := ReadText(strings.NewReader(text), "results.txt")
	if err != nil {
		t.Fatal(err)
	}
	f := Recognise(a)
	if len(f.Coefficients) != 6 {
		t.Fatalf("%d coefficients, want 6: %+v", len(f.Coefficients), f.Coefficients)
	}
	want := []struct{ published, basis, firstEst, secondEst string }{
		{"first-stronger", "unstated", ".34", ".12"}, // "stronger" compares magnitudes
		{"differ", "significance-split", "0.41", "0.09"},
		{"no-difference", "overlap", "1.80", "1.40"},
	}
	if len(f.Claims) != len(want) {
		t.Fatalf("%d claims, want %d: %+v", len(f.Claims), len(want), f.Claims)
	}
	est := map[string]string{}
	for _, c := range f.Coefficients {
		est[c.Label] = c.Estimate
	}
	for i, w := range want {
		c := f.Claims[i]
		if c.Published != w.published || c.Basis != w.basis || est[c.First] != w.firstEst || est[c.Second] != w.secondEst {
			t.Errorf("claim %d = %s/%s %s vs %s, want %s/%s %s vs %s", i+1, c.Published, c.Basis, est[c.First], est[c.Second],
				w.published, w.basis, w.firstEst, w.secondEst)
		}
	}
	unmatched := false
	for _, c := range f.ToConfirm {
		unmatched = unmatched || strings.Contains(c.Reason, "could not be matched") && strings.Contains(c.Text, "did not differ")
	}
	if !unmatched {
		t.Errorf("the comparison without coefficients is not listed to confirm: %+v", f.ToConfirm)
	}
	if f.Study != "results" || f.Format != FormatText {
		t.Errorf("study %q, format %q, want results, text", f.Study, f.Format)
	}
}

// TestSentenceCorrelationN: a correlation printed as r(df) gives n = df + 2
// (df = n − 2 for the test of a correlation), which Fisher's z test needs;
// the n is written with the sentence as its place and listed to confirm,
// since the sentence implies it rather than prints it.
func TestSentenceCorrelationN(t *testing.T) {
	a, err := ReadText(strings.NewReader("Stress correlated with sleep, r(198) = −.45, p < .001."), "results.txt")
	if err != nil {
		t.Fatal(err)
	}
	f := Recognise(a)
	if len(f.Coefficients) != 1 {
		t.Fatalf("%d coefficients, want 1: %+v", len(f.Coefficients), f.Coefficients)
	}
	c := f.Coefficients[0]
	if c.Measure != "r" || c.DF != "198" || c.N != "200" || c.Places["n"] == "" {
		t.Errorf("coefficient %+v, want measure r, df 198, n 200 with its place", c)
	}
	found := false
	for _, k := range f.ToConfirm {
		found = found || strings.Contains(k.Reason, "n = 200 taken as df + 2")
	}
	if !found {
		t.Errorf("the derived n is not listed to confirm: %+v", f.ToConfirm)
	}
}

// TestSentenceResultsInEveryFormat writes invented results sections in
// every format, reads them back and checks every result the sentences
// print: recall (printed results found) and precision (results reported
// that were printed, with every number as printed), reported in the log.
// A test statistic without an estimate ("t(120) = 3.20") and numbers that
// are no statistics yield nothing.
func TestSentenceResultsInEveryFormat(t *testing.T) {
	type result struct{ measure, estimate, ci, se, stat, df, p string }
	printed := []result{
		{"beta", ".34", "[.21, .47]", "", "", "", "< .001"},
		{"beta", ".12", "[.01, .23]", "", "", "", ".03"},
		{"b", "0.41", "", "0.12", "3.20", "120", ".002"},
		{"r", "−.45", "", "", "", "198", "< .001"},
		{"or", "1.80", "1.21–2.68", "", "", "", ""},
		{"hr", "1.45", "1.13 to 1.86", "", "", "", ""},
		{"b", "-0.27", "", "0.09", "", "", ".003"},
	}
	a := tarticle{author: "Marrow", year: "2025", paras: []string{
		"Outdoor time predicted attention for girls (β = .34, 95% CI [.21, .47], p < .001) and for boys (β = .12, 95% CI [.01, .23], p = .03).",
		"Sleep was associated with mood, b = 0.41, SE = 0.12, t(120) = 3.20, p = .002.",
		"Stress correlated with sleep, r(198) = −.45, p < .001.",
		"Daily play lowered the odds of problems (OR = 1.80, 95% CI 1.21–2.68). Hazard was higher in cohort A (HR = 1.45, 95% CI 1.13 to 1.86).",
		"Screen time lowered reading scores, b = -0.27, SE = 0.09, p = .003.",
		"The groups differed, t(120) = 3.20, p = .002. Only 3 groups and 12 schools took part in 2019.",
	}}
	var found, printedN, right, reported int
	for format, file := range articleFormats(t, t.TempDir(), "marrow", a) {
		f, err := ReadFile(file, nil)
		if err != nil {
			t.Fatalf("%s: %v", format, err)
		}
		got := map[result]bool{}
		for _, c := range f.Coefficients {
			reported++
			r := result{c.Measure, c.Estimate, c.CI, c.SE, c.Stat, c.DF, c.P}
			if slices.Contains(printed, r) && strings.Contains(c.Source, "sentence") {
				right++
				got[r] = true
			} else {
				t.Errorf("%s: %+v was not printed so", format, c)
			}
		}
		for _, r := range printed {
			printedN++
			if got[r] {
				found++
			} else {
				t.Errorf("%s: %+v not found", format, r)
			}
		}
	}
	if printedN == 0 || reported == 0 {
		t.Fatal("no result was checked")
	}
	t.Logf("sentences: recall %d/%d = %.3f, precision %d/%d = %.3f", found, printedN, float64(found)/float64(printedN),
		right, reported, float64(right)/float64(reported))
}
