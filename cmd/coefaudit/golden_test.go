package main

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"coefaudit/fixtures"

	"github.com/xuri/excelize/v2"
)

// update rewrites the golden files from the current output:
//
//	go test ./cmd/coefaudit -run Golden -update
var update = flag.Bool("update", false, "rewrite testdata/*.golden from the current output")

// golden compares got with testdata/name.golden, or rewrites the file
// under -update. A mismatch names the first line that differs, so that a
// change of wording is seen in review.
func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", name+".golden")
	if *update {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./cmd/coefaudit -run Golden -update to write it)", err)
	}
	if bytes.Equal(got, want) {
		return
	}
	gl, wl := strings.Split(string(got), "\n"), strings.Split(string(want), "\n")
	for i := 0; i < max(len(gl), len(wl)); i++ {
		var g, w string
		if i < len(gl) {
			g = gl[i]
		}
		if i < len(wl) {
			w = wl[i]
		}
		if g != w {
			t.Fatalf("%s differs from the output at line %d:\ngot  %q\nwant %q\n(if the change is meant, run go test ./cmd/coefaudit -run Golden -update and review the diff)", path, i+1, g, w)
		}
	}
}

// demoInFolder writes the demo workbook into a fresh temporary folder and
// makes it the working directory, so that the reports name the input as
// "demo-review.xlsx" whatever the folder.
func demoInFolder(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, fixtures.DemoName), fixtures.DemoWorkbook, 0o600); err != nil {
		t.Fatal(err)
	}
	t.Chdir(dir)
	return dir
}

// TestGoldenCheck: "coefaudit check" of the demo workbook in every format.
// The text formats are compared as written; the xlsx workbook as a text
// dump of every sheet's cells and comments (dumpWorkbook), since the file
// itself is a zip archive.
func TestGoldenCheck(t *testing.T) {
	wd, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	outputs := map[string][]byte{}
	t.Run("run", func(t *testing.T) {
		dir := demoInFolder(t)
		for _, format := range []string{"table", "json", "csv", "md", "html", "xlsx"} {
			out := filepath.Join(dir, "audit."+format)
			stdout, stderr, code := runArgs("check", fixtures.DemoName, "--format", format, "--out", out)
			if code != exitFlagged {
				t.Fatalf("check --format %s = %d, want %d (the demo flags claims on purpose); stderr %q", format, code, exitFlagged, stderr)
			}
			if stdout != "" {
				t.Errorf("check --format %s --out wrote %q to standard output", format, stdout)
			}
			if format == "xlsx" {
				outputs[format] = dumpWorkbook(t, out)
				continue
			}
			b, err := os.ReadFile(out)
			if err != nil {
				t.Fatal(err)
			}
			outputs[format] = b
		}
	})
	t.Chdir(wd)
	for _, format := range []string{"table", "json", "csv", "md", "html", "xlsx"} {
		t.Run(format, func(t *testing.T) {
			if outputs[format] == nil {
				t.Skip("not written")
			}
			golden(t, "check."+format, outputs[format])
		})
	}
}

// TestGoldenCompare: "coefaudit compare" in each of its formats, for the
// two ratios of Altman DG, Bland JM (2003), BMJ 326:219 (RR 0.67, 0.46 to
// 0.98, against 0.88, 0.71 to 1.08; the second interval from memory) and
// for two coefficients of one model with a printed sampling correlation.
func TestGoldenCompare(t *testing.T) {
	cases := []struct {
		name string
		args []string
	}{
		{"ratios", []string{"--first", "0.67 (0.46 to 0.98)", "--second", "0.88 (0.71 to 1.08)", "--independent",
			"--measure", "rr", "--published", "no-difference"}},
		{"same-model", []string{"--first", "0.41, SE 0.05", "--second", "0.18, SE 0.06", "--same-model", "--corr", "0.35", "--df", "120"}},
	}
	for _, c := range cases {
		for _, format := range []string{"text", "json"} {
			t.Run(c.name+"."+format, func(t *testing.T) {
				stdout, stderr, code := runArgs(append([]string{"compare", "--format", format}, c.args...)...)
				if code != exitOK && code != exitFlagged {
					t.Fatalf("compare = %d; stderr %q", code, stderr)
				}
				golden(t, fmt.Sprintf("compare.%s.%s", c.name, format), []byte(stdout))
			})
		}
	}
}

// dumpWorkbook writes every sheet of an xlsx file as text: one line per
// non-empty cell, "sheet!A1 = value" with the value as displayed, and the
// cell's comment, if any, on a line of its own.
func dumpWorkbook(t *testing.T, path string) []byte {
	t.Helper()
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var b bytes.Buffer
	for _, sheet := range f.GetSheetList() {
		fmt.Fprintf(&b, "== sheet %q\n", sheet)
		rows, err := f.GetRows(sheet)
		if err != nil {
			t.Fatal(err)
		}
		for r, row := range rows {
			for c, v := range row {
				if v == "" {
					continue
				}
				cell, _ := excelize.CoordinatesToCellName(c+1, r+1)
				fmt.Fprintf(&b, "%s = %q\n", cell, v)
			}
		}
		comments, err := f.GetComments(sheet)
		if err != nil {
			t.Fatal(err)
		}
		for _, cm := range comments {
			text := cm.Text
			for _, p := range cm.Paragraph {
				text += p.Text
			}
			fmt.Fprintf(&b, "comment %s: %q\n", cm.Cell, text)
		}
	}
	return b.Bytes()
}
