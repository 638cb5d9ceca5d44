package report

import (
	"archive/zip"
	"bytes"
	"errors"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"

	"github.com/xuri/excelize/v2"
)

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
	rep := audit.Audit(in, audit.DefaultOptions)
	f := openXLSX(t, writeInput(t, "xlsx", in))
	if got, want := f.GetSheetList(), []string{"summary", "claims", "methods", "coefficients"}; !slices.Equal(got, want) {
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
			want := xlsxPFormat
			if c.P < 0.001 {
				want = xlsxPTinyFormat
			}
			if st.CustomNumFmt == nil || *st.CustomNumFmt != want {
				t.Errorf("p cell %s number format = %v, want %s", pcell, st.CustomNumFmt, want)
			}
			// The displayed text is the p as journals print it. The '#' of
			// "#.000" shows no insignificant leading zero (ECMA-376 Part 1,
			// §18.8.31), as Excel and LibreOffice do; excelize's own
			// rendering writes one, so it is dropped before comparing.
			shown, _ := f.GetCellValue("claims", pcell)
			if want := audit.FormatP(float64(c.P)); strings.TrimPrefix(shown, "0") != want {
				t.Errorf("p cell %s shows %q, want %s", pcell, shown, want)
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
		if len(r) >= 2 && slices.Contains(audit.Outcomes, r[0]) && found < len(audit.Outcomes) {
			if n, _ := strconv.Atoi(r[1]); n != rep.Summary.Counts[r[0]] {
				t.Errorf("summary count of %s = %s, want %d", r[0], r[1], rep.Summary.Counts[r[0]])
			}
			found++
		}
	}
	if found != len(audit.Outcomes) {
		t.Errorf("summary lists %d outcomes, want %d", found, len(audit.Outcomes))
	}
}

// TestWriteXLSXFormulaLikeText checks that text starting with =, +, -, @,
// tab or CR is stored as text: an inline string with no formula, read back
// exactly as written, and that no sheet of the file holds a formula.
func TestWriteXLSXFormulaLikeText(t *testing.T) {
	b := writeInput(t, "xlsx", reportInput())
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

// TestWriteXLSXFormulaLikeColumnNames: the pass-through columns' names
// that start like a formula are text cells of the claims and coefficients
// headers, shown as written, like the values.
func TestWriteXLSXFormulaLikeColumnNames(t *testing.T) {
	in := reportInput()
	for i := range in.Claims {
		in.Claims[i].Extra = extract.Extra{Names: injectionTexts, Values: injectionTexts}
	}
	for i := range in.Coefficients {
		in.Coefficients[i].Extra = extract.Extra{Names: injectionTexts, Values: injectionTexts}
	}
	f := openXLSX(t, writeInput(t, "xlsx", in))
	for _, sheet := range []string{"claims", "coefficients"} {
		rows, err := f.GetRows(sheet, excelize.Options{RawCellValue: true})
		if err != nil || len(rows) == 0 {
			t.Fatalf("sheet %s: %v", sheet, err)
		}
		for _, name := range injectionTexts {
			c := slices.Index(rows[0], name)
			if c < 0 {
				t.Errorf("sheet %s: no header cell reads back as %q (header %q)", sheet, name, rows[0])
				continue
			}
			cell, _ := excelize.CoordinatesToCellName(c+1, 1)
			if formula, err := f.GetCellFormula(sheet, cell); err != nil || formula != "" {
				t.Errorf("%s!%s holds formula %q (%v), want none", sheet, cell, formula, err)
			}
			if typ, _ := f.GetCellType(sheet, cell); typ != excelize.CellTypeInlineString {
				t.Errorf("%s!%s (%q) type = %v, want an inline string", sheet, cell, name, typ)
			}
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
	if err := os.WriteFile(out, writeInput(t, "xlsx", in), 0o600); err != nil {
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
	rep2 := audit.Audit(again, audit.DefaultOptions)
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
	rep := audit.Audit(reportInput(), audit.DefaultOptions)
	f := openXLSX(t, writeReport(t, "xlsx", rep))
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
		if err := Write("xlsx", io.Discard, rep); err != nil {
			b.Fatal(err)
		}
	}
}

// TestXLSXSheetFull: a sheet whose last row is written refuses the next
// one with ErrSheetFull, rather than a workbook Excel cannot open.
func TestXLSXSheetFull(t *testing.T) {
	f := excelize.NewFile()
	defer f.Close()
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		t.Fatal(err)
	}
	s := &xlsxSheet{f: f, name: "Sheet1", sw: sw, row: excelize.TotalRows - 1}
	if err := s.add("last"); err != nil {
		t.Fatalf("writing row %d: %v", excelize.TotalRows, err)
	}
	if err := s.add("one more"); !errors.Is(err, ErrSheetFull) {
		t.Errorf("writing row %d: error %v, want ErrSheetFull", excelize.TotalRows+1, err)
	}
}

// longClaimsSheet begins a workbook whose claims sheet grows past what
// excelize keeps in memory (16 MB), with excelize's temporary files in
// tmpDir, and leaves it unfinished.
func longClaimsSheet(t *testing.T, tmpDir string) *xlsxWriter {
	t.Helper()
	rep := tenThousandClaims()
	wr := newXLSXWriter(io.Discard, tmpDir)
	if err := wr.Begin(Header{}); err != nil {
		t.Fatal(err)
	}
	for range 3 {
		if err := wr.Study(audit.StudyResult{Claims: rep.Claims}); err != nil {
			t.Fatal(err)
		}
	}
	return wr
}

// TestXLSXCloseRemovesTemporaryFiles stops a workbook whose claims sheet
// has grown past what excelize keeps in memory (16 MB) before End, as a
// failed run does: Close must remove the temporary file excelize made.
func TestXLSXCloseRemovesTemporaryFiles(t *testing.T) {
	dir := t.TempDir()
	t.Setenv("TMPDIR", dir)
	wr := longClaimsSheet(t, "")
	if m, _ := filepath.Glob(filepath.Join(dir, "*")); len(m) == 0 {
		t.Fatal("excelize made no temporary file; the test needs one")
	}
	if err := wr.Close(); err != nil {
		t.Fatal(err)
	}
	if m, _ := filepath.Glob(filepath.Join(dir, "*")); len(m) != 0 {
		t.Errorf("Close left %v", m)
	}
}

// TestXLSXTempDir: with a folder for temporary files (Options.TempDir),
// excelize keeps its long sheets there and nowhere else, so that a run
// cut short by a signal can remove them with the folder.
func TestXLSXTempDir(t *testing.T) {
	system, own := t.TempDir(), t.TempDir()
	t.Setenv("TMPDIR", system)
	wr := longClaimsSheet(t, own)
	defer wr.Close()
	if m, _ := filepath.Glob(filepath.Join(own, "*")); len(m) == 0 {
		t.Error("excelize made no temporary file in the writer's folder")
	}
	if m, _ := filepath.Glob(filepath.Join(system, "*")); len(m) != 0 {
		t.Errorf("excelize made temporary files in the system's folder: %v", m)
	}
}

// TestXLSXClaimLimit: past its limit of claims the xlsx report stops with
// ErrTooManyForXLSX, naming csv and json; up to it, it writes them all.
func TestXLSXClaimLimit(t *testing.T) {
	rep := tenThousandClaims()
	for _, limit := range []int{len(rep.Claims), len(rep.Claims) - 1} {
		wr := newXLSXWriter(io.Discard, t.TempDir())
		wr.maxClaims = limit
		err := writeTo(wr, rep)
		wr.Close()
		switch {
		case limit == len(rep.Claims) && err != nil:
			t.Errorf("%d claims, limit %d: %v", len(rep.Claims), limit, err)
		case limit < len(rep.Claims) && (!errors.Is(err, ErrTooManyForXLSX) || !strings.Contains(err.Error(), "csv or json")):
			t.Errorf("%d claims, limit %d: error %v, want ErrTooManyForXLSX naming csv or json", len(rep.Claims), limit, err)
		}
	}
}

// TestHeldCoefficientsInAFile: the input's coefficients wait for the end
// of the xlsx report in a temporary file of the writer's folder, not in
// memory, are read back as written (a cell with a comma, a quote and line
// breaks, "\r\n" included, which a CSV reader would change), and close
// removes the file.
func TestHeldCoefficientsInAFile(t *testing.T) {
	dir := t.TempDir()
	h := heldCoefficients{records: spool[[]string]{dir: dir, what: "coefficients"}}
	defer h.close()
	c := extract.Coefficient{Position: extract.Position{Sheet: "coefficients", Row: 7}, Study: "Quillon 2026",
		Label: "sleep, \"hours\"\nweekdays\r\nweekends", Measure: "b", Estimate: extract.Printed{Text: "0.41"}}
	for range 3 {
		if err := h.add(&c); err != nil {
			t.Fatal(err)
		}
	}
	files, _ := filepath.Glob(filepath.Join(dir, "*"))
	if len(files) != 1 {
		t.Fatalf("files in the writer's folder: %v, want the held coefficients' one", files)
	}
	var recs [][]string
	if err := h.records.each(func(rec []string) error { recs = append(recs, rec); return nil }); err != nil {
		t.Fatal(err)
	}
	if len(recs) != 3 || recs[2][1] != c.Label || recs[2][7] != "0.41" || recs[2][heldSheetPosition+1] != "7" {
		t.Errorf("read back %q", recs)
	}
	h.close()
	if files, _ := filepath.Glob(filepath.Join(dir, "*")); len(files) != 0 {
		t.Errorf("close left %v", files)
	}
}

// TestSpoolMethodsRows: the methods sheet's rows are read back from their
// spool as written ("\r\n" and empty texts included), an empty spool makes
// no file and reads as nothing, and close removes the file.
func TestSpoolMethodsRows(t *testing.T) {
	dir := t.TempDir()
	empty := spool[methodsRow]{dir: dir, what: "methods"}
	if err := empty.each(func(methodsRow) error { t.Error("an empty spool gave a row"); return nil }); err != nil {
		t.Fatal(err)
	}
	h := spool[methodsRow]{dir: dir, what: "methods"}
	defer h.close()
	rows := []methodsRow{
		{Row: 7, Study: "Quillon 2026", Claim: "c1", Outcome: audit.Consistent, Methods: "Fisher's z,\r\n\"two-sided\"."},
		{Row: 8, Outcome: audit.Incomplete},
		{Row: 9, Study: "Quillon 2026", Claim: "c3", Outcome: audit.Consistent, Methods: "x"},
	}
	for _, r := range rows {
		if err := h.add(r); err != nil {
			t.Fatal(err)
		}
	}
	files, _ := filepath.Glob(filepath.Join(dir, "*"))
	if len(files) != 1 {
		t.Fatalf("files in the writer's folder: %v, want the spool's one", files)
	}
	var got []methodsRow
	if err := h.each(func(r methodsRow) error { got = append(got, r); return nil }); err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(got, rows) {
		t.Errorf("read back %#v, want %#v", got, rows)
	}
	h.close()
	if files, _ := filepath.Glob(filepath.Join(dir, "*")); len(files) != 0 {
		t.Errorf("close left %v", files)
	}
}

// TestXLSXRefusesCountedInputAtBegin: an input whose rows were counted
// when it was opened is refused by Begin, before any of it is audited,
// when its claims pass the limit or its coefficients a sheet's rows; at
// the limits, and when the rows were not counted, Begin goes on.
func TestXLSXRefusesCountedInputAtBegin(t *testing.T) {
	for _, tc := range []struct {
		h    Header
		want error
	}{
		{Header{RowsKnown: true, ClaimRows: 11, CoefficientRows: 22}, ErrTooManyForXLSX},
		{Header{RowsKnown: true, ClaimRows: 10, CoefficientRows: excelize.TotalRows}, ErrSheetFull},
		{Header{RowsKnown: true, ClaimRows: 10, CoefficientRows: excelize.TotalRows - 1}, nil},
		{Header{ClaimRows: 11, CoefficientRows: excelize.TotalRows}, nil},
	} {
		wr := newXLSXWriter(io.Discard, t.TempDir())
		wr.maxClaims = 10
		err := wr.Begin(tc.h)
		wr.Close()
		if !errors.Is(err, tc.want) || (tc.want == nil) != (err == nil) {
			t.Errorf("Begin(%+v) = %v, want %v", tc.h, err, tc.want)
		}
	}
}
