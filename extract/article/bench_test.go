package article

import (
	"fmt"
	"strings"
	"testing"
)

// benchArticle is an invented article of about 100 kB: 260 paragraphs
// reporting a result each, and 9 tables of 25 predictors in two models.
func benchArticle() string { return denseArticle(false) }

// denseArticle is benchArticle's article; with contradict, 4 rows in 5 of
// each table print p = .600 beside B 0.41 and SE 0.12 (p ≈ .001): 360
// p-values that contradict their estimates.
func denseArticle(contradict bool) string {
	a := tarticle{author: "Tenby", year: "2025"}
	for i := range 260 {
		a.paras = append(a.paras, fmt.Sprintf("In paragraph %d the association of predictor %d with the outcome was stronger for girls than for boys (β = .%02d, 95%% CI [.%02d, .%02d], p < .001), while other effects did not differ between the schools.",
			i, i, 30+i%50, 10+i%40, 50+i%40))
	}
	for k := range 9 {
		t := ttable{label: fmt.Sprintf("Table %d", k+2), caption: "Regressions predicting wellbeing (N = 400)",
			head: [][]tcell{{{text: "", span: 1}, {text: "Model 1", span: 3}, {text: "Model 2", span: 3}}, cells("Predictor", "B", "SE", "p", "B", "SE", "p")}}
		for r := range 25 {
			p1, p2 := ".001", ".008"
			if contradict && r%5 != 0 {
				p1, p2 = ".600", ".600"
			}
			t.body = append(t.body, cells(fmt.Sprintf("Predictor %d", r), "0.41", "0.12", p1, "0.35", "0.13", p2))
		}
		a.tables = append(a.tables, t)
	}
	return jatsArticle(a)
}

// BenchmarkReadJATS reads and recognises one article of about 100 kB.
func BenchmarkReadJATS(b *testing.B) {
	s := benchArticle()
	b.SetBytes(int64(len(s)))
	for b.Loop() {
		a, err := ReadJATS(strings.NewReader(s), "bench.xml")
		if err != nil {
			b.Fatal(err)
		}
		Recognise(a)
	}
}
