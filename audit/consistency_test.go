package audit

import (
	"strings"
	"testing"

	"coefaudit/extract"
)

// TestConsistencyConflicts covers each kind of contradiction between a
// coefficient's printed numbers, beyond their rounding. Each case is worked
// by hand in its comment.
func TestConsistencyConflicts(t *testing.T) {
	mk := func(mut func(*extract.Coefficient)) extract.Coefficient {
		c := extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: 7}, Study: "S", Label: "x",
			Measure: extract.MeasureB, CILevel: 95}
		mut(&c)
		return c
	}
	tests := []struct {
		name   string
		c      extract.Coefficient
		column string // "" for no conflict
		want   string
	}{
		// 0.35 lies below 0.38 − 0.005 − 0.005.
		{"estimate outside interval", mk(func(c *extract.Coefficient) {
			c.Estimate, c.CI = printed("0.35"), extract.Interval{Low: printed("0.38"), High: printed("0.60")}
		}), "estimate", "outside its own interval"},
		// [0.12, 0.45] excludes 0 whatever the rounding, so p must be below .05.
		{"interval excludes 0, p above .05", mk(func(c *extract.Coefficient) {
			c.Estimate, c.CI, c.P = printed("0.28"), extract.Interval{Low: printed("0.12"), High: printed("0.45")}, printed("0.08")
		}), "p", "excludes 0"},
		// [−0.05, 0.45] includes 0, so p must be .05 or more.
		{"interval includes 0, p below .05", mk(func(c *extract.Coefficient) {
			c.Estimate, c.CI, c.P = printed("0.20"), extract.Interval{Low: printed("-0.05"), High: printed("0.45")}, printed("0.01")
		}), "p", "includes 0"},
		// Odds ratio 1.50 (1.10, 2.05) excludes 1; "p = .20" contradicts it.
		{"ratio interval excludes 1", mk(func(c *extract.Coefficient) {
			c.Measure = extract.MeasureOR
			c.Estimate, c.CI, c.P = printed("1.50"), extract.Interval{Low: printed("1.10"), High: printed("2.05")}, printed("0.20")
		}), "p", "excludes 1"},
		// 0.50/0.10 = 5 (z between 0.495/0.105 = 4.71 and 0.505/0.095 = 5.32), printed t 2.50.
		{"statistic against estimate/SE", mk(func(c *extract.Coefficient) {
			c.Estimate, c.SE, c.Stat = printed("0.50"), printed("0.10"), printed("2.50")
		}), "stat", "disagrees"},
		// z = 0.20/0.10 = 2 gives p 0.0455 (range 0.027 to 0.073 over rounding), printed .40.
		{"p against estimate/SE", mk(func(c *extract.Coefficient) {
			c.Estimate, c.SE, c.P = printed("0.20"), printed("0.10"), printed("0.40")
		}), "p", "disagrees"},
		{"df not below n", mk(func(c *extract.Coefficient) {
			c.Estimate, c.SE, c.DF, c.N = printed("0.20"), printed("0.10"), printed("120"), printed("100")
		}), "df", "not below n"},
		// Agreeing numbers: 0.20/0.10 = 2, p = .046 lies in [0.027, 0.073].
		{"consistent p", mk(func(c *extract.Coefficient) {
			c.Estimate, c.SE, c.P = printed("0.20"), printed("0.10"), printed(".046")
		}), "", ""},
		// An asymmetric interval is no conflict: 0.30 (0.05, 0.45).
		{"asymmetric interval", mk(func(c *extract.Coefficient) {
			c.Estimate, c.CI, c.P = printed("0.30"), extract.Interval{Low: printed("0.05"), High: printed("0.45")}, printed("0.01")
		}), "", ""},
		// The t reference with n − 2 df is allowed when df is not printed: est/SE =
		// 2.10 gives p .036 (normal) and .045 (t, 18 df); printed .045 with n = 20.
		{"t reference allowed", mk(func(c *extract.Coefficient) {
			c.Estimate, c.SE, c.P, c.N = printed("0.210"), printed("0.100"), printed(".050"), printed("20")
		}), "", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			ps := consistencyProblems(&tt.c)
			if tt.column == "" {
				if len(ps) != 0 {
					t.Errorf("unexpected conflicts %v", ps)
				}
				return
			}
			if len(ps) != 1 || ps[0].Column != tt.column || ps[0].Row != 7 || !strings.Contains(ps[0].Message, tt.want) {
				t.Errorf("conflicts %v, want one in column %q mentioning %q", ps, tt.column, tt.want)
			}
		})
	}
}

// TestConflictsReachProblemsAndClaims: a conflict is reported under its
// coefficient even when no claim uses it, and a claim using it is a conflict.
func TestConflictsReachProblemsAndClaims(t *testing.T) {
	bad := coefficient("S", 2, coefSpec{label: "x", measure: "b", group: "g", est: "0.35", lo: "0.38", hi: "0.60"})
	ok := coefficient("S", 3, coefSpec{label: "y", measure: "b", group: "h", est: "0.12", lo: "0.02", hi: "0.22"})
	unused := coefficient("S", 4, coefSpec{label: "z", measure: "b", group: "h", est: "0.90", lo: "0.02", hi: "0.22"})
	in := &extract.Input{Coefficients: []extract.Coefficient{bad, ok, unused},
		Claims: []extract.Claim{claim("S", "c", 2, "x", "y", "differ", "test")}}
	rep := Audit(in, DefaultOptions)
	if rep.Claims[0].Outcome != Conflict {
		t.Errorf("claim outcome %s, want conflict", rep.Claims[0].Outcome)
	}
	rows := map[int]bool{}
	for _, p := range rep.Problems {
		rows[p.Row] = true
	}
	if !rows[2] || !rows[4] {
		t.Errorf("problems %v, want conflicts at coefficients rows 2 and 4", rep.Problems)
	}
}

func TestTableNotPositiveDefinite(t *testing.T) {
	// r12 = r13 = .9 with r23 = −.9: smallest eigenvalue −0.8 (see
	// regress.TestCheckCorrelationMatrix).
	tab := corrTable("S", "g", []string{"a", "b", "c"}, [][]float64{{1, .9, .9}, {.9, 1, -.9}, {.9, -.9, 1}}, 100, nil)
	rep := Audit(&extract.Input{Tables: []extract.CorrelationTable{tab}}, DefaultOptions)
	// The table is also listed as unused (no claim compares estimates of
	// its sample), after the problem with the table itself.
	if len(rep.Problems) != 2 || !strings.Contains(rep.Problems[0].Message, "-0.8") || rep.Problems[0].Sheet != "table S" ||
		!strings.Contains(rep.Problems[1].Message, "was not used") {
		t.Errorf("problems %v, want the table named with smallest eigenvalue -0.8, then unused", rep.Problems)
	}
}
