package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"coefaudit/extract"
	"coefaudit/fixtures"
)

// runCLI runs the command line in-process and returns what it printed.
func runCLI(t *testing.T, args ...string) (stdout, stderr string, code exitCode) {
	t.Helper()
	var out, errb bytes.Buffer
	code = run(args, &out, &errb)
	return out.String(), errb.String(), code
}

// TestDemoJSONContract checks `coefaudit demo --format json` against the
// output contract of DESIGN.md: the top-level keys, every claim's keys, one
// entry per claims row in input order, and the outcome vocabulary.
func TestDemoJSONContract(t *testing.T) {
	stdout, stderr, code := runCLI(t, "demo", "--format", "json")
	if code == exitError {
		t.Fatalf("demo --format json failed: %s", stderr)
	}
	var doc map[string]json.RawMessage
	if err := json.Unmarshal([]byte(stdout), &doc); err != nil {
		t.Fatalf("output is not JSON: %v", err)
	}
	for _, k := range []string{"alpha", "summary", "claims", "problems"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("top-level key %q missing", k)
		}
	}
	var claims []map[string]json.RawMessage
	if err := json.Unmarshal(doc["claims"], &claims); err != nil {
		t.Fatal(err)
	}
	want := []string{"study", "claim", "row", "first", "second", "relation", "method", "difference",
		"difference_se", "difference_ci", "statistic", "df", "p", "p_range", "published", "recomputed",
		"outcome", "notes", "overlap"}
	outcomes := []string{"consistent", "unsupported", "missed", "reversed", "indeterminate", "conflict", "incomplete"}
	seen := map[string]bool{}
	prevRow := 1
	for i, c := range claims {
		for _, k := range want {
			if _, ok := c[k]; !ok {
				t.Errorf("claim %d lacks key %q", i, k)
			}
		}
		var row int
		var outcome string
		json.Unmarshal(c["row"], &row)
		json.Unmarshal(c["outcome"], &outcome)
		if row <= prevRow {
			t.Errorf("claim %d has row %d after row %d: not in input order", i, row, prevRow)
		}
		prevRow = row
		if !slices.Contains(outcomes, outcome) {
			t.Errorf("claim %d outcome %q is not in the contract", i, outcome)
		}
		seen[outcome] = true
		var side map[string]json.RawMessage
		json.Unmarshal(c["first"], &side)
		for _, k := range []string{"label", "estimate", "se", "se_from"} {
			if _, ok := side[k]; !ok {
				t.Errorf("claim %d first lacks %q", i, k)
			}
		}
	}
	for _, o := range outcomes {
		if !seen[o] {
			t.Errorf("the demo shows no claim with outcome %q", o)
		}
	}
	// Every claims row of the workbook appears exactly once.
	path, cleanup, err := fixtures.DemoFile()
	if err != nil {
		t.Fatal(err)
	}
	defer cleanup()
	in, err := extract.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(claims) != len(in.Claims) {
		t.Errorf("%d claims in the JSON, %d claims rows in the workbook", len(claims), len(in.Claims))
	}
	var summary map[string]int
	json.Unmarshal(doc["summary"], &summary)
	if summary["claims"] != len(claims) {
		t.Errorf("summary claims = %d, want %d", summary["claims"], len(claims))
	}
}

// TestDemoMethodsPerDesign checks that every design of the demo gets its
// method: independent samples, a model rebuilt from the table (b and beta),
// overlapping and non-overlapping dependent correlations, a printed
// estimate_corr, and the admissible range when nothing gives the covariance.
func TestDemoMethodsPerDesign(t *testing.T) {
	stdout, _, _ := runCLI(t, "demo", "--format", "json")
	var doc struct {
		Claims []struct {
			Claim, Method, Relation, Outcome string
			Alternatives                     []struct{ Method string }
		}
	}
	if err := json.Unmarshal([]byte(stdout), &doc); err != nil {
		t.Fatal(err)
	}
	byClaim := map[string]string{}
	alts := map[string]int{}
	for _, c := range doc.Claims {
		byClaim[c.Claim] = c.Method + "/" + c.Relation + "/" + c.Outcome
		alts[c.Claim] = len(c.Alternatives)
	}
	want := map[string]string{
		"A1": "independent-z/independent/consistent",
		"F1": "t-from-correlation-table/same-model/consistent",
		"F5": "z-delta-from-correlation-table/same-model/unsupported",
		"F6": "williams-t/same-model/unsupported",
		"F7": "zpf/same-model/consistent",
		"G1": "admissible-range/same-model/indeterminate",
		"G2": "t-with-estimate-corr/same-model/consistent",
	}
	for claim, w := range want {
		if byClaim[claim] != w {
			t.Errorf("claim %s: %s, want %s", claim, byClaim[claim], w)
		}
	}
	if alts["F6"] < 2 || alts["F7"] < 2 {
		t.Errorf("dependent correlation claims list %d and %d alternatives, want the other published methods", alts["F6"], alts["F7"])
	}
}

func TestCheckFormatsAndOut(t *testing.T) {
	dir := t.TempDir()
	wb := filepath.Join(dir, "demo.xlsx")
	if _, _, code := runCLI(t, "demo", "--save", wb); code != exitOK {
		t.Fatal("demo --save failed")
	}
	before, _ := os.ReadFile(wb)
	stdout, stderr, code := runCLI(t, "check", wb)
	if code == exitError || !strings.Contains(stdout, "claims audited") || !strings.Contains(stdout, "Cautions") {
		t.Fatalf("check printed %q (stderr %q)", stdout, stderr)
	}
	out := filepath.Join(dir, "audit.csv")
	if _, stderr, code := runCLI(t, "check", wb, "--format", "csv", "--out", out); code == exitError {
		t.Fatalf("check --format csv --out: %s", stderr)
	}
	csvText, err := os.ReadFile(out)
	if err != nil || !strings.HasPrefix(string(csvText), "row,study,claim") {
		t.Fatalf("CSV output %q, %v", csvText, err)
	}
	md, _, code := runCLI(t, "check", wb, "--format", "md", "--fail-on", "none")
	if code != exitOK || !strings.Contains(md, "# Audit of published comparisons") || !strings.Contains(md, "## Cautions") {
		t.Errorf("check --format md: code %d, output %.200q", code, md)
	}
	// The report may not overwrite its input, and the input is never changed.
	if _, stderr, code := runCLI(t, "check", wb, "--out", wb); code != exitError || !strings.Contains(stderr, "input") {
		t.Errorf("--out equal to the input: code %d, stderr %q", code, stderr)
	}
	after, _ := os.ReadFile(wb)
	if !bytes.Equal(before, after) {
		t.Error("the input workbook changed")
	}
	if _, stderr, code := runCLI(t, "check", wb, "--format", "yaml"); code != exitError || !strings.Contains(stderr, "--format") {
		t.Errorf("bad --format: code %d, stderr %q", code, stderr)
	}
	if _, stderr, code := runCLI(t, "check", filepath.Join(dir, "missing.xlsx")); code != exitError || stderr == "" {
		t.Errorf("missing input: code %d, stderr %q", code, stderr)
	}
}

func TestTemplateCommand(t *testing.T) {
	path := filepath.Join(t.TempDir(), "blank.xlsx")
	if _, stderr, code := runCLI(t, "template", path); code != exitOK {
		t.Fatalf("template: %s", stderr)
	}
	in, err := extract.Read(path)
	if err != nil {
		t.Fatalf("the template does not read back: %v", err)
	}
	if len(in.Claims) != 0 || len(in.Coefficients) != 0 {
		t.Errorf("the template holds %d claims and %d coefficients, want none", len(in.Claims), len(in.Coefficients))
	}
	if _, stderr, code := runCLI(t, "template", path); code != exitError || !strings.Contains(stderr, "exists") {
		t.Errorf("template over an existing file: code %d, stderr %q", code, stderr)
	}
}

// TestReadmeCommands keeps the README's two newcomer commands true.
func TestReadmeCommands(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	for _, cmd := range []string{"go run ./cmd/coefaudit demo", "go test ./..."} {
		if !strings.Contains(string(readme), cmd) {
			t.Errorf("README lacks %q", cmd)
		}
	}
	if _, _, code := runCLI(t, "demo"); code == exitError {
		t.Error("the README's demo command fails")
	}
	for _, cmd := range []string{"check", "demo", "template", "bootstrap", "pool", "compare", "version"} {
		out, _, code := runCLI(t, cmd, "--help")
		if code != exitOK || !strings.Contains(out, "Examples:") {
			t.Errorf("%s --help shows no examples", cmd)
		}
	}
}
