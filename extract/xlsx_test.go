package extract

import (
	"archive/zip"
	"bytes"
	"compress/flate"
	"errors"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

var coefficientHeader = xrow("study", "label", "measure", "estimate", "ci_low", "ci_high", "se", "p", "n")
var claimHeader = xrow("study", "claim", "first", "second", "published", "basis")

// TestWorkbookDecimals checks how the printed decimals of numeric cells are
// recovered from their number format. Built-in format 2 is "0.00" and 10 is
// "0.00%" (ECMA-376 Part 1 §18.8.30, as listed in excelize's documentation);
// a General cell shows the shortest form of its value, so 0.4 shows "0.4".
func TestWorkbookDecimals(t *testing.T) {
	dir := t.TempDir()
	path := writeWorkbook(t, dir, "decimals.xlsx",
		xsheet{"coefficients", [][]xcell{
			coefficientHeader,
			xcells(xtxt("s"), xtxt("two"), xtxt("b"), xnum(0.4, 2)),
			xcells(xtxt("s"), xtxt("general"), xtxt("b"), xnum(0.4, 0)),
			xcells(xtxt("s"), xtxt("text"), xtxt("b"), xtxt("0.40")),
			xcells(xtxt("s"), xtxt("percent"), xtxt("b"), xnum(0.4, 10)),
			xcells(xtxt("s"), xtxt("three"), xtxt("b"), xnumFmt(0.4349, "0.000")),
			xcells(xtxt("s"), xtxt("noise"), xtxt("b"), xnum(0.1+0.2, 0)),
			xcells(xtxt("s"), xtxt("date"), xtxt("b"), xnum(43832, 14)),
			xcells(xtxt("s"), xtxt("sci"), xtxt("b"), xnumFmt(0.000023, "0.0E+00")),
		}},
		xsheet{"claims", [][]xcell{claimHeader, xrow("s", "c1", "two", "general", "differ", "test")}},
	)
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		label       string
		value       float64
		decimals    int
		fromDisplay bool
		problem     string
	}{
		{"two", 0.4, 2, true, ""},
		{"general", 0.4, 1, true, ""},
		{"text", 0.4, 2, false, ""},
		{"percent", 0.4, 4, true, ""},
		{"three", 0.4349, 3, true, ""},
		{"noise", 0.1 + 0.2, 1, true, ""},
		{"date", 0, 0, false, "date or time"},
		{"sci", 0.000023, 6, true, ""},
	}
	if len(in.Coefficients) != len(tests) {
		t.Fatalf("Read(%s) gave %d coefficients, want %d", path, len(in.Coefficients), len(tests))
	}
	for i, tt := range tests {
		t.Run(tt.label, func(t *testing.T) {
			c := in.Coefficients[i]
			if tt.problem != "" {
				if !hasProblem(c.Problems, ErrMalformedNumber, tt.problem) {
					t.Errorf("estimate of %s: problems %s, want one saying %q", tt.label, problemTexts(c.Problems), tt.problem)
				}
				return
			}
			e := c.Estimate
			if len(c.Problems) > 0 || e.Value != tt.value || int(e.Decimals) != tt.decimals || e.DecimalsFromDisplay != tt.fromDisplay {
				t.Errorf("estimate of %s = {%v, dec %d, fromDisplay %v} %s, want {%v, dec %d, fromDisplay %v}",
					tt.label, e.Value, e.Decimals, e.DecimalsFromDisplay, problemTexts(c.Problems), tt.value, tt.decimals, tt.fromDisplay)
			}
		})
	}
}

// TestWorkbookUnchanged checks that reading never writes to the input.
func TestWorkbookUnchanged(t *testing.T) {
	dir := t.TempDir()
	path := writeWorkbook(t, dir, "in.xlsx",
		xsheet{"coefficients", [][]xcell{coefficientHeader, xcells(xtxt("s"), xtxt("a"), xtxt("b"), xnum(0.4, 2))}},
		xsheet{"claims", [][]xcell{claimHeader, xrow("s", "c1", "a", "b", "differ")}},
	)
	old := time.Now().Add(-time.Hour).Truncate(time.Second)
	if err := os.Chtimes(path, old, old); err != nil {
		t.Fatal(err)
	}
	before, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Read(path); err != nil {
		t.Fatal(err)
	}
	// ReadData also opens the workbook; its result does not matter here.
	_, _ = ReadData(path, "coefficients")
	after, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	fi, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(before, after) {
		t.Errorf("Read(%s) changed the file's bytes", path)
	}
	if !fi.ModTime().Equal(old) {
		t.Errorf("Read(%s) changed the modification time to %v, want %v", path, fi.ModTime(), old)
	}
}

// TestWorkbookSheets covers sheet names matched case-insensitively, the
// sheets ignored, a missing coefficients sheet and a missing claims sheet.
func TestWorkbookSheets(t *testing.T) {
	dir := t.TempDir()
	path := writeWorkbook(t, dir, "names.xlsx",
		xsheet{"Instructions", [][]xcell{xrow("not read")}},
		xsheet{"COEFFICIENTS", [][]xcell{xrow("Study", " LABEL ", "Estimate", "Note"), xrow("s", "a", "0.40", "kept")}},
		xsheet{"Claims", [][]xcell{xrow("STUDY", "claim", "first", "second", "published"), xrow("s", "c1", "a", "b", "Differ")}},
		// A row left out of the sheet's XML ends the table, as a blank row
		// does: the row after it is not the table's.
		xsheet{"Table 2", [][]xcell{xrow("n", "100"), xrow("variable", "1", "2"), xrow("1. A", "—"), xrow("2. B", ".30", "—"), nil, xrow("3. C", ".20", ".10", "—")}},
	)
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Coefficients) != 1 || len(in.Claims) != 1 || len(in.Tables) != 1 {
		t.Fatalf("Read(%s) = %d coefficients, %d claims, %d tables, want 1, 1, 1", path, len(in.Coefficients), len(in.Claims), len(in.Tables))
	}
	c := in.Coefficients[0]
	if c.Sheet != "COEFFICIENTS" || c.Row != 2 || c.File != path || c.Label != "a" {
		t.Errorf("coefficient position = %+v label %q, want sheet COEFFICIENTS row 2 label a", c.Position, c.Label)
	}
	if len(c.Extra.Names) != 1 || c.Extra.Names[0] != "Note" || c.Extra.Values[0] != "kept" {
		t.Errorf("coefficient Extra = %+v, want Note=kept", c.Extra)
	}
	if in.Claims[0].Published != PublishedDiffer {
		t.Errorf("claim published = %q, want %q", in.Claims[0].Published, PublishedDiffer)
	}
	if tb := in.Tables[0]; tb.Name != "2" || tb.Study != "2" || len(tb.Variables) != 2 || tb.R[0][1].Value != 0.30 {
		t.Errorf("table = name %q study %q variables %q r %v, want name 2, study 2, variables A and B, r .30", tb.Name, tb.Study, tb.Variables, tb.R[0][1].Value)
	}

	noCoef := writeWorkbook(t, dir, "nocoef.xlsx",
		xsheet{"claims", [][]xcell{claimHeader, xrow("s", "c1", "a", "b", "differ")}})
	in, err = Read(noCoef)
	if err != nil {
		t.Fatal(err)
	}
	if !hasProblem(in.Problems, ErrMissingSheet, "no coefficients sheet") || len(in.Claims) != 1 {
		t.Errorf("Read(%s) problems %s, want a missing coefficients sheet and the claim still read", noCoef, problemTexts(in.Problems))
	}

	noClaims := writeWorkbook(t, dir, "noclaims.xlsx",
		xsheet{"coefficients", [][]xcell{coefficientHeader}})
	if _, err := Read(noClaims); !errors.Is(err, ErrMissingSheet) || !strings.Contains(err.Error(), `"coefficients"`) {
		t.Errorf("Read(%s) error = %v, want ErrMissingSheet naming the sheets found", noClaims, err)
	}
}

func TestNotAWorkbook(t *testing.T) {
	dir := t.TempDir()
	text := filepath.Join(dir, "fake.xlsx")
	if err := os.WriteFile(text, []byte("study,claim\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Read(text); !errors.Is(err, ErrUnsupportedInput) {
		t.Errorf("Read(text named .xlsx) error = %v, want ErrUnsupportedInput", err)
	}
	ole := filepath.Join(dir, "old.xls")
	if err := os.WriteFile(ole, append(append([]byte{}, oleMagic...), make([]byte, 512)...), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Read(ole); !errors.Is(err, ErrUnsupportedInput) || !strings.Contains(err.Error(), ".xls") {
		t.Errorf("Read(old .xls) error = %v, want ErrUnsupportedInput naming .xls", err)
	}
	if _, err := Read(filepath.Join(dir, "missing.xlsx")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("Read(missing file) error = %v, want os.ErrNotExist", err)
	}
}

// writeRawZip writes an archive whose members carry the given declared
// sizes and raw (already deflated) contents.
func writeRawZip(t *testing.T, path string, members []rawMember) {
	t.Helper()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, m := range members {
		w, err := zw.CreateRaw(&zip.FileHeader{Name: m.name, Method: zip.Deflate,
			CompressedSize64: uint64(len(m.deflated)), UncompressedSize64: m.declared, CRC32: m.crc})
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.Write(m.deflated); err != nil {
			t.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

type rawMember struct {
	name     string
	declared uint64
	deflated []byte
	crc      uint32
}

// deflate compresses data into a complete deflate stream.
func deflate(t *testing.T, data []byte) []byte {
	t.Helper()
	return compress(t, data, (*flate.Writer).Close)
}

// compress deflates data at the best compression and ends the stream with
// finish: Close for a complete stream, Flush for one that can be continued.
func compress(t *testing.T, data []byte, finish func(*flate.Writer) error) []byte {
	t.Helper()
	var b bytes.Buffer
	w, err := flate.NewWriter(&b, flate.BestCompression)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := w.Write(data); err != nil {
		t.Fatal(err)
	}
	if err := finish(w); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// TestZipBomb refuses archives that declare, pack or hide too much, before
// any part is parsed.
func TestZipBomb(t *testing.T) {
	dir := t.TempDir()
	zeros := make([]byte, 20<<20)
	packed := deflate(t, zeros)
	small := deflate(t, make([]byte, 10000))
	// Incompressible bytes, so that a declaration of more than half the
	// limit passes the ratio check and only the total is over the limit.
	noise := make([]byte, 1<<20)
	half := uint64(MaxUnzippedBytes/2 + 1<<20)
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range noise {
		noise[i] = byte(rng.Uint32())
	}
	tests := []struct {
		name    string
		members []rawMember
		want    string
	}{
		{"declares a huge member", []rawMember{{name: "xl/worksheets/sheet1.xml", declared: 1 << 40, deflated: small}}, "unpacks to"},
		{"members add up", []rawMember{
			{name: "a.xml", declared: half, deflated: noise},
			{name: "b.xml", declared: half, deflated: noise}}, fmt.Sprintf("more than %d MiB", MaxUnzippedBytes>>20)},
		{"ratio", []rawMember{{name: "xl/sharedStrings.xml", declared: uint64(len(zeros)), deflated: packed}}, "zip bomb"},
		{"understates its size", []rawMember{{name: "xl/workbook.xml", declared: 100, deflated: small}}, "holds more than"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := filepath.Join(dir, strings.ReplaceAll(tt.name, " ", "-")+".xlsx")
			writeRawZip(t, path, tt.members)
			start := time.Now()
			_, err := Read(path)
			if !errors.Is(err, ErrInputTooLarge) || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("Read(%s) error = %v, want ErrInputTooLarge saying %q", tt.name, err, tt.want)
			}
			t.Logf("refused in %v", time.Since(start))
		})
	}
	empty := deflate(t, nil)
	many := make([]rawMember, MaxZipMembers+1)
	for i := range many {
		many[i] = rawMember{name: "m" + strconv.Itoa(i), deflated: empty}
	}
	path := filepath.Join(dir, "many.xlsx")
	writeRawZip(t, path, many)
	if _, err := Read(path); !errors.Is(err, ErrInputTooLarge) || !strings.Contains(err.Error(), "parts") {
		t.Errorf("Read(%d members) error = %v, want ErrInputTooLarge", len(many), err)
	}
}

// TestWorkbookClaimsInOrder checks that every non-blank claims row of a
// workbook, however malformed, gives exactly one claim, in order, with the
// sheet's own row numbers (blank rows skipped, not renumbered).
func TestWorkbookClaimsInOrder(t *testing.T) {
	dir := t.TempDir()
	path := writeWorkbook(t, dir, "claims.xlsx",
		xsheet{"coefficients", [][]xcell{coefficientHeader, xrow("s", "a", "b", "0.1"), xrow("s", "b", "b", "0.2")}},
		xsheet{"claims", [][]xcell{
			nil, // a blank first row: the header is on row 2
			xrow("study", "claim", "first", "second", "published", "alpha"),
			xrow("s", "c1", "a", "b", "differ"),
			nil,
			xcells(xnum(2020, 0), xnum(7, 0), xtxt("a"), xtxt("b"), xnum(1, 0), xnum(0.05, 2)),
			xrow("", "", "", "", "", "2"),
			nil, nil,
			xrow("s", "c3", "a", "a", "NO_DIFFERENCE", "0.10"),
		}})
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	rows := []int{3, 5, 6, 9}
	if len(in.Claims) != len(rows) {
		t.Fatalf("Read gave %d claims, want %d", len(in.Claims), len(rows))
	}
	for i, c := range in.Claims {
		if c.Row != rows[i] || c.Sheet != "claims" {
			t.Errorf("claim %d at %v, want sheet claims row %d", i, c.Position, rows[i])
		}
	}
	if c := in.Claims[0]; c.Claim != "c1" || len(c.Problems) != 0 {
		t.Errorf("row 3 = %+v%s", c, problemTexts(c.Problems))
	}
	if c := in.Claims[1]; c.Study != "2020" || c.Claim != "7" || c.Alpha != 0.05 || !hasProblem(c.Problems, ErrUnknownValue, `"1" is not a published value`) {
		t.Errorf("row 5 (numeric cells) = %+v%s, want study 2020, claim 7, alpha 0.05 and published 1 refused", c, problemTexts(c.Problems))
	}
	if c := in.Claims[2]; len(c.Problems) < 5 || !hasProblem(c.Problems, ErrOutOfRange, "alpha") {
		t.Errorf("row 6 (all blank but alpha 2) problems:%s, want every required cell and alpha flagged", problemTexts(c.Problems))
	}
	if c := in.Claims[3]; c.Published != PublishedNoDifference || c.Alpha != 0.10 || !hasProblem(c.Problems, ErrDuplicate, "same coefficient") {
		t.Errorf("row 9 = %+v%s", c, problemTexts(c.Problems))
	}
	want := path + `, sheet "claims", row 5, column "published": "1" is not a published value`
	if !hasProblem(in.Claims[1].Problems, nil, want) {
		t.Errorf("row 5 problems:%s, want the message to start %q", problemTexts(in.Claims[1].Problems), want)
	}
}

// BenchmarkReadWorkbook reads a workbook of 5000 coefficients and 2500
// claims, all text cells as the template makes them.
func BenchmarkReadWorkbook(b *testing.B) {
	coefs := [][]xcell{coefficientHeader}
	claims := [][]xcell{claimHeader}
	for i := 0; i < 5000; i++ {
		coefs = append(coefs, xrow("s"+strconv.Itoa(i/2), "l"+strconv.Itoa(i%2), "b", "0.43", "0.12", "0.74", "0.16", "p < .01", "120"))
		if i%2 == 0 {
			claims = append(claims, xrow("s"+strconv.Itoa(i/2), "c", "l0", "l1", "differ", "test"))
		}
	}
	path := writeWorkbook(b, b.TempDir(), "bench.xlsx", xsheet{"coefficients", coefs}, xsheet{"claims", claims})
	b.ReportAllocs()
	for b.Loop() {
		in, err := Read(path)
		if err != nil || len(in.Claims) != 2500 {
			b.Fatalf("Read = %d claims, %v", len(in.Claims), err)
		}
	}
}

// TestWorkbookMessage checks the wording of a problem, position first, as
// the input contract asks.
func TestWorkbookMessage(t *testing.T) {
	dir := t.TempDir()
	path := writeWorkbook(t, dir, "demo.xlsx",
		xsheet{"coefficients", [][]xcell{
			xrow("study", "label", "estimate", "ci"),
			xrow("s", "a", "0.30", "(0.12 0.45"),
		}},
		xsheet{"claims", [][]xcell{claimHeader}})
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	want := path + `, sheet "coefficients", row 2, column "ci": "(0.12 0.45" is not a confidence interval (the opening "(" has no closing bracket; expected e.g. [0.12, 0.45], (.12–.45), 0.12 to 0.45)`
	if len(in.Coefficients) != 1 || len(in.Coefficients[0].Problems) != 1 || in.Coefficients[0].Problems[0].Error() != want {
		t.Errorf("problems:%s\nwant\n\t%s", problemTexts(in.Coefficients[0].Problems), want)
	}
}
