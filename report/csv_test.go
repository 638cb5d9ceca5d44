package report

import (
	"bytes"
	"encoding/csv"
	"slices"
	"strconv"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
)

// TestWriteCSVFormulaLikeText checks that no CSV cell would be evaluated by
// a spreadsheet: a cell starting with =, +, -, @, tab or carriage return
// is either a number (a negative difference) or text prefixed with an
// apostrophe, and every injection text of the input comes back with that
// prefix, otherwise unchanged.
func TestWriteCSVFormulaLikeText(t *testing.T) {
	in := reportInput()
	rep := audit.Audit(in, audit.DefaultOptions)
	records, err := csv.NewReader(bytes.NewReader(writeInput(t, "csv", in))).ReadAll()
	if err != nil {
		t.Fatalf("the CSV does not read back: %v", err)
	}
	if len(records) != len(rep.Claims)+1 {
		t.Fatalf("CSV has %d records, want a header and %d claims", len(records), len(rep.Claims))
	}
	header := records[0]
	if !slices.Contains(header, "reviewer") {
		t.Errorf("header %q lacks the pass-through column reviewer", header)
	}
	prefixed := map[string]int{}
	for r, rec := range records[1:] {
		for c, v := range rec {
			if v == "" {
				continue
			}
			if strings.ContainsRune("=+-@\t\r", rune(v[0])) {
				if _, err := strconv.ParseFloat(v, 64); err != nil {
					t.Errorf("record %d, column %s = %q: starts like a formula and is not a number", r+2, header[c], v)
				}
			}
			for _, text := range injectionTexts {
				if v == "'"+text {
					prefixed[text]++
				}
			}
		}
	}
	// Each claim carries its text in study, claim, first and the extra
	// column reviewer: four cells per text.
	for _, text := range injectionTexts {
		if prefixed[text] < 4 {
			t.Errorf("%q appears %d times with the apostrophe prefix, want 4 (study, claim, first, reviewer)", text, prefixed[text])
		}
	}
}

func TestSafeText(t *testing.T) {
	tests := []struct{ name, in, want string }{
		{"formula", "=1+1", "'=1+1"},
		{"plus", "+1", "'+1"},
		{"minus", "-1", "'-1"},
		{"at", "@x", "'@x"},
		{"tab", "\tx", "'\tx"},
		{"carriage return", "\rx", "'\rx"},
		{"plain", "Lee 2019", "Lee 2019"},
		{"inner sign", "a=b", "a=b"},
		{"empty", "", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := safeText(tt.in); got != tt.want {
				t.Errorf("safeText(%q) = %q, want %q", tt.in, got, tt.want)
			}
		})
	}
}

// TestWriteCSVGuardsColumnNames checks the pass-through columns' names: a
// name a spreadsheet would evaluate is prefixed like a cell, and a name the
// report's own columns use is not written twice.
func TestWriteCSVGuardsColumnNames(t *testing.T) {
	in := reportInput()
	for i := range in.Claims {
		in.Claims[i].Extra = extract.Extra{Names: []string{"=cmd()", "notes", "reviewer"}, Values: []string{"x", "y", "z"}}
	}
	records, err := csv.NewReader(bytes.NewReader(writeInput(t, "csv", in))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	header := records[0]
	if !slices.Contains(header, "'=cmd()") || slices.Contains(header, "=cmd()") {
		t.Errorf("header %q: want the name =cmd() written '=cmd()", header)
	}
	if n := strings.Count(strings.Join(header, ","), "notes"); n != 1 {
		t.Errorf("header %q names notes %d times, want once", header, n)
	}
	if got := records[1][len(header)-1]; got != "z" {
		t.Errorf("the last pass-through cell = %q, want z", got)
	}
	// Every trigger of the OWASP list, as a column's name.
	in = reportInput()
	for i := range in.Claims {
		in.Claims[i].Extra = extract.Extra{Names: injectionTexts, Values: injectionTexts}
	}
	records, err = csv.NewReader(bytes.NewReader(writeInput(t, "csv", in))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range injectionTexts {
		if !slices.Contains(records[0], "'"+name) || slices.Contains(records[0], name) {
			t.Errorf("header %q: want the name %q written with an apostrophe before it", records[0], name)
		}
	}
}

// TestIssue20CSVFullPrecision: the CSV used to round every number to ten
// significant digits; like the JSON it now keeps full precision, each
// number reading back as the same float64.
func TestIssue20CSVFullPrecision(t *testing.T) {
	for _, x := range []float64{0.06362461862197612, 1e-300, -0.2726093727483928, 5.396508455906384e-11, 1.0 / 3} {
		got := csvNumber(audit.Number(x))
		back, err := strconv.ParseFloat(got, 64)
		if err != nil || back != x {
			t.Errorf("csvNumber(%v) = %q, which reads back as %v (%v)", x, got, back, err)
		}
	}
}
