package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/extract"
	"coefaudit/fixtures"
)

// demoArticleFolder writes the demo articles into a folder of the test.
func demoArticleFolder(t *testing.T) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "articles")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	if _, err := fixtures.DemoArticles(dir); err != nil {
		t.Fatal(err)
	}
	return dir
}

// TestImportCommand imports the demo articles into a workbook, a CSV
// folder and JSON: the workbook and the folder are read by check's own
// reader with the same rows, and JSON lists every article.
func TestImportCommand(t *testing.T) {
	dir := demoArticleFolder(t)
	out := t.TempDir()
	book, folder := filepath.Join(out, "review.xlsx"), filepath.Join(out, "review")
	for _, args := range [][]string{{"import", dir, "--out", book}, {"import", dir, "--out", folder}} {
		if _, stderr, code := runCLI(t, args...); code != exitOK {
			t.Fatalf("%v: exit %d: %s", args, code, stderr)
		}
	}
	a, err := extract.Read(book)
	if err != nil {
		t.Fatal(err)
	}
	b, err := extract.Read(folder)
	if err != nil {
		t.Fatal(err)
	}
	if len(a.Coefficients) == 0 || len(a.Coefficients) != len(b.Coefficients) || len(a.Claims) != len(b.Claims) || len(a.Tables) != 1 {
		t.Errorf("workbook: %d coefficients, %d claims, %d tables; folder: %d, %d", len(a.Coefficients), len(a.Claims), len(a.Tables),
			len(b.Coefficients), len(b.Claims))
	}
	if _, err := os.Stat(filepath.Join(folder, "to confirm.csv")); err != nil {
		t.Errorf("no to confirm sheet in the folder: %v", err)
	}
	stdout, stderr, code := runCLI(t, "import", dir, "--format", "json")
	if code != exitOK {
		t.Fatalf("json: exit %d: %s", code, stderr)
	}
	var doc struct {
		Articles []struct{ Format string } `json:"articles"`
	}
	if err := json.Unmarshal([]byte(stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Articles) != 4 {
		t.Errorf("%d articles in the JSON, want 4", len(doc.Articles))
	}
}

// TestImportCommandErrors: no --out is a usage error; a file that is not
// an article is named on standard error, and with nothing readable the
// exit status is 2 and nothing is written.
func TestImportCommandErrors(t *testing.T) {
	dir := t.TempDir()
	pdf := filepath.Join(dir, "scan.pdf")
	if err := os.WriteFile(pdf, []byte("%PDF-1.4"), 0o600); err != nil {
		t.Fatal(err)
	}
	if _, stderr, code := runCLI(t, "import", pdf); code != exitError || !strings.Contains(stderr, "--out") {
		t.Errorf("without --out: exit %d, %q", code, stderr)
	}
	out := filepath.Join(dir, "review.xlsx")
	_, stderr, code := runCLI(t, "import", pdf, "--out", out)
	if code != exitError || !strings.Contains(stderr, pdf) || !strings.Contains(stderr, "no file could be read") {
		t.Errorf("a PDF alone: exit %d, %q", code, stderr)
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("a workbook was written though no article was read")
	}
}

// TestCheckArticles checks a folder of articles in one step and the demo
// articles: the report carries the caution that the numbers were read
// automatically, and every claim its "read" column.
func TestCheckArticles(t *testing.T) {
	dir := demoArticleFolder(t)
	stdout, stderr, code := runCLI(t, "check", dir, "--format", "csv", "--fail-on", "none")
	if code != exitOK {
		t.Fatalf("check %s: exit %d: %s", dir, code, stderr)
	}
	lines := strings.Split(strings.TrimSpace(stdout), "\n")
	if len(lines) < 3 || !strings.HasSuffix(lines[0], ",read") || !strings.HasSuffix(lines[1], ",automatically") {
		t.Errorf("the CSV report does not mark the claims read automatically:\n%s", stdout)
	}
	stdout, stderr, code = runCLI(t, "demo", "--article")
	if code == exitError {
		t.Fatalf("demo --article: %s", stderr)
	}
	if !strings.Contains(stdout, "read automatically") || !strings.Contains(stdout, "the demo articles") {
		t.Errorf("demo --article lacks the caution:\n%s", stdout)
	}
}

// TestImportFailureLeavesNothing: an import that fails leaves nothing it
// created, neither the CSV folder it made nor a workbook, whether no
// article was read or the writing failed (the run's files aborted before
// the sheets were written, as an interrupt does); a folder that existed
// before the run stays, without the run's files.
func TestImportFailureLeavesNothing(t *testing.T) {
	articles := demoArticleFolder(t)
	pdf := filepath.Join(t.TempDir(), "scan.pdf")
	if err := os.WriteFile(pdf, []byte("%PDF-1.4"), 0o600); err != nil {
		t.Fatal(err)
	}
	existing := filepath.Join(t.TempDir(), "kept")
	if err := os.Mkdir(existing, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name, input, out string
		aborted          bool
	}{
		{"nothing read, new folder", pdf, "review", false},
		{"nothing read, workbook", pdf, "review.xlsx", false},
		{"writing fails, new folder", articles, "review", true},
		{"writing fails, workbook", articles, "review.xlsx", true},
		{"writing fails, existing folder", articles, existing, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			out := tc.out
			if !filepath.IsAbs(out) {
				out = filepath.Join(dir, out)
			}
			files := output.NewFiles()
			if tc.aborted {
				files.Abort()
			}
			var stderr bytes.Buffer
			o := &importOptions{inputs: []string{tc.input}, out: out, stdout: &bytes.Buffer{}, stderr: &stderr, files: files}
			if err := runImport(o); err == nil {
				t.Fatal("the import did not fail")
			}
			if out == existing {
				if left := dirNames(t, existing); len(left) != 0 {
					t.Errorf("the existing folder holds %v after the failed run", left)
				}
				return
			}
			if left := dirNames(t, dir); len(left) != 0 {
				t.Errorf("the failed run left %v", left)
			}
		})
	}
}

// TestCheckArticlesNamesTheFile: a problem of a folder of articles names
// the article it is in, since the row alone does not say which. Each
// sentence prints a p that its own estimate and SE contradict (0.41/0.12
// gives z = 3.4, p < .001).
func TestCheckArticlesNamesTheFile(t *testing.T) {
	dir := t.TempDir()
	for name, text := range map[string]string{
		"alpha.txt": "Results\n\nSleep predicted mood, b = 0.41, SE = 0.12, p = .600.\n",
		"beta.txt":  "Results\n\nExercise predicted mood, b = 0.35, SE = 0.13, p = .900.\n",
	} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	stdout, stderr, code := runCLI(t, "check", dir, "--format", "md", "--fail-on", "none")
	if code != exitOK {
		t.Fatalf("check %s: exit %d: %s", dir, code, stderr)
	}
	for _, want := range []string{`- alpha.txt, sheet "coefficients", row 2, column "p": coefficient Sleep`, `- beta.txt, sheet "coefficients", row 2, column "p": coefficient Exercise`} {
		if !strings.Contains(stdout, want) {
			t.Errorf("the problems do not name the article: want a line starting %q in\n%s", want, stdout)
		}
	}
}
