package audit

import (
	"archive/zip"
	"bytes"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"coefaudit/extract"

	"github.com/xuri/excelize/v2"
)

// injectionTexts are text cells a spreadsheet would evaluate if they were
// written as they are: a formula, a sign, an at-sign, a leading tab or
// carriage return (the OWASP list of CSV-injection triggers).
var injectionTexts = []string{
	`=HYPERLINK("http://example.invalid","open me")`,
	"+SUM(1,2)",
	"-2+3",
	"@SUM(A1:A2)",
	"\t=1+1",
	"\r=1+1",
}

// tenThousandClaims is the audit of reportInput repeated to 10,000 claims,
// numbered as rows of one sheet: the report the writers' benchmarks time.
func tenThousandClaims() *Report {
	base := Audit(reportInput(), DefaultOptions)
	rep := &Report{Alpha: base.Alpha, Cautions: Cautions}
	for len(rep.Claims) < 10000 {
		for _, c := range base.Claims {
			c.Row = len(rep.Claims) + 2
			rep.Claims = append(rep.Claims, c)
		}
	}
	rep.Summary = Summary{}
	rep.Summary.Add(rep.Claims)
	return rep
}

// reportInput is an invented input: one study per injection text, each with
// two independent coefficients and one claim whose study, claim id, first
// label and extra column carry the text. The second estimates vary so
// that several outcomes occur.
func reportInput() *extract.Input {
	in := &extract.Input{Source: "invented.xlsx"}
	seconds := []string{"0.18", "0.40", "0.05", "0.60", "0.30", "0.25"}
	published := []string{extract.PublishedDiffer, extract.PublishedDiffer, extract.PublishedNoDifference,
		extract.PublishedFirstLarger, extract.PublishedDiffer, extract.PublishedSecondLarger}
	for k, text := range injectionTexts {
		row := 2 + 2*k
		se := 0.06
		for i, est := range []string{"0.41", seconds[k]} {
			label := []string{text, "second"}[i]
			in.Coefficients = append(in.Coefficients, extract.Coefficient{
				Position: extract.Position{Sheet: "coefficients", Row: row + i},
				Study:    text, Label: label, Measure: extract.MeasureB, Group: []string{"women", "men"}[i], Model: "m",
				Estimate: printed(est), SE: printed(strconv.FormatFloat(se, 'f', 2, 64)), CILevel: 95,
				Extra: extract.Extra{Names: []string{"comment"}, Values: []string{text}},
			})
		}
		in.Claims = append(in.Claims, extract.Claim{Position: extract.Position{Sheet: "claims", Row: k + 2},
			Study: text, Claim: text, First: text, Second: "second", Published: published[k],
			Basis: extract.BasisTest, Alpha: 0.05, Topic: "t",
			Extra: extract.Extra{Names: []string{"reviewer"}, Values: []string{text}}})
	}
	return in
}

func writeXLSXForTest(t *testing.T, rep *Report, in *extract.Input) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := WriteXLSX(&buf, rep, in); err != nil {
		t.Fatalf("WriteXLSX: %v", err)
	}
	return buf.Bytes()
}

func openXLSX(t *testing.T, b []byte) *excelize.File {
	t.Helper()
	f, err := excelize.OpenReader(bytes.NewReader(b))
	if err != nil {
		t.Fatalf("the workbook does not reopen: %v", err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

// columnIndex finds a header in the first row.
func columnIndex(t *testing.T, rows [][]string, name string) int {
	t.Helper()
	if len(rows) == 0 {
		t.Fatal("sheet has no header row")
	}
	i := slices.Index(rows[0], name)
	if i < 0 {
		t.Fatalf("header %v lacks %q", rows[0], name)
	}
	return i
}

func TestWriteXLSXClaimsAndOutcomeFills(t *testing.T) {
	in := reportInput()
	rep := Audit(in, DefaultOptions)
	f := openXLSX(t, writeXLSXForTest(t, rep, in))
	if got, want := f.GetSheetList(), []string{"summary", "claims", "coefficients", "methods"}; !slices.Equal(got, want) {
		t.Errorf("sheets = %v, want %v", got, want)
	}
	rows, err := f.GetRows("claims", excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(rep.Claims)+1 {
		t.Fatalf("claims sheet has %d rows, want a header and %d claims", len(rows), len(rep.Claims))
	}
	oc, sc, cc, pc := columnIndex(t, rows, "outcome"), columnIndex(t, rows, "study"), columnIndex(t, rows, "claim"), columnIndex(t, rows, "p")
	outcomes := map[string]bool{}
	for i, c := range rep.Claims {
		row := rows[i+1]
		if row[sc] != c.Study || row[cc] != c.Claim {
			t.Errorf("claims row %d = (%q, %q), want (%q, %q)", i+2, row[sc], row[cc], c.Study, c.Claim)
		}
		if row[oc] != c.Outcome {
			t.Errorf("claims row %d outcome = %q, want %q", i+2, row[oc], c.Outcome)
		}
		outcomes[c.Outcome] = true
		cell, _ := excelize.CoordinatesToCellName(oc+1, i+2)
		id, err := f.GetCellStyle("claims", cell)
		if err != nil {
			t.Fatal(err)
		}
		st, err := f.GetStyle(id)
		if err != nil {
			t.Fatal(err)
		}
		if st.Fill.Pattern != 1 || len(st.Fill.Color) == 0 ||
			!strings.EqualFold(strings.TrimPrefix(st.Fill.Color[0], "#"), strings.TrimPrefix(fillOf(c.Outcome), "#")) {
			t.Errorf("outcome cell %s fill = %+v, want solid %s", cell, st.Fill, fillOf(c.Outcome))
		}
		if c.P.Known() {
			pcell, _ := excelize.CoordinatesToCellName(pc+1, i+2)
			id, _ := f.GetCellStyle("claims", pcell)
			st, _ := f.GetStyle(id)
			want := "0.0000"
			if c.P < 1e-4 {
				want = "0.0E+00"
			}
			if st.CustomNumFmt == nil || *st.CustomNumFmt != want {
				t.Errorf("p cell %s number format = %v, want %s", pcell, st.CustomNumFmt, want)
			}
			// The displayed text is the p rounded as the format says.
			shown, _ := f.GetCellValue("claims", pcell)
			if want == "0.0000" && shown != strconv.FormatFloat(float64(c.P), 'f', 4, 64) {
				t.Errorf("p cell %s shows %q, want %.4f", pcell, shown, float64(c.P))
			}
			if typ, _ := f.GetCellType("claims", pcell); typ == excelize.CellTypeInlineString || typ == excelize.CellTypeSharedString {
				t.Errorf("p cell %s is text, want a number", pcell)
			}
		}
	}
	if len(outcomes) < 3 {
		t.Errorf("the invented input gave outcomes %v; the test needs several to check fills", outcomes)
	}
	for _, sheet := range []string{"claims", "coefficients", "methods"} {
		p, err := f.GetPanes(sheet)
		if err != nil || !p.Freeze || p.YSplit != 1 {
			t.Errorf("sheet %s panes = %+v (%v), want the header row frozen", sheet, p, err)
		}
	}
	// The claims header carries filter buttons (an autofilter, set before
	// the stream's Flush, which would drop it afterwards).
	filtered := false
	for _, d := range f.GetDefinedName() {
		if d.Name == "_xlnm._FilterDatabase" && strings.HasPrefix(d.RefersTo, "'claims'!") {
			filtered = true
		}
	}
	if !filtered {
		t.Error("the claims sheet has no autofilter")
	}
	// The summary counts every outcome.
	sum, _ := f.GetRows("summary", excelize.Options{RawCellValue: true})
	found := 0
	for _, r := range sum {
		if len(r) >= 2 && slices.Contains(Outcomes, r[0]) && found < len(Outcomes) {
			if n, _ := strconv.Atoi(r[1]); n != rep.Summary.Counts[r[0]] {
				t.Errorf("summary count of %s = %s, want %d", r[0], r[1], rep.Summary.Counts[r[0]])
			}
			found++
		}
	}
	if found != len(Outcomes) {
		t.Errorf("summary lists %d outcomes, want %d", found, len(Outcomes))
	}
}

// TestWriteXLSXFormulaLikeText checks that text starting with =, +, -, @,
// tab or CR is stored as text: an inline string with no formula, read back
// exactly as written, and that no sheet of the file holds a formula.
func TestWriteXLSXFormulaLikeText(t *testing.T) {
	in := reportInput()
	rep := Audit(in, DefaultOptions)
	b := writeXLSXForTest(t, rep, in)
	f := openXLSX(t, b)
	for _, sheet := range []string{"claims", "coefficients", "methods"} {
		rows, err := f.GetRows(sheet, excelize.Options{RawCellValue: true})
		if err != nil {
			t.Fatal(err)
		}
		seen := map[string]bool{}
		for r, row := range rows {
			for c, v := range row {
				if !slices.Contains(injectionTexts, v) {
					continue
				}
				seen[v] = true
				cell, _ := excelize.CoordinatesToCellName(c+1, r+1)
				if formula, err := f.GetCellFormula(sheet, cell); err != nil || formula != "" {
					t.Errorf("%s!%s holds formula %q (%v), want none", sheet, cell, formula, err)
				}
				if typ, _ := f.GetCellType(sheet, cell); typ != excelize.CellTypeInlineString {
					t.Errorf("%s!%s type = %v, want an inline string", sheet, cell, typ)
				}
			}
		}
		for _, text := range injectionTexts {
			if !seen[text] {
				t.Errorf("sheet %s: no cell reads back as %q", sheet, text)
			}
		}
	}
	zr, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatal(err)
	}
	formula := regexp.MustCompile(`<f[ >/]`)
	for _, zf := range zr.File {
		if !strings.HasPrefix(zf.Name, "xl/worksheets/") || !strings.HasSuffix(zf.Name, ".xml") {
			continue
		}
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		xml, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		if formula.Match(xml) {
			t.Errorf("%s holds a formula element", zf.Name)
		}
	}
}

// TestWriteXLSXReadsBack writes the demo's audit as a workbook, reads that
// workbook as an input and audits it again: the input sheets must carry
// the input faithfully, so every claim gets the same outcome and p. A
// claims row that could not be read is the exception: the reader keeps no
// text of a malformed cell, so the workbook leaves it blank with the
// problem beside it, and the row reads back as a claim of its own.
func TestWriteXLSXReadsBack(t *testing.T) {
	rep, in := demoReport(t)
	out := filepath.Join(t.TempDir(), "audit.xlsx")
	if err := os.WriteFile(out, writeXLSXForTest(t, rep, in), 0o600); err != nil {
		t.Fatal(err)
	}
	again, err := extract.Read(out)
	if err != nil {
		t.Fatalf("extract.Read(written workbook): %v", err)
	}
	if len(again.Coefficients) != len(in.Coefficients) || len(again.Correlations) != len(in.Correlations) || len(again.Tables) != len(in.Tables) {
		t.Errorf("read back %d coefficients, %d correlations, %d tables, want %d, %d, %d", len(again.Coefficients),
			len(again.Correlations), len(again.Tables), len(in.Coefficients), len(in.Correlations), len(in.Tables))
	}
	rep2 := Audit(again, DefaultOptions)
	if len(rep2.Claims) != len(rep.Claims) {
		t.Fatalf("read back %d claims, want %d", len(rep2.Claims), len(rep.Claims))
	}
	for i, c := range rep.Claims {
		d := rep2.Claims[i]
		if len(in.Claims[i].Problems) > 0 {
			if d.Study != c.Study || d.Claim != c.Claim {
				t.Errorf("claim %d read back as (%s, %s), want (%s, %s)", i, d.Study, d.Claim, c.Study, c.Claim)
			}
			continue
		}
		if d.Study != c.Study || d.Claim != c.Claim || d.Outcome != c.Outcome {
			t.Errorf("claim %d read back as (%s, %s, %s), want (%s, %s, %s)", i, d.Study, d.Claim, d.Outcome, c.Study, c.Claim, c.Outcome)
		}
		if c.P.Known() && (!d.P.Known() || float64(d.P) != float64(c.P)) {
			t.Errorf("claim %s p read back as %v, want %v", c.Claim, d.P, c.P)
		}
	}
}

// TestWriteXLSXWithoutInput: with no input, the claims come from the report.
func TestWriteXLSXWithoutInput(t *testing.T) {
	rep := Audit(reportInput(), DefaultOptions)
	f := openXLSX(t, writeXLSXForTest(t, rep, nil))
	if got, want := f.GetSheetList(), []string{"summary", "claims", "methods"}; !slices.Equal(got, want) {
		t.Errorf("sheets = %v, want %v", got, want)
	}
	rows, _ := f.GetRows("claims", excelize.Options{RawCellValue: true})
	sc := columnIndex(t, rows, "study")
	for i, c := range rep.Claims {
		if rows[i+1][sc] != c.Study {
			t.Errorf("claims row %d study = %q, want %q", i+2, rows[i+1][sc], c.Study)
		}
	}
}

func TestTableSheetName(t *testing.T) {
	used := map[string]bool{"summary": true}
	tests := []struct{ name, in, want string }{
		{"plain", "Lee 2019", "table Lee 2019"},
		{"forbidden characters", "a/b:c*d?[e]", "table a_b_c_d__e_"},
		{"cut to 31", "a very long correlation table name indeed", "table a very long correlation t"},
		{"duplicate", "Lee 2019", "table Lee 2019 2"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := tableSheetName(tt.in, used); got != tt.want {
				t.Errorf("tableSheetName(%q) = %q, want %q", tt.in, got, tt.want)
			}
		})
	}
}

// BenchmarkWriteXLSX measures the workbook of 10,000 claims.
func BenchmarkWriteXLSX(b *testing.B) {
	rep := tenThousandClaims()
	b.ReportAllocs()
	for b.Loop() {
		if err := WriteXLSX(io.Discard, rep, nil); err != nil {
			b.Fatal(err)
		}
	}
}
