package extract

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"math/rand/v2"
	"path/filepath"
	"strings"
	"testing"
)

// sharedStringsPart is the member excelize writes the shared strings to.
const sharedStringsPart = "xl/sharedStrings.xml"

// sharedStringsWith returns the workbook's shared-strings part with text
// added as its last entry, and that entry's index.
func sharedStringsWith(t *testing.T, data map[string][]byte, text string) ([]byte, int) {
	t.Helper()
	sst := string(data[sharedStringsPart])
	end := strings.LastIndex(sst, "</sst>")
	if end < 0 {
		t.Fatalf("the test workbook's %s has no </sst>", sharedStringsPart)
	}
	var b bytes.Buffer
	b.WriteString(sst[:end])
	b.WriteString("<si><t>")
	if err := xml.EscapeText(&b, []byte(text)); err != nil {
		t.Fatal(err)
	}
	b.WriteString("</t></si></sst>")
	return b.Bytes(), strings.Count(sst, "<si>")
}

// wordText returns n bytes of words drawn at random from a small list: text
// that packs about as well as prose, so that a long string of it passes the
// compression-ratio check.
func wordText(n int, seed uint64) string {
	words := strings.Fields("the of and estimate interval sample model group claim study coefficient table paper reported larger smaller")
	rng := rand.New(rand.NewPCG(seed, seed))
	var b strings.Builder
	b.Grow(n + 16)
	for b.Len() < n {
		b.WriteString(words[rng.IntN(len(words))])
		b.WriteByte(' ')
	}
	return b.String()[:n]
}

// claimsUsing is a claims sheet of rows claims between claimsSheetXML's
// two, on rows 3 to rows+2, each with its cell in column col (E, published,
// or F, beyond the header) referring to shared string ref.
func claimsUsing(rows, ref int, col string) []byte {
	var b strings.Builder
	for r := 3; r < rows+3; r++ {
		fmt.Fprintf(&b, `<row r="%d"><c r="A%d" t="inlineStr"><is><t>s</t></is></c><c r="B%d" t="inlineStr"><is><t>c%d</t></is></c>`+
			`<c r="C%d" t="inlineStr"><is><t>a</t></is></c><c r="D%d" t="inlineStr"><is><t>b</t></is></c><c r="%s%d" t="s"><v>%d</v></c></row>`,
			r, r, r, r, r, r, col, r, ref)
	}
	return claimsSheetXML(b.String(), rows+3)
}

// TestHostileSharedStringBomb reads workbooks whose claims refer to one
// long shared string over and over. A cell's text is capped at
// MaxFieldBytes, as in a CSV file (the cell is read as blank, with a
// problem naming it), and every use of a shared string counts its length
// against MaxUnzippedBytes, so that a workbook of a few MB cannot unpack to
// gigabytes of cells: it is refused at the cell that passes the limit,
// naming sheet, row and column. Memory is what the workbook holds, not
// what its cells repeat.
func TestHostileSharedStringBomb(t *testing.T) {
	names, data := workbookParts(t)
	tests := []struct {
		name       string
		text, uses int
		col        string
		refused    bool // refused at a row before the last
	}{
		// The hostile-input issue's case: 1,000 uses of 15 MB.
		{"15 MB string in 1,000 cells", 15 << 20, 1000, "E", true},
		// Under the cap, each use is read until the uses add up. The
		// cells stand beyond the header, so that what is measured is
		// the reader, not the claims reader's messages, which quote a
		// cell they refuse in full.
		{"600 KiB string in 1,000 cells", 600 << 10, 1000, "F", true},
		{"2 MiB string in 3 cells", 2 << 20, 3, "E", false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			sst, ref := sharedStringsWith(t, data, wordText(tt.text, uint64(tt.text)))
			path := filepath.Join(t.TempDir(), "bomb.xlsx")
			writeWorkbookParts(t, path, names, data, map[string][]byte{sharedStringsPart: sst, claimsPart: claimsUsing(tt.uses, ref, tt.col)}, zip.Deflate)
			var in *Input
			var err error
			alloc := allocated(func() { in, err = Read(path) })
			if alloc > 200<<20 {
				t.Errorf("Read(%s) allocated %d MiB, want at most 200", tt.name, alloc>>20)
			}
			t.Logf("allocated %d MiB; error %v", alloc>>20, err)
			if tt.refused {
				var ce *CellError
				if !errors.As(err, &ce) || !errors.Is(err, ErrInputTooLarge) || ce.File != path || ce.Sheet != "claims" || ce.Column != tt.col ||
					ce.Row < 3 || ce.Row > tt.uses+1 || !strings.HasPrefix(err.Error(), fmt.Sprintf(`%s, sheet "claims", row %d, column %q: `, path, ce.Row, tt.col)) {
					t.Errorf("Read(%s) error = %v, want ErrInputTooLarge at column %s of a row of the claims sheet before the last", tt.name, err, tt.col)
				}
				return
			}
			if err != nil {
				t.Fatalf("Read(%s) error = %v, want its claims read", tt.name, err)
			}
			if len(in.Claims) != tt.uses+2 {
				t.Fatalf("Read(%s) = %d claims, want %d", tt.name, len(in.Claims), tt.uses+2)
			}
			for _, c := range in.Claims[1 : tt.uses+1] {
				want := fmt.Sprintf(`%s, sheet "claims", row %d, column "published": the cell holds 2048 KiB of text; a cell longer than 1 MiB is read as blank`, path, c.Row)
				if c.Published != "" || !hasProblem(c.Problems, ErrInputTooLarge, want) {
					t.Errorf("claim on row %d: published %.20q, problems:%s, want it blank with a problem starting %q", c.Row, c.Published, problemTexts(c.Problems), want)
				}
			}
			if last := in.Claims[tt.uses+1]; last.Published != PublishedNoDifference || len(last.Problems) != 0 {
				t.Errorf("the last claim = %q%s, want no-difference read without a problem", last.Published, problemTexts(last.Problems))
			}
		})
	}
}

// TestHostileNestedXML stores (without compressing, so that the
// compression-ratio check does not apply) a part of a million nested
// elements, 3 MB: each part the reader reads is refused at a depth of
// maxXMLDepth, allocating a few MiB at most. The hostile-input issue's
// workbook of 4 million took 1.4 GB and 18 s.
func TestHostileNestedXML(t *testing.T) {
	names, data := workbookParts(t)
	nest := strings.Repeat("<a>", 1_000_000)
	tests := []struct {
		part, head string
	}{
		{claimsPart, `<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>`},
		{claimsPart, `<worksheet><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>`},
		{sharedStringsPart, `<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><si><t>study</t></si>`},
		{"xl/styles.xml", `<styleSheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">`},
		{"xl/workbook.xml", string(data["xl/workbook.xml"][:bytes.Index(data["xl/workbook.xml"], []byte("<sheets>"))])},
	}
	for _, tt := range tests {
		t.Run(tt.part, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "nested.xlsx")
			writeWorkbookParts(t, path, names, data, map[string][]byte{tt.part: []byte(tt.head + nest)}, zip.Store)
			var err error
			alloc := allocated(func() { _, err = Read(path) })
			want := fmt.Sprintf("part %q nests its XML elements more than %d deep", tt.part, maxXMLDepth)
			if !errors.Is(err, ErrInputTooLarge) || !strings.HasPrefix(err.Error(), path) || !strings.Contains(err.Error(), want) {
				t.Errorf("Read(a million nested elements in %s) error = %v, want ErrInputTooLarge naming the file and saying %q", tt.part, err, want)
			}
			if alloc > 16<<20 {
				t.Errorf("Read(a million nested elements in %s) allocated %d MiB, want at most 16", tt.part, alloc>>20)
			}
		})
	}
}

// TestSheetXMLElements checks the bound on a sheet's elements, lowered to
// 40 here (maxSheetXMLElement in use): the claims sheet of claimsSheetXML
// has 34 elements to the end of its second row and 50 in all.
func TestSheetXMLElements(t *testing.T) {
	path := filepath.Join(t.TempDir(), "elements.xlsx")
	names, data := workbookParts(t)
	rebuildWorkbook(t, path, names, data, claimsPart, claimsSheetXML("", 3))
	wb, err := openWorkbook(path)
	if err != nil {
		t.Fatal(err)
	}
	defer wb.Close()
	wb.sheetXML.elements = 40
	src, err := wb.source("claims")
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	_, _, err = readClaimSheet(src, Position{File: path, Sheet: "claims"})
	want := path + `, sheet "claims", after row 2: part "xl/worksheets/sheet2.xml" holds more than 40 XML elements`
	if !errors.Is(err, ErrInputTooLarge) || !strings.HasPrefix(err.Error(), want) {
		t.Errorf("readClaimSheet(50 elements, at most 40) error = %v, want ErrInputTooLarge starting %q", err, want)
	}
}

// TestHostileXMLEntities reads parts that declare entities, among them an
// external one naming a local file (XML external entities) and one that
// expands a thousandfold: encoding/xml reads no document type definition,
// so an entity it does not know is an error, never a file read or an
// expansion, and the workbook is refused as damaged.
func TestHostileXMLEntities(t *testing.T) {
	names, data := workbookParts(t)
	external := `<?xml version="1.0"?><!DOCTYPE x [<!ENTITY xxe SYSTEM "file:///etc/passwd">]>`
	laughs := `<?xml version="1.0"?><!DOCTYPE x [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;"><!ENTITY c "&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;">]>`
	tests := []struct {
		name, part, xml, want string
	}{
		{"external entity in the shared strings", sharedStringsPart,
			external + `<sst><si><t>&xxe;</t></si></sst>`, `part "xl/sharedStrings.xml" is damaged`},
		{"expanding entity in the shared strings", sharedStringsPart,
			laughs + `<sst><si><t>&c;</t></si></sst>`, `part "xl/sharedStrings.xml" is damaged`},
		{"external entity in the sheet", claimsPart,
			external + `<worksheet><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>&xxe;</t></is></c></row></sheetData></worksheet>`,
			`sheet "claims": the sheet's XML is damaged`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "entities.xlsx")
			rebuildWorkbook(t, path, names, data, tt.part, []byte(tt.xml))
			in, err := Read(path)
			if !errors.Is(err, ErrUnsupportedInput) || !strings.HasPrefix(err.Error(), path) || !strings.Contains(err.Error(), tt.want) || strings.Contains(err.Error(), "root:") {
				t.Errorf("Read(%s) = %v, error %v, want ErrUnsupportedInput saying %q", tt.name, in, err, tt.want)
			}
		})
	}
}
