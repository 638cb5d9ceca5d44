package report

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"coefaudit/audit"
)

// TestJSONClaimNullsAndReuse checks the contract's names and nulls for the
// numbers not known, and that a claim encoded after another shows nothing
// of the one before (the writer reuses one jsonClaimBuffer).
func TestJSONClaimNullsAndReuse(t *testing.T) {
	nan := audit.Number(math.NaN())
	full := audit.ClaimResult{
		Study: "S", Claim: "c1", Row: 2,
		First:      audit.Side{Label: "a", Estimate: 0.5, SE: 0.1, SEFrom: "se"},
		Second:     audit.Side{Label: "b", Estimate: 0.25, SE: nan, SEFrom: ""},
		Relation:   audit.SameSample,
		Difference: 0.25, DifferenceSE: nan, DifferenceCI: [2]audit.Number{nan, nan},
		Statistic: nan, DF: nan, P: nan, PRange: [2]audit.Number{0.001, 1},
		Outcome:      audit.Indeterminate,
		Notes:        []string{"a note"},
		Overlap:      &audit.OverlapResult{Proportion: 0.5, ImpliedP: audit.Number(math.Inf(1))},
		TippingCorr:  []audit.Number{0.75},
		Alternatives: []audit.Alternative{{Method: "other", Statistic: 2, P: 0.04}},
		AdjustedP:    &audit.AdjustedPValues{BH: 0.04, Holm: nan},
	}
	plain := audit.ClaimResult{Study: "S", Claim: "c2", Row: 3, Difference: 1, P: 0.5,
		DifferenceCI: [2]audit.Number{nan, nan}, PRange: [2]audit.Number{nan, nan}}
	var buf bytes.Buffer
	w := newJSONWriter(&buf)
	if err := w.Begin(Header{Alpha: 0.05}); err != nil {
		t.Fatal(err)
	}
	if err := w.Study(audit.StudyResult{Study: "S", Claims: []audit.ClaimResult{full, plain}}); err != nil {
		t.Fatal(err)
	}
	if err := w.End(Footer{}); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(buf.String(), "\n")
	if len(lines) < 3 {
		t.Fatalf("want a line per claim:\n%s", buf.String())
	}
	for _, tc := range []struct {
		line int
		want []string
		not  []string
	}{
		{1, []string{`"second":{"label":"b","estimate":0.25,"se":null,"se_from":""}`, `"difference_se":null`,
			`"difference_ci":[null,null]`, `"statistic":null`, `"df":null`, `"p":null`, `"p_range":[0.001,1]`,
			`"overlap":{"proportion":0.5,"implied_p":null}`, `"tipping_corr":[0.75]`,
			`"alternatives":[{"method":"other","statistic":2,"p":0.04}]`, `"p_adjusted":{"bh":0.04,"holm":null}`}, nil},
		{2, []string{`"claim":"c2"`, `"difference":1`, `"p":0.5`, `"notes":null`, `"overlap":null`},
			[]string{"tipping_corr", "alternatives", "p_adjusted", `"label":"a"`}},
	} {
		line := lines[tc.line]
		for _, w := range tc.want {
			if !strings.Contains(line, w) {
				t.Errorf("claim line %d lacks %s:\n%s", tc.line, w, line)
			}
		}
		for _, n := range tc.not {
			if strings.Contains(line, n) {
				t.Errorf("claim line %d has %s from the claim before:\n%s", tc.line, n, line)
			}
		}
	}
	var doc map[string]any
	if err := json.Unmarshal(buf.Bytes(), &doc); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, buf.String())
	}
}
