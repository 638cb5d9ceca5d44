package pool_test

import (
	"fmt"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/pool"
)

// decimalsInput is an invented input of three studies, each with two
// independent coefficients printed as given and one claim of topic "t".
func decimalsInput(t *testing.T, est1, est2, ciLow, ciHigh string) *extract.Input {
	t.Helper()
	num := func(s string) extract.Printed {
		if s == "" {
			return extract.Printed{}
		}
		p, err := extract.ParseNumber(s)
		if err != nil {
			t.Fatalf("ParseNumber(%q): %v", s, err)
		}
		return p
	}
	in := &extract.Input{Source: "invented.xlsx"}
	for k := range 3 {
		study := fmt.Sprintf("S%d", k+1)
		for i, est := range []string{est1, est2} {
			c := extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: 2 + 2*k + i}, Study: study,
				Label: []string{"a", "b"}[i], Measure: extract.MeasureB, Group: []string{"g1", "g2"}[i],
				Estimate: num(est), SE: num("0.1"), CILevel: 95}
			if i == 0 && ciLow != "" {
				c.SE = extract.Printed{}
				c.CI = extract.Interval{Low: num(ciLow), High: num(ciHigh)}
			}
			in.Coefficients = append(in.Coefficients, c)
		}
		in.Claims = append(in.Claims, extract.Claim{Position: extract.Position{Sheet: "claims", Row: k + 2}, Study: study,
			Claim: "1", First: "a", Second: "b", Published: extract.PublishedDiffer, Basis: extract.BasisTest, Alpha: 0.05, Topic: "t"})
	}
	return in
}

// TestIssue20PoolDecimals: a topic's numbers are shown as precisely as the
// claims' own reports show them (audit's precision rule: one decimal more
// than the estimates and interval limits were printed with, from 2 to 4;
// the rule of issue 20), so that a pooled value never has fewer decimals
// than the claims it pools.
func TestIssue20PoolDecimals(t *testing.T) {
	for _, tt := range []struct {
		name                      string
		est1, est2, ciLow, ciHigh string
		want                      int
	}{
		{"integers", "3", "1", "", "", 2},
		{"one decimal", "0.4", "0.1", "", "", 2},
		{"two decimals", "0.41", "0.1", "", "", 3},
		{"three decimals", "0.412", "0.1", "", "", 4},
		{"six decimals", "0.412345", "0.1", "", "", 4},
		{"interval printed finer than the estimates", "0.4", "0.1", "0.204", "0.596", 4},
	} {
		t.Run(tt.name, func(t *testing.T) {
			rep := audit.Audit(decimalsInput(t, tt.est1, tt.est2, tt.ciLow, tt.ciHigh), audit.DefaultOptions)
			for _, c := range rep.Claims {
				if c.EstimateDecimals() != tt.want {
					t.Fatalf("claim row %d EstimateDecimals() = %d, want %d (outcome %s, notes %q)", c.Row, c.EstimateDecimals(), tt.want, c.Outcome, c.Notes)
				}
			}
			tp := poolOne(t, rep.Claims, pool.DefaultOptions)
			if tp.K != 3 || tp.Decimals != tt.want {
				t.Errorf("Run(%s).Topics[0] K %d, Decimals %d; want 3, %d", tt.name, tp.K, tp.Decimals, tt.want)
			}
		})
	}
}
