package report

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"coefaudit/audit"
)

// TestWriteBootstrapTableEscapes: column names (typed as flags, matched in
// the data's header) reach the terminal with their control characters
// shown escaped, so that they neither drive it nor move the columns of
// the coefficients' table. The data are invented: y = x + z/2 + a small
// deterministic wobble.
func TestWriteBootstrapTableEscapes(t *testing.T) {
	names := []string{"y", "x\x1b[31m", "z\tq"}
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	w.Write(names)
	for i := range 40 {
		x, z := float64(i%7), float64(i%5)
		w.Write([]string{fmt.Sprint(x + z/2 + float64(i%3)/10), fmt.Sprint(x), fmt.Sprint(z)})
	}
	w.Flush()
	path := filepath.Join(t.TempDir(), "data.csv")
	if err := os.WriteFile(path, buf.Bytes(), 0o600); err != nil {
		t.Fatal(err)
	}
	o := audit.DefaultBootstrapOptions
	o.Data, o.Outcome, o.Predictors, o.Compare = path, names[0], names[1:], [2]string{names[1], names[2]}
	o.Resamples, o.Workers = 200, 1
	rep, err := Bootstrap(o)
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	if err := WriteBootstrapTable(&out, rep); err != nil {
		t.Fatal(err)
	}
	checkVisible(t, "WriteBootstrapTable()", out.String())
	for _, want := range []string{`x\x1b[31m`, `z\tq`} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("WriteBootstrapTable() lacks %q:\n%s", want, out.String())
		}
	}
}
