package audit

import (
	"strings"
	"testing"

	"coefaudit/extract"
)

// TestIssue17PrintedAgainstTable: a correlation printed as a coefficient
// and the table's cell for the same pair must agree within rounding, and a
// table that is not positive definite decides no verdict (issue 17, 7).
func TestIssue17PrintedAgainstTable(t *testing.T) {
	rc := func(label, a, b, text string, row int) extract.Coefficient {
		c := rCoef(label, a, b, 0, row)
		c.Group, c.Estimate = "", printed(text)
		return c
	}
	tests := []struct {
		name        string
		r1, r2      string
		table       [][]float64
		wantProblem string // "" for none
		want        string
	}{
		// rebuildTable's cells: r(y,x1) = .50, r(y,x2) = .30, r(x1,x2) = .40.
		{"agree", ".50", ".30", nil, "", ""},
		// .45 against the cell .50: [.445, .455] and [.495, .505] do not meet.
		{"printed r beside a different cell", ".45", ".30", nil, "printed as r = .45, but sheet \"table S\" gives 0.50", Conflict},
		// A table no sample can have: r12 = r13 = .9 with r23 = −.9 (smallest
		// eigenvalue −0.8, see regress.TestCheckCorrelationMatrix).
		{"not positive definite", ".90", ".90", [][]float64{{1, .9, .9}, {.9, 1, -.9}, {.9, -.9, 1}}, "not positive definite", Conflict},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tab := rebuildTable("")
			if tt.table != nil {
				tab = corrTable("S", "", []string{"y", "x1", "x2"}, tt.table, 200, nil)
			}
			in := &extract.Input{
				Coefficients: []extract.Coefficient{rc("r1", "y", "x1", tt.r1, 2), rc("r2", "y", "x2", tt.r2, 3)},
				Claims:       []extract.Claim{claim("S", "c", 2, "r1", "r2", "differ", "unstated")},
				Tables:       []extract.CorrelationTable{tab},
			}
			rep := Audit(in, DefaultOptions)
			c := rep.Claims[0]
			if tt.want != "" && c.Outcome != tt.want {
				t.Errorf("outcome %s, want %s; notes %q", c.Outcome, tt.want, c.Notes)
			}
			if tt.want == "" && c.Outcome == Conflict {
				t.Errorf("agreeing numbers give conflict; notes %q", c.Notes)
			}
			var msgs []string
			for _, p := range rep.Problems {
				msgs = append(msgs, p.Message)
			}
			all := strings.Join(msgs, " | ")
			if tt.wantProblem == "" && len(msgs) > 0 {
				t.Errorf("problems %q, want none", msgs)
			}
			if tt.wantProblem != "" && !strings.Contains(all, tt.wantProblem) {
				t.Errorf("problems %q lack %q", msgs, tt.wantProblem)
			}
		})
	}
	// Two coefficients of one regression whose table is not positive
	// definite: conflict, not a verdict over the admissible range.
	in := &extract.Input{
		Coefficients: []extract.Coefficient{beta(t, "b1", "x1", "", ".45", "0.05", 2), beta(t, "b2", "x2", "", ".12", "0.05", 3)},
		Claims:       []extract.Claim{claim("S", "c", 2, "b1", "b2", "differ", "unstated")},
		Tables:       []extract.CorrelationTable{corrTable("S", "", []string{"y", "x1", "x2"}, [][]float64{{1, .9, .9}, {.9, 1, -.9}, {.9, -.9, 1}}, 200, nil)},
	}
	if c := Audit(in, DefaultOptions).Claims[0]; c.Outcome != Conflict {
		t.Errorf("regression on a table not positive definite: outcome %s, want conflict; notes %q", c.Outcome, c.Notes)
	}
}
