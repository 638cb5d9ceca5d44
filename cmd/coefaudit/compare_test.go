package main

import (
	"encoding/json"
	"strings"
	"testing"
)

func TestCompareCommand(t *testing.T) {
	tests := []struct {
		name string
		args []string
		code exitCode
		// stdout must hold every one of these.
		want []string
	}{
		{"independent intervals", []string{"--first", "0.41 [0.30, 0.52]", "--second", "0.18 (0.05 to 0.31)", "--independent"},
			exitOK, []string{"independent samples", "independent-z", "Verdict:   CONSISTENT", "Methods", "Cautions"}},
		// Var(b1 − b2) = 0.05² + 0.06² − 2·0.35·0.05·0.06 = 0.004 (the
		// variance of a difference): z = 0.23/0.06325 = 3.64, p < 0.001.
		{"same model with a printed correlation", []string{"--first", "0.41, SE 0.05", "--second", "0.18, SE 0.06", "--same-model", "--corr", "0.35"},
			exitOK, []string{"one fitted model", "z-with-estimate-corr", "difference 0.230 [", "p < .001"}},
		// Altman DG, Bland JM (2003). Interaction revisited: the difference
		// between two estimates. BMJ 326:219, worked example (data of Torgerson
		// & Bell-Syer 2001, JAMA 285:2891–2897; the CI 0.71 to 1.08 from
		// memory): log difference −0.2726 as printed (SECONDARY: OCR of the
		// printed note on es.scribd.com, document 375349251); P 0.2165 derived
		// here from the note's formula, not a published value; no evidence of
		// a difference. Shown as the ratio of the RRs exp(−0.2726) = 0.761,
		// 95% CI 0.494 to 1.173 (the note: 0.76, 0.49 to 1.17, from memory).
		{"ratios, no difference published", []string{"--first", "0.67 (0.46 to 0.98)", "--second", "0.88 (0.71 to 1.08)",
			"--independent", "--measure", "rr", "--published", "no-difference"},
			exitOK, []string{"ratio of the two ratios 0.761 [0.494, 1.173]", "p = .217", "log scale", "CONSISTENT"}},
		// SEs 0.41/2.968 = 0.138 and 0.18/1.282 = 0.140: d = 0.23, z 1.17, p 0.24.
		// The point estimates point the other way, not significantly (issue 17).
		{"p-values and an opposite point estimate", []string{"--first", "0.41, p = .003", "--second", "0.18, p = .20", "--independent",
			"--published", "second-larger"}, exitFlagged, []string{"UNSUPPORTED", "point the other way"}},
		// SEs 0.41/3.891 = 0.105 and 0.05/0.524 = 0.095: d = 0.36, SE 0.142, z 2.54,
		// p 0.011: the test shows the first is the larger.
		{"p-values and a reversed direction", []string{"--first", "0.41, p = .0001", "--second", "0.05, p = .60", "--independent",
			"--published", "second-larger"}, exitFlagged, []string{"REVERSED"}},
		{"correlations need n", []string{"--first", "0.45 (0.29 to 0.58)", "--second", "0.20 (0.01 to 0.38)", "--independent",
			"--measure", "r", "--n1", "120", "--n2", "110"}, exitOK, []string{"fisher-z"}},

		// Issue 17: every test that check has, and the forms pasted from papers.
		// A correlation with n alone. Textbook example (PUBLISHED-VALUES 3.1,
		// "CHAPTER 15 Introducing Correlation and Regression", p. 205): r1 = 0.4
		// (N1 = 100), r2 = 0.6 (N2 = 150), difference of z 0.269, SE 0.131; z =
		// −2.06, P = 0.039 derived from them.
		{"correlations with n alone", []string{"--first", "r = .4", "--second", "r = .6", "--independent", "--n1", "100", "--n2", "150"},
			exitOK, []string{"fisher-z", "statistic -2.06", "p = .039"}},
		// Overlapping correlations of one sample: Howell, Statistical Methods for
		// Psychology, 6th ed., p. 262 (SECONDARY, via a university statistics
		// wiki): r12 = .80, r13 = .72, r23 = .89, n = 26; Williams' t = 1.361,
		// df = 23, p = .187.
		{"overlapping correlations", []string{"--first", "r = .80", "--second", "r = .72", "--same-sample", "--n", "26", "--r23", ".89"},
			exitFlagged, []string{"williams-t", "statistic 1.36", "df 23", "p = .187"}},
		// Non-overlapping: r12 = .50, r34 = .30, r13 = .40, r14 = .20, r23 = .25,
		// r24 = .35, n = 100: ZPF = 1.7834, P 0.0745 (DERIVED illustration values
		// from the formula of Raghunathan, Rosenthal & Rubin 1996, Psychological
		// Methods 1:178; no published worked example was found).
		{"non-overlapping correlations", []string{"--first", "r = .50", "--second", "r = .30", "--same-sample", "--n", "100",
			"--r13", ".40", "--r14", ".20", "--r23", ".25", "--r24", ".35"}, exitFlagged, []string{"zpf", "statistic 1.78", "p = .075"}},
		// Woodward M (2019). Heart 105:1701, Table 4: women RR 2.15 (1.33 to
		// 3.47), men ln RR 0.746688 with SE 0.324736 (RR 2.11); ln RRR 0.01878,
		// 95% CI −0.778101 to 0.815661.
		{"ratio with its label", []string{"--first", "RR 2.15 (1.33–3.47)", "--second", "RR 2.11, SE 0.3247", "--independent",
			"--published", "no-difference"}, exitOK, []string{"log scale", "ratio of the two ratios 1.019 [0.459, 2.261]", "CONSISTENT"}},
		// Gelman A, Stern H (2006). The American Statistician 60:328: 25 (SE 10)
		// against 10 (SE 10), difference 15 with SE 14.1, z 1.06 (P 0.289 derived).
		{"labelled b with SE", []string{"--first", "b = 25, SE = 10", "--second", "b = 10, SE = 10", "--independent"},
			exitFlagged, []string{"statistic 1.06", "p = .289"}},
		// The same with the SEs given as t(120) = 25/10 and 10/10.
		{"t with its df", []string{"--first", "b = 25, t(120) = 2.5", "--second", "b = 10, t(120) = 1.0", "--independent"},
			exitFlagged, []string{"statistic 1.06", "p = .289"}},
		// Altman DG, Bland JM (2011). BMJ 343:d2090: an estimate with P = 0.032
		// has z = 2.144 (exact normal), so 17 has SE 7.93. Stars and a p bound
		// read as bounds: "β = .34, p < .01" gives the SE at p = .01.
		// SE ≤ .34/2.576 = 0.132 and .05/3.291 = 0.0152: z = 0.29/0.133 = 2.18.
		{"beta with a p bound and stars", []string{"--first", "β = .34, p < .01", "--second", "β = .05***", "--independent"},
			exitOK, []string{"SE 0.132, from estimate, p bound", "SE 0.015, from estimate, p bound", "p = .029"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			stdout, stderr, code := runArgs(append([]string{"compare"}, tt.args...)...)
			if code != tt.code {
				t.Fatalf("compare %q = %d, want %d (stderr %q)\n%s", tt.args, code, tt.code, stderr, stdout)
			}
			for _, w := range tt.want {
				if !strings.Contains(stdout, w) {
					t.Errorf("compare %q output lacks %q:\n%s", tt.args, w, stdout)
				}
			}
		})
	}
}

func TestCompareCommandJSON(t *testing.T) {
	stdout, stderr, code := runArgs("compare", "--first", "0.41 [0.30, 0.52]", "--second", "0.18 (0.05 to 0.31)",
		"--independent", "--format", "json")
	if code != exitOK {
		t.Fatalf("compare --format json = %d (%s)", code, stderr)
	}
	var doc struct {
		Claims []struct{ Method, Outcome, Relation string }
	}
	if err := json.Unmarshal([]byte(stdout), &doc); err != nil {
		t.Fatalf("output is not JSON: %v", err)
	}
	if len(doc.Claims) != 1 || doc.Claims[0].Method != "independent-z" || doc.Claims[0].Relation != "independent" {
		t.Errorf("compare --format json claims = %+v, want one independent-z claim", doc.Claims)
	}
}

func TestCompareCommandErrors(t *testing.T) {
	base := []string{"--first", "0.41, SE 0.05", "--second", "0.18, SE 0.06"}
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"no relation", base, "independent same-model same-sample"},
		{"two relations", append(append([]string{}, base...), "--independent", "--same-model"), "none of the others"},
		{"correlation for independent", append(append([]string{}, base...), "--independent", "--corr", "0.3"), "independent estimates have none"},
		{"correlation out of range", append(append([]string{}, base...), "--same-model", "--corr", "1.3"), "--corr"},
		{"n and n1", append(append([]string{}, base...), "--same-sample", "--n", "100", "--n1", "90"), "--n"},
		{"bad n", append(append([]string{}, base...), "--independent", "--n1", "many"), "--n1"},
		{"bad measure", append(append([]string{}, base...), "--independent", "--measure", "d"), "measure"},
		{"bad verdict", append(append([]string{}, base...), "--independent", "--published", "bigger"), "published"},
		{"bad second", []string{"--first", "0.41, SE 0.05", "--second", "0.18 ± 0.06", "--independent"}, "--second"},
		{"bad format", append(append([]string{}, base...), "--independent", "--format", "csv"), "--format"},
		{"an argument", append(append([]string{}, base...), "--independent", "extra"), "unknown command"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			stdout, stderr, code := runArgs(append([]string{"compare"}, tt.args...)...)
			if code != exitError || !strings.Contains(stderr, tt.want) || stdout != "" {
				t.Errorf("compare %q = %d, stderr %q, stdout %d bytes; want exit 2 saying %q and no output", tt.args, code, stderr, len(stdout), tt.want)
			}
		})
	}
}

// TestIssue17CompareShowsNoWorkbook: compare's report showed the
// placeholders of the workbook it builds (study "compare", group "sample",
// "claims row 2").
func TestIssue17CompareShowsNoWorkbook(t *testing.T) {
	for _, args := range [][]string{
		{"--first", "0.41, SE 0.05", "--second", "0.18, SE 0.06", "--same-model"},
		{"--first", "0.41, SE 0.05", "--second", "0.18, SE 0.06", "--same-sample", "--format", "json"},
		{"--first", "r = .80", "--second", "r = .72", "--same-sample", "--n", "26", "--r23", ".89"},
	} {
		stdout, stderr, _ := runArgs(append([]string{"compare"}, args...)...)
		for _, bad := range []string{`"compare"`, `group "sample"`, "claims row", "correlations sheet", `study ""`} {
			if strings.Contains(stdout, bad) {
				t.Errorf("compare %q shows %q:\n%s%s", args, bad, stdout, stderr)
			}
		}
	}
}
