package extract

import (
	"archive/zip"
	"bytes"
	"compress/flate"
	"encoding/binary"
	"errors"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
	"unicode/utf16"
)

// Hostile inputs: each must be refused or read with a clear message, in
// bounded memory. Memory is measured as the bytes allocated (TotalAlloc)
// or held (HeapAlloc after a collection) while reading, from
// runtime.ReadMemStats; timings are left to the benchmarks.

// allocated returns the bytes allocated while f runs.
func allocated(f func()) uint64 {
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	f()
	runtime.ReadMemStats(&after)
	return after.TotalAlloc - before.TotalAlloc
}

// deflateFlushed compresses data on its own and ends the output on a byte
// boundary without a final block, so that copies of it can be strung
// together into one long deflate stream (RFC 1951 §3.2.3: blocks are
// independent apart from back references, which here stay within a copy).
func deflateFlushed(t *testing.T, data []byte) []byte {
	t.Helper()
	return compress(t, data, (*flate.Writer).Flush)
}

// finalBlock is an empty stored block with the final bit set (RFC 1951
// §3.2.4): BFINAL 1, BTYPE 00, then LEN 0 and NLEN 0xFFFF.
var finalBlock = []byte{0x01, 0x00, 0x00, 0xFF, 0xFF}

// writeBombWorkbook writes a workbook whose claims sheet is a deflate
// stream of unpacked bytes of worksheet XML, declared as declared bytes,
// without ever holding more than a MiB of it.
func writeBombWorkbook(t *testing.T, path string, unpacked int64, declared uint64) int {
	t.Helper()
	names, data := workbookParts(t)
	row := []byte(`<row><c t="inlineStr"><is><t>bomb</t></is></c></row>`)
	chunk := bytes.Repeat(row, (1<<20)/len(row))
	head := []byte(`<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>`)
	var stream bytes.Buffer
	stream.Write(deflateFlushed(t, head))
	packed := deflateFlushed(t, chunk)
	for n := int64(len(head)); n < unpacked; n += int64(len(chunk)) {
		stream.Write(packed)
	}
	stream.Write(finalBlock)

	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, n := range names {
		if n == claimsPart {
			w, err := zw.CreateRaw(&zip.FileHeader{Name: n, Method: zip.Deflate,
				CompressedSize64: uint64(stream.Len()), UncompressedSize64: declared})
			if err != nil {
				t.Fatal(err)
			}
			if _, err := w.Write(stream.Bytes()); err != nil {
				t.Fatal(err)
			}
			continue
		}
		w, err := zw.Create(n)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.Write(data[n]); err != nil {
			t.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return buf.Len()
}

// TestHostileWorkbookBomb hides a 1 GiB claims sheet in an otherwise valid
// workbook of a few MiB, declaring its true size, a size under the limit,
// or almost nothing. Each is refused with ErrInputTooLarge before a row is
// read, allocating a few MiB at most (unpacking it would take a GiB).
func TestHostileWorkbookBomb(t *testing.T) {
	dir := t.TempDir()
	const gib = 1 << 30
	tests := []struct {
		name     string
		declared uint64
		want     string
	}{
		{"true size", gib, fmt.Sprintf("part %q unpacks to 1024 MiB", claimsPart)},
		{"declared under the limit", 32 << 20, "holds more than the 33554432 bytes it declares"},
		{"declared tiny", 1000, "holds more than the 1000 bytes it declares"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := filepath.Join(dir, strings.ReplaceAll(tt.name, " ", "-")+".xlsx")
			size := writeBombWorkbook(t, path, gib, tt.declared)
			var err error
			alloc := allocated(func() { _, err = Read(path) })
			if !errors.Is(err, ErrInputTooLarge) || !strings.Contains(err.Error(), tt.want) || !strings.HasPrefix(err.Error(), path) {
				t.Errorf("Read(1 GiB sheet in %d bytes, declared %d) error = %v, want ErrInputTooLarge naming the file and saying %q", size, tt.declared, err, tt.want)
			}
			if alloc > 16<<20 {
				t.Errorf("Read(1 GiB sheet) allocated %d MiB before refusing it, want at most 16", alloc>>20)
			}
			t.Logf("archive %d KiB; allocated %d KiB", size>>10, alloc>>10)
		})
	}
}

// claimsSheetXML is a claims sheet: the header, rows in between and a
// claim on the last row, each written as inline strings.
func claimsSheetXML(between string, last int) []byte {
	cells := func(r int, vals ...string) string {
		var b strings.Builder
		fmt.Fprintf(&b, `<row r="%d">`, r)
		for i, v := range vals {
			fmt.Fprintf(&b, `<c r="%c%d" t="inlineStr"><is><t>%s</t></is></c>`, 'A'+i, r, v)
		}
		return b.String() + "</row>"
	}
	return []byte(`<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>` +
		cells(1, "study", "claim", "first", "second", "published") + cells(2, "s", "c1", "a", "b", "differ") +
		between + cells(last, "s", "c2", "b", "a", "no-difference") + `</sheetData></worksheet>`)
}

// millionEmptyRows writes a workbook whose claims sheet has a million rows
// written as <row r="n"/> between its two claims, 17 MB of XML in a file of
// about 2.5 MB.
func millionEmptyRows(t testing.TB, path string) {
	t.Helper()
	var b strings.Builder
	for r := 3; r < 1_000_003; r++ {
		fmt.Fprintf(&b, `<row r="%d"/>`, r)
	}
	names, data := workbookParts(t)
	rebuildWorkbook(t, path, names, data, claimsPart, claimsSheetXML(b.String(), 1_000_003))
}

// TestHostileMillionEmptyRows reads the two real claims of a sheet padded
// with a million empty rows, keeping none of the padding: what Read returns
// holds less than 1 MiB more than before. BenchmarkReadMillionEmptyRows
// gives the time.
func TestHostileMillionEmptyRows(t *testing.T) {
	path := filepath.Join(t.TempDir(), "million.xlsx")
	millionEmptyRows(t, path)
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	in, err := Read(path)
	runtime.GC()
	runtime.ReadMemStats(&after)
	if err != nil {
		t.Fatal(err)
	}
	held := int64(after.HeapAlloc) - int64(before.HeapAlloc)
	if held > 1<<20 {
		t.Errorf("Read(a million empty rows) holds %d KiB after reading, want under 1 MiB", held>>10)
	}
	t.Logf("holds %d KiB after reading", held>>10)
	if len(in.Claims) != 2 || in.Claims[0].Row != 2 || in.Claims[1].Row != 1_000_003 || in.Claims[1].Claim != "c2" {
		t.Fatalf("Read(a million empty rows) = %d claims, want c1 on row 2 and c2 on row 1000003", len(in.Claims))
	}
	for _, c := range in.Claims {
		if len(c.Problems) != 0 {
			t.Errorf("claim on row %d problems:%s, want none", c.Row, problemTexts(c.Problems))
		}
	}
	runtime.KeepAlive(in)

	// The same rows left out entirely: the reader steps over the gap.
	sparse := filepath.Join(t.TempDir(), "sparse.xlsx")
	names, data := workbookParts(t)
	rebuildWorkbook(t, sparse, names, data, claimsPart, claimsSheetXML("", 1_048_576))
	in, err = Read(sparse)
	if err != nil || len(in.Claims) != 2 || in.Claims[1].Row != 1_048_576 {
		t.Errorf("Read(claims on rows 2 and 1048576) = %v, want both claims, the second on row 1048576", err)
	}
}

func BenchmarkReadMillionEmptyRows(b *testing.B) {
	path := filepath.Join(b.TempDir(), "million.xlsx")
	millionEmptyRows(b, path)
	b.ReportAllocs()
	for b.Loop() {
		in, err := Read(path)
		if err != nil || len(in.Claims) != 2 {
			b.Fatalf("Read = %v", err)
		}
	}
}

// TestHostileWideRows reads 2000 claims rows that each hold a value in
// column XFD, the last a spreadsheet has: every row is kept with a problem
// naming the column, without building 16384 cells for each (about 2 MiB a
// row, 4 GiB in all).
func TestHostileWideRows(t *testing.T) {
	var b strings.Builder
	for r := 3; r < 2003; r++ {
		fmt.Fprintf(&b, `<row r="%d"><c r="A%d" t="inlineStr"><is><t>s</t></is></c><c r="XFD%d"><v>1</v></c></row>`, r, r, r)
	}
	// A row whose far cells carry only a style is not wide: a spreadsheet
	// counts no cell without a value or a formula, so it is read as usual.
	b.WriteString(`<row r="2003"><c r="A2003" t="inlineStr"><is><t>s</t></is></c><c r="B2003" t="inlineStr"><is><t>c3</t></is></c><c r="XFD2003" s="1"/></row>`)
	path := filepath.Join(t.TempDir(), "wide.xlsx")
	names, data := workbookParts(t)
	rebuildWorkbook(t, path, names, data, claimsPart, claimsSheetXML(b.String(), 2004))
	var in *Input
	var err error
	alloc := allocated(func() { in, err = Read(path) })
	if err != nil {
		t.Fatal(err)
	}
	if alloc > 64<<20 {
		t.Errorf("Read(2000 rows reaching column XFD) allocated %d MiB, want at most 64", alloc>>20)
	}
	if len(in.Claims) != 2003 {
		t.Fatalf("Read(2000 wide rows) = %d claims, want 2003 (every row kept)", len(in.Claims))
	}
	wide := in.Claims[1]
	want := path + `, sheet "claims", row 3: the row has a value in column XFD, beyond the first 1024 columns that are read`
	if wide.Row != 3 || !hasProblem(wide.Problems, ErrInputTooLarge, want) {
		t.Errorf("row 3 problems:%s, want one starting %q", problemTexts(wide.Problems), want)
	}
	if c := in.Claims[2001]; c.Row != 2003 || c.Claim != "c3" || hasProblem(c.Problems, ErrInputTooLarge, "") {
		t.Errorf("row 2003 (a far cell with a style only) = claim %q%s, want c3 read without a size problem", c.Claim, problemTexts(c.Problems))
	}
	t.Logf("allocated %d MiB", alloc>>20)
}

// TestSheetCellBudget checks that a sheet is refused once its rows add up
// to more cells than its budget (maxSheetCells in use; 100 here), blank
// cells within a row included: rows ending far to the right cost their
// whole width.
func TestSheetCellBudget(t *testing.T) {
	var b strings.Builder
	for r := 3; r < 40; r++ {
		fmt.Fprintf(&b, `<row r="%d"><c r="A%d" t="inlineStr"><is><t>s</t></is></c><c r="E%d"><v>1</v></c></row>`, r, r, r)
	}
	path := filepath.Join(t.TempDir(), "budget.xlsx")
	names, data := workbookParts(t)
	rebuildWorkbook(t, path, names, data, claimsPart, claimsSheetXML(b.String(), 40))
	wb, err := openWorkbook(path)
	if err != nil {
		t.Fatal(err)
	}
	defer wb.Close()
	src, err := wb.source("claims")
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	src.cellBudget = 100
	_, _, err = readClaimSheet(src, Position{File: path, Sheet: "claims"})
	var ce *CellError
	if !errors.Is(err, ErrInputTooLarge) || !errors.As(err, &ce) || ce.Row != 21 || !strings.Contains(err.Error(), "more than 100 cells") {
		t.Errorf("readClaimSheet(5 cells a row, budget 100) error = %v, want ErrInputTooLarge at row 21", err)
	}
}

// TestHostileDamagedSheetXML breaks a claims sheet's XML after its first
// rows. excelize read a syntax error as the end of the sheet; Read must
// refuse the workbook instead of losing the rows after it silently.
func TestHostileDamagedSheetXML(t *testing.T) {
	names, data := workbookParts(t)
	good := string(claimsSheetXML("", 5))
	tests := []struct {
		name, xml string
	}{
		{"truncated", good[:len(good)-40]},
		{"broken tag", strings.Replace(good, `<row r="5">`, `<row r="5"<`, 1)},
		{"no root", `<heetml/2006/main">` + good[strings.Index(good, "<sheetData>"):]},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "damaged.xlsx")
			rebuildWorkbook(t, path, names, data, claimsPart, []byte(tt.xml))
			_, err := Read(path)
			if !errors.Is(err, ErrUnsupportedInput) || !strings.Contains(err.Error(), `sheet "claims": the sheet's XML is damaged`) {
				t.Errorf("Read(%s sheet XML) error = %v, want ErrUnsupportedInput saying the claims sheet's XML is damaged", tt.name, err)
			}
		})
	}
}

// TestHostileGarbage feeds random bytes named as a workbook, a CSV and a
// folder's claims.csv, and random bytes behind a zip signature.
func TestHostileGarbage(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 8))
	garbage := make([]byte, 64<<10)
	for i := range garbage {
		garbage[i] = byte(rng.Uint32())
	}
	dir := t.TempDir()
	folder := filepath.Join(dir, "folder")
	if err := os.Mkdir(folder, 0o755); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, file string
		data       []byte
		want       string
	}{
		{"random .xlsx", filepath.Join(dir, "random.xlsx"), garbage, "is not an .xlsx workbook"},
		{"random .csv", filepath.Join(dir, "random.csv"), garbage, "is not a text file"},
		{"zip signature then random", filepath.Join(dir, "zipped.xlsx"), append([]byte("PK\x03\x04"), garbage...), "is not a readable zip package"},
		{"random claims.csv", filepath.Join(folder, "claims.csv"), garbage, "is not a text file"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if err := os.WriteFile(tt.file, tt.data, 0o644); err != nil {
				t.Fatal(err)
			}
			input := tt.file
			if filepath.Base(tt.file) == "claims.csv" {
				input = folder
			}
			_, err := Read(input)
			if !errors.Is(err, ErrUnsupportedInput) || !strings.HasPrefix(err.Error(), tt.file) || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("Read(%s) error = %v, want ErrUnsupportedInput naming %s and saying %q", tt.name, err, tt.file, tt.want)
			}
			if _, err := ReadData(tt.file, ""); !errors.Is(err, ErrUnsupportedInput) || !strings.Contains(err.Error(), tt.file) {
				t.Errorf("ReadData(%s) error = %v, want ErrUnsupportedInput naming the file", tt.name, err)
			}
		})
	}
}

// TestHostileEmptyFiles reads 0-byte files in each form.
func TestHostileEmptyFiles(t *testing.T) {
	dir := t.TempDir()
	empty := func(name string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, nil, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	xlsx, csvFile := empty("empty.xlsx"), empty("empty.csv")
	if _, err := Read(xlsx); !errors.Is(err, ErrUnsupportedInput) || !strings.Contains(err.Error(), "is empty (0 bytes)") {
		t.Errorf("Read(0-byte .xlsx) error = %v, want ErrUnsupportedInput saying it is empty", err)
	}
	if _, err := Read(csvFile); !errors.Is(err, ErrMissingColumn) || !strings.Contains(err.Error(), csvFile+" has no header row") {
		t.Errorf("Read(0-byte .csv) error = %v, want ErrMissingColumn: no header row", err)
	}
	for _, p := range []string{xlsx, csvFile} {
		if _, err := ReadData(p, ""); err == nil || !strings.Contains(err.Error(), p) {
			t.Errorf("ReadData(%s) error = %v, want an error naming the file", p, err)
		}
	}
	folder := filepath.Join(dir, "folder")
	if err := os.Mkdir(folder, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, n := range []string{"coefficients.csv", "claims.csv"} {
		if err := os.WriteFile(filepath.Join(folder, n), nil, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	in, err := Read(folder)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"the coefficients sheet is empty", "the claims sheet is empty"} {
		if !hasProblem(in.Problems, ErrMissingValue, want) {
			t.Errorf("Read(folder of 0-byte CSVs) problems:%s, want %q", problemTexts(in.Problems), want)
		}
	}
}

// utf16Bytes encodes s as UTF-16 in the byte order given, with or without
// the byte order mark.
func utf16Bytes(s string, order binary.AppendByteOrder, bom bool) []byte {
	var out []byte
	units := utf16.Encode([]rune(s))
	if bom {
		units = append([]uint16{0xFEFF}, units...)
	}
	for _, u := range units {
		out = order.AppendUint16(out, u)
	}
	return out
}
