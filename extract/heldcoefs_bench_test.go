package extract

import (
	"encoding/csv"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"testing"
)

// BenchmarkOpenWorkbook100k opens the workbook of BenchmarkReadWorkbook100k
// (100,000 claims, 200,000 coefficients; written when missing) as check
// does and reads its studies. held-MB is the live heap once the first
// study is yielded: the coefficients sheet held (heldCoefficients) and the
// claims counted. With -large-folder DIR it also writes the workbook
// again as a folder of CSV files, when DIR is missing, and opens that.
func BenchmarkOpenWorkbook100k(b *testing.B) {
	path := largeWorkbook(b)
	inputs := []string{path}
	if dir := *largeFolderPath; dir != "" {
		if _, err := os.Stat(dir); err != nil {
			writeWorkbookAsFolder(b, path, dir)
		}
		inputs = append(inputs, dir)
	}
	for _, in := range inputs {
		b.Run(filepath.Base(in), func(b *testing.B) {
			for b.Loop() {
				src, err := Open(in)
				if err != nil {
					b.Fatal(err)
				}
				claims := 0
				for st, err := range src.Studies() {
					if err != nil {
						b.Fatal(err)
					}
					if claims == 0 {
						var ms runtime.MemStats
						runtime.GC()
						runtime.ReadMemStats(&ms)
						b.ReportMetric(float64(ms.HeapAlloc)/(1<<20), "held-MB")
					}
					claims += len(st.Claims)
				}
				src.Close()
				if claims != *largeWorkbookClaims {
					b.Fatalf("%d claims, want %d", claims, *largeWorkbookClaims)
				}
			}
		})
	}
}

// writeWorkbookAsFolder writes the coefficients and claims sheets of a
// workbook as coefficients.csv and claims.csv in dir, each cell as the
// spreadsheet shows it.
func writeWorkbookAsFolder(tb testing.TB, path, dir string) {
	tb.Helper()
	s, err := workbookSheets(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer s.close()
	if err := os.MkdirAll(dir, 0o755); err != nil {
		tb.Fatal(err)
	}
	for _, k := range s.kinds {
		src, err := s.open(k.name)
		if err != nil {
			tb.Fatal(err)
		}
		f, err := os.Create(filepath.Join(dir, k.kind+".csv"))
		if err != nil {
			tb.Fatal(err)
		}
		w := csv.NewWriter(f)
		var row sheetRow
		var rec []string
		for {
			err := src.Next(&row)
			if err == io.EOF {
				break
			}
			if err != nil {
				tb.Fatal(err)
			}
			rec = rec[:0]
			for _, c := range row.Cells {
				rec = append(rec, c.shown())
			}
			w.Write(rec)
		}
		w.Flush()
		if err := w.Error(); err != nil {
			tb.Fatal(err)
		}
		if err := f.Close(); err != nil {
			tb.Fatal(err)
		}
		src.Close()
	}
}
