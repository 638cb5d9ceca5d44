package audit

import (
	"strconv"
	"strings"
	"testing"

	"coefaudit/extract"
)

// rebuildTable is an invented correlation table of y, x1 and x2 with n =
// 200: r(y,x1) = .50, r(y,x2) = .30, r(x1,x2) = .40. The standardized
// coefficients follow from the two-predictor formula β1 = (r_y1 − r_y2 r_12)
// / (1 − r_12²) (Cohen, Cohen, West & Aiken 2003, Applied Multiple
// Regression/Correlation Analysis, 3rd ed., eq. 3.2.4; from memory):
// β1 = .38/.84 = 0.4524, β2 = .10/.84 = 0.1190. With R² = β1 r_y1 + β2 r_y2
// = 0.2619 the classical SE of β2 is √((1 − R²)/(n − 3)/(1 − r_12²)) =
// 0.0668, so β2/SE = 1.78 and p ≈ 0.075: not significant at .05.
func rebuildTable(group string) extract.CorrelationTable {
	t := corrTable("S", group, []string{"y", "x1", "x2"}, [][]float64{{1, .50, .30}, {.50, 1, .40}, {.30, .40, 1}}, 200, nil)
	for i := range t.R {
		for j := range t.R[i] {
			if i != j {
				t.R[i][j] = printed(strconv.FormatFloat(t.R[i][j].Value, 'f', 2, 64))
			}
		}
	}
	return t
}

// beta is a standardized coefficient of the model y ~ x1 + x2 printed as
// text (stars kept), with nothing else printed unless se is given.
func beta(t *testing.T, label, pred, group, text, se string, row int) extract.Coefficient {
	t.Helper()
	est, err := extract.ParseNumber(text)
	if err != nil {
		t.Fatal(err)
	}
	return extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: row}, Study: "S", Label: label,
		Measure: extract.MeasureBeta, Outcome: "y", Predictor: pred, Group: group, Model: "m", Estimate: est,
		SE: printed(se), CILevel: 95}
}

// TestIssue17BareBetasFromTable: standardized coefficients printed with
// stars only, beside the paper's correlation table, came out incomplete
// because the SE was sought from the printed numbers before the table was
// tried; and a table printed without a group (as the template's example)
// matched no coefficient of group "all".
func TestIssue17BareBetasFromTable(t *testing.T) {
	tests := []struct {
		name          string
		b1, b2        string
		se1           string
		wantOutcome   string
		wantNote      string
		wantProblem   string
		wantNoProblem bool
	}{
		{"stars agree", ".45***", ".12", "", Consistent, "its SE (", "", true},
		// ".12**" says p < .01; the rebuilt p is about 0.075.
		{"stars disagree", ".45***", ".12**", "", Consistent, "printed with 2 star(s)", "coefficient b2 is printed with 2 star(s)", false},
		// .30 is far outside the rebuilt 0.4524 and its rounding.
		{"estimate disagrees", ".30***", ".12", "", Conflict, "disagree beyond rounding", "coefficient b1 is printed as .30***", false},
		// A printed SE 0.06 beside the table: the rebuilt delta-method SE of β1
		// is 0.0604 (0.0599 to 0.0610 over the table's rounding), within the
		// SE's own rounding [0.055, 0.065].
		{"printed SE too", ".45***", ".12", "0.06", Consistent, "agrees with the rebuilt SE", "", true},
		// A printed SE 0.20 is far from the rebuilt one: said, not a conflict.
		{"printed SE disagrees", ".45***", ".12", "0.20", Consistent, "does not agree with the rebuilt SE", "", true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in := &extract.Input{
				Coefficients: []extract.Coefficient{beta(t, "b1", "x1", "all", tt.b1, tt.se1, 2), beta(t, "b2", "x2", "all", tt.b2, "", 3)},
				Claims:       []extract.Claim{claim("S", "c", 2, "b1", "b2", "first-larger", "unstated")},
				Tables:       []extract.CorrelationTable{rebuildTable("")},
			}
			rep := Audit(in, DefaultOptions)
			c := rep.Claims[0]
			if c.Method != "z-delta-from-correlation-table" || c.Outcome != tt.wantOutcome {
				t.Fatalf("method %q outcome %s, want z-delta-from-correlation-table, %s; notes %q", c.Method, c.Outcome, tt.wantOutcome, c.Notes)
			}
			if relDiff(float64(c.First.Estimate), 0.38/0.84) > 1e-9 || relDiff(float64(c.Second.Estimate), 0.10/0.84) > 1e-9 {
				t.Errorf("rebuilt betas %v, %v; want 0.4524, 0.1190", c.First.Estimate, c.Second.Estimate)
			}
			if !strings.Contains(strings.Join(c.Notes, " "), tt.wantNote) {
				t.Errorf("notes %q lack %q", c.Notes, tt.wantNote)
			}
			found := false
			for _, p := range rep.Problems {
				found = found || (tt.wantProblem != "" && strings.Contains(p.Message, tt.wantProblem) && p.Sheet == "coefficients")
			}
			if tt.wantNoProblem && len(rep.Problems) > 0 {
				t.Errorf("problems %v, want none", rep.Problems)
			}
			if tt.wantProblem != "" && !found {
				t.Errorf("problems %v lack %q", rep.Problems, tt.wantProblem)
			}
		})
	}
}

// TestIssue17TableMatching: the rules that place a correlation table
// printed without a group, and that list a table no claim used.
func TestIssue17TableMatching(t *testing.T) {
	t.Run("two samples: no group is a problem naming them", func(t *testing.T) {
		in := &extract.Input{
			Coefficients: []extract.Coefficient{beta(t, "b1", "x1", "women", ".45***", "", 2), beta(t, "b2", "x2", "women", ".12", "", 3),
				beta(t, "m1", "x1", "men", ".40***", "", 4)},
			Claims: []extract.Claim{claim("S", "c", 2, "b1", "b2", "first-larger", "unstated")},
			Tables: []extract.CorrelationTable{rebuildTable("")},
		}
		rep := Audit(in, DefaultOptions)
		if rep.Claims[0].Outcome != Incomplete {
			t.Errorf("outcome %s, want incomplete (no SE, and the table has no sample)", rep.Claims[0].Outcome)
		}
		if len(rep.Problems) != 1 || !strings.Contains(rep.Problems[0].Message, `groups "women", "men"`) {
			t.Errorf("problems %v, want one naming the groups women and men", rep.Problems)
		}
	})
	t.Run("another group: listed as unused, and the note says so", func(t *testing.T) {
		in := &extract.Input{
			Coefficients: []extract.Coefficient{
				coefficient("S", 2, coefSpec{label: "x", measure: "b", group: "all", model: "m", est: "0.31", se: "0.07"}),
				coefficient("S", 3, coefSpec{label: "y", measure: "b", group: "all", model: "m", est: "0.12", se: "0.05"}),
				coefficient("S", 4, coefSpec{label: "z", measure: "b", group: "boys", model: "m", est: "0.12", se: "0.05"})},
			Claims: []extract.Claim{claim("S", "c", 2, "x", "y", "first-larger", "unstated")},
			Tables: []extract.CorrelationTable{rebuildTable("girls")},
		}
		rep := Audit(in, DefaultOptions)
		notes := strings.Join(rep.Claims[0].Notes, " ")
		if strings.Contains(notes, "would settle it.") && !strings.Contains(notes, "another sample") {
			t.Errorf("the note speaks as if no table were printed: %q", notes)
		}
		if len(rep.Problems) != 1 || !strings.Contains(rep.Problems[0].Message, "was not used") ||
			!strings.Contains(rep.Problems[0].Message, `group "girls"`) {
			t.Errorf("problems %v, want the table listed as unused", rep.Problems)
		}
	})
	t.Run("tried and failed: the reason is given", func(t *testing.T) {
		tab := rebuildTable("all")
		tab.Variables = []string{"y", "x1", "w"}
		in := &extract.Input{
			Coefficients: []extract.Coefficient{beta(t, "b1", "x1", "all", ".45***", "", 2), beta(t, "b2", "x2", "all", ".12", "", 3)},
			Claims:       []extract.Claim{claim("S", "c", 2, "b1", "b2", "first-larger", "unstated")},
			Tables:       []extract.CorrelationTable{tab},
		}
		rep := Audit(in, DefaultOptions)
		if len(rep.Problems) != 1 || !strings.Contains(rep.Problems[0].Message, "the model needs x2") {
			t.Errorf("problems %v, want the table unused because the model needs x2", rep.Problems)
		}
	})
}
