package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// runArgs runs the command line in-process through run, as main does.
func runArgs(args ...string) (stdout, stderr string, code exitCode) {
	var out, errb bytes.Buffer
	code = run(args, &out, &errb)
	return out.String(), errb.String(), code
}

// consistentFolder writes a folder of CSVs holding one claim that stands:
// Altman DG, Bland JM (2003). Interaction revisited: the difference between
// two estimates. BMJ 326:219, worked example (data of Torgerson & Bell-Syer
// 2001, JAMA 285:2891–2897): RR 0.67 (0.46–0.98) against 0.88 (0.71–1.08,
// this CI from memory) in independent subgroups, published as no difference
// (from memory). The test of the difference gives P = 0.2165, derived here
// from the note's formula, not a published value, so the verdict is
// consistent.
func consistentFolder(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	files := map[string]string{
		"coefficients.csv": "study,label,measure,group,estimate,ci_low,ci_high\n" +
			"Altman 2003,under60,rr,<60,0.67,0.46,0.98\n" +
			"Altman 2003,over60,rr,>=60,0.88,0.71,1.08\n",
		"claims.csv": "study,claim,first,second,published,basis\n" +
			"Altman 2003,A,under60,over60,no-difference,test\n",
	}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o600); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func savedDemo(t *testing.T) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "demo.xlsx")
	if _, stderr, code := runArgs("demo", "--save", path); code != exitOK {
		t.Fatalf("demo --save: %s", stderr)
	}
	return path
}

// Two estimates whose difference the test does not show (z = 0.11/0.0866
// = 1.27, p = 0.20 by the z test of Altman & Bland 2003), published as a
// difference: unsupported.
var unsupportedCompare = []string{"compare", "--first", "0.41, SE 0.06", "--second", "0.30, SE 0.0625", "--independent"}

// The same estimates from one sample with nothing printed about their
// covariance: over the admissible correlations p runs from below to above
// 0.05, so the verdict is indeterminate.
var indeterminateCompare = []string{"compare", "--first", "0.41, SE 0.06", "--second", "0.30, SE 0.0625", "--same-sample"}

func TestExitStatus(t *testing.T) {
	consistent := consistentFolder(t)
	demo := savedDemo(t)
	dir := t.TempDir()
	tests := []struct {
		name string
		args []string
		want exitCode
		// stderrHas is a text the error message must contain ("" for none).
		stderrHas string
	}{
		{"every claim consistent", []string{"check", consistent}, exitOK, ""},
		{"flagged claims", []string{"check", demo}, exitFlagged, ""},
		{"flagged, but --fail-on none", []string{"check", demo, "--fail-on", "none"}, exitOK, ""},
		{"--fail-on chooses the outcomes", []string{"check", consistent, "--fail-on", "consistent"}, exitFlagged, ""},
		{"flagged, written to a file", []string{"check", demo, "--format", "csv", "--out", filepath.Join(dir, "a.csv")}, exitFlagged, ""},
		{"the demo never fails", []string{"demo"}, exitOK, ""},
		{"compare consistent", []string{"compare", "--first", "0.41 [0.30, 0.52]", "--second", "0.18 (0.05 to 0.31)", "--independent"}, exitOK, ""},
		{"compare unsupported", unsupportedCompare, exitFlagged, ""},
		{"compare unsupported, --fail-on none", append(append([]string{}, unsupportedCompare...), "--fail-on", "none"), exitOK, ""},
		{"indeterminate does not fail by default", indeterminateCompare, exitOK, ""},
		{"indeterminate in --fail-on", append(append([]string{}, indeterminateCompare...), "--fail-on", "indeterminate"), exitFlagged, ""},
		{"unknown flag", []string{"check", consistent, "--bogus"}, exitError, "unknown flag"},
		{"unknown command", []string{"audit-everything"}, exitError, "unknown command"},
		{"bad --format", []string{"check", consistent, "--format", "pdf"}, exitError, "--format"},
		{"bad --fail-on", []string{"check", consistent, "--fail-on", "wrong"}, exitError, "--fail-on"},
		{"none with an outcome", []string{"check", consistent, "--fail-on", "none,missed"}, exitError, "--fail-on"},
		{"xlsx without --out", []string{"check", consistent, "--format", "xlsx"}, exitError, "--out"},
		{"missing input", []string{"check", filepath.Join(dir, "missing.xlsx")}, exitError, "missing.xlsx"},
		{"no input", []string{"check"}, exitError, "arg"},
		{"compare without --first", []string{"compare", "--second", "0.1, SE 0.1", "--independent"}, exitError, "first"},
		{"compare with a bad estimate", []string{"compare", "--first", "0.41 (0.30 to)", "--second", "0.1, SE 0.1", "--independent"}, exitError, "--first"},
		{"help", []string{"help"}, exitOK, ""},
		{"completion", []string{"completion", "bash"}, exitOK, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, stderr, code := runArgs(tt.args...)
			if code != tt.want {
				t.Errorf("run(%q) = %d, want %d (stderr %q)", tt.args, code, tt.want, stderr)
			}
			if tt.want != exitError && stderr != "" {
				t.Errorf("run(%q) wrote %q to stderr, want nothing", tt.args, stderr)
			}
			if tt.stderrHas != "" && (!strings.Contains(stderr, tt.stderrHas) || !strings.HasPrefix(stderr, "coefaudit: ")) {
				t.Errorf("run(%q) stderr = %q, want coefaudit: ... %q", tt.args, stderr, tt.stderrHas)
			}
		})
	}
}

// TestExitStatusInProcess runs the command tree itself, as run does, and
// checks the errors that run maps to the codes.
func TestExitStatusInProcess(t *testing.T) {
	consistent := consistentFolder(t)
	tests := []struct {
		name  string
		args  []string
		check func(error) bool
		want  string
	}{
		{"nil when nothing is flagged", []string{"check", consistent}, func(err error) bool { return err == nil }, "nil"},
		{"errFlagged when a claim is flagged", unsupportedCompare, func(err error) bool { return errors.Is(err, errFlagged) }, "errFlagged"},
		{"a flag error for a bad flag", []string{"check", consistent, "--format", "pdf"},
			func(err error) bool { var fe flagError; return errors.As(err, &fe) }, "flagError"},
		{"a flag error for an unparsable flag", []string{"compare", "--alpha", "x"},
			func(err error) bool { var fe flagError; return errors.As(err, &fe) }, "flagError"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var out, errb bytes.Buffer
			root := newRootCmd(&out, &errb)
			root.SetArgs(tt.args)
			root.SetOut(&out)
			root.SetErr(&errb)
			err := root.Execute()
			if !tt.check(err) {
				t.Errorf("Execute(%q) = %v, want %s", tt.args, err, tt.want)
			}
			if errors.Is(err, errFlagged) && out.Len() == 0 {
				t.Error("a flagged run wrote no report")
			}
		})
	}
}

func TestHelpDocumentsExitStatusAndCompletion(t *testing.T) {
	for _, args := range [][]string{{"--help"}, {"check", "--help"}} {
		stdout, _, code := runArgs(args...)
		if code != exitOK {
			t.Fatalf("run(%q) = %d", args, code)
		}
		for _, want := range []string{"Exit status", "0 when", "1 when", "2 for a usage error"} {
			if !strings.Contains(stdout, want) {
				t.Errorf("%q help lacks %q", args, want)
			}
		}
	}
	stdout, _, _ := runArgs("--help")
	if !strings.Contains(stdout, "coefaudit completion bash") {
		t.Error("root help does not mention shell completion")
	}
	stdout, _, _ = runArgs("check", "--help")
	if !strings.Contains(stdout, "indeterminate and incomplete do not fail") {
		t.Error("check help does not say what --fail-on leaves out by default")
	}
}

func TestCompletion(t *testing.T) {
	for _, shell := range []string{"bash", "zsh", "fish", "powershell"} {
		stdout, stderr, code := runArgs("completion", shell)
		if code != exitOK || !strings.Contains(stdout, "coefaudit") {
			t.Errorf("completion %s: code %d, %d bytes, stderr %q", shell, code, len(stdout), stderr)
		}
	}
	// Cobra's hidden __complete command is what the scripts call.
	tests := []struct {
		args []string
		want []string
	}{
		{[]string{"__complete", "check", "x.xlsx", "--format", ""}, []string{"xlsx", "html", "csv"}},
		{[]string{"__complete", "check", "x.xlsx", "--fail-on", ""}, []string{"unsupported", "indeterminate", "none"}},
		{[]string{"__complete", "compare", "--measure", ""}, []string{"rr", "beta"}},
		{[]string{"__complete", "comp"}, []string{"compare", "completion"}},
	}
	for _, tt := range tests {
		stdout, _, code := runArgs(tt.args...)
		for _, w := range tt.want {
			if code != exitOK || !strings.Contains(stdout, w+"\n") && !strings.Contains(stdout, w+"\t") {
				t.Errorf("run(%q) = %d, %q; want %q offered", tt.args, code, stdout, w)
			}
		}
	}
}

// TestCheckXLSXAndHTML writes both publishable formats through the command.
func TestCheckXLSXAndHTML(t *testing.T) {
	demo := savedDemo(t)
	dir := t.TempDir()
	xlsx, page := filepath.Join(dir, "audit.xlsx"), filepath.Join(dir, "audit.html")
	if _, stderr, code := runArgs("check", demo, "--format", "xlsx", "--out", xlsx); code != exitFlagged {
		t.Fatalf("check --format xlsx: code %d, stderr %q", code, stderr)
	}
	f, err := excelize.OpenFile(xlsx)
	if err != nil {
		t.Fatalf("the workbook does not open: %v", err)
	}
	defer f.Close()
	for _, sheet := range []string{"summary", "claims", "coefficients", "methods", "problems"} {
		if idx, err := f.GetSheetIndex(sheet); err != nil || idx < 0 {
			t.Errorf("the workbook lacks sheet %q", sheet)
		}
	}
	jsonOut, _, _ := runArgs("check", demo, "--format", "json")
	claims := strings.Count(jsonOut, `"outcome":`)
	rows, _ := f.GetRows("claims")
	if len(rows)-1 != claims {
		t.Errorf("claims sheet has %d claims, the JSON %d", len(rows)-1, claims)
	}
	if _, stderr, code := runArgs("check", demo, "--format", "html", "--out", page); code != exitFlagged {
		t.Fatalf("check --format html: code %d, stderr %q", code, stderr)
	}
	b, err := os.ReadFile(page)
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Count(string(b), `<tr data-outcome=`); got != claims {
		t.Errorf("the page has %d lines of claims, want %d", got, claims)
	}
	flaggedClaims := claims - strings.Count(jsonOut, `"outcome":"consistent"`)
	if got := strings.Count(string(b), `<section class="claim `); got != flaggedClaims {
		t.Errorf("the page has %d claim cards, want one per flagged claim (%d)", got, flaggedClaims)
	}
	stdout, _, code := runArgs("check", demo, "--format", "html")
	if code != exitFlagged || !strings.HasPrefix(stdout, "<!DOCTYPE html>") {
		t.Errorf("html to standard output: code %d, starts %.30q", code, stdout)
	}
}

// TestErrorEscapesControls: an error naming what was typed (a file name
// holding an escape sequence) reaches the terminal with its control
// characters shown escaped, as the reports show them.
func TestErrorEscapesControls(t *testing.T) {
	missing := filepath.Join(t.TempDir(), "\x1b]0;owned\x07\x1b[2J.xlsx")
	_, stderr, code := runArgs("check", missing)
	if code != exitError {
		t.Fatalf("check of a missing file: code %d", code)
	}
	if strings.ContainsAny(stderr, "\x1b\x07") || !strings.Contains(stderr, `\x1b]0;owned\a\x1b[2J.xlsx`) {
		t.Errorf("stderr = %q, want the file name with its control characters escaped", stderr)
	}
}
