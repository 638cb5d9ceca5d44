package article

import (
	"slices"
	"strings"
	"testing"
)

// TestSentenceGroupAndModel reads invented sentences: each result gets
// the group and the model its own words, else its sentence, else its
// paragraph name, with its predictor without them; results of one
// paragraph left with the same key are listed to confirm, and no group is
// guessed where the words name two.
func TestSentenceGroupAndModel(t *testing.T) {
	tests := []struct {
		name, text string
		// want is each result's "predictor|group|model".
		want []string
		// confirm are reasons, in part, that must be listed; sameKey
		// says whether results were listed as sharing a key.
		confirm []string
		sameKey bool
	}{
		{"a group each, the second predictor from the first",
			"Outdoor time predicted attention for girls (β = .34, p < .001) and for boys (β = .12, p = .03).",
			[]string{"Outdoor time predicted attention|girls|", "Outdoor time predicted attention|boys|"},
			[]string{"predictor \"Outdoor time predicted attention\" taken from the result before it"}, false},
		{"the sentence's one group for both results",
			"Among girls, outdoor time (β = .34) and screen time (β = −.20) predicted sleep.",
			[]string{"outdoor time|girls|", "screen time|girls|"},
			[]string{"group \"girls\" taken from the sentence"}, false},
		{"a named group", "In the control group, sleep predicted mood (b = 0.41, SE = 0.12).",
			[]string{"sleep predicted mood|control group|"}, nil, false},
		{"a model", "In Model 2, stress remained a predictor of sleep (β = −.21, p = .002).",
			[]string{"stress remained a predictor of sleep||Model 2"}, nil, false},
		{"the model in the parenthesis", "Stress predicted sleep (β = −.21, p = .002, model 3) and so did noise (β = .10, Model 2).",
			[]string{"Stress predicted sleep||Model 3", "so did noise||Model 2"}, nil, false},
		{"group and model from the paragraph",
			"We report the results for women in Model 2. Stress predicted sleep (β = .30, p = .01).",
			[]string{"Stress predicted sleep|women|Model 2"},
			[]string{"group \"women\" taken from the paragraph", "model \"Model 2\" taken from the paragraph"}, false},
		{"the whole sample is no group", "In the whole sample, stress predicted sleep (r = .20, p = .01).",
			[]string{"stress predicted sleep||"}, nil, false},
		{"the same key twice in a paragraph",
			"Stress predicted sleep (β = .30, p = .01). In a second analysis, stress predicted sleep (β = .25, p = .04).",
			[]string{"Stress predicted sleep||", "stress predicted sleep||"},
			[]string{"same predictor \"Stress predicted sleep\""}, true},
		{"two groups named before one result: none guessed",
			"The association was stronger for girls than for boys (β = .34 and β = .12).",
			[]string{"||", "||"}, nil, true},
		{"the same predictor in two paragraphs is no clash",
			"Stress predicted sleep (β = .30, p = .01).\n\nStress predicted sleep (β = .25, p = .04).",
			[]string{"Stress predicted sleep||", "Stress predicted sleep||"}, nil, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			a, err := ReadText(strings.NewReader(tt.text), "results.txt")
			if err != nil {
				t.Fatal(err)
			}
			f := Recognise(a)
			var got []string
			for _, c := range f.Coefficients {
				got = append(got, c.Predictor+"|"+c.Group+"|"+c.Model)
			}
			if !slices.Equal(got, tt.want) {
				t.Errorf("results %q, want %q", got, tt.want)
			}
			var reasons []string
			same := 0
			for _, c := range f.ToConfirm {
				reasons = append(reasons, c.Reason)
				if strings.Contains(c.Reason, "results of one paragraph with the same predictor") {
					same++
				}
			}
			for _, w := range tt.confirm {
				if !slices.ContainsFunc(reasons, func(r string) bool { return strings.Contains(r, w) }) {
					t.Errorf("no line to confirm saying %q; lines: %q", w, reasons)
				}
			}
			if tt.sameKey && same != 2 || !tt.sameKey && same != 0 {
				t.Errorf("%d lines of results sharing a key, want %v (both results); lines: %q", same, tt.sameKey, reasons)
			}
		})
	}
}
