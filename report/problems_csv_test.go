package report

import (
	"bytes"
	"encoding/json"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// TestIssue20CSVProblemsNameTheFile: the problems of a CSV folder and of a
// paired CSV used to carry an empty sheet, so neither the JSON nor the
// text said which file a bad row was in. Each problem of a row now names
// its file: the JSON's sheet is the file's name and the Markdown says
// `file "claims.csv", row 8`.
func TestIssue20CSVProblemsNameTheFile(t *testing.T) {
	for _, tt := range []struct {
		input string
		files []string // the file names a row's problem may carry
		want  string   // a problem the Markdown must show
	}{
		{"folder", []string{"coefficients.csv", "claims.csv", "correlations.csv", "table 1.csv"}, `file "coefficients.csv", row 8, column "estimate"`},
		{"paired.csv", []string{"paired.csv"}, `file "paired.csv", row 5, column "published"`},
	} {
		t.Run(tt.input, func(t *testing.T) {
			path := filepath.Join("..", "extract", "testdata", tt.input)
			var js bytes.Buffer
			if _, err := Check(path, &js, "json", Options{}); err != nil {
				t.Fatal(err)
			}
			var rep struct {
				Problems []struct {
					Sheet string `json:"sheet"`
					Row   int    `json:"row"`
				} `json:"problems"`
			}
			if err := json.Unmarshal(js.Bytes(), &rep); err != nil {
				t.Fatal(err)
			}
			if len(rep.Problems) == 0 {
				t.Fatalf("Check(%s) has no problems; the fixture has bad rows", path)
			}
			for _, p := range rep.Problems {
				if !slices.Contains(tt.files, p.Sheet) {
					t.Errorf("problem at row %d has sheet %q, want one of %v", p.Row, p.Sheet, tt.files)
				}
			}
			var md bytes.Buffer
			if _, err := Check(path, &md, "md", Options{}); err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(md.String(), tt.want) {
				t.Errorf("Markdown of %s lacks %s", path, tt.want)
			}
		})
	}
}
