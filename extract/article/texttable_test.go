package article

import (
	"fmt"
	"reflect"
	"strings"
	"testing"
)

// comparable is what a coefficient must have alike in two formats: every
// number as printed, its names and its place.
func comparable(rows []CoefficientRow) []string {
	var out []string
	for _, c := range rows {
		out = append(out, fmt.Sprintf("%s|%s|%s|%s|%s|%s|%s|%s|%s|%s|%s|%s|%s|%s|%s", c.Predictor, c.Model, c.Group, c.Measure, c.Outcome,
			c.Estimate, c.SE, c.CI, c.CILow, c.CIHigh, c.CILevel, c.P, c.Stat, c.N, c.Source))
	}
	return out
}

// TestTextTablesAsInHTML: each invented table pasted as text, its columns
// separated by tabs (the caption a paragraph of its own) or aligned by
// spaces (caption, table and notes in one block), gives the coefficients
// and correlation sheets the same table gives in HTML and JATS, every
// number and place alike. Tables marked by bold are left out: plain text
// cannot print bold.
func TestTextTablesAsInHTML(t *testing.T) {
	tables := []ttable{correlationTable}
	for _, l := range layouts {
		if !hasBold(l.table) {
			tables = append(tables, l.table)
		}
	}
	for _, tb := range tables {
		a := tarticle{author: "Quillon", year: "2026", tables: []ttable{tb}}
		ha, err := ReadHTML(strings.NewReader(htmlArticle(a)), "a.html")
		if err != nil {
			t.Fatal(err)
		}
		ja, err := ReadJATS(strings.NewReader(jatsArticle(a)), "a.xml")
		if err != nil {
			t.Fatal(err)
		}
		want, jats := Recognise(ha), Recognise(ja)
		if !reflect.DeepEqual(comparable(want.Coefficients), comparable(jats.Coefficients)) {
			t.Fatalf("%s: HTML and JATS differ; the test's reference is wrong", tb.label)
		}
		for _, v := range []struct {
			name        string
			tabs, apart bool
		}{{"spaces", false, false}, {"tabs", true, true}} {
			text := "Results are in the table.\n\n" + textTableOf(tb, v.tabs, v.apart) + "\n\nThe end of the results.\n"
			ta, err := ReadText(strings.NewReader(text), "a.txt")
			if err != nil {
				t.Fatal(err)
			}
			got := Recognise(ta)
			if g, w := comparable(got.Coefficients), comparable(want.Coefficients); !reflect.DeepEqual(g, w) {
				t.Errorf("%s as text with %s:\n%s\ngives\n%q\nwant as in HTML\n%q", tb.label, v.name, text, g, w)
			}
			var gotRows, wantRows [][][]string
			for _, s := range got.Tables {
				gotRows = append(gotRows, s.Rows[1:]) // the study key names the file
			}
			for _, s := range want.Tables {
				wantRows = append(wantRows, s.Rows[1:])
			}
			if !reflect.DeepEqual(gotRows, wantRows) {
				t.Errorf("%s as text with %s: correlation sheets %q, want %q", tb.label, v.name, gotRows, wantRows)
			}
			if len(ta.Paragraphs) != 2 {
				t.Errorf("%s as text with %s: paragraphs %q, want the two sentences around the table", tb.label, v.name, ta.Paragraphs)
			}
		}
	}
}

// TestTextTableRecognition: what is read as a table in text, and what is
// not: a table without caption is named by its line; prose with two
// spaces after its periods, an address block and a numbered list are
// prose.
func TestTextTableRecognition(t *testing.T) {
	tests := []struct {
		name, text string
		tables     []string // the tables' labels
		paragraphs int
	}{
		{"no caption", "Our results:\n\nPredictor   B     SE    p\nSleep       0.41  0.12  .001\nStress      -0.20  0.09  .03\n",
			[]string{"text table at line 3"}, 1},
		{"a label line, then the title", "Table 3\nRegressions predicting mood\n\tB\tSE\nSleep\t0.41\t0.12\nStress\t-0.20\t0.09\n",
			[]string{"Table 3"}, 0},
		{"prose with two spaces after periods", "Sleep predicted mood.  The effect was large.\nStress did not.  Nor did age.\nWe stop here.  B is the slope.\n", nil, 1},
		{"a numbered list", "1. Sleep  the hours slept\n2. Stress  the score of the scale\n", nil, 1},
		{"an address block", "Department of Psychology    University of Nowhere\nPhone    555 0101\n", nil, 1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			a, err := ReadText(strings.NewReader(tt.text), "a.txt")
			if err != nil {
				t.Fatal(err)
			}
			var labels []string
			for _, tb := range a.Tables {
				labels = append(labels, tb.Label)
			}
			if !reflect.DeepEqual(labels, tt.tables) || len(a.Paragraphs) != tt.paragraphs {
				t.Errorf("tables %q and %d paragraphs, want %q and %d", labels, len(a.Paragraphs), tt.tables, tt.paragraphs)
			}
			if len(tt.tables) > 0 {
				f := Recognise(a)
				if len(f.Coefficients) != 2 || !strings.HasPrefix(f.Coefficients[0].Source, tt.tables[0]+", row \"Sleep\"") {
					t.Errorf("coefficients %q, want Sleep and Stress from %s", comparable(f.Coefficients), tt.tables[0])
				}
			}
		})
	}
}
