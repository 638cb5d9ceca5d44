package report

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"coefaudit/pool"

	"github.com/xuri/excelize/v2"
)

// updateGolden rewrites the golden files instead of comparing with them:
//
//	go test ./report -run Golden -update
var updateGolden = flag.Bool("update", false, "rewrite the golden files in testdata")

// fontData is the base64 text of a font in a data URL.
var fontData = regexp.MustCompile(`base64,[A-Za-z0-9+/=]{1000,}`)

// poolDemoDocument pools the bundled demo workbook as `coefaudit pool
// demo-review.xlsx --out pool.md` does, with its forest plot beside the
// report.
func poolDemoDocument(t testing.TB, opts pool.Options) PoolDocument {
	t.Helper()
	rep, err := PoolInput("../fixtures/demo-review.xlsx", Options{}, opts)
	if err != nil {
		t.Fatal(err)
	}
	rep.Source = "demo-review.xlsx"
	doc := PoolDocument{Report: rep, Figures: map[int][]string{}}
	files, _ := PoolPlotFiles(rep, PoolPlotOptions{Out: "pool.md"})
	for _, f := range files {
		rep.Plots = append(rep.Plots, f.Path)
		if f.Format == PlotSVG {
			doc.Figures[f.Topic] = append(doc.Figures[f.Topic], f.Path)
		}
	}
	return doc
}

// xlsxCells lists a workbook's cells as each sheet shows them (with their
// number formats), one row a line, cells separated by tabs.
func xlsxCells(t testing.TB, b []byte) []byte {
	t.Helper()
	f, err := excelize.OpenReader(bytes.NewReader(b))
	if err != nil {
		t.Fatalf("the xlsx report does not open: %v", err)
	}
	defer f.Close()
	var out bytes.Buffer
	for _, name := range f.GetSheetList() {
		rows, err := f.GetRows(name)
		if err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(&out, "== sheet %s\n", name)
		for _, r := range rows {
			fmt.Fprintln(&out, strings.Join(r, "\t"))
		}
	}
	return out.Bytes()
}

// TestIssue20PoolGolden compares the pooling report of the demo workbook in
// every format with testdata/pool-demo.<format>.golden, so that a change
// of wording or of a number shows in review (the xlsx as the cells it
// shows). On a mismatch the output is written into the test's temporary
// folder and its path logged.
func TestIssue20PoolGolden(t *testing.T) {
	doc := poolDemoDocument(t, pool.DefaultOptions)
	writers := map[string]func(io.Writer, PoolDocument) error{
		"table": WritePoolTable, "json": WritePoolJSON, "csv": WritePoolCSV, "md": WritePoolMarkdown,
		"html": WritePoolHTML, "xlsx": WritePoolXLSX,
	}
	for _, format := range PoolFormats() {
		t.Run(format, func(t *testing.T) {
			var buf bytes.Buffer
			if err := writers[format](&buf, doc); err != nil {
				t.Fatal(err)
			}
			got := buf.Bytes()
			switch format {
			case "xlsx":
				got = xlsxCells(t, got)
			case "html":
				// The page's fonts come from a library, not from us: their
				// data would be a megabyte of noise in the golden file.
				got = fontData.ReplaceAll(got, []byte("base64,…"))
			}
			path := filepath.Join("testdata", "pool-demo."+format+".golden")
			if *updateGolden {
				if err := os.WriteFile(path, got, 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (write it with go test ./report -run Golden -update)", err)
			}
			if !bytes.Equal(got, want) {
				gotPath := filepath.Join(t.TempDir(), "pool-demo."+format)
				if err := os.WriteFile(gotPath, got, 0o644); err != nil {
					t.Fatal(err)
				}
				t.Errorf("pool %s report differs from %s; the output is in %s (diff them; -update accepts it)", format, path, gotPath)
			}
		})
	}
}
