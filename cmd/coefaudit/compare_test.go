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
		{"p-values and a decided direction", []string{"--first", "0.41, p = .003", "--second", "0.18, p = .20", "--independent",
			"--published", "second-larger"}, exitFlagged, []string{"REVERSED"}},
		{"correlations need n", []string{"--first", "0.45 (0.29 to 0.58)", "--second", "0.20 (0.01 to 0.38)", "--independent",
			"--measure", "r", "--n1", "120", "--n2", "110"}, exitOK, []string{"fisher-z"}},
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
